/**
 * The scoring choice shared by the commands that score designs beside `evaluate` and `recommend`
 * (sensitivity, sweep, compare, report): `--score exact|simulation|auto`, `--seed`, `--max-sets`,
 * `--jobs`, and the one rule that picks the method of a whole record:
 *
 * - `exact`: the exact recursion; past the set guard it stops (TooLargeError, exit 4).
 * - `simulation`: seeded simulation for every figure.
 * - `auto`: simulation when the file gives patience (the exact product form has none), otherwise the
 *   exact recursion, and simulation for the whole record when a design passes the exact guard.
 *
 * One method per record: every design a record compares is scored by the same method, so that a
 * difference is never exact on one side and simulated on the other. Simulated designs share the
 * plan's streams (common random numbers, src/design/scoring/sim-score.ts): the difference of two is
 * the paired difference of their replications, with its own 95 % interval.
 */
import { TooLargeError } from '../errors.js';
import type { CompiledModel } from '../model/compile.js';
import { extendedScore, type Score, type ScoreMethod, type ScoreSpec } from '../design/scoring/score.js';
import { allocateReplications, allocationPlan, INDIFFERENCE, negligibleDifference, type AllocationRecord } from '../design/search/allocation.js';
import { pairedDifference, reportPlan, type Interval, type PairedDifference, type SimPlan } from '../design/scoring/sim-score.js';
import { createScorer, workerScriptUrl } from '../design/scoring/scorer.js';
import type { ScenarioContext } from './context.js';
import { evaluateOrExplain, outcomeOf, type Outcome, type OutcomeScorer } from './outcomes.js';
import { checkStability } from '../stability/check.js';
import { impatientClasses } from './warnings.js';

export interface ScoringInput {
  /** Default 'exact' (the library's historical behaviour); the CLI's default is 'auto'. */
  readonly score?: ScoreMethod;
  /** Seed of the simulation streams (default 1). */
  readonly seed?: number;
  /** Guard of the exact recursion (independent sets). */
  readonly maxSets?: number;
  /** Worker threads of the simulated scoring (default 1); the figures do not depend on it. */
  readonly jobs?: number;
  /** Compiled worker override (null: this thread). */
  readonly workerUrl?: URL | null;
}

/** How a record's figures were made, and for simulated ones how long and why. */
export interface ScoringRecord {
  readonly method: 'exact' | 'simulation';
  /** Simulated: why, and the plan (replications of `arrivals` measured arrivals, streams from `seed`). */
  readonly simulation?: {
    readonly reason: string;
    readonly arrivals: number;
    readonly warmup: number;
    readonly replications: number;
    readonly seed: number;
    readonly abandonment: boolean;
    /** More replications where a difference from the reference was not yet settled (allocation.ts). */
    readonly allocation?: AllocationRecord;
  };
}

/** Mean patience per class in model order (0 = patient), or undefined when the file gives none. */
export function patienceOf(ctx: ScenarioContext): number[] | undefined {
  return ctx.patience ? ctx.scenario.classes.map((c) => c.patience ?? 0) : undefined;
}

/** The plan of simulated figures a command reports (the same as `evaluate`'s). */
export function scoringPlan(ctx: ScenarioContext, input: ScoringInput): SimPlan {
  return reportPlan(input.seed ?? 1, ctx.model.n);
}

/** The scoring record of a simulated figure set, with its reason. */
export function simulationRecord(ctx: ScenarioContext, input: ScoringInput, reason: string, allocation?: AllocationRecord): ScoringRecord {
  const plan = scoringPlan(ctx, input);
  return {
    method: 'simulation',
    simulation: { reason, arrivals: plan.arrivals, warmup: plan.warmup, replications: plan.replications, seed: input.seed ?? 1, abandonment: ctx.patience, ...(allocation ? { allocation } : {}) },
  };
}

/** The warning a simulated record carries (one sentence). */
export function simulationWarning(rec: ScoringRecord): string | null {
  const s = rec.simulation;
  if (!s) return null;
  const a = s.allocation;
  const more =
    a && a.extended > 0
      ? ` (more, up to ${a.maxReplications}, for the ${a.openAtStart} difference${a.openAtStart === 1 ? '' : 's'} from the reference they left unsettled${a.unresolved > 0 ? `; ${a.unresolved} still not distinguishable` : ''})`
      : '';
  return `Simulated figures (${s.reason}): ${s.replications} replications of ${s.arrivals.toLocaleString('en-US')} arrivals${more}, seed ${s.seed}, the same arrival stream for every design (common random numbers); each carries its 95 % interval.`;
}

/**
 * Runs `exact` or `simulated` by the rule above: the one place the method of a record is chosen.
 * `simulated` receives the reason to print.
 */
export async function byScoring<T>(ctx: ScenarioContext, input: ScoringInput, exact: () => T | Promise<T>, simulated: (reason: string) => Promise<T>): Promise<T> {
  const method = input.score ?? 'exact';
  if (method === 'simulation') return simulated('asked for (--score simulation)');
  if (method === 'auto' && ctx.patience) return simulated(`patience in the file (${impatientClasses(ctx)} one): simulated with abandonment`);
  try {
    return await exact();
  } catch (e) {
    if (method === 'auto' && e instanceof TooLargeError) return simulated(`the exact recursion is not feasible: ${e.message.split(';')[0]!}`);
    throw e;
  }
}

type PairList = ReadonlyArray<readonly [number, number]>;

/**
 * Scores designs over the same classes and rates by simulation, every one with the same plan
 * (common random numbers), on the worker pool when `jobs` > 1; scores in input order whatever
 * order the workers finish in (same bytes whatever --jobs). A design is given by its pairs (class
 * indices); an unstable design (stability LP) is never simulated.
 */
