import { EdgewiseError, TooLargeError } from '../errors.js';
import type { ReplicationRecord } from './record.js';

/** Messages between the runner and its worker threads. */
export interface ToWorker {
  readonly index: number;
  readonly state: Uint32Array;
}

export type FromWorker =
  | { readonly type: 'progress'; readonly arrivals: number }
  | { readonly type: 'done'; readonly record: ReplicationRecord }
  | { readonly type: 'error'; readonly error: SerialisedError };

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

/** Rebuilds the error thrown in a worker (typed errors keep their class). */
export function reviveError(s: SerialisedError): Error {
  if (s.name === 'TooLargeError') return new TooLargeError(s.message, s.count ?? NaN, s.limit ?? NaN);
  if (s.name === 'EdgewiseError') return new EdgewiseError(s.message);
  const e = new Error(`${s.name} in a simulation worker: ${s.message}`);
  if (s.stack) e.stack = s.stack;
  return e;
}
