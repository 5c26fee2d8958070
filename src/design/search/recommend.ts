/**
 * The design recommender: the cost/objective Pareto set of the designs within a budget.
 *
 * 1. MILP stage (milp.ts, HiGHS): the cheapest stable design (without a solve when the design with
 *    only the fixed pairs is stable), and, when asked (`ladderLevels`; --exhaustive keeps five levels
 *    for its record), for a ladder of budget levels the design that maximises the smallest edge flow;
 *    each answer verified with checkStability. The search runs no ladder by default: on the bench
 *    problems and 24 seeded 10–13-toggle problems its designs were found by the search anyway, the
 *    fronts were the same without them, and it took most of the time of small problems
 *    (bench/recommend.ts prints the figures).
 * 2. Pareto local search (local-search.ts) from today's design, the MILP designs and the baselines,
 *    or, with `exhaustive`, every design (exhaustive.ts). Scoring runs on worker threads (pool.ts);
 *    designs one toggle from a scored design may be scored by reuse of its single-change preparation
 *    (reuse.ts).
 * 3. The Pareto archive (pareto.ts) of admissible designs (stable, within budget and limits, wait
 *    targets met, no harmful paid compatibility), sorted by cost; baselines (baselines.ts) beside it,
 *    with their distance to the front at their cost.
 *
 * Indices only: ids are attached in src/report/recommendation.ts.
 */
import { InfeasibleDesignError, InterruptedError, UsageError } from '../../errors.js';
import { compileGraph } from '../../model/compile.js';
import { evaluateExact } from '../../exact/evaluate.js';
import { valueRate as sumValue } from '../../model/values.js';
import { checkStability } from '../../stability/check.js';
import { minEdgeFlowOf } from '../../stability/report.js';
import { seededRandom } from '../../random.js';
import { baselines as buildBaselines, type BaselineName } from './baselines.js';
import { DesignEvaluator, overAbandonmentLimit, scoreSpecOf, type DesignRecord, type ScoringChoice } from '../scoring/evaluator.js';
import { extendedScore, hasPatience, sharedTrieSets, simulatesAlways, type Score, type ScoreMethod, type SimulatedFigures } from '../scoring/score.js';
import { pairedDifference, reportPlan, searchPlan, type PairedDifference } from '../scoring/sim-score.js';
import { allocateReplications, allocationPlan, INDIFFERENCE, limitInsideInterval, negligibleDifference, type AllocationRecord } from './allocation.js';
import { exhaustiveSearch, MAX_EXHAUSTIVE_TOGGLES } from './exhaustive.js';
import { paretoLocalSearch } from './local-search.js';
import { budgetLadder, cheapestStableDesign, maxMinFlowDesign, type MilpDesign } from './milp.js';
import { needsMatchRates, needsSimulation, objectiveValue, type ObjectiveName } from '../space/objective.js';
import { frontValueAt, paretoFront } from '../space/pareto.js';
import { penaltyBatch, penaltyVerdict } from '../space/penalty.js';
import { createScorer, inThreadScorer, SearchStopped, workerScriptUrl } from '../scoring/scorer.js';
import type { ReuseMode } from '../scoring/reuse.js';
import {
  degreesAllowed,
  designChanges,
  designCost,
  designKey,
  designPairs,
  designPairValues,
  withinBudget,
  type DesignProblem,
} from '../space/problem.js';

export interface RecommendProgress {
  readonly phase: 'milp' | 'search' | 'exhaustive' | 'details';
  /** Designs scored so far. */
  readonly scored: number;
  /** Exact evaluations so far. */
  readonly evaluations: number;
}

export interface RecommendOptions {
  readonly objective?: ObjectiveName;
  /** Parallel scoring batches (worker threads); default 1 (in the calling thread). */
  readonly jobs?: number;
  /** Enumerate every design instead of searching (at most 20 toggles). */
  readonly exhaustive?: boolean;
  /** Seed of the search's random kicks (default 1). */
  readonly seed?: number;
  /** Memory guard of the exact evaluator (independent sets per design). */
  readonly maxSets?: number;
  /**
   * How designs are scored (default 'exact', today's behaviour): 'simulation' for every design, or
   * 'auto': exact where feasible and no patience, simulation otherwise (per design). The simulation
   * streams come from `seed` alone (common random numbers across designs).
   */
  readonly score?: ScoreMethod;
  /** Mean patience per class (0 = patient); with 'auto' or 'simulation' the figures include abandonment. */
  readonly patience?: readonly number[];
  /** Budget levels of the MILP ladder (default: none for the search, 5 with `exhaustive`; 0: none). */
  readonly ladderLevels?: number;
  /** Wall-clock limit of one MILP solve, seconds (default 30). */
  readonly milpTimeLimitSeconds?: number;
  /**
   * Pareto layers the local search expands (default 2; 4 for max-wait, whose landscape is flatter:
   * only the worst class counts).
   */
  readonly depth?: number;
  /** Of those, the layers that also get swap moves (default 2). */
  readonly swapLayers?: number;
  /** Random kicks of the local search (default: the number of toggles). */
  readonly kicks?: number;
  /**
   * Most designs the search may score (default: `defaultDesignLimit`: SIMULATED_SEARCH_DESIGNS
   * for a simulated search, EXACT_SEARCH_SETS over the first designs' set count for an exact one).
   * The search stops there and says so.
   */
  readonly maxDesigns?: number;
  readonly onProgress?: (p: RecommendProgress) => void;
  /**
   * Scoring of the designs one toggle away from a scored design (add/remove moves, the penalty's
   * neighbours) by reuse of its single-change preparation: 'auto' (default) where reuse.ts measured
   * it to pay, 'always', 'never'. Results do not depend on it beyond 1e-10 relative in the search's
   * own figures; every returned figure comes from a fresh evaluation.
   */
  readonly reuse?: ReuseMode;
  /** Compiled scoring worker; null forces scoring in the calling thread. Default: the worker pool's. */
  readonly workerUrl?: URL | null;
  /**
   * Stops the search (SIGINT): the result is then the Pareto set of what was scored so far, marked
   * `partial` (designs not yet checked by the flexibility penalty included).
   */
  readonly signal?: AbortSignal;
}

