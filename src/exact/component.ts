import { A, mask64, setMask64, type KernelMemory } from './kernel-layout.js';
import type { MaskGraph } from './masks.js';
import { KERNEL_CHUNK, type SetTrie } from './trie.js';

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
 * The walk runs in WebAssembly (kernel-code.ts: prefix) on the trie's memory; psi (and psi1) receive
 * copies of the results.
 */
export function prefixSums(g: MaskGraph, t: SetTrie, psi: Float64Array, tol: number, psi1?: Float64Array): void {
  const { memory: m, run } = t.kernel;
  const { i32, f64 } = m;
  startWalk(m);
  i32[A.moment >> 2] = psi1 ? 1 : 0;
  f64[A.tol >> 3] = tol;
  m.psi[0] = 1;
  m.tail[0] = 0; // Ψ1(∅)
  let status: number;
  while ((status = run.prefix(KERNEL_CHUNK)) === 1);
  if (status < 0) {
    const { lo, hi } = mask64(m, A.sat);
    throw new SaturatedSet(lo, hi);
  }
  if (psi !== m.psi) psi.set(m.psi);
  if (psi1) psi1.set(m.tail);
}

/** Puts ∅ alone on the walk stack (depth 0; both walks start there). */
function startWalk(m: KernelMemory): void {
  if (!m.current()) throw new Error('internal: a trie was used after a later buildTrie reused its memory');
  m.i32[A.depth >> 2] = 0;
  m.i32[A.idx >> 2] = 0;
  m.f64[A.r >> 3] = 0;
  for (const at of [A.smask, A.nmask, A.omask]) setMask64(m, at, 0, 0);
  setMask64(m, A.todo, m.node[1]!, m.node[2]!);
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
 * Tail sums T in decreasing mask order (every superset first: a post-order walk of the trie with
 * children in descending c), with every metric accumulated on the way. Written "forward" over the
 * members of each set B, like prefixSums (the walk keeps the indices of B ∖ {k} for every k ∈ B):
 *   T(A) = [1 + Σ_{k addable} λ_k/μ(A∪k) · T(A∪k)] / (1 − r(A)/μ(A))   (A ≠ ∅; T(∅) has no divisor),
 * so once T(B) is final (all supersets of B are finished before B) it adds f_k = λ_k T(B)/μ(B) to the
 * pending sum of each B ∖ {k}, kept in tail[] until that set is finished. Per pair (B, k ∈ B):
 *   v = Ψ(B∖k) f_k is the mass of words u·k·rest with set(u) = B ∖ k and k not in u: it adds to L_k
 *     (the first k after such a prefix), and v·λ_i is the rate at which an arrival of
 *     i ∈ N(k) ∖ N(B∖k) takes that k (the word holds no partner of i before it);
 *   L_k also gets Ψ(B) f_k when k ∉ S (a repeated k, prefix set B).
 * The receivers N(k) ∖ N(B∖k) are the classes of N(k) that no other member of B covers: with
 * N1(B) = the classes with exactly one neighbour in B (a self-compatible member covers itself),
 * they are N(k) ∩ N1(B), since B is independent and k ∈ N(i) for each of them. N1 is carried down
 * the walk: N1(B∪c) = (N1(B) ∖ N(c)) ∪ (N(c) ∖ N(B)).
 *
 * Matched on arrival from the flows. Every arrival of i either finds a compatible item and takes
 * exactly one, of some class j ∈ N(i), or finds none; so, by PASTA,
 *   λ_i · P(i matched at once) = Σ_{j∈N(i)} M(i→j).
 * The same holds for the sums themselves, word by word: a word (a state) either holds no partner of
 * i — mass Σ_{A∩N(i)=∅} Ψ(A) — or has a first letter j ∈ N(i), preceded by a prefix u whose set B
 * avoids N(i) and followed by any continuation: mass Ψ(B) λ_j/μ(B∪j) T(B∪j). Summing over all
 * words gives Z = Σ_{A∩N(i)=∅} Ψ(A) + Σ_j M(i→j)·Z/λ_i, i.e.
 *   1 − (1/Z) Σ_{A∩N(i)=∅} Ψ(A) = Σ_j M(i→j) / λ_i,
 * a sum of positive terms (no cancellation), and no extra pass over the classes per set.
 * Everything is divided by Z = T(∅) at the end. tail[] is overwritten (its input is ignored). The
 * walk runs in WebAssembly (kernel-code.ts: tail; `overTail` for a design over a shared trie after its
 * `over` walk, shared-trie.ts); tail receives a copy of T.
 */
export function tailPass(g: MaskGraph, t: SetTrie, psi: Float64Array, tail: Float64Array, kernel: 'tail' | 'overTail' = 'tail'): ComponentMetrics {
  const n = g.n;
  const rate = g.rate;
  const { memory: m, run } = t.kernel;
  if (psi !== m.psi) m.psi.set(psi);
  const backlog = m.f64.subarray(A.backlog >> 3, (A.backlog >> 3) + n);
  const pstart = m.i32.subarray(A.pstart >> 2, (A.pstart >> 2) + n + 1);
  const pclass = m.i32.subarray(A.pclass >> 2, (A.pclass >> 2) + pstart[n]!);
  const pflow = m.f64.subarray(A.pflow >> 3, (A.pflow >> 3) + pstart[n]!);
  m.tail.fill(0);
  backlog.fill(0);
  pflow.fill(0);
  startWalk(m);
  while (run[kernel](KERNEL_CHUNK) === 1);
  const flow = new Float64Array(n * n); // flow[i*n + k] / λ_i until the end
  for (let k = 0; k < n; k++) for (let t = pstart[k]!; t < pstart[k + 1]!; t++) flow[pclass[t]! * n + k] = pflow[t]!;
  if (tail !== m.tail) tail.set(m.tail);
  const z = m.tail[0]!;
  const out = new Float64Array(n);
  const rates = new Float64Array(n * n);
  const immediateMatch = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    out[i] = backlog[i]! / z;
    const scale = rate[i]! / z;
    let sum = 0;
    for (let k = 0; k < n; k++) {
      const x = flow[i * n + k]! * scale;
      rates[i * n + k] = x;
      sum += x;
    }
    immediateMatch[i] = sum / rate[i]!;
  }
  return { z, backlog: out, immediateMatch, flow: rates };
}
