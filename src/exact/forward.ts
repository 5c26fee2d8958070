import { SaturatedSet } from './component.js';
import { maskRate, type MaskGraph } from './masks.js';
import { child4, type SetIndex } from './set-index.js';
import { nextLowest } from './trie.js';

/**
 * Forward-only exact metrics of one component with per-class backlogs, keeping every intermediate
 * value so that single-edge changes can be re-evaluated incrementally (src/exact/variant.ts).
 *
 * Besides Ψ (see prefixSums in component.ts) it computes, for every set A and every member k ∈ A,
 *   Ψ_k(A) = Σ over words w with set A of weight(w) · (number of k-letters in w).
 * Grouping the words by their last letter as for Ψ (a first occurrence of some x ∈ A, whose prefix has
 * set A ∖ x, or a repeat of a letter of A ∖ S, whose prefix has set A, each with factor λ/μ(A)):
 *   Ψ_k(A) μ(A) = Σ_{x∈A} λ_x [Ψ_k(A∖x) + [x = k] Ψ(A∖x)] + Σ_{y∈A∖S} λ_y [Ψ_k(A) + [y = k] Ψ(A)]
 *   ⇒ Ψ_k(A) = [Σ_{x∈A, x≠k} λ_x Ψ_k(A∖x) + λ_k Ψ(A∖k) + [k ∉ S] λ_k Ψ(A)] / (μ(A) − r(A)),
 * so the mean number of waiting k-items is L_k = Σ_A Ψ_k(A) / Σ_A Ψ(A), without any tail pass.
 * (Summed over k ∈ A this is the first-moment recursion Ψ1 of component.ts.)
 *
 * Layout (set-index.ts): the block of the set with index s starts at o = node[4s+3]; blk[o] = Ψ(A) and
 * blk[o + 1 + u] = Ψ_k(A) for its u-th member in decreasing class order (the order the trie adds them).
 */
export interface ForwardSums {
  /** Σ_A Ψ(A) = 1 / P(empty). */
  readonly z: number;
  /** Σ_A Ψ_k(A) per local class (divide by z for the mean backlog). */
  readonly classSums: Float64Array;
  /** Ψ and Ψ_k of every set, see Layout. */
  readonly blk: Float64Array;
  /** withPsi[i] = Σ_{A∋i} Ψ(A). */
  readonly withPsi: Float64Array;
  /** withPsik[i·n + k] = Σ_{A∋i} Ψ_k(A). */
  readonly withPsik: Float64Array;
}

/**
 * Runs the forward recursion over every set (depth first over the trie, subsets before supersets).
 * μ(A) comes from the mask of N(A) (maskRate). Throws SaturatedSet when μ(A) − r(A) <= tol.
 * With `withSums` false the two withPsi arrays stay zero (half the work per set).
 */
export function forwardSums(g: MaskGraph, t: SetIndex, tol: number, withSums = true): ForwardSums {
  const n = g.n;
  const { rate, loop, nbLo, nbHi } = g;
  const { node } = t;
  const blk = new Float64Array(t.total);
  const classSums = new Float64Array(n);
  const withPsi = new Float64Array(n);
  const withPsik = new Float64Array(n * n);
  const D = n + 1;
  const idx = new Int32Array(D);
  const elem = new Int32Array(D); // elem[d] = class added at depth d (decreasing with d)
  const rem = new Int32Array(D * n); // rem[d*n + j] = index of A_d ∖ elem[j+1]
  const r = new Float64Array(D);
  const todoLo = new Int32Array(D);
  const todoHi = new Int32Array(D);
  const mLo = new Int32Array(D);
  const mHi = new Int32Array(D);
  const nLo = new Int32Array(D); // N(A_d)
  const nHi = new Int32Array(D);
  const acc = new Float64Array(D);
  blk[0] = 1; // Ψ(∅)
  let z = 1;
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
    const s = child4(node, p, c);
    const e = d + 1;
    idx[e] = s;
    elem[e] = c;
    const base = d * n;
    const nb = e * n;
    for (let j = 0; j < d; j++) rem[nb + j] = child4(node, rem[base + j]!, c);
    rem[nb + d] = p;
    const re = r[d]! + (loop[c] ? 0 : rate[c]!);
    r[e] = re;
    mLo[e] = c < 32 ? mLo[d]! | (1 << c) : mLo[d]!;
    mHi[e] = c < 32 ? mHi[d]! : mHi[d]! | (1 << (c - 32));
    nLo[e] = nLo[d]! | nbLo[c]!;
    nHi[e] = nHi[d]! | nbHi[c]!;
    const den = maskRate(g, nLo[e]!, nHi[e]!) - re;
    if (!(den > tol)) throw new SaturatedSet(mLo[e]!, mHi[e]!);
    // members at positions 0..d (elem[1..e]); A ∖ elem[j+1] has member t at position t − [t > j]
    for (let q = 0; q < e; q++) acc[q] = 0;
    let sum = 0;
    for (let j = 0; j < e; j++) {
      const q = rem[nb + j]!;
      const w = rate[elem[j + 1]!]!;
      const o = node[4 * q + 3]!; // blk[o] = Ψ(q), blk[o + 1 + u] = its u-th member
      for (let u = 0; u < j; u++) acc[u] += w * blk[o + 1 + u]!;
      for (let u = j + 1; u < e; u++) acc[u] += w * blk[o + u]!;
      const f = w * blk[o]!;
      acc[j] += f;
      sum += f;
    }
    const ps = sum / den;
    const os = node[4 * s + 3]!;
    blk[os] = ps;
    z += ps;
    for (let u = 0; u < e; u++) {
      const k = elem[u + 1]!;
      const v = (acc[u]! + (loop[k] ? 0 : rate[k]! * ps)) / den;
      blk[os + 1 + u] = v;
      classSums[k] += v;
    }
    if (withSums) {
      for (let u = 0; u < e; u++) {
        const i = elem[u + 1]!;
        withPsi[i] += ps;
        const row = i * n;
        for (let w = 0; w < e; w++) withPsik[row + elem[w + 1]!] += blk[os + 1 + w]!;
      }
    }
    todoLo[e] = node[4 * s + 1]!;
    todoHi[e] = node[4 * s + 2]!;
    d = e;
  }
  return { z, classSums, blk, withPsi, withPsik };
}