/** Exact figures of a design on the front or of a baseline. */
export interface DesignDetails extends SimulatedFigures {
  readonly design: Uint8Array;
  readonly key: string;
  readonly cost: number;
  /** Toggle indices of added candidates and dropped removable compatibilities (forced removals not included). */
  readonly added: number[];
  readonly removed: number[];
  readonly stable: boolean;
  /** Objective value (NaN when unstable). */
  readonly objective: number;
  readonly backlogTotal: number;
  /** Σ value · match rate (per time unit) when stable and the problem has values, else NaN. */
  readonly valueRate: number;
  /** Per class, when stable. */
  readonly backlog: Float64Array | null;
  readonly wait: Float64Array | null;
  readonly maxWait: number;
  /** Smallest flow on a present edge, max over flows (t* of the edge-flow LP, min over components). */
  readonly minEdgeFlow: number;
  /** Smallest λ(N(I)) − λ(I) over independent sets I (the bottleneck), when stable. */
  readonly bottleneckSlack: number;
  readonly independentSets: number;
  /** Simulated: ends of the 95 % interval of each class's wait. */
  readonly waitLo?: Float64Array;
  readonly waitHi?: Float64Array;
  /**
   * On the front, simulated: backlog of this design minus that of the next cheaper one (paired, same
   * streams); `negligible`: the whole interval lies within ±1 % of the cheaper design's backlog.
   */
  readonly vsCheaper?: PairedDifference & { readonly negligible: boolean };
}

export interface BaselineResult extends DesignDetails {
  readonly name: BaselineName;
  readonly note: string;
  readonly withinBudget: boolean;
  /** Within maxCompatibilities. */
  readonly withinLimits: boolean;
  readonly meetsTargets: boolean;
  /** Paid toggles whose removal would lower the objective. */
  readonly harmful: number[];
  /** Stable, within budget and limits, wait targets met: comparable with the front. */
  readonly feasible: boolean;
  /** Best front objective at this baseline's cost (Infinity when the front has nothing that cheap). */
  readonly frontValue: number;
  /** objective − frontValue (NaN when not comparable). */
  readonly gap: number;
}

export interface Recommendation {
  readonly objective: ObjectiveName;
  readonly budget: number;
  readonly pareto: DesignDetails[];
  readonly baselines: BaselineResult[];
  /** Exact evaluations of the search (cache misses reaching the exact evaluator). */
  readonly evaluations: number;
  /** Designs scored (evaluations plus designs refused as unstable before evaluating). */
  readonly scored: number;
  readonly toggles: number;
  /** 2^toggles: the size of the design space. */
  readonly designSpace: number;
  readonly exhaustive: boolean;
  readonly milp: { readonly cheapest: MilpDesign; readonly ladder: ReadonlyArray<{ readonly budget: number; readonly design: MilpDesign | undefined }> };
  /** Designs refused by the flexibility penalty. */
  readonly harmfulRefused: number;
  /** How scoring ran (not part of any output: it must not change results). */
  readonly scoring: 'workers' | 'in-thread';
  /** True when the search was stopped before it finished. */
  readonly partial: boolean;
  /** Today's design with the same scoring as the front. */
  readonly today?: DesignDetails;
  /** Designs scored by simulation during the search. */
  readonly simulated?: number;
  /** The search stopped at its limit of designs (`maxDesigns`): the value of that limit. */
  readonly designLimit?: number;
  /**
   * The file's maxAbandonment limits were judged (designs simulated with patience): designs over a
   * limit were kept out of the Pareto set. False when the file has limits but the figures have no
   * abandonment (exact figures); absent when the file has none.
   */
  readonly limitsChecked?: boolean;
  /** Pareto designs of the search dropped because the final re-score put them over an abandonment limit. */
  readonly overLimitAfterRescore?: number;
  /** Simulated re-score: the replications added where the ranking was uncertain (allocation.ts). */
  readonly allocation?: AllocationRecord;
}

