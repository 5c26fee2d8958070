/**
 * One decision, one story: the recommended design and every single-change verdict measured against
 * it (and, beside them, against today's design).
 *
 * The recommended design is the Pareto design with the lowest objective within the budget. It is
 * then made single-change optimal: while some single change of it gives a feasible design that is
 * better (lower objective) or as good and cheaper, that design replaces it (a search that missed a
 * neighbour is corrected here, never contradicted). Afterwards no verdict against the recommended
 * design can say "fund" or "drop" about a pair the design treats the other way:
 *   - a pair outside it: adding it within the budget never lowers the objective (else it would
 *     have been taken), so it is 'harmful', 'no effect', 'over budget' (helps, but costs more than
 *     the budget allows) or 'not allowed' (maxCompatibilities);
 *   - a pair inside it: dropping it never lowers the objective at no extra cost, so it is 'keep'
 *     or 'needed for stability'.
 * Verdicts against today's design carry only their measured effect (`effect`), never advice.
 */
import { lower } from '../space/objective.js';
import type { ObjectiveName } from '../space/objective.js';
import type { DesignProblem } from '../space/problem.js';
import { singleChanges, type SingleChange, type SingleChanges } from './single-changes.js';

export type Advice = 'harmful' | 'no effect' | 'over budget' | 'not allowed' | 'keep' | 'needed for stability' | 'take it';
export type Effect = 'lowers' | 'raises' | 'no change' | 'breaks stability';

export interface Verdict {
  readonly toggle: number;
  readonly change: 'add' | 'remove';
  readonly against: 'recommended' | 'today';
  /** Exact change of the objective (Infinity when the change breaks stability). */
  readonly delta: number;
  readonly backlogDelta: number;
  /** The changed design's cost. */
  readonly cost: number;
  readonly stable: boolean;
  /** Within budget, maxCompatibilities and wait targets. */
  readonly feasible: boolean;
  readonly withinBudget: boolean;
  readonly effect: Effect;
  /** Only against the recommended design. */
  readonly advice?: Advice;
}

export interface Decision {
  /** The recommended design, single-change optimal. */
  readonly design: Uint8Array;
  /** How many single-change improvements were applied to the search's pick. */
  readonly improvements: number;
  readonly recommended: SingleChanges;
  readonly today: SingleChanges;
  readonly verdicts: readonly Verdict[];
}

/** Relative tolerance under which a change of the objective counts as none (rounding level). */
export const NO_CHANGE = 1e-9;

function effectOf(c: SingleChange, base: number): Effect {
  if (!c.stable) return 'breaks stability';
  if (Math.abs(c.delta) <= NO_CHANGE * Math.max(Math.abs(base), Number.MIN_VALUE)) return 'no change';
  return c.delta < 0 ? 'lowers' : 'raises';
}

function adviceOf(problem: DesignProblem, c: SingleChange, effect: Effect): Advice {
  if (c.change === 'remove') return effect === 'breaks stability' ? 'needed for stability' : 'keep';
  if (effect === 'raises') return 'harmful';
  if (effect === 'no change' || effect === 'breaks stability') return 'no effect';
  if (!c.admissible) return c.cost > problem.budget + 1e-9 ? 'over budget' : 'not allowed';
  if (!c.meetsTargets) return 'not allowed';
  return 'take it'; // cannot happen after improvement; kept so that a bug shows instead of hiding
}

/** The better single change, if any: feasible, and lower objective, or equal objective and cheaper. */
function improvement(problem: DesignProblem, s: SingleChanges): SingleChange | undefined {
  let best: SingleChange | undefined;
  for (const c of s.changes) {
    if (!c.feasible) continue;
    const better = lower(c.objective, s.base.objective) || (!lower(s.base.objective, c.objective) && c.cost < s.base.cost - 1e-9);
    if (!better) continue;
    if (!best || lower(c.objective, best.objective) || (!lower(best.objective, c.objective) && c.cost < best.cost)) best = c;
  }
  return best;
}

function verdicts(problem: DesignProblem, s: SingleChanges, against: 'recommended' | 'today'): Verdict[] {
  return s.changes.map((c) => {
    const effect = effectOf(c, s.base.objective);
    return {
      toggle: c.toggle,
      change: c.change,
      against,
      delta: c.delta,
      backlogDelta: c.backlogDelta,
      cost: c.cost,
      stable: c.stable,
      feasible: c.feasible,
      withinBudget: c.cost <= problem.budget + 1e-9,
      effect,
      ...(against === 'recommended' ? { advice: adviceOf(problem, c, effect) } : {}),
    };
  });
}

/** The decision from the search's pick (a feasible design), at most `maxSteps` improvements. */
export function decide(
  problem: DesignProblem,
  objective: ObjectiveName,
  pick: Uint8Array,
  options: { readonly maxSets?: number; readonly maxSteps?: number } = {},
): Decision {
  const opts = options.maxSets === undefined ? {} : { maxSets: options.maxSets };
  let design = Uint8Array.from(pick);
  let rec = singleChanges(problem, objective, design, opts);
  let improvements = 0;
  for (let step = 0; step < (options.maxSteps ?? 50); step++) {
    const better = improvement(problem, rec);
    if (!better) break;
    design = Uint8Array.from(design);
    design[better.toggle] = design[better.toggle] ? 0 : 1;
    rec = singleChanges(problem, objective, design, opts);
    improvements++;
  }
  const today = singleChanges(problem, objective, Uint8Array.from(problem.today), opts);
  return { design, improvements, recommended: rec, today, verdicts: [...verdicts(problem, rec, 'recommended'), ...verdicts(problem, today, 'today')] };
}
