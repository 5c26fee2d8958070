import type { MaskGraph } from './masks.js';
import { child, nextHighest, nextLowest, type SetTrie } from './trie.js';

/** Exact FCFM metrics of one connected component, in its local class indices. */
export interface ComponentMetrics {
  /** Z = Σ_A Ψ(A) = 1 / P(empty). */
  readonly z: number;
  readonly backlog: Float64Array;
  readonly immediateMatch: Float64Array;
  /** Directed match flows: flow[i * n + j] = rate at which arrivals of i take a waiting j. */
  readonly flow: Float64Array;
}

/** Thrown by the recursion when some set A has μ(A) <= r(A): (lo, hi) is that set. */
export class SaturatedSet extends Error {
  constructor(
    readonly lo: number,
    readonly hi: number,
  ) {
    super('saturated independent set');
  }
}

/**
 * Prefix sums Ψ in increasing mask order (every subset first), by a depth-first walk of the trie:
 *   Ψ(∅) = 1,  Ψ(A) = Σ_{i∈A} λ_i Ψ(A∖{i}) / (μ(A) − r(A)),  r(A) = λ(A ∖ S).
 * The walk keeps, for the set A_d on the stack, the indices of A_d ∖ {i} for its elements i; going
 * down to A_d ∪ {c} each becomes child(·, c). Throws SaturatedSet when μ(A) − r(A) <= tol.
 */
export function prefixSums(g: MaskGraph, t: SetTrie, psi: Float64Array, tol: number, psi1?: Float64Array): void {
  const n = g.n;
  const { rate, loop } = g;
  const { node, mu } = t;
  const D = n + 1;
  const idx = new Int32Array(D);
  const elem = new Int32Array(D); // elem[d] = class added at depth d (d >= 1)
  const rem = new Int32Array(D * n); // rem[d*n + j] = index of A_d ∖ {elem[j+1]}
  const r = new Float64Array(D);
  const todoLo = new Int32Array(D); // children still to visit (ascending)
  const todoHi = new Int32Array(D);
  const mLo = new Int32Array(D); // mask of A_d (for certificates)
  const mHi = new Int32Array(D);
  psi[0] = 1;
  if (psi1) psi1[0] = 0;
  idx[0] = 0;
  todoLo[0] = node[1]!;
  todoHi[0] = node[2]!;
  let d = 0;
  while (d >= 0) {
    const c = nextLowest(todoLo, todoHi, d);
    if (c < 0) {
      d--;
      continue;
    }
    const p = idx[d]!;
    const s = child(node, p, c);
    const e = d + 1;
    idx[e] = s;
    elem[e] = c;
    const base = d * n;
    const nb = e * n;
    let sum = 0;
    for (let j = 0; j < d; j++) {
      const q = child(node, rem[base + j]!, c);
      rem[nb + j] = q;
      sum += rate[elem[j + 1]!]! * psi[q]!;
    }
    rem[nb + d] = p;
    const lc = rate[c]!;
    sum += lc * psi[p]!;
    const re = r[d]! + (loop[c] ? 0 : lc);
    r[e] = re;
    mLo[e] = c < 32 ? mLo[d]! | (1 << c) : mLo[d]!;
    mHi[e] = c < 32 ? mHi[d]! : mHi[d]! | (1 << (c - 32));
    const den = mu[s]! - re;
    if (!(den > tol)) throw new SaturatedSet(mLo[e]!, mHi[e]!);
    const ps = sum / den;
    psi[s] = ps;
    if (psi1) {
      // first moment of the word length over words with set A (see firstMoment below)
      let m1 = lc * (psi1[p]! + psi[p]!);
      for (let j = 0; j < d; j++) {
        const q = rem[nb + j]!;
        m1 += rate[elem[j + 1]!]! * (psi1[q]! + psi[q]!);
      }
      psi1[s] = (m1 + re * ps) / den;
    }
    todoLo[e] = node[3 * s + 1]!;
    todoHi[e] = node[3 * s + 2]!;
    d = e;
  }
}

/**
 * firstMoment: with psi1 given, prefixSums also fills Ψ1(A) = Σ over words w with set A of
 * weight(w)·|w|. Grouping by the last letter (a first occurrence of i, or a repeat of a letter of
 * A ∖ S, each with factor λ/μ(A), and the length growing by one):
 *   Ψ1(A) = [Σ_{i∈A} λ_i (Ψ1(A∖i) + Ψ(A∖i)) + r(A)(Ψ1(A) + Ψ(A))] / μ(A)
 *   ⇒ Ψ1(A) = [Σ_{i∈A} λ_i (Ψ1(A∖i) + Ψ(A∖i)) + r(A) Ψ(A)] / (μ(A) − r(A)),
 * so the mean total backlog Σ_A Ψ1(A) / Σ_A Ψ(A) needs no tail pass.
 */

/**
 * Tail sums T in decreasing mask order (every superset first: a post-order walk with children in
 * descending c), with every metric accumulated on the way:
 *   T(A) = [1 + Σ_{k addable} λ_k/μ(A∪k) · T(A∪k)] / (1 − r(A)/μ(A))   (A ≠ ∅; T(∅) has no divisor)
 *   v(A,k) = Ψ(A) λ_k T(A∪k) / μ(A∪k) is the mass of words u·k·rest with set(u) = A:
 *     it adds to L_k (the first k after such a prefix), and v·λ_i is the rate at which an arrival of
 *     i ∈ N(k) ∖ N(A) takes that k (the word holds no partner of i before it);
 *   L_k also gets Ψ(A) λ_k T(A)/μ(A) for each k ∈ A ∖ S (a repeated k);
 *   P(an arrival of k finds no partner) gets Ψ(A) when k ∉ N(A).
 * The walk keeps, for A_d on the stack, the index of A_d ∪ {k} for every addable k; going down to
 * A_d ∪ {c} it becomes child(A_d ∪ {c}, k) for k < c and child(A_d ∪ {k}, c) for k > c.
 * Everything is divided by Z = T(∅) at the end.
 */