/** True when some class of the problem has a maxAbandonment. */
export function hasAbandonmentLimits(problem: DesignProblem): boolean {
  return problem.maxAbandonment?.some((x) => !Number.isNaN(x)) ?? false;
}

/**
 * Designs a simulated search scores at most by default. Each costs a short simulation (3
 * replications of 20 000–60 000 arrivals, about 0.03–0.1 s a design at 80–100 classes on one core),
 * so the search stays within minutes where the full first-layer expansion measured well over an
 * hour at 80 classes × 50 candidates.
 */
export const SIMULATED_SEARCH_DESIGNS = 1500;
/** The search plan's arrivals a replication at which the limit is SIMULATED_SEARCH_DESIGNS (sim-score.ts: searchPlan's most). */
const SIMULATED_PLAN_ARRIVALS = 60_000;

/**
 * Independent sets an exact search scores at most by default: the limit of designs is this over
 * the largest set count of the first designs scored (today's and the cheapest stable one), and at
 * least EXACT_SEARCH_MIN_DESIGNS. Small problems never reach it (20 classes of 30 000 sets: 33 000
 * designs); a 40-class problem of 1.1 million sets a design stops at 900 designs, about 10 minutes
 * on two cores, where the search unbounded ran past half an hour. Counted in sets, not seconds, so
 * the same file gives the same bytes on any machine.
 */
export const EXACT_SEARCH_SETS = 1e9;
export const EXACT_SEARCH_MIN_DESIGNS = 300;

/**
 * The default limit of designs of a search (undefined: none). A simulated search's limit is counted
 * in arrivals: SIMULATED_SEARCH_DESIGNS designs of the longest search plan (60 000 arrivals a
 * replication, 100 classes and more), more designs where the plan is shorter (20 000 arrivals at 33
 * classes and fewer: 4 500 designs).
 */
export function defaultDesignLimit(simulated: boolean, firstSets: readonly number[], simArrivals = SIMULATED_PLAN_ARRIVALS): number | undefined {
  if (simulated) return Math.floor((SIMULATED_SEARCH_DESIGNS * SIMULATED_PLAN_ARRIVALS) / Math.max(1, Math.min(simArrivals, SIMULATED_PLAN_ARRIVALS)));
  const sets = Math.max(0, ...firstSets);
  if (sets <= 0) return undefined;
  return Math.max(EXACT_SEARCH_MIN_DESIGNS, Math.floor(EXACT_SEARCH_SETS / sets));
}

/** Why `--objective net-value` is refused on a file without values. */
export const NO_VALUES_MESSAGE =
  '--objective net-value needs values: no compatibility or candidate of the scenario has a "value" (per match) and the file gives no "waitingCost"; add them (docs/scenario-format.md, "Value per match") or choose another objective';

/** Why `--objective abandonment` is refused: exact figures have no abandonment. */
export const NO_ABANDONMENT_MESSAGE = (exact: boolean): string =>
  exact
    ? '--objective abandonment needs simulated figures with patience; --score exact has no abandonment: use --score auto or simulation'
    : '--objective abandonment needs a "patience" on some class: without patience no item abandons, so the share is 0 for every design; add patience (docs/scenario-format.md) or choose another objective';

/** "add a ↔ b, c ↔ d; drop e ↔ f" for messages (the one text notation of a pair). */
export function describeChanges(problem: DesignProblem, design: Uint8Array): string {
  const { added, removed } = designChanges(problem, design);
  const name = (j: number): string => {
    const t = problem.toggles[j]!;
    return `${problem.ids[t.a]} ↔ ${problem.ids[t.b]}`;
  };
  const parts: string[] = [];
  if (added.length > 0) parts.push(`add ${added.map(name).join(', ')}`);
  if (removed.length > 0) parts.push(`drop ${removed.map(name).join(', ')}`);
  return parts.length > 0 ? parts.join('; ') : "no change from today's design";
}

/** The figures of an unstable design: none. */
const UNSTABLE_FIGURES = { stable: false, objective: NaN, backlogTotal: NaN, valueRate: NaN, backlog: null, wait: null, maxWait: NaN, minEdgeFlow: NaN, bottleneckSlack: NaN, independentSets: 0 } as const;

/** The largest of the values (0 for none: waits are never negative). */
function largest(xs: ArrayLike<number>): number {
  let m = 0;
  for (let k = 0; k < xs.length; k++) m = Math.max(m, xs[k]!);
  return m;
}

