/**
 * Scoring one design: is it stable, and what are its exact FCFM metrics? The same function runs in
 * the main thread and in the scoring workers (score-worker.ts), so that both give identical numbers.
 *
 * Instability is detected without any LP: a class with no compatibility or a bipartite component is
 * unstable at once (see "Stability of the stochastic matching model", J. Appl. Probab. 2016), and
 * otherwise the exact recursion itself refuses every independent set A with λ(N(A)) <= λ(A ∖ S)
 * (UnstableDesignError), which is the stability condition.
 */
import { TooLargeError, UnstableDesignError } from '../../errors.js';
import { compileGraph, type CompiledModel } from '../../model/compile.js';
import { bipartition, components } from '../../model/components.js';
import { DEFAULT_MAX_SETS, evaluateBacklog, evaluateExact } from '../../exact/evaluate.js';
import { countIndependentSets } from '../../exact/count.js';
import { maskGraph } from '../../exact/masks.js';
import { backlogOverShared, exactOverShared, sharedTrie, type SharedTrie } from '../../exact/shared-trie.js';
import { valueRate as sumValue } from '../../model/values.js';
import { checkStability } from '../../stability/check.js';
import { mergeFigures, simulateDesign, type Interval, type SimFigures, type SimPlan } from './sim-score.js';

/**
 * How designs are scored: the exact recursion, seeded simulation, or `auto` — exact where it is
 * feasible (the independent sets under the guard, every connected group of at most 64 classes) and
 * the file has no patience, simulation otherwise, decided per design.
 */
export type ScoreMethod = 'exact' | 'simulation' | 'auto';
export const SCORE_METHODS: readonly ScoreMethod[] = ['exact', 'simulation', 'auto'];

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
  /** Default 'exact' (today's behaviour: TooLargeError past the guard). */
  readonly method?: ScoreMethod;
  /** The simulation plan (needed unless method is 'exact'). */
  readonly sim?: SimPlan;
  /** Mean patience per class (model order, 0 = patient): simulation with abandonment. */
  readonly patience?: readonly number[];
}

/** How a design's figures were made, and what a simulated score adds (absent fields: exact). */
export interface SimulatedFigures {
  /** How the figures were made (absent: exact). */
  readonly method?: 'exact' | 'simulation';
  /** Simulated: 95 % interval of the total backlog. */
  readonly backlogCi95?: Interval | null;
  /** Simulated: total backlog of each replication (paired comparisons under common random numbers). */
  readonly perReplication?: Float64Array;
  /** Simulated with patience: share of arrivals that abandon, per class and over all. */
  readonly abandonShare?: Float64Array;
  readonly abandonShareTotal?: number;
  /** Simulated with patience: ends of the 95 % interval of each class's share, and of the share over all. */
  readonly abandonShareLo?: Float64Array;
  readonly abandonShareHi?: Float64Array;
  readonly abandonShareCi95?: Interval | null;
}

