/**
 * Adapter for the npm package `javascript-lp-solver` (pure JavaScript simplex with branch-and-cut,
 * synchronous). Every variable is rewritten over non-negative solver variables (x = l + y,
 * x = u − y, or x = y⁺ − y⁻ when free) so that the solver's own handling of free variables is never
 * relied on; finite upper bounds become rows. Every answer is checked against the original program
 * before it is returned (src/solvers/verify.ts).
 */
import * as jslpModule from 'javascript-lp-solver';
import { SolverError } from '../errors.js';
import { boundsOf, emptySolution, type LinearProgram, type LpSolution, type SolveOptions } from './lp.js';
import { assertFeasible } from './verify.js';

const NAME = 'javascript-lp-solver';

type JsSolver = { Solve(model: unknown, precision?: number): unknown };

/** The solver object, whichever way the module system hands it over (ESM default or CommonJS). */
const jslp: JsSolver = (() => {
  const ns = jslpModule as unknown as Record<string, unknown>;
  const inner = ns.default as Record<string, unknown> | undefined;
  for (const pick of [() => inner, () => inner?.default, () => ns]) {
    const c = pick();
    if (c && typeof (c as JsSolver).Solve === 'function') return c as JsSolver;
  }
  throw new SolverError(`${NAME} could not be loaded (no Solve function)`);
})();
const OBJ = '_objective';

interface Mapping {
  /** x_j = offset[j] + Σ sign · y[name]. */
  readonly offset: Float64Array;
  readonly parts: ReadonlyArray<ReadonlyArray<readonly [string, number]>>;
}

type JsModel = {
  optimize: string;
  opType: 'max' | 'min';
  constraints: Record<string, { min?: number; max?: number; equal?: number }>;
  variables: Record<string, Record<string, number>>;
  ints: Record<string, 1>;
  binaries: Record<string, 1>;
  timeout?: number;
  tolerance?: number;
};

function translate(lp: LinearProgram, options: SolveOptions): { model: JsModel; map: Mapping; constant: number } | { infeasible: string } {
  const variables: Record<string, Record<string, number>> = {};
  const constraints: JsModel['constraints'] = {};
  const ints: Record<string, 1> = {};
  const binaries: Record<string, 1> = {};
  const offset = new Float64Array(lp.variables.length);
  const parts: Array<Array<[string, number]>> = [];
  lp.variables.forEach((v, j) => {
    let { lower, upper } = boundsOf(v);
    const integral = v.kind === 'integer' || v.kind === 'binary';
    if (integral) {
      lower = Math.ceil(lower);
      upper = Math.floor(upper);
    }
    if (lower > upper) return;
    const mine: Array<[string, number]> = [];
    const add = (sign: number): string => {
      const name = `y${j}_${mine.length}`;
      variables[name] = { [OBJ]: 0 };
      mine.push([name, sign]);
      if (v.kind === 'binary') binaries[name] = 1;
      else if (integral) ints[name] = 1;
      return name;
    };
    if (Number.isFinite(lower)) {
      offset[j] = lower;
      const y = add(1);
      if (Number.isFinite(upper) && v.kind !== 'binary') {
        constraints[`u${j}`] = { max: upper - lower };
        variables[y]![`u${j}`] = 1;
      }
    } else if (Number.isFinite(upper)) {
      offset[j] = upper;
      add(-1);
    } else {
      add(1);
      add(-1);
    }
    parts[j] = mine;
  });
  for (let j = 0; j < lp.variables.length; j++) {
    if (parts[j] === undefined) return { infeasible: `variable ${lp.variables[j]!.name ?? `x${j}`} has empty bounds` };
  }
  let constant = 0;
  for (let i = 0; i < lp.objective.variables.length; i++) {
    const j = lp.objective.variables[i]!;
    const a = lp.objective.coefficients[i]!;
    constant += a * offset[j]!;
    for (const [name, sign] of parts[j]!) variables[name]![OBJ] = (variables[name]![OBJ] ?? 0) + a * sign;
  }
  for (let r = 0; r < lp.constraints.length; r++) {
    const c = lp.constraints[r]!;
    const key = `c${r}`;
    let rhs = c.rhs;
    let terms = 0;
    for (let i = 0; i < c.variables.length; i++) {
      const j = c.variables[i]!;
      const a = c.coefficients[i]!;
      if (a === 0) continue;
      rhs -= a * offset[j]!;
      for (const [name, sign] of parts[j]!) variables[name]![key] = (variables[name]![key] ?? 0) + a * sign;
      terms++;
    }
    if (terms === 0) {
      const ok = c.relation === '<=' ? 0 <= rhs : c.relation === '>=' ? 0 >= rhs : rhs === 0;
      if (!ok) return { infeasible: `constraint ${c.name ?? `#${r}`} has no terms and cannot hold` };
      continue;
    }
    constraints[key] = c.relation === '<=' ? { max: rhs } : c.relation === '>=' ? { min: rhs } : { equal: rhs };
  }
  const model: JsModel = { optimize: OBJ, opType: lp.sense, constraints, variables, ints, binaries };
  if (options.timeLimitSeconds !== undefined) model.timeout = Math.max(1, Math.round(options.timeLimitSeconds * 1000));
  if (options.mipRelativeGap !== undefined) model.tolerance = options.mipRelativeGap;
  return { model, map: { offset, parts }, constant };
}

/** Solves with javascript-lp-solver (synchronous) and checks the answer; throws SolverError on a wrong one. */
export function solveWithJsLp(lp: LinearProgram, options: SolveOptions = {}): LpSolution {
  const t = translate(lp, options);
  if ('infeasible' in t) return emptySolution(lp, 'infeasible', NAME, NaN, t.infeasible);
  let raw: Record<string, unknown>;
  try {
    raw = jslp.Solve(t.model) as Record<string, unknown>;
  } catch (e) {
    return emptySolution(lp, 'error', NAME, NaN, (e as Error).message);
  }
  if (raw.feasible !== true) return emptySolution(lp, 'infeasible', NAME);
  if (raw.bounded === false) return emptySolution(lp, 'unbounded', NAME, lp.sense === 'max' ? Infinity : -Infinity);
  const values = new Float64Array(lp.variables.length);
  for (let j = 0; j < lp.variables.length; j++) {
    let x = t.map.offset[j]!;
    for (const [name, sign] of t.map.parts[j]!) {
      const y = raw[name];
      if (y !== undefined && typeof y !== 'number') throw new SolverError(`${NAME} returned a non-numeric value for ${name}`);
      x += sign * (y ?? 0);
    }
    values[j] = x;
  }
  const objective = (typeof raw.result === 'number' ? raw.result : NaN) + t.constant;
  assertFeasible(lp, values, objective, NAME, options.checkTolerance);
  return { status: 'optimal', objective, values, solver: NAME };
}
