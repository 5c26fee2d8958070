/** Stability of a set of added toggles over a repair space's fixed part (checkStability, exact verdict). */
import { SolverError } from '../../errors.js';
import { compileGraph } from '../../model/compile.js';
import { checkStability } from '../../stability/check.js';
import type { StabilityReport } from '../../stability/report.js';
import type { DesignProblem } from '../space/problem.js';

/** The stability report of the sub-problem's fixed pairs plus the toggles `on` (toggle indices of `sub`). */
export function stabilityWith(sub: DesignProblem, on: readonly number[]): StabilityReport {
  const pairs: Array<readonly [number, number]> = [...sub.fixed];
  for (const j of on) pairs.push([sub.toggles[j]!.a, sub.toggles[j]!.b]);
  return checkStability(compileGraph(sub.ids, sub.rates, pairs));
}

/**
 * True when the design is stable. A design the verdict cannot decide (on the stability boundary
 * within numerical precision, SolverError) counts as not stable: a repair must be clearly stable.
 */
export function isStableWith(sub: DesignProblem, on: readonly number[]): boolean {
  try {
    return stabilityWith(sub, on).stable;
  } catch (e) {
    if (e instanceof SolverError) return false;
    throw e;
  }
}