/** Exact details of one design (main thread). */
export function designDetails(problem: DesignProblem, objective: ObjectiveName, design: Uint8Array, maxSets?: number): DesignDetails {
  const model = compileGraph(problem.ids, problem.rates, designPairs(problem, design));
  const { added, removed } = designChanges(problem, design);
  const base = { design, key: designKey(design), cost: designCost(problem, design), added, removed };
  const report = checkStability(model);
  if (!report.stable) {
    return { ...base, ...UNSTABLE_FIGURES };
  }
  const r = evaluateExact(model, maxSets === undefined ? {} : { maxSets });
  const minEdgeFlow = minEdgeFlowOf(report);
  const maxWait = largest(r.wait);
  const valueRate = problem.hasValues ? sumValue(designPairValues(problem, design), r.matchRates) : NaN;
  return {
    ...base,
    stable: true,
    objective: objectiveValue(objective, r.backlogTotal, r.backlog, problem.rates, problem.weight, { valueRate, waitingCost: problem.waitingCost }),
    backlogTotal: r.backlogTotal,
    valueRate,
    backlog: r.backlog,
    wait: r.wait,
    maxWait,
    minEdgeFlow,
    bottleneckSlack: report.bottleneck?.slack ?? NaN,
    independentSets: r.independentSets,
  };
}

/**
 * Details of a design from a simulated score (the stability LP gives the margins; the figures and
 * intervals come from the simulation). A score that is not simulated gives the exact details.
 */
export function detailsOfScore(problem: DesignProblem, objective: ObjectiveName, design: Uint8Array, s: Score, maxSets?: number): DesignDetails {
  if (s.method !== 'simulation' || !s.stable) {
    if (!s.stable && s.method === 'simulation') {
      const { added, removed } = designChanges(problem, design);
      return { design, key: designKey(design), cost: designCost(problem, design), added, removed, ...UNSTABLE_FIGURES, method: 'simulation' };
    }
    return designDetails(problem, objective, design, maxSets);
  }
  const model = compileGraph(problem.ids, problem.rates, designPairs(problem, design));
  const { added, removed } = designChanges(problem, design);
  const report = checkStability(model);
  const backlog = s.backlog!;
  const wait = Float64Array.from(backlog, (b, k) => b / problem.rates[k]!);
  const minEdgeFlow = minEdgeFlowOf(report);
  const maxWait = largest(wait);
  return {
    design,
    key: designKey(design),
    cost: designCost(problem, design),
    added,
    removed,
    stable: true,
    objective: objectiveValue(objective, s.backlogTotal, backlog, problem.rates, problem.weight, undefined, s.abandonShareTotal),
    valueRate: NaN,
    backlogTotal: s.backlogTotal,
    backlog,
    wait,
    maxWait,
    minEdgeFlow,
    bottleneckSlack: report.bottleneck?.slack ?? NaN,
    independentSets: 0,
    method: 'simulation',
    backlogCi95: s.backlogCi95 ?? null,
    ...(s.backlogLo && s.backlogHi ? { waitLo: Float64Array.from(s.backlogLo, (b, k) => b / problem.rates[k]!), waitHi: Float64Array.from(s.backlogHi, (b, k) => b / problem.rates[k]!) } : {}),
    ...(s.perReplication ? { perReplication: s.perReplication } : {}),
    ...(s.abandonShare ? { abandonShare: s.abandonShare, abandonShareTotal: s.abandonShareTotal ?? 0 } : {}),
    ...(s.abandonShareLo && s.abandonShareHi ? { abandonShareLo: s.abandonShareLo, abandonShareHi: s.abandonShareHi, abandonShareCi95: s.abandonShareCi95 ?? null } : {}),
  };
}

/**
 * Details of a design from its search record (an interrupted exact run): the totals the search
 * computed and the stability LP's margins; per-class backlogs and waits only where the record has
 * them (absent: null, and NaN for the largest wait).
 */
function detailsOfRecord(problem: DesignProblem, r: DesignRecord): DesignDetails {
  const { added, removed } = designChanges(problem, r.design);
  const base = { design: r.design, key: r.key, cost: r.cost, added, removed };
  if (!r.stable) {
    return { ...base, ...UNSTABLE_FIGURES };
  }
  const report = checkStability(compileGraph(problem.ids, problem.rates, designPairs(problem, r.design)));
  const minEdgeFlow = minEdgeFlowOf(report);
  const wait = r.backlog ? Float64Array.from(r.backlog, (b, k) => b / problem.rates[k]!) : null;
  const maxWait = wait ? largest(wait) : NaN;
  return {
    ...base,
    stable: true,
    objective: r.objective,
    backlogTotal: r.backlogTotal,
    valueRate: r.valueRate,
    backlog: r.backlog,
    wait,
    maxWait,
    minEdgeFlow,
    bottleneckSlack: report.bottleneck?.slack ?? NaN,
    independentSets: r.independentSets,
  };
}

/** The paired comparisons of a front (cheapest first) under common random numbers. */
function withComparisons(front: DesignDetails[]): DesignDetails[] {
  return front.map((d, i) => {
    const prev = front[i - 1];
    if (!prev || !d.perReplication || !prev.perReplication) return d;
    const diff = pairedDifference(d.perReplication, prev.perReplication);
    return { ...d, vsCheaper: { ...diff, negligible: negligibleDifference(diff, prev.backlogTotal, INDIFFERENCE) } };
  });
}

