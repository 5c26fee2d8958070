/**
 * Every single change of one design of a design problem: each toggle flipped (a candidate funded or
 * given up, a removable compatibility dropped or kept), evaluated exactly by the single-change
 * evaluator of src/exact/single-change.ts (only the independent sets holding an endpoint are
 * recomputed), with the objective, the cost and the feasibility of the changed design.
 *
 * This is what every verdict of the decision rests on: a verdict is always "this change, measured
 * against this design".
 */
import { EdgewiseError, TooLargeError, UnstableDesignError } from '../../errors.js';
import { compileGraph } from '../../model/compile.js';
import { singleChangeEvaluator, type ChangeResult } from '../../exact/single-change.js';
import { evaluateExact } from '../../exact/evaluate.js';
import { countIndependentSets } from '../../exact/count.js';
import { maskGraph } from '../../exact/masks.js';
import { REUSE_MIN_SETS } from '../scoring/reuse.js';
import { valueRate as sumValue } from '../../model/values.js';
import { needsMatchRates, objectiveValue, type ObjectiveName } from '../space/objective.js';
import { admissibleBeforeEvaluation, designCost, designPairs, designPairValues, type DesignProblem } from '../space/problem.js';

/** What a design does, as far as the decision is concerned. */
export interface DesignOutcome {
  readonly stable: boolean;
  /** Objective (NaN when unstable). */
  readonly objective: number;
  /** Mean total backlog (NaN when unstable). */
  readonly backlog: number;
  /** Mean wait per class (null when unstable). */
  readonly wait: Float64Array | null;
  readonly cost: number;
  /** Within budget and maxCompatibilities. */
  readonly admissible: boolean;
  /** Every class meets its wait target. */
  readonly meetsTargets: boolean;
  /** Stable, admissible and meeting every target. */
  readonly feasible: boolean;
}

export interface SingleChange extends DesignOutcome {
  /** The toggle flipped. */
  readonly toggle: number;
  /** 'add': the pair is absent from the design and the change puts it in; 'remove': the reverse. */
  readonly change: 'add' | 'remove';
  /** objective(changed) − objective(design); Infinity when the change breaks stability. */
  readonly delta: number;
  /** backlog(changed) − backlog(design); Infinity when unstable. */
  readonly backlogDelta: number;
}

export interface SingleChanges {
  readonly design: Uint8Array;
  readonly base: DesignOutcome;
  readonly changes: readonly SingleChange[];
  /** Why the changes could not be evaluated (the design is unstable or too large), when so. */
  readonly skipped?: string;
}

/** What outcome() reads of an evaluation: ChangeResult's figures, and the value rate for net value. */
type Evaluated = Pick<ChangeResult, 'stable' | 'backlogTotal' | 'backlog' | 'wait'> & { readonly valueRate?: number };

function outcome(problem: DesignProblem, objective: ObjectiveName, design: ArrayLike<number>, r: Evaluated | null): DesignOutcome {
  const cost = designCost(problem, design);
  const admissible = admissibleBeforeEvaluation(problem, design);
  if (!r || !r.stable) {
    return { stable: false, objective: NaN, backlog: NaN, wait: null, cost, admissible, meetsTargets: false, feasible: false };
  }
  let meets = true;
  for (let k = 0; k < problem.n; k++) if (r.wait[k]! > problem.waitTarget[k]! * (1 + 1e-12)) meets = false;
  const obj = objectiveValue(objective, r.backlogTotal, r.backlog, problem.rates, problem.weight, { valueRate: r.valueRate ?? NaN, waitingCost: problem.waitingCost });
  return { stable: true, objective: obj, backlog: r.backlogTotal, wait: r.wait, cost, admissible, meetsTargets: meets, feasible: admissible && meets };
}

/** The single change of `design` that flips toggle j, from the changed design's evaluation, measured against `base`. */
function changeOf(
  problem: DesignProblem,
  objective: ObjectiveName,
  design: Uint8Array,
  j: number,
  r: Evaluated,
  base: DesignOutcome,
  changed: Uint8Array = flip(design, j),
): SingleChange {
  const o = outcome(problem, objective, changed, r);
  return {
    ...o,
    toggle: j,
    change: design[j] ? 'remove' : 'add',
    delta: o.stable ? o.objective - base.objective : Infinity,
    backlogDelta: o.stable ? o.backlog - base.backlog : Infinity,
  };
}

