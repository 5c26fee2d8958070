/**
 * `simulate`: replications of the matching system under a policy, with 95 % intervals, wait
 * percentiles and abandonment, and the exact FCFM value beside each estimate when the exact
 * evaluator can handle the design (patient items, FCFM, stable, not too large).
 *
 * The stability verdict and the exact evaluator are imported as the replications start
 * (`analysis`), and this thread joins the replications once it has used them
 * (`SimulationOptions.startAfter`): with worker threads their modules load while the workers
 * simulate, instead of delaying the workers' first replication (the serial start-up of
 * `simulate --jobs 2`; bench/simulate.ts). With workers, the exact column is a worker's first task
 * (`SimulationOptions.side`), so that this thread's replications start at once and the threads'
 * shares of the work come out even; without workers this thread computes it.
 */
import { describeCertificate, EdgewiseError } from '../errors.js';
import type { ExactColumn } from '../exact/column.js';
import { edgePairs } from '../model/compile.js';
import type { PolicyName } from '../sim/policy.js';
import { simulate, type SimulationOptions } from '../sim/simulate.js';
import type { Estimate, WaitEstimate } from '../sim/summary.js';
import { recordBase, type ScenarioContext } from './context.js';
import { certificateRecord, finite, pairIds, type CertificateRecord, type PairIds, type RecordBase, type Reference } from './records.js';
import { demandNote } from './warnings.js';
import { limitsOfEstimates, type AbandonmentLimit } from './designs.js';

/** A simulated mean with its 95 % interval across replications (null with one replication), and the exact value when known. */
export interface EstimateRecord {
  /** null when nothing was observed (e.g. no item of the class was matched). */
  readonly mean: number | null;
  readonly ci95: [number, number] | null;
  readonly exact?: number;
}

export interface WaitRecord extends EstimateRecord {
  /** Percentiles of the pooled waits (matched items; those matched at once wait 0). */
  readonly p50: number | null;
  readonly p90: number | null;
  readonly p99: number | null;
  readonly p50Ci95: [number, number] | null;
  readonly p90Ci95: [number, number] | null;
  readonly p99Ci95: [number, number] | null;
}

export interface SimulateRecord extends RecordBase {
  readonly command: 'simulate';
  readonly reference: Reference;
  readonly method: 'simulation';
  readonly policy: PolicyName;
  readonly ranking: string[] | null;
  /** Replications finished (fewer than planned when the run was interrupted). */
  readonly replications: number;
  readonly plannedReplications: number;
  /** True when the run was interrupted: the figures come from the replications finished. */
  readonly partial: boolean;
  readonly arrivals: number;
  readonly warmup: number;
  readonly seed: number;
  readonly maxWaiting: number;
  readonly engine: 'arrival-chain' | 'timed';
  readonly stability: { readonly stable: boolean | null; readonly certificate: CertificateRecord | null; readonly note: string | null };
  readonly exact: { readonly available: boolean; readonly reason: string | null; readonly independentSets: number | null };
  readonly backlog: { readonly total: EstimateRecord; readonly byClass: Record<string, EstimateRecord> };
  readonly wait: { readonly total: WaitRecord; readonly byClass: Record<string, WaitRecord> };
  readonly matchedAtOnce: { readonly total: EstimateRecord; readonly byClass: Record<string, EstimateRecord> };
  readonly matchRates: Array<{ readonly pair: PairIds; readonly rate: EstimateRecord }>;
  /** With maxAbandonment in the file: each limited class's simulated share against its limit. */
  readonly abandonmentLimits?: AbandonmentLimit[];
  readonly abandonment: {
    readonly total: { readonly rate: EstimateRecord; readonly share: EstimateRecord };
    readonly byClass: Record<string, { readonly patience: number | null; readonly rate: EstimateRecord; readonly share: EstimateRecord }>;
  };
  readonly notes: string[];
}

export interface SimulateInput {
  readonly policy: PolicyName;
  readonly ranking?: readonly string[];
  readonly arrivals?: number;
  readonly replications?: number;
  readonly warmup?: number;
  readonly seed?: number;
  readonly maxWaiting?: number;
  readonly jobs: number;
  readonly timed?: boolean;
  /** Memory guard of the exact column. */
  readonly exactMaxSets: number;
  readonly onProgress?: (done: number, total: number) => void;
  readonly signal?: AbortSignal;
}

