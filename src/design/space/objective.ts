/**
 * Objectives of the recommender: one number to minimise per evaluated design.
 *
 * - `total`: mean total number of waiting items, Σ_k L_k (the default);
 * - `weighted`: Σ_k w_k L_k with the per-class `weight` of the scenario (default 1);
 * - `max-wait`: the largest class mean wait, max_k W_k with W_k = L_k / λ_k (Little's law).
 */
export type ObjectiveName = 'total' | 'weighted' | 'max-wait';

export const OBJECTIVES: readonly ObjectiveName[] = ['total', 'weighted', 'max-wait'];

/** Human name of an objective (table headers). */
export function objectiveLabel(name: ObjectiveName): string {
  return name === 'total' ? 'total backlog' : name === 'weighted' ? 'weighted backlog' : 'largest mean wait';
}

/** True when the objective (or a wait target) needs per-class figures, i.e. the full evaluation. */
export function needsPerClass(name: ObjectiveName, hasWaitTargets: boolean): boolean {
  return name !== 'total' || hasWaitTargets;
}

/** The objective of a design from its per-class backlog (when needed) and total backlog. */
export function objectiveValue(
  name: ObjectiveName,
  backlogTotal: number,
  backlog: ArrayLike<number> | undefined,
  rates: ArrayLike<number>,
  weight: ArrayLike<number>,
): number {
  if (name === 'total') return backlogTotal;
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
