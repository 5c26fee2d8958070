/**
 * The Pareto archive: designs that no other design beats on both cost and objective.
 *
 * The front is a function of the set of designs only (never of the order they were found in): sort
 * by cost, then objective, then fewer changes from today, then design key, and sweep, keeping a design
 * when its objective is lower than every cheaper-or-equal design's by more than the relative
 * tolerance of objective.ts. Among designs of equal cost and (within tolerance) equal objective the
 * first in that order is kept, so exact ties are resolved deterministically.
 */
import { lower } from './objective.js';

export interface ParetoPoint {
  readonly cost: number;
  readonly objective: number;
  /** Changes from today's design (fewer is preferred on ties). */
  readonly changes: number;
  /** Canonical design key (last tie-break). */
  readonly key: string;
}

/** Total order of the sweep: cost, objective, changes, key. */
export function comparePoints(a: ParetoPoint, b: ParetoPoint): number {
  if (a.cost !== b.cost) return a.cost - b.cost;
  if (a.objective !== b.objective) return a.objective - b.objective;
  if (a.changes !== b.changes) return a.changes - b.changes;
  return a.key < b.key ? -1 : a.key > b.key ? 1 : 0;
}

/** The non-dominated points, sorted by cost (objective strictly decreasing along the front). */
export function paretoFront<T extends ParetoPoint>(points: Iterable<T>): T[] {
  return frontOfSorted([...points].sort(comparePoints));
}

/** paretoFront of points already sorted by comparePoints (its sweep, without the sort). */
export function frontOfSorted<T extends ParetoPoint>(sorted: readonly T[]): T[] {
  const out: T[] = [];
  let best = Infinity;
  for (const p of sorted) {
    if (lower(p.objective, best)) {
      out.push(p);
      best = p.objective;
    }
  }
  return out;
}

/** The first `depth` Pareto layers: the front, then the front of what is left, and so on. */
export function paretoLayers<T extends ParetoPoint>(points: Iterable<T>, depth: number): T[][] {
  let rest = [...points];
  const layers: T[][] = [];
  for (let d = 0; d < depth && rest.length > 0; d++) {
    const front = paretoFront(rest);
    layers.push(front);
    const taken = new Set(front);
    rest = rest.filter((p) => !taken.has(p));
  }
  return layers;
}

/**
 * Best objective among front points costing at most `cost` (Infinity when none): the front's value
 * at that cost. `front` must be sorted by cost.
 */
export function frontValueAt(front: ReadonlyArray<{ readonly cost: number; readonly objective: number }>, cost: number): number {
  let v = Infinity;
  for (const p of front) {
    if (p.cost > cost + 1e-9) break;
    v = Math.min(v, p.objective);
  }
  return v;
}

/** True when a dominates b: no worse on both, strictly better on one (objective within tolerance). */
export function dominates(a: ParetoPoint, b: ParetoPoint): boolean {
  const noWorseObjective = !lower(b.objective, a.objective);
  if (a.cost < b.cost) return noWorseObjective;
  if (a.cost === b.cost) return lower(a.objective, b.objective);
  return false;
}
