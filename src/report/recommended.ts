/**
 * The recommender's designs with class ids attached: each design as the pairs it adds to today's
 * design and the pairs it drops (forced removals of `forbidden` pairs included, since every design
 * drops them), with its exact figures under today's rates.
 */
import type { DesignProblem } from '../design/space/problem.js';
import type { DesignDetails, Recommendation } from '../design/search/recommend.js';
import { changePairs } from './recommendation.js';
import type { Pair } from './report-data.js';

export interface RecommendedDesign {
  readonly cost: number;
  readonly added: readonly Pair[];
  readonly removed: readonly Pair[];
  readonly stable: boolean;
  /** Mean total backlog (NaN when unstable). */
  readonly backlog: number;
  readonly maxWait: number;
  /** Mean wait per class, class order (null when unstable). */
  readonly waits: readonly number[] | null;
}

/** Ids view of one design of the recommender (pairs from recommendation.ts's changePairs). */
export function recommendedDesign(problem: DesignProblem, d: DesignDetails): RecommendedDesign {
  const { added, removed } = changePairs(problem, d.design);
  return {
    cost: d.cost,
    added,
    removed,
    stable: d.stable,
    backlog: d.stable ? d.backlogTotal : NaN,
    maxWait: d.stable ? d.maxWait : NaN,
    waits: d.wait ? Array.from(d.wait) : null,
  };
}

/** The Pareto front, sorted by cost (backlog decreasing along it). */
export function frontPoints(problem: DesignProblem, rec: Recommendation): RecommendedDesign[] {
  return rec.pareto.map((d) => recommendedDesign(problem, d)).sort((a, b) => a.cost - b.cost || a.backlog - b.backlog);
}
