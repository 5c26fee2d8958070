/**
 * The scenario fields read by the design recommender (docs/scenario-format.md, "Recommender
 * fields"), as typed arrays in class order:
 *
 * - per class: `maxCompatibilities` (integer ≥ 0: at most this many compatibilities touch the class,
 *   a self-loop counting once), `waitTarget` (mean wait must stay ≤ this, time units, > 0) and
 *   `weight` (≥ 0, default 1, used by the weighted objective), `maxAbandonment` (the share of the
 *   class's arrivals that abandon must stay ≤ this; judged on simulated figures, as it needs patience);
 * - top level: `mustKeep` (compatibilities no design may drop) and `forbidden` (pairs no design may
 *   contain: a candidate is never added, a removable compatibility is always dropped).
 *
 * Every rule on them (unknown ids, duplicates, consistency of mustKeep and forbidden, limits below
 * the fixed compatibilities) is checked when the file is read (validate.ts, cross-checks.ts).
 */
import type { IdPair, Scenario } from './scenario.js';

export interface DesignFields {
  /** Per class (scenario order): most compatibilities allowed, Infinity when unlimited. */
  readonly maxCompatibilities: Float64Array;
  /** Per class: mean wait target, Infinity when none. */
  readonly waitTarget: Float64Array;
  /** Per class: weight of the weighted objective (default 1). */
  readonly weight: Float64Array;
  /** Per class: most share of its arrivals that may abandon, NaN when none (needs a patience: cross-checks.ts). */
  readonly maxAbandonment: Float64Array;
  /** Pairs (class ids) no design may drop, as listed. */
  readonly mustKeep: ReadonlyArray<IdPair>;
  /** Pairs (class ids) no design may contain, as listed. */
  readonly forbidden: ReadonlyArray<IdPair>;
}

/** Reads the recommender fields of a validated scenario (`source` is unused: kept for callers). */
export function readDesignFields(scenario: Scenario, _source?: string): DesignFields {
  const n = scenario.classes.length;
  const maxCompatibilities = new Float64Array(n).fill(Infinity);
  const waitTarget = new Float64Array(n).fill(Infinity);
  const weight = new Float64Array(n).fill(1);
  const maxAbandonment = new Float64Array(n).fill(NaN);
  scenario.classes.forEach((c, k) => {
    if (c.maxCompatibilities !== undefined) maxCompatibilities[k] = c.maxCompatibilities;
    if (c.waitTarget !== undefined) waitTarget[k] = c.waitTarget;
    if (c.weight !== undefined) weight[k] = c.weight;
    if (c.maxAbandonment !== undefined) maxAbandonment[k] = c.maxAbandonment;
  });
  return {
    maxCompatibilities,
    waitTarget,
    weight,
    maxAbandonment,
    mustKeep: scenario.mustKeep.map((r) => r.pair),
    forbidden: scenario.forbidden.map((r) => r.pair),
  };
}