/** The modules of the stability verdict and of the exact column, loaded on first use. */
const analysis = async () => {
  const [{ checkStability }, { certificateWithIds }, { exactColumn }] = await Promise.all([
    import('../stability/check.js'),
    import('../stability/certificate.js'),
    import('../exact/column.js'),
  ]);
  return { checkStability, certificateWithIds, exactColumn };
};
type Analysis = Awaited<ReturnType<typeof analysis>>;

function stabilityOf(ctx: ScenarioContext, impatient: boolean, { checkStability, certificateWithIds }: Analysis): SimulateRecord['stability'] {
  try {
    const report = checkStability(ctx.model);
    if (report.stable) return { stable: true, certificate: null, note: null };
    const c = certificateWithIds(ctx.model, report.certificate!);
    const tail = impatient
      ? '; abandonment may still keep the queues bounded'
      : '; the queues grow without bound, so the figures describe a transient and grow with --arrivals';
    return { stable: false, certificate: certificateRecord(c), note: describeCertificate(c, ctx.scenario.timeUnit) + tail };
  } catch (e) {
    if (e instanceof EdgewiseError) return { stable: null, certificate: null, note: `stability could not be decided: ${e.message}` };
    throw e;
  }
}

/** Why the exact column is left out before any evaluation, or null when it is to be computed. */
function exactRefused(input: SimulateInput, impatient: boolean, stable: boolean | null): string | null {
  if (input.policy !== 'fcfm') return 'exact values exist for FCFM only';
  if (impatient) return 'exact values assume patient items';
  if (stable === false) return 'the design is unstable';
  return null;
}

function exactOf(ctx: ScenarioContext, input: SimulateInput, impatient: boolean, stable: boolean | null, { exactColumn }: Analysis): ExactColumn {
  const refused = exactRefused(input, impatient, stable);
  if (refused !== null) return { reason: refused };
  return exactColumn(ctx.model.ids, ctx.model.rates, edgePairs(ctx.model), { maxSets: input.exactMaxSets, timeUnit: ctx.scenario.timeUnit });
}

const interval = (c: readonly [number, number] | null | undefined): [number, number] | null =>
  c && Number.isFinite(c[0]) && Number.isFinite(c[1]) ? [c[0], c[1]] : null;

const est = (e: Estimate, exact?: number): EstimateRecord => ({
  mean: finite(e.mean),
  ci95: Number.isFinite(e.mean) ? interval(e.ci95) : null,
  ...(exact === undefined || !Number.isFinite(exact) ? {} : { exact }),
});

function waitRec(w: WaitEstimate, exact?: number): WaitRecord {
  const q = w.quantileCi95.map(interval);
  return { ...est(w, exact), p50: finite(w.p50), p90: finite(w.p90), p99: finite(w.p99), p50Ci95: q[0] ?? null, p90Ci95: q[1] ?? null, p99Ci95: q[2] ?? null };
}

