/**
 * Parallel scoring of designs on the one worker pool (src/workers/pool.ts). Results always come
 * back in the order of the input, whatever order the workers finish in, so the search that consumes
 * them never depends on timing (`--jobs 1` and `--jobs 2` give the same output). Work comes as tasks
 * (score-task.ts): single designs travel in chunks; the flips of a base design (scored by reuse)
 * travel alone, dispatched first since they are the longest units.
 *
 * When there is no compiled worker (running from the TypeScript sources) or jobs = 1, scoring runs
 * in the calling thread (same code, same numbers).
 */
import { createPool, PoolClosedError, workerUrl, type WorkerPool } from '../../workers/pool.js';
import type { Score, ScoreSpec } from './score.js';
import { runTask, type ScoreTask } from './score-task.js';

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

/**
 * Thrown by a scorer when its signal is aborted (SIGINT): the search stops and returns what it has
 * scored so far.
 */
export class SearchStopped extends Error {
  constructor() {
    super('the search was stopped');
  }
}

/** Milliseconds of scoring in the calling thread between two looks at the signal. */
const SLICE_MS = 50;

/** How many designs go into one message: enough to amortise messaging, small enough to balance. */
function chunkSize(count: number, jobs: number): number {
  return Math.max(1, Math.min(32, Math.ceil(count / (jobs * 4))));
}

function chunks<T>(items: readonly T[], size: number): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < items.length; i += size) out.push(items.slice(i, i + size));
  return out;
}

/**
 * Scoring in the calling thread. With a signal, the work is cut into slices of about 50 ms with a
 * turn of the event loop between them, so that SIGINT is seen; the order of the work, and so every
 * result, is the same.
 */
export function inThreadScorer(spec: ScoreSpec, jobs = 1, signal?: AbortSignal): Scorer {
  const scoreTasks = async (tasks: readonly ScoreTask[]): Promise<Score[][]> => {
    const out: Score[][] = [];
    let t0 = performance.now();
    for (const t of tasks) {
      if (signal?.aborted) throw new SearchStopped();
      out.push(runTask(spec, t));
      if (signal && performance.now() - t0 > SLICE_MS) {
        await new Promise<void>((r) => setImmediate(r));
        t0 = performance.now();
      }
    }
    return out;
  };
  return {
    mode: 'in-thread',
    jobs,
    score: async (designs) => (await scoreTasks(designs.map((design) => ({ design })))).map((s) => s[0]!),
    scoreTasks,
    close: async () => undefined,
  };
}

class PoolScorer implements Scorer {
  readonly mode = 'workers' as const;
  constructor(
    private readonly pool: WorkerPool,
    readonly jobs: number,
    private readonly signal?: AbortSignal,
  ) {
    signal?.addEventListener('abort', () => void pool.close(), { once: true });
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
    if (this.signal?.aborted) throw new SearchStopped();
    const out: Score[][] = new Array<Score[]>(tasks.length);
    try {
      await Promise.all(
        parts.map(async (part) => {
          const scores = await this.pool.run<Score[][]>({ kind: 'score', tasks: part.map((i) => tasks[i]!) });
          part.forEach((i, q) => (out[i] = scores[q]!));
        }),
      );
    } catch (e) {
      if (e instanceof PoolClosedError && this.signal?.aborted) throw new SearchStopped();
      throw e;
    }
    return out;
  }

  close(): Promise<void> {
    return this.pool.close();
  }
}

/** URL of the compiled worker, or undefined when running from TypeScript sources. */
export const workerScriptUrl = workerUrl;

/**
 * A scorer for `jobs` parallel batches: worker threads when jobs > 1 and the compiled worker exists
 * (or `url` is given), the calling thread otherwise.
 */
export function createScorer(spec: ScoreSpec, jobs: number, url: URL | undefined = workerUrl(), signal?: AbortSignal): Scorer {
  const j = Math.max(1, Math.floor(jobs));
  const pool = createPool({ kind: 'score', spec }, j, url);
  return pool ? new PoolScorer(pool, j, signal) : inThreadScorer(spec, j, signal);
}
