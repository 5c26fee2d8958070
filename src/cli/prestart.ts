/**
 * Worker threads started before a command's modules load (src/workers/pool.ts: prestartWorkers), so
 * that they boot on the idle cores while this thread reads its modules and its file. Only where the
 * flags alone say that workers will run; the command checks the flags itself.
 */
import { availableParallelism } from 'node:os';

/**
 * Replications when --replications is not given: SIM_DEFAULTS.replications of src/sim/simulate.ts,
 * not imported here (that module loads the simulator); tests/cli/prestart.test.ts checks they agree.
 */
export const DEFAULT_REPLICATIONS = 8;

/**
 * `simulate`: min(--jobs, --replications) − 1 workers (this thread runs replications too:
 * src/sim/runner.ts), the defaults of the command where not given.
 */
export async function prestartSimulation(opts: { readonly jobs?: unknown; readonly replications?: unknown }): Promise<void> {
  const jobs = opts.jobs === undefined ? availableParallelism() : Number(opts.jobs);
  const replications = opts.replications === undefined ? DEFAULT_REPLICATIONS : Number(opts.replications);
  const count = Math.min(jobs, replications, 256) - 1;
  if (!Number.isSafeInteger(count) || count < 1) return;
  const { prestartWorkers } = await import('../workers/pool.js');
  prestartWorkers('simulate', count);
}

/**
 * `recommend --jobs N` (N ≥ 2): the N scoring workers of its pool (src/design/scoring/scorer.ts),
 * booting while this thread loads the command, reads the file and runs the MILP stage.
 */
export async function prestartScoring(opts: { readonly jobs?: unknown }): Promise<void> {
  const count = opts.jobs === undefined ? 1 : Math.min(Number(opts.jobs), 256);
  if (!Number.isSafeInteger(count) || count < 2) return;
  const { prestartWorkers } = await import('../workers/pool.js');
  prestartWorkers('score', count);
}
