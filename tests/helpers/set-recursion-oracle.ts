import type { CompiledModel } from '../../src/model/compile.js';

/**
 * The recursions over independent sets written the plain way, for differential tests of the
 * WebAssembly kernels: sets as (lo, hi) word pairs listed in increasing mask order, found by binary
 * search in that list instead of the trie, and every formula applied as written (no index bookkeeping, no
 * push form). Formulas (derived for this project from "A product form for the general stochastic
 * matching model", J. Appl. Probab. 2021; checked against the permutation sums and the truncated
 * chain in the other tests):
 *   Ψ(∅) = 1,  Ψ(A) = Σ_{i∈A} λ_i Ψ(A∖i) / (μ(A) − r(A)),  μ(A) = λ(N(A)),  r(A) = λ(A ∖ S)
 *   T(A) = [1 + Σ_{k addable} λ_k/μ(A∪k) T(A∪k)] / (1 − r(A)/μ(A))   (no divisor for ∅), Z = T(∅)
 *   L_k = (1/Z) Σ_{B∋k} λ_k/μ(B) (Ψ(B∖k) + [k∉S] Ψ(B)) T(B)
 *   matched at once_k = 1 − (1/Z) Σ_{A∩N(k)=∅} Ψ(A)
 *   M(i→j) = λ_i (1/Z) Σ_{B∩N(i)=∅, B∪j∈I} Ψ(B) λ_j/μ(B∪j) T(B∪j)
 * One connected component, at most 53 classes (keys hi·2^32 + lo stay exact). For a few hundred
 * thousand sets at most.
 */
export interface SetRecursion {
  /** Masks in increasing order (hi, then lo unsigned). */
  readonly lo: Int32Array;
  readonly hi: Int32Array;
  /** Position of a mask (lo, hi) in the list, −1 when it is not an independent set. */
  readonly position: (lo: number, hi: number) => number;
  readonly mu: Float64Array;
  readonly psi: Float64Array;
  readonly tail: Float64Array;
  readonly z: number;
  readonly backlog: Float64Array;
  readonly immediateMatch: Float64Array;
  /** flow[i·n + j] = M(i→j). */
  readonly flow: Float64Array;
}

const key = (lo: number, hi: number): number => (hi >>> 0) * 4294967296 + (lo >>> 0);
const has = (lo: number, hi: number, k: number): boolean => (k < 32 ? ((lo >>> k) & 1) === 1 : ((hi >>> (k - 32)) & 1) === 1);

