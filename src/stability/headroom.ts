/**
 * Headroom of each class of a stable component: how far λ_k may grow, the other rates fixed, before
 * the component turns unstable.
 *
 * Derived for this project: with rates λ' = λ + s·e_k, the edge-flow system Bμ = λ', μ ≥ 0 is
 * solvable iff the double cover H saturates (μ_ij = (f(i'→j'') + f(j'→i''))/2 turns a saturating
 * flow into a solution and back), iff λ'(N(A)) ≥ λ'(A) for all sets A. Only sets with k ∈ A, k ∉ N(A)
 * lose from growing λ_k, so the largest s is min over such A of slack(A), which double-cover.ts
 * reduces to min over independent self-loop-free I ∋ k of λ(N(I)) − λ(I). A self-looped class is in
 * the neighbourhood of every set containing it, so its headroom is infinite (its own loop absorbs
 * the growth). The stability condition is strict, so the design stays stable for growth strictly
 * below the headroom.
 */
import type { CompiledModel } from '../model/compile.js';
import { compareTight, tightestPerClass } from './certificate.js';
import type { DoubleCover } from './double-cover.js';
import type { TightSet } from './report.js';
import type { SetMeasure } from './sets.js';

const key = (s: Int32Array): string => s.join(',');

/**
 * Writes headroom[k] for every member and returns the distinct tightest sets of the component,
 * sorted by slack ascending (ties to the larger set).
 */
export function componentHeadroom(model: CompiledModel, members: Int32Array, cover: DoubleCover, headroom: Float64Array): SetMeasure[] {
  const tight = tightestPerClass(model, members, cover);
  const distinct = new Map<string, SetMeasure>();
  for (let i = 0; i < members.length; i++) {
    const k = members[i]!;
    const m = tight.get(k);
    if (!m) {
      headroom[k] = Infinity;
      continue;
    }
    headroom[k] = m.slack;
    distinct.set(key(m.set), m);
  }
  return [...distinct.values()].sort(compareTight);
}

export function asTightSet(m: SetMeasure): TightSet {
  return { set: m.set, neighbours: m.neighbours, slack: m.slack, demand: m.demand, capacity: m.capacity };
}
