/**
 * The cheapest minimal stabilising sets of a repair space, cheapest first, by the edge-flow MILP of
 * ../milp.ts (HiGHS; every answer re-checked with checkStability there):
 *
 * 1. Solve min Σ (p_j + ε_j) x_j over the allowed candidates with a strictly positive flow on every
 *    present edge (t ≥ the recommender's floor) and the degree rows, at a relative MIP gap of 0. The
 *    small ε_j (tie-weights.ts) order equal costs by fewer pairs, then earlier pairs. The cuts start
 *    from today's overloaded sets (seed-cuts.ts) and every solve's stability cuts are kept.
 * 2. Check the answer minimal (minimal.ts drops each member once; with positive weights an optimum is
 *    minimal, so this only guards against solver tolerance) and cut it off with the no-good cut
 *    Σ_{j∈S} x_j ≤ |S| − 1, which also excludes every superset of S (none of them is minimal).
 * 3. Repeat until `count` sets are out or the MILP is infeasible.
 *
 * Every minimal stabilising set T other than those found so far stays feasible (T contains none of
 * them, being minimal), and every feasible point contains such a T that weighs no more; so the
 * solves go through the minimal sets in order of weight, i.e. by cost, then size, then Σ positions.
 */
import { roundCost, type DesignProblem } from '../space/problem.js';
import { solveFlowMilp, stableFlowFloor, type ToggleCut } from '../search/milp.js';
import { minimise } from './minimal.js';
import { seedCuts } from './seed-cuts.js';
import { tieWeights } from './tie-weights.js';

/** A minimal stabilising set (toggle indices of the sub-problem, ascending) and its cost. */
export interface FoundSet {
  readonly set: readonly number[];
  readonly cost: number;
}

/** Stability cuts the MILP may need per solve (balanced bipartite answers cut off one at a time). */
const MAX_STABILITY_CUTS = 200;

/** Cost, then fewer pairs, then earlier pairs (smaller Σ positions), then lexicographic. */
export function compareSets(x: FoundSet, y: FoundSet): number {
  if (x.cost !== y.cost) return x.cost - y.cost;
  if (x.set.length !== y.set.length) return x.set.length - y.set.length;
  const sum = (s: readonly number[]): number => s.reduce((a, j) => a + j, 0);
  if (sum(x.set) !== sum(y.set)) return sum(x.set) - sum(y.set);
  for (let i = 0; i < x.set.length; i++) if (x.set[i] !== y.set[i]) return x.set[i]! - y.set[i]!;
  return 0;
}

/** A set with its cost. */
export function foundSet(sub: DesignProblem, set: readonly number[]): FoundSet {
  let s = 0;
  for (const j of set) s += sub.toggles[j]!.price;
  return { set, cost: roundCost(s) };
}

/** Σ_{j∈S} x_j ≤ |S| − 1, written as Σ −x_j ≥ 1 − |S|. */
function noGood(set: readonly number[]): ToggleCut {
  return { toggles: set, coefficients: set.map(() => -1), rhs: 1 - set.length };
}

/** Up to `count` cheapest minimal stabilising sets (see the top of this file), in that order. */
export async function cheapestSets(sub: DesignProblem, count: number): Promise<FoundSet[]> {
  const out: FoundSet[] = [];
  if (sub.toggles.length === 0) return out;
  const weights = tieWeights(sub.toggles.map((t) => t.price));
  const weighted: DesignProblem = { ...sub, toggles: sub.toggles.map((t, j) => ({ ...t, price: weights[j]! })) };
  const minFlow = stableFlowFloor(sub);
  const seeds = seedCuts(sub);
  if (seeds.hopeless) return out;
  const cuts: ToggleCut[] = [...seeds.cuts];
  while (out.length < count) {
    const got = await solveFlowMilp(weighted, { goal: 'min-cost', minFlow, cuts }, { maxCuts: MAX_STABILITY_CUTS, mipRelativeGap: 0 });
    if (!got) break;
    const on: number[] = [];
    got.design.forEach((v, j) => v && on.push(j));
    const found = foundSet(sub, minimise(sub, on));
    out.push(found);
    cuts.push(...(got.stabilityCuts ?? []), noGood(found.set));
  }
  return out.sort(compareSets);
}
