/**
 * Messages between the one worker pool (pool.ts) and its worker threads (worker.ts), and how typed
 * errors cross the thread boundary: structured cloning keeps only plain data, so an error travels
 * as its class name and fields and is rebuilt as the same class on the main side.
 */
import { EdgewiseError, InternalError, SolverError, TooLargeError, UsageError } from '../errors.js';
import type { ScoreSpec } from '../design/scoring/score.js';
import type { ScoreTask } from '../design/scoring/score-task.js';
import type { ReplicationPlan } from '../sim/record.js';
import type { SimModel } from '../sim/sim-model.js';

/** What a worker is set up with once (workerData, or the first message of a prestarted worker). */
export type WorkerInit =
  | {
      readonly kind: 'simulate';
      readonly model: SimModel;
      readonly plan: ReplicationPlan;
      /**
       * One flag per replication over a SharedArrayBuffer, when the main thread runs replications
       * too (runner.ts): a thread runs a replication only after setting its flag from 0 to 1.
       */
      readonly claims?: Int32Array;
    }
  | { readonly kind: 'score'; readonly spec: ScoreSpec };

export type WorkerKind = WorkerInit['kind'];

/** The workerData of a worker started before its pool (pool.ts: prestartWorkers). */
export interface DeferredInit {
  readonly kind: WorkerKind;
  readonly deferred: true;
}

/** One unit of work. */
export type WorkerTask =
  | { readonly kind: 'replication'; readonly index: number; readonly state: Uint32Array }
  /** A simulation worker's task besides its replications: the exact column (src/exact/column.ts). */
  | {
      readonly kind: 'exact';
      readonly ids: readonly string[];
      readonly rates: Float64Array;
      readonly pairs: ReadonlyArray<readonly [number, number]>;
      readonly maxSets: number;
      readonly timeUnit: string;
    }
  | { readonly kind: 'score'; readonly tasks: readonly ScoreTask[] };

/** A task, or (first message of a prestarted worker only) its WorkerInit. */
export type ToWorker = { readonly id: number; readonly task: WorkerTask } | { readonly init: WorkerInit };

export type FromWorker =
  | { readonly id: number; readonly type: 'progress'; readonly amount: number }
  | { readonly id: number; readonly type: 'done'; readonly result: unknown }
  | { readonly id: number; readonly type: 'error'; readonly error: SerialisedError };

export interface SerialisedError {
  readonly name: string;
  readonly message: string;
  readonly stack?: string;
  readonly count?: number;
  readonly limit?: number;
}

export function serialiseError(e: unknown): SerialisedError {
  if (e instanceof TooLargeError) return { name: e.name, message: e.message, count: e.count, limit: e.limit };
  if (e instanceof Error) return { name: e.name, message: e.message, ...(e.stack === undefined ? {} : { stack: e.stack }) };
  return { name: 'Error', message: String(e) };
}

/** The error to throw on the main side: typed errors keep their class, anything else is internal. */
export function reviveError(s: SerialisedError): Error {
  switch (s.name) {
    case 'TooLargeError':
      return new TooLargeError(s.message, s.count ?? Number.NaN, s.limit ?? Number.NaN);
    case 'SolverError':
      return new SolverError(s.message);
    case 'UsageError':
      return new UsageError(s.message);
    case 'InternalError':
      return new InternalError(s.message);
    case 'EdgewiseError':
      return new EdgewiseError(s.message);
    default: {
      const e = new Error(`${s.name} in a worker thread: ${s.message}`);
      if (s.stack) e.stack = s.stack;
      return e;
    }
  }
}
