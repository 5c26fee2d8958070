/**
 * Parallel scoring of designs on worker threads, with the number of batches in flight bounded by
 * p-limit. Results always come back in the order of the input, whatever order the workers finish
 * in, so the search that consumes them never depends on timing (`--jobs 1` and `--jobs 2` give the
 * same output). Work comes as tasks (score-task.ts): single designs travel in chunks; the flips of
 * a base design (scored by reuse) travel alone, dispatched first since they are the longest units.
 *
 * Workers run the compiled module dist/design/score-worker.js. When this module runs from the
 * TypeScript sources (vitest, tsx) there is no compiled worker next to it; scoring then runs in the
 * calling thread (same code, same numbers), and so it does for `jobs` = 1.
 */
import { Worker } from 'node:worker_threads';
import pLimit from 'p-limit';
import type { Score, ScoreSpec } from './score.js';
import { runTask, type ScoreTask } from './score-task.js';
import { rebuildError, type WorkerReply, type WorkerRequest } from './worker-protocol.js';

export interface Scorer {
  /** 'workers' when worker threads do the scoring, 'in-thread' otherwise. */
  readonly mode: 'workers' | 'in-thread';
  readonly jobs: number;
  /** Scores of the designs, in input order. */
  score(designs: readonly Uint8Array[]): Promise<Score[]>;
  /** Scores of each task (one per design, one per flip), in input order. */
  scoreTasks(tasks: readonly ScoreTask[]): Promise<Score[][]>;
  /** Stops the workers (always call it, or the process stays alive). */
  close(): Promise<void>;
}

/** URL of the compiled worker next to this module, or undefined when running from TypeScript sources. */
export function workerScriptUrl(): URL | undefined {
  return import.meta.url.endsWith('.js') ? new URL('./score-worker.js', import.meta.url) : undefined;
}

/** How many designs go into one message: enough to amortise messaging, small enough to balance. */
function chunkSize(count: number, jobs: number): number {
  return Math.max(1, Math.min(32, Math.ceil(count / (jobs * 4))));
}

function chunks<T>(items: readonly T[], size: number): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < items.length; i += size) out.push(items.slice(i, i + size));
  return out;
}

/** Scoring in the calling thread. */
export function inThreadScorer(spec: ScoreSpec, jobs = 1): Scorer {
  return {
    mode: 'in-thread',
    jobs,
    score: async (designs) => designs.map((design) => runTask(spec, { design })[0]!),
    scoreTasks: async (tasks) => tasks.map((t) => runTask(spec, t)),
    close: async () => undefined,
  };
}

class WorkerScorer implements Scorer {
  readonly mode = 'workers' as const;
  private readonly workers: Worker[] = [];
  private readonly idle: Worker[] = [];
  private readonly pending = new Map<number, { resolve: (s: Score[][]) => void; reject: (e: Error) => void }>();
  private readonly limit: ReturnType<typeof pLimit>;
  private nextId = 0;
  private failure: Error | undefined;

  constructor(
    private readonly spec: ScoreSpec,
    readonly jobs: number,
    private readonly url: URL,
  ) {
    this.limit = pLimit(jobs);
  }

  private spawn(): Worker {
    const w = new Worker(this.url, { workerData: this.spec });
    w.on('message', (reply: WorkerReply) => {
      const p = this.pending.get(reply.id);
      if (!p) return;
      this.pending.delete(reply.id);
      if ('error' in reply) p.reject(rebuildError(reply.error));
      else p.resolve(reply.scores);
    });
    const fail = (e: Error): void => {
      this.failure ??= e;
      for (const p of this.pending.values()) p.reject(e);
      this.pending.clear();
    };
    w.on('error', (e) => fail(new Error(`scoring worker failed: ${e.message}`)));
    w.on('exit', (code) => {
      if (code !== 0) fail(new Error(`scoring worker stopped with code ${code}`));
    });
    this.workers.push(w);
    return w;
  }

  private run(batch: ScoreTask[]): Promise<Score[][]> {
    if (this.failure) return Promise.reject(this.failure);
    const w = this.idle.pop() ?? this.spawn();
    const id = this.nextId++;
    return new Promise<Score[][]>((resolve, reject) => {
      this.pending.set(id, { resolve, reject });
      const msg: WorkerRequest = { id, tasks: batch };
      w.postMessage(msg);
    }).finally(() => {
      this.idle.push(w);
    });
  }

  async score(designs: readonly Uint8Array[]): Promise<Score[]> {
    const scores = await this.scoreTasks(designs.map((design) => ({ design })));
    return scores.map((s) => s[0]!);
  }

  async scoreTasks(tasks: readonly ScoreTask[]): Promise<Score[][]> {
    if (tasks.length === 0) return [];
    const flips: number[] = [];
    const singles: number[] = [];
    tasks.forEach((t, i) => ('design' in t ? singles : flips).push(i));
    const parts = [...flips.map((i) => [i]), ...chunks(singles, chunkSize(singles.length, this.jobs))];
    const out: Score[][] = new Array<Score[]>(tasks.length);
    await Promise.all(
      parts.map((part) =>
        this.limit(async () => {
          const scores = await this.run(part.map((i) => tasks[i]!));
          part.forEach((i, q) => (out[i] = scores[q]!));
        }),
      ),
    );
    return out;
  }

  async close(): Promise<void> {
    const all = this.workers.splice(0);
    this.idle.length = 0;
    await Promise.all(all.map((w) => w.terminate()));
  }
}

/**
 * A scorer for `jobs` parallel batches: worker threads when jobs > 1 and the compiled worker exists
 * (or `workerUrl` is given), the calling thread otherwise.
 */
export function createScorer(spec: ScoreSpec, jobs: number, workerUrl: URL | undefined = workerScriptUrl()): Scorer {
  const j = Math.max(1, Math.floor(jobs));
  if (j === 1 || workerUrl === undefined) return inThreadScorer(spec, j);
  return new WorkerScorer(spec, j, workerUrl);
}
