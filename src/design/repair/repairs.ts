/**
 * A way out of instability: for a design that is unstable today, the cheapest sets of allowed
 * candidates whose addition makes it stable (docs/repairs.md). Today's design is the problem's:
 * fixed pairs and every removable compatibility (a repair only adds; forced removals stay out).
 */
import { degreesAllowed, type DesignProblem } from '../space/problem.js';
import { cheapestSets, foundSet } from './enumerate.js';
import { limitBound } from './limits.js';
import { minimise } from './minimal.js';
import { overloadOf } from './overload.js';
import { repairOf } from './repair-of.js';
import { repairSpace, unlimitedSpace } from './space.js';
import { isStableWith } from './stable.js';
import type { RepairOptions, RepairResult } from './types.js';

/** Default number of repairs. */
export const DEFAULT_REPAIR_COUNT = 5;

/**
 * The cheapest repairs of today's design, cheapest first (ties: fewer pairs, then pair order), each
 * minimal and distinct, up to `count`; or, when none exists, why (see RepairResult).
 */
export async function repairs(problem: DesignProblem, options: RepairOptions = {}): Promise<RepairResult> {
  const count = Math.max(1, Math.floor(options.count ?? DEFAULT_REPAIR_COUNT));
  const space = repairSpace(problem);
  if (isStableWith(space.sub, [])) return { status: 'stable-today' };
  const sets = await cheapestSets(space.sub, count);
  if (sets.length > 0) return { status: 'repairs', repairs: sets.map((f) => repairOf(problem, space, f)), complete: true };
  const overload = overloadOf(problem, space, options.forbiddenCandidates ?? []);
  if (overload) return { status: 'overloaded', overload };
  const all = space.sub.toggles.map((_, j) => j);
  if (degreesAllowed(space.sub, new Uint8Array(all.length).fill(1))) {
    // stable, within every limit, yet below the MILP's flow floor: drop what is not needed
    return { status: 'repairs', repairs: [repairOf(problem, space, foundSet(space.sub, minimise(space.sub, all)))], complete: false };
  }
  return limitBound(problem, unlimitedSpace(problem));
}