export interface Score extends SimulatedFigures {
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
  /** Simulated, per class: ends of the 95 % interval of the backlog (when per-class figures are asked). */
  readonly backlogLo?: Float64Array;
  readonly backlogHi?: Float64Array;
  /**
   * Simulated with per-class figures asked (the re-score of the designs returned): the figures of
   * every replication, so that more replications can be added (`extendedScore`).
   */
  readonly figures?: SimFigures;
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

/** True when the spec scores by simulation whatever the design. */
export function simulatesAlways(spec: ScoreSpec): boolean {
  return spec.method === 'simulation' || (spec.method === 'auto' && hasPatience(spec.patience));
}

export function hasPatience(patience: ArrayLike<number> | undefined): boolean {
  if (!patience) return false;
  for (let k = 0; k < patience.length; k++) if (patience[k]! > 0 && Number.isFinite(patience[k]!)) return true;
  return false;
}

/**
 * Simulated score of a design: the stability LP first (an unstable design is never simulated), then
 * the plan's replications. A design whose queues outgrow the plan's cap counts as unusable (unstable).
 */
export function simulatedScore(spec: ScoreSpec, model: CompiledModel): Score {
  if (!checkStability(model).stable) return UNSTABLE_UNEVALUATED;
  const plan = spec.sim;
  if (!plan) throw new RangeError('a simulated score needs a simulation plan');
  try {
    return scoreOfFigures(spec, simulateDesign(model, plan, spec.patience));
  } catch (e) {
    if (e instanceof TooLargeError) return UNSTABLE_EVALUATED;
    throw e;
  }
}

function scoreOfFigures(spec: Pick<ScoreSpec, 'perClass'>, f: SimFigures): Score {
  return {
    stable: true,
    backlogTotal: f.backlogTotal,
    backlog: spec.perClass ? f.backlog : null,
    // a value rate needs exact match rates: a simulated score has none
    valueRate: NaN,
    independentSets: 0,
    evaluated: true,
    method: 'simulation',
    backlogCi95: f.backlogCi95,
    perReplication: f.perReplication,
    abandonShare: f.abandonShare,
    abandonShareTotal: f.abandonShareTotal,
    ...(f.impatient ? { abandonShareLo: f.abandonShareLo, abandonShareHi: f.abandonShareHi, abandonShareCi95: f.abandonShareCi95 } : {}),
    ...(spec.perClass ? { backlogLo: f.backlogLo, backlogHi: f.backlogHi, figures: f } : {}),
  };
}

/**
 * A simulated score with the replications of `more` added (scored with the same spec, except that
 * its plan starts at the replication where `score`'s end: `firstReplication`). Both must carry their
 * figures (spec.perClass). A score that became unusable in the extra replications (a queue past the
 * cap) makes the design unusable, as it would have been in one longer run.
 */
export function extendedScore(spec: Pick<ScoreSpec, 'perClass'>, score: Score, more: Score): Score {
  if (!score.stable) return score;
  if (!more.stable) return more;
  if (!score.figures || !more.figures) throw new RangeError('only simulated scores with their figures can be extended');
  return scoreOfFigures(spec, mergeFigures(score.figures, more.figures));
}

export function scoreDesign(spec: ScoreSpec, design: ArrayLike<number>): Score {
  const model = specModel(spec, design);
  if (unstableAtSight(model)) return UNSTABLE_UNEVALUATED;
  if (simulatesAlways(spec)) return simulatedScore(spec, model);
  try {
    return exactScore(spec, model, design);
  } catch (e) {
    if (e instanceof TooLargeError && spec.method === 'auto') return simulatedScore(spec, model);
    throw e;
  }
}

function exactScore(spec: ScoreSpec, model: CompiledModel, design: ArrayLike<number>): Score {
  const options = spec.maxSets === undefined ? {} : { maxSets: spec.maxSets };
  try {
    if (spec.perClass || spec.matchValue === true) {
      const r = sharedEvaluation(spec, model, options, exactOverShared) ?? evaluateExact(model, options);
      const valueRate = spec.matchValue ? sumValue(specValues(spec, design), r.matchRates) : NaN;
      return { stable: true, backlogTotal: r.backlogTotal, backlog: spec.perClass ? r.backlog : null, valueRate, independentSets: r.independentSets, evaluated: true };
    }
    const r = sharedEvaluation(spec, model, options, backlogOverShared) ?? evaluateBacklog(model, options);
    return { stable: true, backlogTotal: r.backlogTotal, backlog: null, valueRate: NaN, independentSets: r.independentSets, evaluated: true };
  } catch (e) {
    if (e instanceof UnstableDesignError) return UNSTABLE_EVALUATED;
    throw e;
  }
}

/**
 * The shared trie of a spec's fixed pairs (exact/shared-trie.ts), made on its first exact scoring in
 * this thread: every design contains the fixed pairs, so every connected design is evaluated over it
 * with the figures, count and refusals of evaluateBacklog / evaluateExact to the last bit. Which path
 * a design takes therefore changes its time only, never a result, and the choice may depend on what
 * this thread has scored. The walk's fixed cost is in the base's count (the bitmap, and the tail
 * array a full evaluation clears): a base past SHARED_TRIE_MAX_SETS is not made, and one whose designs
 * reach on average less than 1/SHARED_TRIE_SPARSE of its sets (judged after SHARED_TRIE_TRIAL
 * designs) is dropped.
 */
interface SharedState {
  trie: SharedTrie | undefined;
  designs: number;
  sets: number;
}

export const SHARED_TRIE_MAX_SETS = 1 << 20;
export const SHARED_TRIE_SPARSE = 8;
export const SHARED_TRIE_TRIAL = 16;

const shared = new WeakMap<ScoreSpec, SharedState>();

function sharedEvaluation<R extends { readonly independentSets: number }>(
  spec: ScoreSpec,
  model: CompiledModel,
  options: { maxSets?: number },
  evaluate: (t: SharedTrie, model: CompiledModel, options: { maxSets?: number }) => R | undefined,
): R | undefined {
  let st = shared.get(spec);
  if (!st) {
    const limit = Math.min(SHARED_TRIE_MAX_SETS, options.maxSets ?? DEFAULT_MAX_SETS);
    st = { trie: sharedTrie(compileGraph(spec.ids, spec.rates, spec.fixed), limit), designs: 0, sets: 0 };
    shared.set(spec, st);
  }
  const t = st.trie;
  if (!t) return undefined;
  const r = evaluate(t, model, options);
  if (!r) return undefined;
  st.designs++;
  st.sets += r.independentSets;
  if (st.designs >= SHARED_TRIE_TRIAL && st.sets * SHARED_TRIE_SPARSE < st.designs * t.count) st.trie = undefined;
  return r;
}

/**
 * The set count of the shared trie a thread makes for the spec (the fixed pairs' independent sets),
 * or undefined when it makes none: a pure function of the spec, so that a choice made from it (reuse.ts)
 * never depends on a thread.
 */
export function sharedTrieSets(spec: ScoreSpec): number | undefined {
  const n = spec.ids.length;
  if (n === 0 || n > 64 || spec.rates.some((r) => !(r > 0))) return undefined;
  const limit = Math.min(SHARED_TRIE_MAX_SETS, spec.maxSets ?? DEFAULT_MAX_SETS);
  const count = countIndependentSets(maskGraph(compileGraph(spec.ids, spec.rates, spec.fixed)), limit);
  return count > limit ? undefined : count;
}