/** Relative distance behind the front (at the same cost or less) within which a simulated design is re-scored. */
export const NEAR_FRONT = 0.03;

/**
 * The designs of a simulated search just behind its front: admissible, known to pay for no harmful
 * compatibility (their penalty decided from scored neighbours), off the front, with an objective
 * within NEAR_FRONT of the front's at their cost. The short run's noise may have put one of them
 * behind a design that is in truth worse; the longer re-score decides. At most as many as the
 * front, the closest first.
 */
function nearFront(problem: DesignProblem, evaluator: DesignEvaluator, front: readonly DesignRecord[], harmful: ReadonlyMap<string, number[]>): DesignRecord[] {
  const on = new Set(front.map((r) => r.key));
  const near: Array<{ r: DesignRecord; gap: number }> = [];
  for (const r of evaluator.records()) {
    if (!r.feasible || on.has(r.key) || harmful.has(r.key) || r.method !== 'simulation') continue;
    const v = frontValueAt(front, r.cost);
    if (!Number.isFinite(v)) continue;
    const gap = (r.objective - v) / Math.max(Math.abs(v), 1e-12);
    if (gap > NEAR_FRONT) continue;
    const verdict = penaltyVerdict(problem, r.design, r.objective, (key) => evaluator.get(key));
    if (verdict.known && verdict.harmful.length === 0) near.push({ r, gap });
  }
  near.sort((a, b) => a.gap - b.gap || (a.r.key < b.r.key ? -1 : a.r.key > b.r.key ? 1 : 0));
  return near.slice(0, front.length).map((x) => x.r);
}

/**
 * The open questions of the re-scored figures (allocation.ts): along the Pareto set of the search's
 * designs rebuilt from `scores`, each design against the next cheaper one; each search design left
 * off that set against the design that dominates it (the best on the set at its cost); each design
 * with a limit inside its abandonment interval. A pair is open unless its paired difference is
 * significant or negligible.
 */
function openQuestions(problem: DesignProblem, objective: ObjectiveName, designs: readonly DesignRecord[], scores: ReadonlyMap<string, Score>): string[][] {
  const points = designs.flatMap((r) => {
    const s = scores.get(r.key);
    if (!s?.stable || !s.perReplication) return [];
    const value = objectiveValue(objective, s.backlogTotal, s.backlog ?? undefined, problem.rates, problem.weight, undefined, s.abandonShareTotal);
    return [{ key: r.key, cost: r.cost, objective: value, changes: r.changes, s }];
  });
  const admissible = points.filter((p) => !overAbandonmentLimit(problem, p.s.abandonShare));
  const front = paretoFront(admissible);
  const open: string[][] = [];
  const pair = (cheaper: (typeof points)[number], other: (typeof points)[number]): void => {
    const diff = pairedDifference(other.s.perReplication!, cheaper.s.perReplication!);
    if (!diff.significant && !negligibleDifference(diff, cheaper.s.backlogTotal, INDIFFERENCE)) open.push([cheaper.key, other.key]);
  };
  for (let i = 1; i < front.length; i++) pair(front[i - 1]!, front[i]!);
  const onFront = new Set(front.map((p) => p.key));
  for (const p of admissible) {
    if (onFront.has(p.key)) continue;
    let best: (typeof points)[number] | undefined;
    for (const f of front) if (f.cost <= p.cost + 1e-9) best = f;
    if (best) pair(best, p);
  }
  for (const p of points) {
    if (limitInsideInterval(problem.maxAbandonment, p.s.abandonShareLo, p.s.abandonShareHi)) open.push([p.key]);
  }
  return open;
}

/**
 * Today's design as a MILP-like answer when it is stable and within maxCompatibilities (the MILP
 * only sees designs whose smallest edge flow clears its floor; today's design may be stable with a
 * thinner margin).
 */
function todayIfStable(problem: DesignProblem): MilpDesign | undefined {
  const design = Uint8Array.from(problem.today);
  if (!degreesAllowed(problem, design)) return undefined;
  const report = checkStability(compileGraph(problem.ids, problem.rates, designPairs(problem, design)));
  if (!report.stable) return undefined;
  const minFlow = minEdgeFlowOf(report);
  return { design, cost: designCost(problem, design), minFlow, verifiedMinFlow: minFlow, proven: false, solves: 0 };
}

function cheaperOf(a: MilpDesign | undefined, b: MilpDesign | undefined): MilpDesign | undefined {
  if (!a || !b) return a ?? b;
  return b.cost < a.cost ? b : a;
}

/** Cost of the design with every candidate added and every removable compatibility kept. */
function fullCost(problem: DesignProblem): number {
  return designCost(problem, Uint8Array.from(problem.toggles, () => 1));
}

/**
 * After an exact search, the designs re-scored with per-class figures (the front, the baselines,
 * today's) are scored in this thread rather than on a new pool of workers when their independent
 * sets add up to at most this (about 0.2 s of work; starting two workers costs about 0.15 s).
 */
