import type { ForwardSums } from './forward.js';
import type { MaskGraph } from './masks.js';
import type { SetIndex } from './set-index.js';
import { touchedClassSums } from './touched-adjoint.js';
import type { VariantScratch } from './touched-record.js';
import { walkFamily, type TouchedFamily, type TouchedSums } from './touched-walk.js';

/**
 * Incremental re-evaluation of one component after one compatibility {i, j} is added or removed
 * (i = j: a self-loop), reusing everything the change leaves alone.
 *
 * Why it is local. Ψ(A) and Ψ_k(A) (src/exact/forward.ts) depend only on μ(B) = λ(N(B)) and
 * r(B) = λ(B ∖ S) for subsets B ⊆ A, and those change only when B contains i or j. So every set that
 * avoids both endpoints keeps its values, and
 *   Σ_{A ∌ i,j} Ψ(A) = Z − Σ_{A∋i} Ψ(A) − Σ_{A∋j, A∌i} Ψ(A)
 * comes from sums kept by the base pass (same for Ψ_k). Only the "touched" sets of the changed
 * design — those containing i or j — are recomputed:
 *   added edge {i, j}:    {i} ∪ B (B avoids N[i] and j) and {j} ∪ B (B avoids N[j] and i);
 *                         the base sets holding both endpoints simply disappear;
 *   removed edge {i, j}:  {i} ∪ B, {j} ∪ B as above (now B may not hold the other endpoint because it
 *                         is a neighbour), plus the new sets {i, j} ∪ B (B avoids N[i] ∪ N[j]);
 *   self-loop at i:       {i} ∪ B (B avoids N[i]); the family of sets does not change.
 * Each family of B is walked depth first over the base trie (touched-walk.ts), which visits B in
 * increasing mask order, so every A ∖ x is known before A. The base trie index of {p} ∪ B is carried
 * along: adding c to B gives child({p} ∪ B, c) when c < p and child(B ∪ {c}, p) when c > p (then
 * every member of B ∪ {c} is above p); the indices of {p} ∪ (B ∖ x) are carried the same way.
 * Ψ' of the touched sets is written at those base indices into scratch arrays (a copy-on-write view
 * of the base); the new sets {i, j} ∪ B of a removal are stored under the index of B. The per-class
 * sums then come from one backward replay (touched-adjoint.ts).
 *
 * Cost: O(|A|) per touched set for Ψ', the index bookkeeping and the per-class sums — a fraction of
 * one evaluation; nothing of size |I| is allocated per change.
 */

export interface ComponentChange {
  /** Local class indices, i <= j (i = j: a self-loop). */
  readonly i: number;
  readonly j: number;
  /** true: the compatibility is added; false: it is removed. */
  readonly add: boolean;
}

export type VariantOutcome =
  | {
      readonly stable: true;
      /** Σ_A Ψ'(A) = 1 / P(empty) of the changed component. */
      readonly z: number;
      /** Σ_A Ψ'_k(A) per local class. */
      readonly classSums: Float64Array;
      /** Number of touched sets (recomputed). */
      readonly touched: number;
    }
  /** A set A of the changed design with μ(A) − r(A) <= tol, as a two-word mask. */
  | { readonly stable: false; readonly lo: number; readonly hi: number };

const bitLo = (k: number): number => (k < 32 ? 1 << k : 0);
const bitHi = (k: number): number => (k < 32 ? 0 : 1 << (k - 32));

/** The families of touched sets of a change (see the comment at the top). */
function families(g: MaskGraph, change: ComponentChange): TouchedFamily[] {
  const { i, j, add } = change;
  const { nbLo, nbHi, conLo, conHi, allLo, allHi, rate, loop } = g;
  const r0 = (k: number): number => (loop[k] ? 0 : rate[k]!);
  const single = (p: number, xLo: number, xHi: number, npLo: number, npHi: number, rP: number, sumBase = false): TouchedFamily => ({
    pair: false,
    p,
    q: p,
    xLo,
    xHi,
    npLo,
    npHi,
    rP,
    sumBase,
  });
  if (i === j) {
    const xLo = allLo & ~conLo[i]!;
    const xHi = allHi & ~conHi[i]!;
    return add
      ? [single(i, xLo, xHi, nbLo[i]! | bitLo(i), nbHi[i]! | bitHi(i), 0)]
      : [single(i, xLo, xHi, nbLo[i]! & ~bitLo(i), nbHi[i]! & ~bitHi(i), rate[i]!)];
  }
  if (add) {
    return [
      single(i, allLo & ~conLo[i]! & ~bitLo(j), allHi & ~conHi[i]! & ~bitHi(j), nbLo[i]! | bitLo(j), nbHi[i]! | bitHi(j), r0(i)),
      single(j, allLo & ~conLo[j]! & ~bitLo(i), allHi & ~conHi[j]! & ~bitHi(i), nbLo[j]! | bitLo(i), nbHi[j]! | bitHi(i), r0(j), true),
    ];
  }
  const niLo = nbLo[i]! & ~bitLo(j);
  const niHi = nbHi[i]! & ~bitHi(j);
  const njLo = nbLo[j]! & ~bitLo(i);
  const njHi = nbHi[j]! & ~bitHi(i);
  return [
    single(i, allLo & ~conLo[i]!, allHi & ~conHi[i]!, niLo, niHi, r0(i)),
    single(j, allLo & ~conLo[j]!, allHi & ~conHi[j]!, njLo, njHi, r0(j)),
    {
      pair: true,
      p: i,
      q: j,
      xLo: allLo & ~conLo[i]! & ~conLo[j]!,
      xHi: allHi & ~conHi[i]! & ~conHi[j]!,
      npLo: niLo | njLo,
      npHi: niHi | njHi,
      rP: r0(i) + r0(j),
      sumBase: false,
    },
  ];
}

/** Exact Σ Ψ' and per-class Σ Ψ'_k of one component after one change, from the base pass. */
export function variantSums(
  g: MaskGraph,
  t: SetIndex,
  base: ForwardSums,
  change: ComponentChange,
  tol: number,
  scratch: VariantScratch,
): VariantOutcome {
  const { i, j, add } = change;
  const n = g.n;
  const fams = families(g, change);
  scratch.ensure(t.count, fams.some((f) => f.pair));
  const sums: TouchedSums = { z: 0, zBase: 0, classBase: new Float64Array(n), satLo: 0, satHi: 0 };
  for (const f of fams) {
    if (!walkFamily(g, t, base, f, tol, scratch, sums)) return { stable: false, lo: sums.satLo, hi: sums.satHi };
  }
  const loop = Uint8Array.from(g.loop); // loops of the changed design
  if (i === j) loop[i] = add ? 1 : 0;
  const classSums = new Float64Array(n);
  touchedClassSums(g.rate, loop, scratch, classSums);
  // sets avoiding both endpoints keep their base values
  let z = base.z - base.withPsi[i]! + sums.z;
  for (let k = 0; k < n; k++) classSums[k] += base.classSums[k]! - base.withPsik[i * n + k]!;
  if (i !== j) {
    if (add) {
      // base sets holding j but not i are exactly the second family
      z -= sums.zBase;
      for (let k = 0; k < n; k++) classSums[k] -= sums.classBase[k]!;
    } else {
      z -= base.withPsi[j]!;
      for (let k = 0; k < n; k++) classSums[k] -= base.withPsik[j * n + k]!;
    }
  }
  return { stable: true, z, classSums, touched: scratch.sets };
}
