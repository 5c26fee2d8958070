/**
 * Adapter for the npm package `highs` (the HiGHS solver compiled to WebAssembly). Loading is
 * asynchronous and done once (the instance is cached; a solver crash drops the cache so the next call
 * reloads); each solve is synchronous inside. Supports integer and binary variables and a time limit
 * (for the MILPs of the design layer). Every returned point is checked against the program
 * (src/solvers/verify.ts) before it is trusted.
 */
import type { Highs } from 'highs';
import { SolverError } from '../errors.js';
import { emptySolution, type LinearProgram, type LpSolution, type SolveOptions } from './lp.js';
import { toLpFormat } from './lp-format.js';
import { assertFeasible } from './verify.js';

const NAME = 'HiGHS';

let instance: Promise<Highs> | undefined;

/** The cached HiGHS instance (loaded on first use). */
export function loadHighs(): Promise<Highs> {
  if (!instance) {
    instance = import('highs').then((m) => {
      // ESM default export or CommonJS module object, depending on how the package is resolved
      const ns = m as unknown as Record<string, unknown>;
      const inner = ns.default as Record<string, unknown> | undefined;
      const load = [ns.default, inner?.default].find((c) => typeof c === 'function') as (() => Promise<Highs>) | undefined;
      if (!load) throw new SolverError(`${NAME} could not be loaded (no loader function)`);
      return load();
    });
    instance.catch(() => {
      instance = undefined;
    });
  }
  return instance;
}

type RawSolution = ReturnType<Highs['solve']>;
type HighsOptions = Parameters<Highs['solve']>[1];

function readValues(lp: LinearProgram, raw: RawSolution): Float64Array | undefined {
  const values = new Float64Array(lp.variables.length);
  for (let j = 0; j < lp.variables.length; j++) {
    const col = raw.Columns[`x${j}`] as { Primal?: number } | undefined;
    if (!col || typeof col.Primal !== 'number') return undefined;
    values[j] = col.Primal;
  }
  return values;
}

/** Solves with HiGHS and checks the answer; throws SolverError when the answer is wrong. */
export async function solveWithHighs(lp: LinearProgram, options: SolveOptions = {}): Promise<LpSolution> {
  const highs = await loadHighs();
  const text = toLpFormat(lp);
  const base: Record<string, unknown> = {};
  if (options.timeLimitSeconds !== undefined) base.time_limit = options.timeLimitSeconds;
  if (options.mipRelativeGap !== undefined) base.mip_rel_gap = options.mipRelativeGap;
  const run = (extra: Record<string, unknown>): RawSolution => {
    try {
      return highs.solve(text, { ...base, ...extra } as HighsOptions);
    } catch (e) {
      instance = undefined; // a failed WebAssembly instance is not reused
      throw new SolverError(`${NAME} failed: ${(e as Error).message}`);
    }
  };
  let raw = run({});
  if (raw.Status === 'Primal infeasible or unbounded') raw = run({ presolve: 'off' });
  switch (raw.Status) {
    case 'Optimal': {
      const values = readValues(lp, raw);
      if (!values) throw new SolverError(`${NAME} reported an optimum without values`);
      assertFeasible(lp, values, raw.ObjectiveValue, NAME, options.checkTolerance);
      return { status: 'optimal', objective: raw.ObjectiveValue, values, solver: NAME };
    }
    case 'Infeasible':
      return emptySolution(lp, 'infeasible', NAME);
    case 'Unbounded':
      return emptySolution(lp, 'unbounded', NAME, lp.sense === 'max' ? Infinity : -Infinity);
    case 'Time limit reached':
    case 'Iteration limit reached': {
      const values = readValues(lp, raw);
      if (values && values.every(Number.isFinite)) {
        assertFeasible(lp, values, raw.ObjectiveValue, NAME, options.checkTolerance);
        return { status: 'limit', objective: raw.ObjectiveValue, values, solver: NAME, message: raw.Status };
      }
      return emptySolution(lp, 'limit', NAME, NaN, raw.Status);
    }
    default:
      return emptySolution(lp, 'error', NAME, NaN, raw.Status);
  }
}
