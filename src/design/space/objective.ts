/**
 * Objectives of the recommender: one number to minimise per evaluated design.
 *
 * - `total`: mean total number of waiting items, Σ_k L_k (the default);
 * - `weighted`: Σ_k w_k L_k with the per-class `weight` of the scenario (default 1);
 * - `max-wait`: the largest class mean wait, max_k W_k with W_k = L_k / λ_k (Little's law);
 * - `net-value`: the net value rate V − c·L, where V = Σ_pairs value · (exact match rate along the
 *   pair) and c the scenario's `waitingCost` (src/model/values.ts). Higher is better, so the number
 *   minimised is its negative, c·L − V; records and outputs show the net value itself
 *   (`objectiveSign`);
 * - `abandonment`: the share of all arrivals that abandon, Σ_k (abandonments of k) / Σ_k arrivals of
 *   k, from a simulation with the file's patience (the exact figures have no abandonment, so it is
 *   refused with `--score exact` and on a file without patience: `needsSimulation`).
 */
export type ObjectiveName = 'total' | 'weighted' | 'max-wait' | 'net-value' | 'abandonment';

export const OBJECTIVES: readonly ObjectiveName[] = ['total', 'weighted', 'max-wait', 'net-value', 'abandonment'];

/** Human name of an objective (table headers). */
export function objectiveLabel(name: ObjectiveName): string {
  return name === 'total' ? 'total backlog' : name === 'weighted' ? 'weighted backlog' : name === 'max-wait' ? 'largest mean wait' : name === 'abandonment' ? 'abandonment share' : 'net value';
}

/** Which way is better for the objective as shown: lower backlog or wait, higher net value. */
export function objectiveBetter(name: ObjectiveName): 'lower' | 'higher' {
  return name === 'net-value' ? 'higher' : 'lower';
}

/** Shown objective = sign · minimised objective (−1 for net value: the search minimises its negative). */
export function objectiveSign(name: ObjectiveName): 1 | -1 {
  return name === 'net-value' ? -1 : 1;
}

/** True when the objective (or a wait target) needs per-class figures, i.e. the full evaluation. */
export function needsPerClass(name: ObjectiveName, hasWaitTargets: boolean): boolean {
  return (name !== 'total' && name !== 'abandonment') || hasWaitTargets;
}

/** True when the objective exists only in simulated figures with patience (the abandonment share). */
export function needsSimulation(name: ObjectiveName): boolean {
  return name === 'abandonment';
}

/** True when the objective needs the exact match rate of every pair (the value rate). */
export function needsMatchRates(name: ObjectiveName): boolean {
  return name === 'net-value';
}

/** What the net-value objective needs besides the backlog: the value rate and the waiting cost. */
export interface ValueTerms {
  /** Σ value · match rate (per time unit). */
  readonly valueRate: number;
  /** Cost per waiting item per time unit. */
  readonly waitingCost: number;
}

/**
 * The objective (the number minimised) of a design from its per-class backlog (when needed), total
 * backlog and, for net value, the value terms.
 */
export function objectiveValue(
  name: ObjectiveName,
  backlogTotal: number,
  backlog: ArrayLike<number> | undefined,
  rates: ArrayLike<number>,
  weight: ArrayLike<number>,
  value?: ValueTerms,
  /** The share of all arrivals that abandon (simulated with patience), for `abandonment`. */
  abandonShareTotal?: number,
): number {
  if (name === 'total') return backlogTotal;
  if (name === 'abandonment') {
    if (abandonShareTotal === undefined || !Number.isFinite(abandonShareTotal)) throw new RangeError('objective abandonment needs a simulated abandonment share');
    return abandonShareTotal;
  }
  if (name === 'net-value') {
    if (!value || !Number.isFinite(value.valueRate)) throw new RangeError('objective net-value needs the value rate');
    return value.waitingCost * backlogTotal - value.valueRate;
  }
  if (!backlog) throw new RangeError(`objective ${name} needs per-class backlog`);
  if (name === 'weighted') {
    let s = 0;
    for (let k = 0; k < rates.length; k++) s += weight[k]! * backlog[k]!;
    return s;
  }
  let m = 0;
  for (let k = 0; k < rates.length; k++) m = Math.max(m, backlog[k]! / rates[k]!);
  return m;
}

/** Relative tolerance under which two objective values count as equal. */
export const OBJECTIVE_TOLERANCE = 1e-9;

/** True when a is lower than b by more than the tolerance. */
export function lower(a: number, b: number): boolean {
  if (b === Infinity) return a < Infinity;
  return a < b - OBJECTIVE_TOLERANCE * Math.abs(b);
}
