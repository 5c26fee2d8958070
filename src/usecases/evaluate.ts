/**
 * `evaluate`: the steady state of one design under FCFM — backlog and wait per class, the chance an
 * arrival is matched at once, the chance the system is empty, and the match rate along every
 * compatibility — exact, from the product form.
 */
import { evaluateExact, DEFAULT_MAX_SETS } from '../exact/evaluate.js';
import { TooLargeError } from '../errors.js';
import type { ExactResult } from '../exact/result.js';
import { simulate } from '../sim/simulate.js';
import { reportPlan } from '../design/scoring/sim-score.js';
import type { ScoreMethod } from '../design/scoring/score.js';
import { impatientClasses, demandNote } from './warnings.js';
import { checkStability } from '../stability/check.js';
import { certificateWithIds } from '../stability/certificate.js';
import { supportedDigits } from '../output/format.js';
import { recordBase, type ScenarioContext } from './context.js';
import { instabilityOf } from './instability.js';
import { byClass, idsOf, pairIds, type InstabilityRecord, type RepairRecord, type PairIds, type RecordBase, type Reference } from './records.js';
import { exactWarnings, limitsIgnoredWarning, valueWarnings } from './warnings.js';
import { limitsOfEstimates, type AbandonmentLimit } from './designs.js';
import { edgeValues } from '../model/values.js';

export interface MatchRateRecord {
  readonly pair: PairIds;
  /** Matches per time unit along the compatibility. */
  readonly rate: number;
  /** Share of all matches. */
  readonly share: number;
  /** Value per match the file gives the pair (null when it gives none: the pair counts 0). */
  readonly value: number | null;
  /** value · rate: what the pair's matches are worth per time unit (null without a value). */
  readonly valueRate: number | null;
}

/**
 * Value per match (docs/scenario-format.md): present when some pair of the file has a value or the
 * file gives waitingCost. Exact FCFM figures (patience ignored: see the warnings).
 */
export interface ValueRecord {
  /** Σ_pairs value · match rate, per time unit (pairs without a value count 0). */
  readonly rate: number;
  /** The file's cost per waiting item per time unit (null when it gives none: counted 0). */
  readonly waitingCost: number | null;
  /** waitingCost · mean total backlog, per time unit. */
  readonly waitingCostRate: number;
  /** rate − waitingCostRate. */
  readonly net: number;
  /** Pairs of the evaluated design with a value, and without one (counted 0). */
  readonly pairsWithValue: number;
  readonly pairsWithoutValue: number;
  /** Some class has a patience the exact figures ignore (the warnings say so too). */
  readonly patienceIgnored: boolean;
}

export interface EvaluateRecord extends RecordBase {
  readonly command: 'evaluate';
  readonly reference: Reference;
  readonly stable: boolean;
  /** How the figures were made. */
  readonly method: 'exact' | 'simulation';
  /** Simulated: why, and how long (replications of `arrivals` measured arrivals, streams from `seed`). */
  readonly simulation?: { readonly reason: string; readonly arrivals: number; readonly warmup: number; readonly replications: number; readonly seed: number; readonly abandonment: boolean };
  /** Simulated: 95 % intervals (Student t across independent replications). */
  readonly backlogCi95?: [number, number];
  readonly backlogByClassCi95?: Record<string, [number, number]>;
  readonly waitCi95?: [number, number];
  readonly waitByClassCi95?: Record<string, [number, number]>;
  readonly matchedAtOnceCi95?: [number, number];
  /** Simulated with patience: the share of arrivals that abandon. */
  readonly abandonShare?: { readonly total: number; readonly ci95: [number, number] | null; readonly byClass: Record<string, number | null> };
  /** Simulated with patience and maxAbandonment in the file: each limited class's share against its limit. */
  readonly abandonmentLimits?: AbandonmentLimit[];
  readonly independentSets: number | null;
  /** Mean number of items waiting: in all, and per class. */
  readonly backlog: { readonly total: number; readonly byClass: Record<string, number | null> } | null;
  /** Mean wait per class (Little's law), in the time unit; `mean` over all arrivals. */
  readonly wait: { readonly mean: number; readonly byClass: Record<string, number | null> } | null;
  /** Probability that an arrival is matched at once (on arrival), per class and over all arrivals. */
  readonly matchedAtOnce: { readonly total: number; readonly byClass: Record<string, number | null> } | null;
  /** Probability that no item waits. */
  readonly emptyProbability: number | null;
  readonly matchRates: MatchRateRecord[];
  /** Value rate, waiting cost rate and net value (null without values in the file, or when unstable). */
  readonly value: ValueRecord | null;
  readonly bottleneck: { readonly set: string[]; readonly spareCapacity: number; readonly capacity: number } | null;
  readonly instability: InstabilityRecord | null;
  /** When unstable: the cheapest sets of allowed candidates that make it stable, cheapest first (as in `instability`). */
  readonly repairs: RepairRecord[] | null;
}