export function setRecursion(model: CompiledModel): SetRecursion {
  const n = model.n;
  if (n > 53) throw new RangeError('the oracle keys masks as doubles: at most 53 classes');
  const rate = model.rates;
  const loop = model.selfLoop;
  const adjacent = (a: number, b: number): boolean => {
    for (let p = model.adjStart[a]!; p < model.adjStart[a + 1]!; p++) if (model.adj[p] === b) return true;
    return false;
  };
  // N(k) as lists, k itself when self-compatible
  const nbrs: number[][] = Array.from({ length: n }, (_, k) => {
    const out: number[] = [];
    for (let j = 0; j < n; j++) if (adjacent(k, j) || (j === k && loop[k])) out.push(j);
    return out;
  });
  // every independent set of the graph without self-loops, by extension with larger classes
  const sets: Array<[number, number]> = [];
  const adjLo = new Int32Array(n);
  const adjHi = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    for (let j = 0; j < n; j++) {
      if (j === k || !adjacent(k, j)) continue;
      if (j < 32) adjLo[k] |= 1 << j;
      else adjHi[k] |= 1 << (j - 32);
    }
  }
  const grow = (lo: number, hi: number, from: number): void => {
    sets.push([lo, hi]);
    for (let k = from; k < n; k++) {
      if ((lo & adjLo[k]!) !== 0 || (hi & adjHi[k]!) !== 0) continue;
      grow(k < 32 ? lo | (1 << k) : lo, k < 32 ? hi : hi | (1 << (k - 32)), k + 1);
    }
  };
  grow(0, 0, 0);
  sets.sort((a, b) => key(a[0], a[1]) - key(b[0], b[1]));
  const count = sets.length;
  const lo = Int32Array.from(sets, (s) => s[0]);
  const hi = Int32Array.from(sets, (s) => s[1]);
  const keys = Float64Array.from(sets, ([a, b]) => key(a, b));
  const position = (a: number, b: number): number => {
    const x = key(a, b);
    let l = 0;
    let h = count - 1;
    while (l <= h) {
      const mid = (l + h) >> 1;
      if (keys[mid]! < x) l = mid + 1;
      else if (keys[mid]! > x) h = mid - 1;
      else return mid;
    }
    return -1;
  };
  const memberList: number[][] = sets.map(([a, b]) => [...Array(n).keys()].filter((k) => has(a, b, k)));
  // N(set) as a flag per class
  const coveredBy = memberList.map((ms) => {
    const c = new Uint8Array(n);
    for (const i of ms) for (const j of nbrs[i]!) c[j] = 1;
    return c;
  });
  const without = (s: number, k: number): number => position(k < 32 ? lo[s]! & ~(1 << k) : lo[s]!, k < 32 ? hi[s]! : hi[s]! & ~(1 << (k - 32)));
  const withK = (s: number, k: number): number =>
    has(lo[s]!, hi[s]!, k) ? -1 : position(k < 32 ? lo[s]! | (1 << k) : lo[s]!, k < 32 ? hi[s]! : hi[s]! | (1 << (k - 32)));
  const mu = new Float64Array(count);
  const r = new Float64Array(count);
  for (let s = 0; s < count; s++) {
    for (let j = 0; j < n; j++) if (coveredBy[s]![j]) mu[s] += rate[j]!;
    for (const i of memberList[s]!) if (!loop[i]) r[s] += rate[i]!;
  }
  const psi = new Float64Array(count);
  psi[0] = 1;
  for (let s = 1; s < count; s++) {
    let sum = 0;
    for (const i of memberList[s]!) sum += rate[i]! * psi[without(s, i)]!;
    psi[s] = sum / (mu[s]! - r[s]!);
  }
  const tail = new Float64Array(count);
  for (let s = count - 1; s >= 0; s--) {
    let acc = 1;
    for (let k = 0; k < n; k++) {
      const q = withK(s, k);
      if (q >= 0) acc += (rate[k]! / mu[q]!) * tail[q]!;
    }
    tail[s] = s === 0 ? acc : acc / (1 - r[s]! / mu[s]!);
  }
  const z = tail[0]!;
  const backlog = new Float64Array(n);
  const noPartner = new Float64Array(n);
  const flow = new Float64Array(n * n);
  for (let s = 0; s < count; s++) {
    for (const k of memberList[s]!) {
      backlog[k] += ((rate[k]! / mu[s]!) * (psi[without(s, k)]! + (loop[k] ? 0 : psi[s]!)) * tail[s]!) / z;
    }
    for (let i = 0; i < n; i++) {
      if (coveredBy[s]![i]) continue; // the set holds a partner of i
      noPartner[i] += psi[s]!;
      for (const j of nbrs[i]!) {
        const q = withK(s, j);
        if (q >= 0) flow[i * n + j] += (rate[i]! * psi[s]! * rate[j]! * tail[q]!) / mu[q]! / z;
      }
    }
  }
  const immediateMatch = Float64Array.from(noPartner, (x) => 1 - x / z);
  return { lo, hi, position, mu, psi, tail, z, backlog, immediateMatch, flow };
}

/** The masks of the trie's sets by index (children of s are s ∪ {c}, c ascending over cand(s)). */
export function trieMasks(node: Int32Array, count: number): { lo: Int32Array; hi: Int32Array } {
  const lo = new Int32Array(count);
  const hi = new Int32Array(count);
  for (let s = 0; s < count; s++) {
    let next = node[3 * s]!;
    for (let c = 0; c < 64; c++) {
      if (!has(node[3 * s + 1]!, node[3 * s + 2]!, c)) continue;
      lo[next] = c < 32 ? lo[s]! | (1 << c) : lo[s]!;
      hi[next] = c < 32 ? hi[s]! : hi[s]! | (1 << (c - 32));
      next++;
    }
  }
  return { lo, hi };
}
