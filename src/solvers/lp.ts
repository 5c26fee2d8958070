/**
 * A small, solver-neutral description of a linear (or mixed-integer) program. Adapters in this
 * folder translate it for one solver each and check every answer against it (src/solvers/verify.ts).
 */

/** How a variable may take values. */
export type VariableKind = 'continuous' | 'integer' | 'binary';

export interface LpVariable {
  /** For messages only; the adapters use their own names. */
  readonly name?: string;
  /** Lower bound; default 0. Use -Infinity for a free variable. */
  readonly lower?: number;
  /** Upper bound; default +Infinity. */
  readonly upper?: number;
  /** Default 'continuous'. A binary variable has bounds [0, 1] whatever lower/upper say. */
  readonly kind?: VariableKind;
}

/** A sparse linear expression: Σ coefficients[i] · x[variables[i]]. */
export interface LinearExpression {
  readonly variables: ArrayLike<number>;
  readonly coefficients: ArrayLike<number>;
}

export type Relation = '<=' | '>=' | '=';

export interface LpConstraint extends LinearExpression {
  readonly name?: string;
  readonly relation: Relation;
  readonly rhs: number;
}

export interface LinearProgram {
  readonly sense: 'max' | 'min';
  readonly objective: LinearExpression;
  readonly variables: readonly LpVariable[];
  readonly constraints: readonly LpConstraint[];
}

/**
 * What an adapter returns. `optimal`: proved optimal; `infeasible`; `unbounded`; `limit`: a time or
 * iteration limit stopped the solver (values hold the best feasible point found, or NaN when none);
 * `error`: the solver failed (see message). Values are NaN when the status carries no solution.
 */
export type LpStatus = 'optimal' | 'infeasible' | 'unbounded' | 'limit' | 'error';

export interface LpSolution {
  readonly status: LpStatus;
  /** Objective value (NaN when there is no solution; ±Infinity when unbounded). */
  readonly objective: number;
  /** One value per variable, in the program's order. */
  readonly values: Float64Array;
  /** Solver name and, for 'error' or 'limit', what happened. */
  readonly solver: string;
  readonly message?: string;
}

/** Options understood by every adapter (each ignores what it cannot honour, documented there). */
export interface SolveOptions {
  /** Wall-clock limit for one solve, in seconds. */
  readonly timeLimitSeconds?: number;
  /** Relative MIP gap at which branch-and-bound may stop (MILPs only). */
  readonly mipRelativeGap?: number;
  /** Feasibility tolerance of the answer check (relative, default 1e-7). */
  readonly checkTolerance?: number;
}

/** Effective bounds of variable j (binary ⇒ [0, 1]). */
export function boundsOf(v: LpVariable): { lower: number; upper: number } {
  if (v.kind === 'binary') return { lower: 0, upper: 1 };
  return { lower: v.lower ?? 0, upper: v.upper ?? Infinity };
}

/** Value of a linear expression at x. */
export function evaluate(expr: LinearExpression, x: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < expr.variables.length; i++) s += expr.coefficients[i]! * x[expr.variables[i]!]!;
  return s;
}

/** Σ |a_i x_i|: the magnitude against which rounding in an expression is judged. */
export function magnitude(expr: LinearExpression, x: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < expr.variables.length; i++) s += Math.abs(expr.coefficients[i]! * x[expr.variables[i]!]!);
  return s;
}

/** True when some variable must be integral. */
export function isMixedInteger(lp: LinearProgram): boolean {
  return lp.variables.some((v) => v.kind === 'integer' || v.kind === 'binary');
}

/** A solution without values. */
export function emptySolution(lp: LinearProgram, status: LpStatus, solver: string, objective = NaN, message?: string): LpSolution {
  return { status, objective, values: new Float64Array(lp.variables.length).fill(NaN), solver, ...(message === undefined ? {} : { message }) };
}