export interface EvaluateOptions {
  readonly maxSets?: number;
  /** Default 'exact' (the library's historical behaviour); the CLI's default is 'auto'. */
  readonly score?: ScoreMethod;
  /** Seed of the simulation streams (default 1). */
  readonly seed?: number;
  /** Worker threads of the simulation (default 1); the figures do not depend on it. */
  readonly jobs?: number;
  /** Compiled worker override for the simulation (null: this thread). */
  readonly workerUrl?: URL | null;
}

type Pair = [number, number];
const pairOf = (c: readonly [number, number] | null): Pair | null => (c ? [c[0], c[1]] : null);
function intervals(ids: readonly string[], list: ReadonlyArray<{ ci95: readonly [number, number] | null }>): Record<string, Pair> {
  const out: Record<string, Pair> = {};
  list.forEach((e, k) => {
    if (e.ci95 && Number.isFinite(e.ci95[0]) && Number.isFinite(e.ci95[1])) out[ids[k]!] = [e.ci95[0], e.ci95[1]];
  });
  return out;
}

export async function evaluateUseCase(ctx: ScenarioContext, options: EvaluateOptions = {}): Promise<EvaluateRecord> {
  const model = ctx.model;
  const stability = checkStability(model);
  const warnings = [...exactWarnings(ctx), ...(ctx.values.any && stability.stable ? valueWarnings(ctx) : [])];
  // the simulated path replaces these warnings and compares each share with its limit
  const ignored = limitsIgnoredWarning(ctx);
  if (ignored) warnings.push(ignored);
  const base = { ...recordBase(ctx, 'evaluate', warnings), reference: ctx.reference, method: 'exact' as const };
  if (!stability.stable) {
    const instability = await instabilityOf(ctx, certificateWithIds(model, stability.certificate!));
    return {
      ...base,
      stable: false,
      independentSets: null,
      backlog: null,
      wait: null,
      matchedAtOnce: null,
      emptyProbability: null,
      matchRates: [],
      value: null,
      bottleneck: null,
      instability,
      repairs: instability.repairs,
    };
  }
  const method = options.score ?? 'exact';
  let r: ExactResult | null = null;
  let reason = 'asked for (--score simulation)';
  if (method === 'exact' || (method === 'auto' && !ctx.patience)) {
    try {
      r = evaluateExact(model, { maxSets: options.maxSets ?? DEFAULT_MAX_SETS, timeUnit: ctx.scenario.timeUnit });
    } catch (e) {
      if (!(e instanceof TooLargeError) || method === 'exact') throw e;
      reason = e.message.split(';')[0]!;
    }
  } else if (method === 'auto') {
    reason = `patience in the file (${impatientClasses(ctx)} one): simulated with abandonment`;
  }
  if (!r) return simulatedEvaluation(ctx, options, base, stability, reason);
  const total = model.totalRate;
  let atOnce = 0;
  for (let k = 0; k < model.n; k++) atOnce += model.rates[k]! * r.immediateMatch[k]!;
  const half = total / 2;
  const b = stability.bottleneck;
  const values = edgeValues(model, ctx.values);
  let valueSum = 0;
  let withValue = 0;
  for (let e = 0; e < model.m; e++) {
    valueSum += values.value[e]! * r.matchRates[e]!;
    withValue += values.given[e]!;
  }
  const waiting = ctx.values.waitingCost * r.backlogTotal;
  return {
    ...base,
    precision: supportedDigits(b ? b.slack / b.capacity : null),
    stable: true,
    independentSets: r.independentSets,
    backlog: { total: r.backlogTotal, byClass: byClass(model.ids, r.backlog) },
    wait: { mean: r.backlogTotal / total, byClass: byClass(model.ids, r.wait) },
    matchedAtOnce: { total: atOnce / total, byClass: byClass(model.ids, r.immediateMatch) },
    emptyProbability: r.emptyProbability,
    matchRates: Array.from({ length: model.m }, (_, e) => ({
      pair: pairIds(model, model.edgeA[e]!, model.edgeB[e]!),
      rate: r.matchRates[e]!,
      share: r.matchRates[e]! / half,
      value: values.given[e] ? values.value[e]! : null,
      valueRate: values.given[e] ? values.value[e]! * r.matchRates[e]! : null,
    })),
    value: ctx.values.any
      ? {
          rate: valueSum,
          waitingCost: ctx.values.hasWaitingCost ? ctx.values.waitingCost : null,
          waitingCostRate: waiting,
          net: valueSum - waiting,
          pairsWithValue: withValue,
          pairsWithoutValue: model.m - withValue,
          patienceIgnored: ctx.patience,
        }
      : null,
    bottleneck: b ? { set: idsOf(model, b.set), spareCapacity: b.slack, capacity: b.capacity } : null,
    instability: null,
    repairs: null,
  };
}

