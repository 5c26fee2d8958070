import { Worker } from 'node:worker_threads';
import { streamStates } from './random.js';
import type { ReplicationPlan, ReplicationRecord } from './record.js';
import { runReplication } from './replication.js';
import type { SimModel } from './sim-model.js';
import { reviveError, type FromWorker } from './worker-protocol.js';

export interface RunnerOptions {
  /** Worker threads to use at most (1 = run in this thread). */
  readonly jobs: number;
  /**
   * Worker script. Default: worker.js next to this module when it runs as compiled JavaScript;
   * when it runs from TypeScript sources (tests) there is no compiled worker and replications run in
   * this thread instead. `null` forces this thread.
   */
  readonly workerUrl?: URL | null;
  /** Called with the number of arrivals just simulated (warm-up included), from time to time. */
  readonly onProgress?: (arrivals: number) => void;
}

/** The default worker script, or null when running from sources. */
export function defaultWorkerUrl(): URL | null {
  return import.meta.url.endsWith('.js') ? new URL('./worker.js', import.meta.url) : null;
}

/**
 * Runs replications 0..count−1, each from its own stream (seed, index), and hands every record to
 * `sink` as it completes (in any order). At most `jobs` worker threads run at once; each receives
 * the model once and then one replication at a time.
 */
export async function runReplications(
  model: SimModel,
  plan: ReplicationPlan,
  seed: number,
  count: number,
  options: RunnerOptions,
  sink: (record: ReplicationRecord) => void,
): Promise<void> {
  const states = streamStates(seed, count);
  const url = options.workerUrl === undefined ? defaultWorkerUrl() : options.workerUrl;
  const jobs = Math.max(1, Math.min(Math.floor(options.jobs), count));
  if (url === null || jobs <= 1) {
    for (let i = 0; i < count; i++) {
      sink(runReplication(model, plan, i, states[i]!, options.onProgress));
      await new Promise<void>((r) => setImmediate(r)); // let timers (progress display) run
    }
    return;
  }
  await inWorkers(model, plan, states, jobs, url, options.onProgress, sink);
}

function inWorkers(
  model: SimModel,
  plan: ReplicationPlan,
  states: Uint32Array[],
  jobs: number,
  url: URL,
  onProgress: ((arrivals: number) => void) | undefined,
  sink: (record: ReplicationRecord) => void,
): Promise<void> {
  const count = states.length;
  const workers: Worker[] = [];
  let next = 0;
  let done = 0;
  let settled = false;
  return new Promise<void>((resolve, reject) => {
    const stopAll = (): void => {
      for (const w of workers) void w.terminate();
    };
    const fail = (e: Error): void => {
      if (settled) return;
      settled = true;
      stopAll();
      reject(e);
    };
    const feed = (w: Worker): void => {
      if (next < count) {
        const index = next++;
        w.postMessage({ index, state: states[index]! });
      }
    };
    for (let j = 0; j < jobs; j++) {
      const w = new Worker(url, { workerData: { model, plan } });
      workers.push(w);
      w.on('message', (msg: FromWorker) => {
        if (settled) return;
        if (msg.type === 'progress') onProgress?.(msg.arrivals);
        else if (msg.type === 'error') fail(reviveError(msg.error));
        else {
          try {
            sink(msg.record);
          } catch (e) {
            fail(e as Error);
            return;
          }
          done++;
          if (done === count) {
            settled = true;
            stopAll();
            resolve();
          } else feed(w);
        }
      });
      w.on('error', (e) => fail(e));
      w.on('exit', (code) => {
        if (!settled) fail(new Error(`a simulation worker stopped unexpectedly (exit code ${code})`));
      });
      feed(w);
    }
  });
}

/** Arrivals a whole run simulates (for progress totals). */
export function plannedArrivals(plan: ReplicationPlan, count: number): number {
  return (plan.warmup + plan.arrivals) * count;
}

