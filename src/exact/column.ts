/**
 * The exact FCFM figures `simulate` prints beside its estimates, or why there are none (the
 * message of the typed error the evaluation stopped with: too large, unstable, too close to the
 * boundary). One function for this thread and for a simulation worker (src/workers/worker.ts),
 * which computes it alongside the replications under `--jobs 2` and more.
 */
import { EdgewiseError } from '../errors.js';
import { compileGraph } from '../model/compile.js';
import { evaluateExact, type ExactOptions } from './evaluate.js';
import type { ExactResult } from './result.js';

export interface ExactColumn {
  readonly exact?: ExactResult;
  readonly reason: string | null;
}

export function exactColumn(ids: readonly string[], rates: ArrayLike<number>, pairs: ReadonlyArray<readonly [number, number]>, options: ExactOptions): ExactColumn {
  try {
    // beside a simulation, a refusal's advice to simulate instead would be beside the point
    return { exact: evaluateExact(compileGraph(ids, rates, pairs), { ...options, adviseSimulation: false }), reason: null };
  } catch (e) {
    if (e instanceof EdgewiseError) return { reason: e.message };
    throw e;
  }
}
