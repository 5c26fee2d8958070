/**
 * The one pool of worker threads, serving simulation replications and design scoring alike. A pool
 * is set up for one job (WorkerInit: the simulation model and plan, or the scoring spec), starts at
 * most `jobs` workers lazily, hands each task to an idle worker (queueing the rest; with `depth` > 1,
 * up to `depth` tasks wait in a worker's own queue, for callers that keep this thread busy), and resolves
 * every task's promise with its result. Callers put results back in input order themselves, so
 * nothing they compute depends on which worker finishes first.
 *
 * Workers run the compiled module worker.js beside this one: dist/workers/worker.js for the library,
 * dist/cli/worker.js in the bundled command line (scripts/bundle-cli.mjs puts the worker's bundle
 * next to the chunk that holds this module). When this module runs from the TypeScript
 * sources (vitest, tsx) there is no compiled worker next to it: `workerUrl()` is undefined and the
 * callers run the same code in the calling thread instead.
 *
 * `close()` terminates the workers; tasks still pending then reject with PoolClosedError, which is
 * how an interrupted run stops its workers at once.
 *
 * A command that knows early that it will want workers (`simulate --jobs 2`, before it has read its
 * file) may start them with `prestartWorkers`: they boot Node and load their modules on the idle
 * cores while this thread is still starting, and a pool of the same kind later adopts them and sends
 * them its WorkerInit as their first message. Until then they do not keep the process alive.
 */
import { Worker } from 'node:worker_threads';
import { reviveError, type FromWorker, type ToWorker, type WorkerInit, type WorkerKind, type WorkerTask } from './protocol.js';

/** Workers started ahead of their pool (see the header), not yet adopted. */
const prestarted: Array<{ readonly href: string; readonly kind: WorkerKind; readonly worker: Worker; exited: boolean }> = [];

/**
 * Starts `count` workers of `kind` now, for a pool created later in this thread (see the header).
 * Without a compiled worker (running from sources) it does nothing.
 */
export function prestartWorkers(kind: WorkerKind, count: number, url: URL | undefined = workerUrl()): void {
  if (!url) return;
  for (let i = 0; i < count; i++) {
    const worker = new Worker(url, { workerData: { kind, deferred: true } });
    const entry = { href: url.href, kind, worker, exited: false };
    worker.unref();
    worker.once('error', () => undefined); // a failure shows when a pool adopts it: it has exited
    worker.once('exit', () => {
      entry.exited = true;
    });
    prestarted.push(entry);
  }
}

/** Prestarted workers still waiting for a pool (for tests). */
export function pendingPrestarted(): number {
  return prestarted.filter((p) => !p.exited).length;
}

/** Takes a prestarted worker of this script and kind, if one is still running. */
function adoptPrestarted(url: URL, kind: WorkerKind): Worker | undefined {
  const i = prestarted.findIndex((p) => p.href === url.href && p.kind === kind && !p.exited);
  if (i < 0) return undefined;
  const [entry] = prestarted.splice(i, 1);
  entry!.worker.ref();
  return entry!.worker;
}

/** URL of the compiled worker next to this module, or undefined when running from TypeScript sources. */
export function workerUrl(): URL | undefined {
  return import.meta.url.endsWith('.js') ? new URL('./worker.js', import.meta.url) : undefined;
}

/** A task rejected because the pool was closed before it finished. */
export class PoolClosedError extends Error {
  constructor() {
    super('the worker pool was closed');
  }
}

interface Pending {
  readonly task: WorkerTask;
  readonly transfer: ArrayBuffer[];
  readonly onProgress: ((amount: number) => void) | undefined;
  readonly resolve: (v: unknown) => void;
  readonly reject: (e: Error) => void;
}

export class WorkerPool {
  private readonly workers: Worker[] = [];
  /** Tasks posted to each worker and not answered yet. */
  private readonly inFlight = new Map<Worker, number>();
  private readonly queue: Array<Pending & { readonly id: number }> = [];
  private readonly running = new Map<number, Pending & { readonly worker: Worker }>();
  private nextId = 0;
  private failure: Error | undefined;
  private closed = false;

