/** Checks of option values shared by several commands (each throws UsageError naming the flag). */
import { UsageError } from '../errors.js';
import { WAIT_UNITS } from '../output/format.js';

/** Checks a `--max-sets` value (absent is fine: the command's default applies). */
export function checkMaxSets(value: number | undefined): void {
  if (value !== undefined && !(Number.isSafeInteger(value) && value > 0)) {
    throw new UsageError(`--max-sets must be a positive integer, got ${value}`);
  }
}

/** `--wait-unit`: one of the time units edgewise converts. */
export function checkWaitUnit(value: string | undefined): void {
  if (value !== undefined && !WAIT_UNITS.includes(value.toLowerCase().replace(/s$/, ''))) {
    throw new UsageError(`--wait-unit must be one of ${WAIT_UNITS.join(', ')}, got ${JSON.stringify(value)}`);
  }
}

/** A whole number option ≥ min (`--jobs`, `--seed`, `--steps`…), given as text or number. */
export function wholeNumber(value: unknown, flag: string, min: number, fallback: number, max = Number.MAX_SAFE_INTEGER): number {
  if (value === undefined) return fallback;
  const text = typeof value === 'string' ? value.trim() : value;
  const n = typeof text === 'string' ? (text === '' || !/^[+-]?\d+$/.test(text) ? NaN : Number(text)) : Number(text);
  if (!(Number.isSafeInteger(n) && n >= min && n <= max)) {
    throw new UsageError(`${flag} must be a whole number${max < Number.MAX_SAFE_INTEGER ? ` from ${min} to ${max}` : ` >= ${min}`}, got ${JSON.stringify(value)}`);
  }
  return n;
}

/** A finite number option (`--budget`), given as text or number. */
export function finiteNumber(value: unknown, flag: string, min = -Infinity): number | undefined {
  if (value === undefined) return undefined;
  const text = typeof value === 'string' ? value.trim() : value;
  const n = text === '' ? NaN : Number(text);
  if (!(Number.isFinite(n) && n >= min)) throw new UsageError(`${flag} must be a number${min > -Infinity ? ` >= ${min}` : ''}, got ${JSON.stringify(value)}`);
  return n;
}

/** --score: exact | simulation | auto (default auto). */
export function scoreMethod(value: unknown): 'exact' | 'simulation' | 'auto' {
  if (value === undefined) return 'auto';
  if (value === 'exact' || value === 'simulation' || value === 'auto') return value;
  throw new UsageError(`--score must be one of exact, simulation, auto, got ${JSON.stringify(value)}`);
}

/** The scoring flags of the commands that score designs (sensitivity, sweep, compare, report). */
export interface ScoringFlags {
  readonly score?: string;
  readonly seed?: number | string;
  readonly maxSets?: number;
  readonly jobs?: number | string;
}

/**
 * `--score`, `--seed`, `--max-sets`, `--jobs` checked in one place (default auto, seed 1, jobs
 * `jobsDefault`): the scoring input of src/usecases/scoring.ts.
 */
export function scoringOptions(
  opts: ScoringFlags,
  jobsDefault = 1,
  jobsMax = 256,
): { score: 'exact' | 'simulation' | 'auto'; seed: number; jobs: number; maxSets?: number } {
  checkMaxSets(opts.maxSets);
  return {
    score: scoreMethod(opts.score),
    seed: wholeNumber(opts.seed, '--seed', 0, 1),
    jobs: wholeNumber(opts.jobs, '--jobs', 1, jobsDefault, jobsMax),
    ...(opts.maxSets === undefined ? {} : { maxSets: opts.maxSets }),
  };
}