/** The figures of a stable design by seeded simulation, with their 95 % intervals. */
async function simulatedEvaluation(
  ctx: ScenarioContext,
  options: EvaluateOptions,
  base: ReturnType<typeof recordBase<'evaluate'>> & { reference: Reference },
  stability: ReturnType<typeof checkStability>,
  reason: string,
): Promise<EvaluateRecord> {
  const model = ctx.model;
  const values = edgeValues(model, ctx.values);
  let valueSum = 0;
  let withValue = 0;
  const plan = reportPlan(options.seed ?? 1, model.n);
  const patience = ctx.patience ? ctx.scenario.classes.map((c) => c.patience ?? Infinity) : undefined;
  const s = await simulate(model, {
    arrivals: plan.arrivals,
    warmup: plan.warmup,
    replications: plan.replications,
    seed: plan.seed,
    maxWaiting: plan.maxWaiting,
    jobs: options.jobs ?? 1,
    ...(patience ? { patience } : {}),
    ...(options.workerUrl === undefined ? {} : { workerUrl: options.workerUrl }),
  });
  const ids = model.ids;
  const half = model.totalRate / 2;
  for (let e = 0; e < model.m; e++) {
    valueSum += values.value[e]! * s.matchRates[e]!.mean;
    withValue += values.given[e]!;
  }
  const b = stability.bottleneck;
  const impatient = patience !== undefined;
  const limits = impatient ? limitsOfEstimates(ids, ctx.problem.maxAbandonment, s.abandonShare.byClass) : null;
  const warnings = [demandNote(ctx)].filter((w): w is string => w !== null);
  const backlogCi = pairOf(s.backlog.total.ci95);
  const waitCi = pairOf(s.wait.total.ci95);
  const atOnceCi = pairOf(s.immediateMatch.total.ci95);
  return {
    ...base,
    warnings: [
      `Simulated figures (${reason}): ${plan.replications} replications of ${plan.arrivals.toLocaleString('en-US')} arrivals, seed ${options.seed ?? 1}; each carries its 95 % interval.`,
      ...warnings,
    ],
    method: 'simulation',
    simulation: { reason, arrivals: plan.arrivals, warmup: plan.warmup, replications: plan.replications, seed: options.seed ?? 1, abandonment: impatient },
    stable: true,
    independentSets: null,
    backlog: { total: s.backlog.total.mean, byClass: byClass(ids, s.backlog.byClass.map((e) => e.mean)) },
    ...(backlogCi ? { backlogCi95: backlogCi } : {}),
    backlogByClassCi95: intervals(ids, s.backlog.byClass),
    // mean wait over all arrivals by Little's law from the backlog (abandoned items included while they wait)
    wait: { mean: s.backlog.total.mean / model.totalRate, byClass: byClass(ids, s.backlog.byClass.map((e, k) => e.mean / model.rates[k]!)) },
    ...(backlogCi ? { waitCi95: [backlogCi[0] / model.totalRate, backlogCi[1] / model.totalRate] as Pair } : waitCi ? { waitCi95: waitCi } : {}),
    waitByClassCi95: intervals(ids, s.backlog.byClass.map((e, k) => ({ ci95: e.ci95 ? ([e.ci95[0] / model.rates[k]!, e.ci95[1] / model.rates[k]!] as const) : null }))),
    matchedAtOnce: { total: s.immediateMatch.total.mean, byClass: byClass(ids, s.immediateMatch.byClass.map((e) => e.mean)) },
    ...(atOnceCi ? { matchedAtOnceCi95: atOnceCi } : {}),
    ...(limits ? { abandonmentLimits: limits } : {}),
    ...(impatient ? { abandonShare: { total: s.abandonShare.total.mean, ci95: pairOf(s.abandonShare.total.ci95), byClass: byClass(ids, s.abandonShare.byClass.map((e) => e.mean)) } } : {}),
    emptyProbability: null,
    matchRates: Array.from({ length: model.m }, (_, e) => ({
      pair: pairIds(model, model.edgeA[e]!, model.edgeB[e]!),
      rate: s.matchRates[e]!.mean,
      share: s.matchRates[e]!.mean / half,
      value: values.given[e] ? values.value[e]! : null,
      valueRate: values.given[e] ? values.value[e]! * s.matchRates[e]!.mean : null,
    })),
    // from the simulated match rates (abandonment included): point estimates, like the backlog's mean
    value: ctx.values.any
      ? {
          rate: valueSum,
          waitingCost: ctx.values.hasWaitingCost ? ctx.values.waitingCost : null,
          waitingCostRate: ctx.values.waitingCost * s.backlog.total.mean,
          net: valueSum - ctx.values.waitingCost * s.backlog.total.mean,
          pairsWithValue: withValue,
          pairsWithoutValue: model.m - withValue,
          patienceIgnored: false,
        }
      : null,
    bottleneck: b ? { set: idsOf(model, b.set), spareCapacity: b.slack, capacity: b.capacity } : null,
    instability: null,
    repairs: null,
  };
}
