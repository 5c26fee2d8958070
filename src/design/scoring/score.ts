/**
 * Scoring one design: is it stable, and what are its exact FCFM metrics? The same function runs in
 * the main thread and in the scoring workers (score-worker.ts), so that both give identical numbers.
 *
 * Instability is detected without any LP: a class with no compatibility or a bipartite component is
 * unstable at once (see "Stability of the stochastic matching model", J. Appl. Probab. 2016), and
 * otherwise the exact recursion itself refuses every independent set A with λ(N(A)) <= λ(A ∖ S)
 * (UnstableDesignError), which is the stability condition.
 */
import { UnstableDesignError } from '../../errors.js';
import { compileGraph, type CompiledModel } from '../../model/compile.js';
import { bipartition, components } from '../../model/components.js';
import { evaluateBacklog, evaluateExact } from '../../exact/evaluate.js';
import { valueRate as sumValue } from '../../model/values.js';

/** Everything a scorer needs, as plain data (it is sent to worker threads). */
export interface ScoreSpec {
  readonly ids: readonly string[];
  readonly rates: readonly number[];
  /** Pairs present in every design. */
  readonly fixed: ReadonlyArray<readonly [number, number]>;
  /** The pair of each toggle. */
  readonly toggles: ReadonlyArray<readonly [number, number]>;
  /** Compute per-class backlog (full evaluation) instead of the total only. */
  readonly perClass: boolean;
  /**
   * Compute the value rate Σ value · match rate (full evaluation: the exact match rates), with the
   * value per match of each fixed pair and of each toggle's pair (0 for a pair without a value,
   * and for every pair when absent). Default false.
   */
  readonly matchValue?: boolean;
  readonly fixedValue?: readonly number[];
  readonly toggleValue?: readonly number[];
  readonly maxSets?: number;
}

export interface Score {
  readonly stable: boolean;
  /** Mean total backlog (NaN when unstable). */
  readonly backlogTotal: number;
  /** Per-class mean backlog when the spec asks for it (null otherwise or when unstable). */
  readonly backlog: Float64Array | null;
  /** Σ value · match rate when the spec asks for it (NaN otherwise or when unstable). */
  readonly valueRate: number;
  /** Independent sets used by the exact recursion (0 when refused before it ran). */
  readonly independentSets: number;
  /** True when the exact evaluator ran (it counts as one evaluation). */
  readonly evaluated: boolean;
}

/** The compiled graph of a design: the fixed pairs, then the toggles that are on. */
export function specModel(spec: ScoreSpec, design: ArrayLike<number>): CompiledModel {
  const pairs: Array<readonly [number, number]> = [...spec.fixed];
  for (let j = 0; j < spec.toggles.length; j++) if (design[j]) pairs.push(spec.toggles[j]!);
  return compileGraph(spec.ids, spec.rates, pairs);
}

/** Value per match of each edge of specModel(spec, design), in its edge order. */
export function specValues(spec: ScoreSpec, design: ArrayLike<number>): number[] {
  const out = spec.fixed.map((_, i) => spec.fixedValue?.[i] ?? 0);
  for (let j = 0; j < spec.toggles.length; j++) if (design[j]) out.push(spec.toggleValue?.[j] ?? 0);
  return out;
}

/** The score of a design refused without evaluating (unstable at sight). */
export const UNSTABLE_UNEVALUATED: Score = { stable: false, backlogTotal: NaN, backlog: null, valueRate: NaN, independentSets: 0, evaluated: false };

/** The score of a design the exact recursion found unstable (it counts as an evaluation). */
export const UNSTABLE_EVALUATED: Score = { ...UNSTABLE_UNEVALUATED, evaluated: true };

/** True when the design is unstable at sight: a class without compatibility, or a bipartite component. */
export function unstableAtSight(model: CompiledModel): boolean {
  for (let k = 0; k < model.n; k++) {
    if (model.adjStart[k + 1] === model.adjStart[k] && !model.selfLoop[k]) return true;
  }
  const comps = components(model);
  for (const members of comps.members) if (bipartition(model, members)) return true;
  return false;
}

export function scoreDesign(spec: ScoreSpec, design: ArrayLike<number>): Score {
  const model = specModel(spec, design);
  if (unstableAtSight(model)) return UNSTABLE_UNEVALUATED;
  const options = spec.maxSets === undefined ? {} : { maxSets: spec.maxSets };
  try {
    if (spec.perClass || spec.matchValue === true) {
      const r = evaluateExact(model, options);
      const valueRate = spec.matchValue ? sumValue(specValues(spec, design), r.matchRates) : NaN;
      return { stable: true, backlogTotal: r.backlogTotal, backlog: spec.perClass ? r.backlog : null, valueRate, independentSets: r.independentSets, evaluated: true };
    }
    const r = evaluateBacklog(model, options);
    return { stable: true, backlogTotal: r.backlogTotal, backlog: null, valueRate: NaN, independentSets: r.independentSets, evaluated: true };
  } catch (e) {
    if (e instanceof UnstableDesignError) return UNSTABLE_EVALUATED;
    throw e;
  }
}