export async function simulateDesigns(
  ids: readonly string[],
  rates: ArrayLike<number>,
  designs: readonly PairList[],
  plan: SimPlan,
  input: ScoringInput,
  patience?: readonly number[],
): Promise<Score[]> {
  if (designs.length === 0) return [];
  const index = new Map<string, number>();
  const toggles: Array<readonly [number, number]> = [];
  const vectors = designs.map((pairs) => {
    const on: number[] = [];
    for (const [x, y] of pairs) {
      const a = Math.min(x, y);
      const b = Math.max(x, y);
      const key = `${a},${b}`;
      let j = index.get(key);
      if (j === undefined) {
        j = toggles.length;
        index.set(key, j);
        toggles.push([a, b]);
      }
      on.push(j);
    }
    return on;
  });
  const spec: ScoreSpec = {
    ids,
    rates: Array.from(rates),
    fixed: [],
    toggles,
    perClass: true,
    method: 'simulation',
    sim: plan,
    ...(patience ? { patience } : {}),
  };
  const url = input.workerUrl === null ? undefined : (input.workerUrl ?? workerScriptUrl());
  const jobs = Math.min(input.jobs ?? 1, designs.length);
  const scorer = createScorer(spec, jobs, url);
  try {
    return await scorer.score(
      vectors.map((on) => {
        const v = new Uint8Array(toggles.length);
        for (const j of on) v[j] = 1;
        return v;
      }),
    );
  } finally {
    await scorer.close();
  }
}

/**
 * simulateDesigns, then sequential allocation (src/design/search/allocation.ts): each design whose
 * paired difference from the first (the reference) is neither significant nor negligible (its
 * interval within ±1 % of the reference's backlog) gets more replications, with the reference, up
 * to the allocation's most; the extra replications continue the same streams.
 */
export async function simulateAgainstFirst(...args: Parameters<typeof simulateDesigns>): Promise<{ scores: Score[]; allocation: AllocationRecord }> {
  const [ids, rates, designs, plan, input, patience] = args;
  const first = await simulateDesigns(...args);
  const keys = designs.map((_, i) => String(i));
  const open = (sc: ReadonlyMap<string, Score>): string[][] => {
    const ref = sc.get('0')!;
    if (!ref.stable) return [];
    return keys.slice(1).flatMap((k) => {
      const d = pairedVs(sc.get(k)!, ref);
      return !sc.get(k)!.stable || d.significant || negligibleDifference(d, ref.backlogTotal, INDIFFERENCE) ? [] : [['0', k]];
    });
  };
  const done = await allocateReplications({
    plan: allocationPlan(plan.replications),
    scores: new Map(keys.map((k, i) => [k, first[i]!] as const)),
    open,
    // a design's key is its index
    extend: async (list, from, count) => simulateDesigns(ids, rates, list.map((k) => designs[Number(k)]!), { ...plan, firstReplication: from, replications: count }, input, patience),
    merge: (a, b) => extendedScore({ perClass: true }, a, b),
    stopped: () => false,
  });
  return { scores: keys.map((k) => done.scores.get(k)!), allocation: done.record };
}

/** The pairs of a compiled model (class indices). */
export function pairsOf(model: CompiledModel): Array<readonly [number, number]> {
  return Array.from({ length: model.m }, (_, e) => [model.edgeA[e]!, model.edgeB[e]!] as const);
}

/** A simulated score's interval of the total backlog, when it has one. */
export function backlogInterval(s: Score): Interval | null {
  return s.stable && s.backlogCi95 ? [s.backlogCi95[0], s.backlogCi95[1]] : null;
}

/**
 * The paired difference a − b of two designs simulated with the same streams (NaN mean, no interval
 * when either is unusable).
 */
export function pairedVs(a: Score, b: Score): PairedDifference {
  if (!a.stable || !b.stable || !a.perReplication || !b.perReplication) return { mean: NaN, ci95: null, significant: false };
  return pairedDifference(a.perReplication, b.perReplication);
}

/** Mean wait per class of a simulated score (Little's law from the class backlog); null when unusable. */
export function simulatedWaits(s: Score, rates: ArrayLike<number>): Float64Array | null {
  if (!s.stable || !s.backlog) return null;
  return Float64Array.from(s.backlog, (b, k) => b / rates[k]!);
}

/**
 * The outcome scorer of one method: exact (evaluateOrExplain with the input's guard; TooLargeError
 * past it) or simulated with the input's plan. Choose the method with byScoring.
 */
export function outcomeScorer(ctx: ScenarioContext, input: ScoringInput, method: 'exact' | 'simulation'): OutcomeScorer {
  const unit = ctx.scenario.timeUnit;
  if (method === 'exact') return async (m) => outcomeOf(m, evaluateOrExplain(m, unit, input.maxSets === undefined ? {} : { maxSets: input.maxSets }));
  const plan = scoringPlan(ctx, input);
  const patience = patienceOf(ctx);
  return async (m): Promise<Outcome> => {
    const none: Outcome = { stable: false, backlog: null, maxWait: null, maxWaitClass: null, method: 'simulation' };
    if (!checkStability(m).stable) return none;
    const [s] = await simulateDesigns(m.ids, m.rates, [pairsOf(m)], plan, input, patience);
    const waits = simulatedWaits(s!, m.rates);
    if (!waits) return none;
    let k = 0;
    for (let i = 1; i < m.n; i++) if (waits[i]! > waits[k]!) k = i;
    return { stable: true, backlog: s!.backlogTotal, maxWait: waits[k]!, maxWaitClass: m.ids[k]!, method: 'simulation', backlogCi95: backlogInterval(s!) };
  };
}