export async function simulateUseCase(ctx: ScenarioContext, input: SimulateInput): Promise<SimulateRecord> {
  const model = ctx.model;
  const patience = ctx.scenario.classes.map((c) => c.patience ?? Infinity);
  const impatient = patience.some((p) => Number.isFinite(p));
  // imported while the workers already simulate; this thread joins them once it has used these
  const modules = analysis();
  const options: SimulationOptions = {
    policy: input.policy,
    ...(input.ranking ? { priority: input.ranking } : {}),
    patience,
    ...(input.arrivals === undefined ? {} : { arrivals: input.arrivals }),
    ...(input.replications === undefined ? {} : { replications: input.replications }),
    ...(input.warmup === undefined ? {} : { warmup: input.warmup }),
    ...(input.seed === undefined ? {} : { seed: input.seed }),
    ...(input.maxWaiting === undefined ? {} : { maxWaiting: input.maxWaiting }),
    jobs: input.jobs,
    timed: input.timed === true,
    ...(input.onProgress ? { onProgress: input.onProgress } : {}),
    ...(input.signal ? { signal: input.signal } : {}),
    startAfter: modules,
  };
  // with workers, one of them computes the exact column first (it is refused below should the
  // design turn out unstable); the task is only posted when the column may be wanted
  let offThread: Promise<unknown> | undefined;
  const side: SimulationOptions['side'] =
    exactRefused(input, impatient, null) === null
      ? {
          task: { kind: 'exact', ids: model.ids, rates: model.rates, pairs: edgePairs(model), maxSets: input.exactMaxSets, timeUnit: ctx.scenario.timeUnit },
          accept: (result) => (offThread = result),
        }
      : undefined;
  // the replications start first: on worker threads (--jobs 2 and more), the stability verdict is
  // computed in this thread while they run instead of before them
  const running = simulate(model, side ? { ...options, side } : options);
  void running.catch(() => undefined); // awaited below, after the imports: not an unhandled rejection meanwhile
  let stability: SimulateRecord['stability'];
  let loaded: Analysis;
  let exact: ExactColumn | undefined;
  try {
    loaded = await modules;
    stability = stabilityOf(ctx, impatient, loaded);
    if (!offThread) exact = exactOf(ctx, input, impatient, stability.stable, loaded);
  } catch (e) {
    await running.catch(() => undefined);
    throw e;
  }
  const r = await running;
  if (!exact) {
    // the worker's column (the same function on the same model), unless refused; a run stopped
    // (SIGINT) before the worker finished it answers at once, without it
    const refused = exactRefused(input, impatient, stability.stable);
    const column = refused === null ? ((await offThread) as ExactColumn | undefined) : { reason: refused };
    exact = column ?? (r.partial ? { reason: 'the run was interrupted before the exact values were computed' } : exactOf(ctx, input, impatient, stability.stable, loaded));
  }
  const x = exact.exact;
  const ids = model.ids;
  const by = <T>(f: (k: number) => T): Record<string, T> => Object.fromEntries(ids.map((id, k) => [id, f(k)]));
  let immediateExact: number | undefined;
  if (x) {
    let s = 0;
    for (let k = 0; k < model.n; k++) s += model.rates[k]! * x.immediateMatch[k]!;
    immediateExact = s / model.totalRate;
  }
  const limits = limitsOfEstimates(ids, ctx.problem.maxAbandonment, r.abandonShare.byClass);
  const warnings = [demandNote(ctx), stability.note, r.partial ? `interrupted: ${r.replications} of ${r.planned} replications finished; the figures come from those` : null];
  return {
    ...recordBase(ctx, 'simulate', warnings),
    reference: ctx.reference,
    method: 'simulation',
    policy: r.policy,
    ranking: input.ranking ? [...input.ranking] : null,
    replications: r.replications,
    plannedReplications: r.planned,
    partial: r.partial,
    arrivals: r.arrivals,
    warmup: r.warmup,
    seed: r.seed,
    maxWaiting: r.maxWaiting,
    engine: r.engine,
    stability,
    exact: { available: x !== undefined, reason: exact.reason, independentSets: x ? x.independentSets : null },
    backlog: { total: est(r.backlog.total, x?.backlogTotal), byClass: by((k) => est(r.backlog.byClass[k]!, x?.backlog[k])) },
    wait: { total: waitRec(r.wait.total, x ? x.backlogTotal / model.totalRate : undefined), byClass: by((k) => waitRec(r.wait.byClass[k]!, x?.wait[k])) },
    matchedAtOnce: { total: est(r.immediateMatch.total, immediateExact), byClass: by((k) => est(r.immediateMatch.byClass[k]!, x?.immediateMatch[k])) },
    matchRates: r.matchRates.map((e, i) => ({ pair: pairIds(model, model.edgeA[i]!, model.edgeB[i]!), rate: est(e, x?.matchRates[i]) })),
    ...(limits ? { abandonmentLimits: limits } : {}),
    abandonment: {
      total: { rate: est(r.abandonRate.total), share: est(r.abandonShare.total) },
      byClass: by((k) => ({ patience: Number.isFinite(r.patience[k]!) ? r.patience[k]! : null, rate: est(r.abandonRate.byClass[k]!), share: est(r.abandonShare.byClass[k]!) })),
    },
    notes: [
      'ci95: 95 % Student t interval of the mean across replications',
      'wait percentiles pool the matched items of all replications (items matched at once count as 0, abandoned items are excluded); pXXCi95 are intervals of the per-replication percentiles',
    ],
  };
}