const IN_THREAD_SETS = 1_000_000;

export async function recommend(problem: DesignProblem, options: RecommendOptions = {}): Promise<Recommendation> {
  const objective = options.objective ?? 'total';
  if (needsMatchRates(objective) && !problem.hasValues) throw new UsageError(NO_VALUES_MESSAGE);
  if (options.exhaustive && options.maxDesigns !== undefined) {
    throw new UsageError('--max-designs limits the search; --exhaustive scores every design: give one or the other');
  }
  if (options.exhaustive && problem.toggles.length > MAX_EXHAUSTIVE_TOGGLES) {
    throw new UsageError(
      `--exhaustive enumerates 2^${problem.toggles.length} designs; it is limited to ${MAX_EXHAUSTIVE_TOGGLES} removable compatibilities and candidates together`,
    );
  }
  const method = options.score ?? 'exact';
  if (needsSimulation(objective) && (method === 'exact' || !hasPatience(options.patience))) {
    throw new UsageError(NO_ABANDONMENT_MESSAGE(method === 'exact'));
  }
  const seed = options.seed ?? 1;
  const choice = (plan: ScoringChoice['sim']): ScoringChoice | undefined =>
    method === 'exact' ? undefined : { method, sim: plan, ...(options.patience ? { patience: options.patience } : {}) };
  const spec = scoreSpecOf(problem, objective, options.maxSets, choice(searchPlan(seed, problem.n)));
  // the designs returned are scored again with the longer plan (its own stream, the same for all)
  const finalChoice = choice(reportPlan(seed, problem.n));
  const simulatesAll = simulatesAlways(spec);
  const finalSpec = finalChoice ? { ...scoreSpecOf(problem, objective, options.maxSets, finalChoice), perClass: true } : undefined;
  const url = options.workerUrl === null ? undefined : (options.workerUrl ?? workerScriptUrl());
  const scorer = createScorer(spec, options.jobs ?? 1, url, options.signal);
  let phase: RecommendProgress['phase'] = 'milp';
  const reuse = options.reuse ?? 'auto';
  // reuse pays only where fresh scoring has no shared trie (reuse.ts); the count is needed only then
  const sharedSets = reuse === 'auto' && spec.perClass && !simulatesAlways(spec) ? sharedTrieSets(spec) : undefined;
  const evaluator = new DesignEvaluator(problem, objective, scorer, (p) => options.onProgress?.({ phase, ...p }), reuse, sharedSets);
  const solve = { timeLimitSeconds: options.milpTimeLimitSeconds ?? 30 };
  const stopped = (): boolean => options.signal?.aborted === true;
  try {
    options.onProgress?.({ phase, scored: 0, evaluations: 0 });
    const cheapest = cheaperOf(await cheapestStableDesign(problem, solve), todayIfStable(problem));
    if (!cheapest) {
      throw new InfeasibleDesignError(
        'no stable design exists, even with every candidate added' +
          (problem.maxDegree.some(Number.isFinite) ? ' within maxCompatibilities' : '') +
          (problem.forcedOut.length > 0 ? ' and the forbidden pairs dropped' : ''),
      );
    }
    if (cheapest.cost > problem.budget + 1e-9) {
      throw new InfeasibleDesignError(
        `no stable design within the budget of ${problem.budget}: the cheapest stable design costs ${cheapest.cost} (${describeChanges(problem, cheapest.design)})`,
      );
    }
    const base = buildBaselines(problem);
    const ladder: Array<{ budget: number; design: MilpDesign | undefined }> = [];
    let front: DesignRecord[] = [];
    let harmful: ReadonlyMap<string, number[]> = new Map();
    let partial = false;
    let simulatedSearch = method === 'simulation' || simulatesAll;
    /** The limit the search stopped at (undefined: it ran to its end). */
    let designLimit: number | undefined;
    try {
      // something to show early: today's design and the cheapest stable one
      const first = await evaluator.evaluate([Uint8Array.from(problem.today), cheapest.design].filter((d) => withinBudget(problem, d) && degreesAllowed(problem, d)));
      // under auto, a problem whose first designs are past the exact guard is searched as a simulated one
      simulatedSearch ||= first.some((r) => r.method === 'simulation');
      const firstSets = first.map((r) => r.independentSets);
      const high = Math.min(problem.budget, fullCost(problem));
      const ladderLevels = options.ladderLevels ?? (options.exhaustive ? 5 : 0);
      const levels = ladderLevels === 0 ? [] : budgetLadder(cheapest.cost, Math.max(cheapest.cost, high), ladderLevels);
      for (const b of levels) {
        if (stopped()) throw new SearchStopped();
        ladder.push({ budget: b, design: await maxMinFlowDesign(problem, b, solve) });
      }
      if (stopped()) throw new SearchStopped();
      const seeds = [Uint8Array.from(problem.today), cheapest.design, ...ladder.flatMap((l) => (l.design ? [l.design.design] : [])), ...base.map((b) => b.design)];
      if (options.exhaustive) {
        phase = 'exhaustive';
        const r = await exhaustiveSearch(evaluator);
        ({ front, harmful } = r);
        partial = r.stopped;
      } else {
        phase = 'search';
        const maxDesigns = options.maxDesigns ?? defaultDesignLimit(simulatedSearch, firstSets, spec.sim?.arrivals);
        const r = await paretoLocalSearch(evaluator, seeds, {
          random: seededRandom(options.seed ?? 1),
          // a simulated search expands the first layer only, without swaps, and kicks less: each
          // simulated design costs about as much as thousands of small exact ones
          depth: options.depth ?? (simulatedSearch ? 1 : objective === 'max-wait' ? 4 : 2),
          ...(options.kicks === undefined ? (simulatedSearch ? { kicks: Math.min(problem.toggles.length, 10) } : {}) : { kicks: options.kicks }),
          ...(options.swapLayers === undefined ? (simulatedSearch ? { swapLayers: 0 } : {}) : { swapLayers: options.swapLayers }),
          // then, where the limit leaves room, a second layer (add and remove moves)
          ...(simulatedSearch && options.depth === undefined && options.swapLayers === undefined ? { refine: { depth: 2, swapLayers: 0 } } : {}),
          ...(maxDesigns === undefined ? {} : { maxDesigns }),
        });
        ({ front, harmful } = r);
        partial = r.stopped;
        if (r.limitReached) designLimit = maxDesigns;
      }
    } catch (e) {
      if (!(e instanceof SearchStopped)) throw e;
      partial = true;
      front = paretoFront([...evaluator.records()].filter((r) => r.feasible));
    }
    const evaluations = evaluator.evaluations;
    const scored = evaluator.scored;
    if (front.length === 0) {
      if (partial) throw new InterruptedError('interrupted before any design within the budget was scored');
      throw new InfeasibleDesignError(
        `no design within the budget of ${problem.budget} meets every waitTarget (and passes the flexibility penalty); ` +
          `the cheapest stable design costs ${cheapest.cost} (${describeChanges(problem, cheapest.design)})`,
      );
    }

    phase = 'details';
    let simulated = 0;
    for (const r of evaluator.records()) if (r.method === 'simulation') simulated++;
    let details: (design: Uint8Array) => DesignDetails = (design) => designDetails(problem, objective, design, options.maxSets);
    let allocation: AllocationRecord | undefined;
    /** The evaluator of the baselines when it is not the search's (an interrupted run). */
    let laterRecords: DesignEvaluator | undefined;
    /** Interrupted: a design the search scored exactly keeps the search's figures (no full evaluation). */
    const exactRecord = (key: string): DesignRecord | undefined => {
      if (!partial) return undefined;
      const r = evaluator.get(key) ?? laterRecords?.get(key);
      return r && r.method !== 'simulation' ? r : undefined;
    };
    if (partial) {
      // interrupted: the figures the search has, without a full evaluation of each design (at tens
      // of classes each costs seconds); the per-class waits are then left out, and said so
      details = (design) => {
        const r = exactRecord(designKey(design));
        return r ? detailsOfRecord(problem, r) : designDetails(problem, objective, design, options.maxSets);
      };
    }
    // a simulated search also re-scores the designs just behind its front (within the short run's
    // noise): the longer run may show one of them ahead of the design that beat it
    const contenders = finalSpec && simulatedSearch && !partial ? [...front, ...nearFront(problem, evaluator, front, harmful)] : front;
    if (finalSpec) {
      // one batch on the pool: the front (and the designs near it), the baselines and today's design, in input order
      const batch = [...contenders.map((r) => r.design), ...base.map((b) => b.design), Uint8Array.from(problem.today)].filter((d) => !exactRecord(designKey(d)));
      // interrupted: a quick re-score in this thread (the search's length, 5 replications) so the
      // partial answer comes within seconds; the figures keep their intervals
      const quick = { ...finalSpec, sim: { ...finalSpec.sim!, arrivals: spec.sim!.arrivals, warmup: spec.sim!.warmup, replications: 5 } };
      // after an exact search, designs of the front's size: when they are small a fresh pool of
      // workers would take longer to start than to score them all here
      const sets = Math.max(1, ...contenders.map((r) => r.independentSets));
      const inThread = partial || (!simulatedSearch && batch.length * sets <= IN_THREAD_SETS);
      const rescorer = inThread ? inThreadScorer(partial ? quick : finalSpec) : createScorer(finalSpec, options.jobs ?? 1, url);
      let scores: Score[];
      try {
        scores = await rescorer.score(batch);
      } finally {
        await rescorer.close();
      }
      let byKey = new Map(batch.map((d, i) => [designKey(d), scores[i]!] as const));
      if (!partial && front.some((r) => byKey.get(r.key)?.method === 'simulation')) {
        // sequential allocation: more replications where the ranking of the returned set is uncertain
        const designs = new Map(contenders.map((r) => [r.key, r.design] as const));
        const done = await allocateReplications({
          plan: allocationPlan(finalSpec.sim!.replications),
          scores: byKey,
          open: (sc) => openQuestions(problem, objective, contenders, sc),
          extend: async (list, first, count) => {
            const more = createScorer({ ...finalSpec, sim: { ...finalSpec.sim!, firstReplication: first, replications: count } }, options.jobs ?? 1, url);
            try {
              return await more.score(list.map((key) => designs.get(key)!));
            } finally {
              await more.close();
            }
          },
          merge: (a, b) => extendedScore(finalSpec, a, b),
          stopped,
        });
        byKey = done.scores;
        allocation = done.record;
      }
      const finalScores = byKey;
      const withoutScore = details;
      details = (design) => {
        const sc = finalScores.get(designKey(design));
        return sc ? detailsOfScore(problem, objective, design, sc, options.maxSets) : withoutScore(design);
      };
    }
    const limited = hasAbandonmentLimits(problem);
    const rescoredAll = contenders.map((r) => details(r.design));
    // the search admitted designs within every abandonment limit on its short run; the longer run
    // may put some over: they leave the set (counted among the search's Pareto designs), those
    // whose interval straddles a limit stay, flagged
    const over = (d: DesignDetails): boolean => d.stable && overAbandonmentLimit(problem, d.abandonShare);
    const rescored = rescoredAll.filter((d) => !over(d));
    const overLimitAfterRescore = rescoredAll.slice(0, front.length).filter(over).length;
    const limitsChecked = limited && rescoredAll.some((d) => d.abandonShare !== undefined && d.method === 'simulation');
    if (rescored.length === 0) {
      throw new InfeasibleDesignError(
        `every design the search found within the abandonment limits (maxAbandonment) is over a limit when simulated longer (${overLimitAfterRescore} design${overLimitAfterRescore === 1 ? '' : 's'}); raise a limit, or try another --seed`,
      );
    }
    // the front of the re-scored figures (noise in the search's figures may have let a dominated design in)
    const pareto = withComparisons(
      finalSpec ? paretoFront(rescored.filter((d) => d.stable).map((d) => ({ d, cost: d.cost, objective: d.objective, changes: d.added.length + d.removed.length, key: d.key }))).map((x) => x.d) : rescored,
    );
    // Baselines: scored (with the neighbours their penalty needs) outside the search's count; an
    // interrupted run scores them in this thread, without the workers it has stopped.
    const after = partial ? new DesignEvaluator(problem, objective, inThreadScorer(spec), undefined, 'never') : evaluator;
    // interrupted: the baselines the search had scored (they are among its seeds) are not scored again
    const known = base.map((b) => (partial ? evaluator.get(designKey(b.design)) : undefined));
    const missing = await after.evaluate(base.flatMap((b, i) => (known[i] ? [] : [b.design])));
    let m = 0;
    const baseRecords = known.map((r) => r ?? missing[m++]!);
    laterRecords = after;
    const neighbours = penaltyBatch(problem, baseRecords);
    if (!partial) await after.evaluate(neighbours.designs, neighbours.origins);
    const results: BaselineResult[] = base.map((b, i) => {
      const rec = baseRecords[i]!;
      const detailsB = details(b.design);
      const verdict = rec.stable ? penaltyVerdict(problem, b.design, rec.objective, (key) => after.get(key)) : { known: true, harmful: [] };
      const inBudget = withinBudget(problem, b.design);
      const inLimits = degreesAllowed(problem, b.design);
      const feasible = detailsB.stable && inBudget && inLimits && rec.meetsTargets && !overAbandonmentLimit(problem, detailsB.abandonShare);
      const frontValue = frontValueAt(pareto, detailsB.cost);
      return {
        ...detailsB,
        name: b.name,
        note: b.note,
        withinBudget: inBudget,
        withinLimits: inLimits,
        meetsTargets: rec.meetsTargets,
        harmful: verdict.harmful,
        feasible,
        frontValue,
        gap: feasible && Number.isFinite(frontValue) ? detailsB.objective - frontValue : NaN,
      };
    });
    return {
      objective,
      budget: problem.budget,
      pareto,
      baselines: results,
      evaluations,
      scored,
      toggles: problem.toggles.length,
      designSpace: 2 ** problem.toggles.length,
      exhaustive: Boolean(options.exhaustive),
      milp: { cheapest, ladder },
      harmfulRefused: harmful.size,
      scoring: scorer.mode,
      partial,
      // today's design in full even when interrupted: its waits are what every verdict starts from
      today: exactRecord(designKey(problem.today)) ? designDetails(problem, objective, Uint8Array.from(problem.today), options.maxSets) : details(Uint8Array.from(problem.today)),
      simulated,
      ...(designLimit === undefined ? {} : { designLimit }),
      ...(limited ? { limitsChecked, overLimitAfterRescore } : {}),
      ...(allocation ? { allocation } : {}),
    };
  } finally {
    await scorer.close();
  }
}