export function tailPass(g: MaskGraph, t: SetTrie, psi: Float64Array, tail: Float64Array): ComponentMetrics {
  const n = g.n;
  const { rate, loop, nbLo, nbHi, conLo, conHi, allLo, allHi } = g;
  const { node, mu } = t;
  const D = n + 1;
  const backlog = new Float64Array(n);
  const noMatch = new Float64Array(n);
  const flow = new Float64Array(n * n);
  const idx = new Int32Array(D);
  const add = new Int32Array(D * n); // add[d*n + k] = index of A_d ∪ {k}
  const aLo = new Int32Array(D); // addable classes of A_d
  const aHi = new Int32Array(D);
  const sLo = new Int32Array(D); // mask of A_d
  const sHi = new Int32Array(D);
  const nLo = new Int32Array(D); // N(A_d)
  const nHi = new Int32Array(D);
  const r = new Float64Array(D);
  const todoLo = new Int32Array(D); // children still to visit (descending)
  const todoHi = new Int32Array(D);

  idx[0] = 0;
  aLo[0] = allLo;
  aHi[0] = allHi;
  for (let k = 0; k < n; k++) add[k] = child(node, 0, k);
  todoLo[0] = node[1]!;
  todoHi[0] = node[2]!;
  let d = 0;
  while (d >= 0) {
    // next child, highest first
    const c = nextHighest(todoLo, todoHi, d);
    if (c >= 0) {
      // go down to A_d ∪ {c}
      const e = d + 1;
      const s = add[d * n + c]!;
      idx[e] = s;
      sLo[e] = c < 32 ? sLo[d]! | (1 << c) : sLo[d]!;
      sHi[e] = c < 32 ? sHi[d]! : sHi[d]! | (1 << (c - 32));
      nLo[e] = nLo[d]! | nbLo[c]!;
      nHi[e] = nHi[d]! | nbHi[c]!;
      r[e] = r[d]! + (loop[c] ? 0 : rate[c]!);
      const eLo = aLo[d]! & ~conLo[c]!;
      const eHi = aHi[d]! & ~conHi[c]!;
      aLo[e] = eLo;
      aHi[e] = eHi;
      const from = d * n;
      const to = e * n;
      for (let w = 0; w < 2; w++) {
        let y = w === 0 ? eLo : eHi;
        while (y !== 0) {
          const b = y & -y;
          const k = (w << 5) + 31 - Math.clz32(b);
          y ^= b;
          add[to + k] = k < c ? child(node, s, k) : child(node, add[from + k]!, c);
        }
      }
      todoLo[e] = node[3 * s + 1]!;
      todoHi[e] = node[3 * s + 2]!;
      d = e;
      continue;
    }
    // all supersets done: finish A_d
    const s = idx[d]!;
    const ps = psi[s]!;
    const row = d * n;
    const NL = nLo[d]!;
    const NH = nHi[d]!;
    let acc = 0;
    for (let w = 0; w < 2; w++) {
      let y = w === 0 ? aLo[d]! : aHi[d]!;
      while (y !== 0) {
        const b = y & -y;
        const k = (w << 5) + 31 - Math.clz32(b);
        y ^= b;
        const q = add[row + k]!;
        const f = (rate[k]! * tail[q]!) / mu[q]!;
        acc += f;
        const v = ps * f;
        backlog[k] += v;
        let z = nbLo[k]! & ~NL;
        while (z !== 0) {
          const bb = z & -z;
          const i = 31 - Math.clz32(bb);
          z ^= bb;
          flow[i * n + k] += rate[i]! * v;
        }
        z = nbHi[k]! & ~NH;
        while (z !== 0) {
          const bb = z & -z;
          const i = 63 - Math.clz32(bb);
          z ^= bb;
          flow[i * n + k] += rate[i]! * v;
        }
      }
    }
    if (d === 0) {
      tail[s] = 1 + acc;
    } else {
      const T = (1 + acc) / (1 - r[d]! / mu[s]!);
      tail[s] = T;
      const rep = (ps * T) / mu[s]!;
      for (let w = 0; w < 2; w++) {
        let y = w === 0 ? sLo[d]! : sHi[d]!;
        while (y !== 0) {
          const b = y & -y;
          const i = (w << 5) + 31 - Math.clz32(b);
          y ^= b;
          if (!loop[i]) backlog[i] += rate[i]! * rep;
        }
      }
    }
    for (let w = 0; w < 2; w++) {
      let y = w === 0 ? allLo & ~NL : allHi & ~NH;
      while (y !== 0) {
        const b = y & -y;
        const k = (w << 5) + 31 - Math.clz32(b);
        y ^= b;
        noMatch[k] += ps;
      }
    }
    d--;
  }
  const z = tail[0]!;
  const immediateMatch = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    backlog[k] /= z;
    immediateMatch[k] = 1 - noMatch[k]! / z;
  }
  for (let q = 0; q < flow.length; q++) flow[q] /= z;
  return { z, backlog, immediateMatch, flow };
}
