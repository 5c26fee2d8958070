/**
 * Messages between the scoring pool and its worker threads, and how typed errors cross the thread
 * boundary (structured cloning keeps only plain data, so errors are rebuilt on the main side).
 */
import { EdgewiseError, SolverError, TooLargeError } from '../errors.js';
import type { Score } from './score.js';
import type { ScoreTask } from './score-task.js';

export interface WorkerRequest {
  readonly id: number;
  readonly tasks: readonly ScoreTask[];
}

export interface SerializedError {
  readonly name: string;
  readonly message: string;
  readonly count?: number;
  readonly limit?: number;
}

/** scores[t]: the scores of tasks[t], in order. */
export type WorkerReply = { readonly id: number; readonly scores: Score[][] } | { readonly id: number; readonly error: SerializedError };

export function serializeError(e: unknown): SerializedError {
  if (e instanceof TooLargeError) return { name: e.name, message: e.message, count: e.count, limit: e.limit };
  if (e instanceof Error) return { name: e.name, message: e.stack ?? e.message };
  return { name: 'Error', message: String(e) };
}

/** The error to throw on the main side. */
export function rebuildError(s: SerializedError): Error {
  if (s.name === 'TooLargeError') return new TooLargeError(s.message, s.count ?? Infinity, s.limit ?? 0);
  if (s.name === 'SolverError') return new SolverError(s.message);
  if (s.name === 'EdgewiseError') return new EdgewiseError(s.message);
  return new Error(`scoring worker failed: ${s.message}`);
}
