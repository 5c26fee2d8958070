import { InterruptedError, UsageError } from '../errors.js';
import type { CompiledModel } from '../model/compile.js';
import type { PolicyName } from './policy.js';
import { isPolicyName, POLICIES } from './policy.js';
import type { ReplicationPlan } from './record.js';
import { plannedArrivals, runReplications, type RunnerOptions } from './runner.js';
import { buildSimModel } from './sim-model.js';
import { ReplicationPool, scaledSummary, type ReplicationSummary } from './summary.js';
import { scaledModel } from '../model/rate-scale.js';

export const SIM_DEFAULTS = {
  arrivals: 2_000_000,
  replications: 8,
  seed: 1,
  maxWaiting: 5_000_000,
} as const;

export interface SimulationOptions {
  readonly policy?: PolicyName;
  /** Priority list of class ids, first = most preferred partner (policy "ranked" only). */
  readonly priority?: readonly string[];
  /** Mean patience per class (model order); 0, Infinity or NaN = patient. */
  readonly patience?: ArrayLike<number>;
  /** Measured arrivals per replication. Default 2 000 000. */
  readonly arrivals?: number;
  /** Arrivals discarded before measuring. Default: a tenth of `arrivals`. */
  readonly warmup?: number;
  /** Default 8. */
  readonly replications?: number;
  /** Non-negative safe integer. Default 1. */
  readonly seed?: number;
  /** Stop when more items wait at once (all classes). Default 5 000 000. */
  readonly maxWaiting?: number;
  /** Worker threads at most. Default 1 (this thread). */
  readonly jobs?: number;
  /** Force the timed engine for patient designs too (it is always used with impatience). */
  readonly timed?: boolean;
  /** Worker script override (see RunnerOptions.workerUrl). */
  readonly workerUrl?: URL | null;
  /** Called with (arrivals simulated so far, arrivals planned), warm-ups included. */
  readonly onProgress?: (done: number, total: number) => void;
  /** Stops the run: the result then holds the replications finished (`partial`). */
  readonly signal?: AbortSignal;
  /** This thread joins the replications once this settles (see RunnerOptions.startAfter). */
  readonly startAfter?: Promise<unknown>;
  /** A worker's task besides the replications (see RunnerOptions.side). */
  readonly side?: RunnerOptions['side'];
}

export interface SimulationResult extends ReplicationSummary {
  readonly policy: PolicyName;
  /** Measured arrivals per replication. */
  readonly arrivals: number;
  readonly warmup: number;
  readonly seed: number;
  readonly maxWaiting: number;
  /** "arrival-chain" for patient designs (Poisson clock integrated out), "timed" otherwise. */
  readonly engine: 'arrival-chain' | 'timed';
  /** Mean patience used per class (Infinity = patient). */
  readonly patience: Float64Array;
  /** True when the run was stopped before every replication finished (`replications` says how many did). */
  readonly partial: boolean;
  /** Replications asked for. */
  readonly planned: number;
}

function positiveInt(name: string, v: number | undefined, fallback: number, min = 1): number {
  const x = v ?? fallback;
  if (!Number.isSafeInteger(x) || x < min) throw new UsageError(`${name} must be an integer >= ${min}, found ${String(v)}`);
  return x;
}

/** Checks the options and fills in the defaults (throws UsageError). */
export function resolveSimulation(model: CompiledModel, options: SimulationOptions) {
  const policy = options.policy ?? 'fcfm';
  if (!isPolicyName(policy)) throw new UsageError(`unknown policy "${String(policy)}" (choose one of ${POLICIES.join(', ')})`);
  let priority: number[] | undefined;
  if (options.priority !== undefined) {
    if (policy !== 'ranked') throw new UsageError('a ranking only applies with the ranked policy');
    priority = options.priority.map((id) => {
      const k = model.index.get(id);
      if (k === undefined) throw new UsageError(`unknown class "${id}" in the ranking (known: ${model.ids.slice(0, 8).join(', ')}${model.n > 8 ? ', …' : ''})`);
      return k;
    });
    if (new Set(priority).size !== priority.length) throw new UsageError('the ranking names a class twice');
  } else if (policy === 'ranked') {
    throw new UsageError('the ranked policy needs a ranking (first = most preferred partner class)');
  }
  const arrivals = positiveInt('arrivals', options.arrivals, SIM_DEFAULTS.arrivals);
  const warmup = positiveInt('warmup', options.warmup, Math.floor(arrivals / 10), 0);
  const replications = positiveInt('replications', options.replications, SIM_DEFAULTS.replications);
  const seed = positiveInt('seed', options.seed, SIM_DEFAULTS.seed, 0);
  const maxWaiting = positiveInt('max-waiting', options.maxWaiting, SIM_DEFAULTS.maxWaiting);
  const jobs = positiveInt('jobs', options.jobs, 1);
  if (options.patience && options.patience.length !== model.n) throw new UsageError('patience must give one value per class');
  const patience = Float64Array.from({ length: model.n }, (_, k) => {
    const p = options.patience?.[k];
    return p !== undefined && p > 0 && Number.isFinite(p) ? p : Infinity;
  });
  const sim = buildSimModel(model, { policy, ...(priority ? { priority } : {}), patience });
  const plan: ReplicationPlan = { arrivals, warmup, maxWaiting, timed: options.timed === true };
  return { policy, sim, plan, replications, seed, jobs, patience };
}

/**
 * Simulates the design under a matching policy: independent replications, each from its own
 * random stream (seed, index), run on up to `jobs` worker threads; returns means and 95 % intervals
 * across replications. The result depends on the seed only, never on `jobs`.
 *
 * Throws UsageError for bad options and TooLargeError when a queue outgrows `maxWaiting`.
 */
export async function simulate(original: CompiledModel, options: SimulationOptions = {}): Promise<SimulationResult> {
  // rates divided by a power of two near their mean: time runs `scale` times slower in the
  // simulation, so patience is multiplied and times divided / rates multiplied on the way back
  const { working: model, scale } = scaledModel(original);
  const scaledOptions = scale === 1 || !options.patience ? options : { ...options, patience: Array.from(options.patience, (p) => p * scale) };
  const { policy, sim, plan, replications, seed, jobs, patience } = resolveSimulation(model, scaledOptions);
  const pool = new ReplicationPool(model.n, model.m, model.totalRate, replications);
  const total = plannedArrivals(plan, replications);
  let simulated = 0;
  const onProgress = options.onProgress;
  const done = await runReplications(
    sim,
    plan,
    seed,
    replications,
    {
      jobs,
      ...(options.signal ? { signal: options.signal } : {}),
      ...(options.startAfter ? { startAfter: options.startAfter } : {}),
      ...(options.side ? { side: options.side } : {}),
      ...(options.workerUrl === undefined ? {} : { workerUrl: options.workerUrl }),
      ...(onProgress
        ? {
            onProgress: (a: number) => {
              simulated += a;
              onProgress(simulated, total);
            },
          }
        : {}),
    },
    (record) => pool.add(record),
  );
  if (done === 0) throw new InterruptedError('interrupted before any replication finished');
  return {
    ...scaledSummary(pool.summary(done < replications), scale),
    partial: done < replications,
    planned: replications,
    policy,
    arrivals: plan.arrivals,
    warmup: plan.warmup,
    seed,
    maxWaiting: plan.maxWaiting,
    engine: plan.timed || sim.impatient ? 'timed' : 'arrival-chain',
    patience: scale === 1 ? patience : patience.map((p) => p / scale),
  };
}