  constructor(
    private readonly init: WorkerInit,
    readonly jobs: number,
    private readonly url: URL,
    private readonly depth = 1,
  ) {}

  /** Runs one task on a worker; `onProgress` receives the progress the task reports. */
  run<R>(task: WorkerTask, onProgress?: (amount: number) => void, transfer: ArrayBuffer[] = []): Promise<R> {
    if (this.failure) return Promise.reject(this.failure);
    if (this.closed) return Promise.reject(new PoolClosedError());
    return new Promise<R>((resolve, reject) => {
      this.queue.push({ id: this.nextId++, task, transfer, onProgress, resolve: resolve as (v: unknown) => void, reject });
      this.dispatch();
    });
  }

  private dispatch(): void {
    while (this.queue.length > 0) {
      const w = this.pick();
      if (!w) return;
      const p = this.queue.shift()!;
      this.running.set(p.id, { ...p, worker: w });
      this.inFlight.set(w, (this.inFlight.get(w) ?? 0) + 1);
      const msg: ToWorker = { id: p.id, task: p.task };
      w.postMessage(msg, p.transfer);
    }
  }

  /** An idle worker, else a new one, else the least loaded one with fewer than `depth` tasks. */
  private pick(): Worker | undefined {
    let best: Worker | undefined;
    let load = Infinity;
    for (const w of this.workers) {
      const n = this.inFlight.get(w) ?? 0;
      if (n < load) {
        best = w;
        load = n;
      }
    }
    if (best && load === 0) return best;
    if (this.workers.length < this.jobs) return this.spawn();
    return best && load < this.depth ? best : undefined;
  }

  private spawn(): Worker {
    const early = adoptPrestarted(this.url, this.init.kind);
    const w = early ?? new Worker(this.url, { workerData: this.init });
    if (early) w.postMessage({ init: this.init } satisfies ToWorker);
    w.on('message', (m: FromWorker) => {
      const p = this.running.get(m.id);
      if (!p) return;
      if (m.type === 'progress') {
        p.onProgress?.(m.amount);
        return;
      }
      this.running.delete(m.id);
      this.inFlight.set(w, this.inFlight.get(w)! - 1);
      if (m.type === 'error') p.reject(reviveError(m.error));
      else p.resolve(m.result);
      this.dispatch();
    });
    w.on('error', (e) => this.fail(new Error(`a worker thread failed: ${e.message}`)));
    w.on('exit', (code) => {
      if (!this.closed && code !== 0) this.fail(new Error(`a worker thread stopped with code ${code}`));
    });
    this.workers.push(w);
    return w;
  }

  private fail(e: Error): void {
    this.failure ??= e;
    for (const p of this.running.values()) p.reject(this.failure);
    for (const p of this.queue) p.reject(this.failure);
    this.running.clear();
    this.queue.length = 0;
  }

  /** Stops every worker; pending tasks reject with PoolClosedError. Always call it. */
  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    const err = new PoolClosedError();
    for (const p of this.running.values()) p.reject(err);
    for (const p of this.queue) p.reject(err);
    this.running.clear();
    this.queue.length = 0;
    const all = this.workers.splice(0);
    this.inFlight.clear();
    await Promise.all(all.map((w) => w.terminate()));
  }
}

export interface PoolOptions {
  /** Tasks a worker may hold at once (1: only idle workers get tasks). */
  readonly depth?: number;
  /** The calling thread works too: `jobs` counts it, so the pool has jobs − 1 workers. */
  readonly withThisThread?: boolean;
}

/**
 * A pool for `jobs` parallel tasks, or undefined when the work should run in the calling thread
 * (jobs ≤ 1, or no compiled worker: running from sources). `url` overrides the worker script (tests).
 */
export function createPool(init: WorkerInit, jobs: number, url: URL | null | undefined = workerUrl(), options: PoolOptions = {}): WorkerPool | undefined {
  const j = Math.max(1, Math.floor(jobs));
  if (j <= 1 || url === null || url === undefined) return undefined;
  return new WorkerPool(init, options.withThisThread ? j - 1 : j, url, Math.max(1, Math.floor(options.depth ?? 1)));
}