/** The design with toggle j switched. */
export function flip(design: ArrayLike<number>, j: number): Uint8Array {
  const d = Uint8Array.from(design);
  d[j] = d[j] ? 0 : 1;
  return d;
}

/**
 * The outcome of `design` and of each of its single changes (every toggle, or those listed).
 * An unstable or too large design gives no changes and says why in `skipped`.
 */
export function singleChanges(
  problem: DesignProblem,
  objective: ObjectiveName,
  design: Uint8Array,
  options: { readonly toggles?: readonly number[]; readonly maxSets?: number } = {},
): SingleChanges {
  if (needsMatchRates(objective)) return freshChanges(problem, objective, design, options);
  const model = compileGraph(problem.ids, problem.rates, designPairs(problem, design));
  // a small design is evaluated afresh faster than the single-change evaluator is prepared
  // (src/design/scoring/reuse.ts: below REUSE_MIN_SETS sets one evaluation takes under 0.2 ms)
  if (countIndependentSets(maskGraph(model), REUSE_MIN_SETS) < REUSE_MIN_SETS) return freshChanges(problem, objective, design, options);
  let ev;
  try {
    ev = singleChangeEvaluator(model, options.maxSets === undefined ? {} : { maxSets: options.maxSets });
  } catch (e) {
    if (e instanceof UnstableDesignError) return { design, base: outcome(problem, objective, design, null), changes: [], skipped: 'the design is unstable' };
    if (e instanceof TooLargeError) return { design, base: outcome(problem, objective, design, null), changes: [], skipped: e.message };
    throw e;
  }
  const base = outcome(problem, objective, design, ev.base);
  const toggles = options.toggles ?? problem.toggles.map((_, j) => j);
  const changes: SingleChange[] = [];
  for (const j of toggles) {
    const t = problem.toggles[j]!;
    let r: ChangeResult | null;
    try {
      r = ev.toggle(t.a, t.b);
    } catch (e) {
      if (e instanceof EdgewiseError) continue; // a joined component beyond the guard: no verdict
      throw e;
    }
    changes.push(changeOf(problem, objective, design, j, r, base));
  }
  return { design, base, changes };
}

/**
 * The same with every design evaluated afresh by evaluateExact, for objectives that need the exact
 * match rates (net value): the single-change evaluator gives backlogs, not match rates. A change
 * the exact recursion finds unstable is unstable; one it cannot evaluate (too large, too close to
 * the boundary) gets no verdict, as above.
 */
function freshChanges(
  problem: DesignProblem,
  objective: ObjectiveName,
  design: Uint8Array,
  options: { readonly toggles?: readonly number[]; readonly maxSets?: number },
): SingleChanges {
  const opts = options.maxSets === undefined ? {} : { maxSets: options.maxSets };
  const evaluate = (d: Uint8Array): Evaluated => {
    const model = compileGraph(problem.ids, problem.rates, designPairs(problem, d));
    try {
      const r = evaluateExact(model, opts);
      return { stable: true, backlogTotal: r.backlogTotal, backlog: r.backlog, wait: r.wait, valueRate: sumValue(designPairValues(problem, d), r.matchRates) };
    } catch (e) {
      if (e instanceof UnstableDesignError) return { stable: false, backlogTotal: Infinity, backlog: new Float64Array(0), wait: new Float64Array(0) };
      throw e;
    }
  };
  let first: Evaluated;
  try {
    first = evaluate(design);
  } catch (e) {
    if (e instanceof EdgewiseError) return { design, base: outcome(problem, objective, design, null), changes: [], skipped: e.message };
    throw e;
  }
  if (!first.stable) return { design, base: outcome(problem, objective, design, null), changes: [], skipped: 'the design is unstable' };
  const base = outcome(problem, objective, design, first);
  const changes: SingleChange[] = [];
  for (const j of options.toggles ?? problem.toggles.map((_, k) => k)) {
    const changed = flip(design, j);
    let r: Evaluated;
    try {
      r = evaluate(changed);
    } catch (e) {
      if (e instanceof EdgewiseError) continue;
      throw e;
    }
    changes.push(changeOf(problem, objective, design, j, r, base, changed));
  }
  return { design, base, changes };
}
