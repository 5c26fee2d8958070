import { createPool, workerUrl } from '../workers/pool.js';
import type { WorkerTask } from '../workers/protocol.js';
import { streamStates } from './random.js';
import type { ReplicationPlan, ReplicationRecord } from './record.js';
import type { SimModel } from './sim-model.js';

export interface RunnerOptions {
  /** Threads to use at most, this one included (1 = this thread only; 2 = this one and a worker). */
  readonly jobs: number;
  /**
   * Worker script. Default: the one worker pool's script next to the compiled modules
   * (src/workers/pool.ts); when running from TypeScript sources (tests) there is none and
   * replications run in this thread instead. `null` forces this thread.
   */
  readonly workerUrl?: URL | null;
  /** Called with the number of arrivals just simulated (warm-up included), from time to time. */
  readonly onProgress?: (arrivals: number) => void;
  /** Stops the run: replications not finished are dropped, the promise resolves with those done. */
  readonly signal?: AbortSignal;
  /**
   * This thread starts its own replications once this settles (rejected or not), the workers
   * already running: the caller's work in this thread (modules to import, the exact column) then
   * overlaps theirs. Without it, this thread starts as soon as the replication modules are loaded.
   */
  readonly startAfter?: Promise<unknown>;
  /**
   * A task for a worker besides the replications (`simulate`'s exact column), posted before them:
   * the worker runs it while this thread starts on its own replications, which balances the
   * threads' work. `accept` is called once, before this function first waits, with the task's
   * result to come (undefined should the task fail or the run be stopped), or with undefined when
   * there are no workers: the caller then does the work itself.
   */
  readonly side?: { readonly task: WorkerTask; readonly accept: (result: Promise<unknown> | undefined) => void };
}

/**
 * The replication modules and the caller's `startAfter`. Imported here, after the workers have
 * their work, not at start-up: this thread loads them while the workers simulate, and the event
 * loop is free meanwhile (a module graph needs a turn of it per level, one per replication once
 * this thread simulates).
 */
async function ownStart(options: RunnerOptions): Promise<typeof import('./replication.js').runReplication> {
  const [{ runReplication }] = await Promise.all([import('./replication.js'), options.startAfter?.catch(() => undefined)]);
  return runReplication;
}

/** The default worker script, or null when running from sources. */
export function defaultWorkerUrl(): URL | null {
  return workerUrl() ?? null;
}

/**
 * Runs replications 0..count−1, each from its own stream (seed, index), and hands every record to
 * `sink` as it completes (in any order). With `jobs` ≥ 2 this thread and jobs − 1 worker threads
 * of the worker pool share them: the workers receive the model once and the replications in index
 * order (all posted at once), this thread takes them from the last one down, and a thread runs a replication only
 * after claiming it in a shared array of flags (a worker answers null for one this thread took).
 * No thread waits for a message to start its next replication, and this thread's own start-up
 * work needs no worker of its own. Returns how many replications finished (fewer than `count`
 * only when `signal` stopped the run).
 */
export async function runReplications(
  model: SimModel,
  plan: ReplicationPlan,
  seed: number,
  count: number,
  options: RunnerOptions,
  sink: (record: ReplicationRecord) => void,
): Promise<number> {
  const states = streamStates(seed, count);
  const url = options.workerUrl === undefined ? defaultWorkerUrl() : options.workerUrl;
  const jobs = Math.max(1, Math.min(Math.floor(options.jobs), count));
  const signal = options.signal;
  const claims = new Int32Array(new SharedArrayBuffer(4 * count));
  const pool = createPool({ kind: 'simulate', model, plan, claims }, jobs, url, { withThisThread: true, depth: count });
  const side = pool && options.side ? pool.run(options.side.task).catch(() => undefined) : undefined;
  options.side?.accept(side);
  if (!pool) {
    const runReplication = await ownStart(options);
    let done = 0;
    for (let i = 0; i < count && !signal?.aborted; i++) {
      sink(runReplication(model, plan, i, states[i]!, options.onProgress));
      done++;
      await new Promise<void>((r) => setImmediate(r)); // let timers (progress display, signals) run
    }
    return done;
  }
  let done = 0;
  const stop = (): void => void pool.close();
  signal?.addEventListener('abort', stop, { once: true });
  let failed = false;
  try {
    const workers = Promise.all(
      states.map((state, index) =>
        pool.run<ReplicationRecord | null>({ kind: 'replication', index, state }, options.onProgress).then((record) => {
          if (record === null) return; // this thread ran it
          sink(record);
          done++;
        }),
      ),
    );
    workers.catch(() => (failed = true)); // seen between this thread's replications; rethrown below
    const runReplication = await ownStart(options);
    for (let i = count - 1; i >= 0 && !failed && !signal?.aborted; i--) {
      if (Atomics.compareExchange(claims, i, 0, 1) !== 0) continue;
      sink(runReplication(model, plan, i, states[i]!, options.onProgress));
      done++;
      await new Promise<void>((r) => setImmediate(r)); // worker messages, timers, signals
    }
    await workers;
    await side; // before the pool closes
  } catch (e) {
    if (!signal?.aborted) throw e;
  } finally {
    signal?.removeEventListener('abort', stop);
    await pool.close();
  }
  return done;
}

/** Arrivals a whole run simulates (for progress totals). */
export function plannedArrivals(plan: ReplicationPlan, count: number): number {
  return (plan.warmup + plan.arrivals) * count;
}

