import { SolverError } from '../errors.js';
import { boundsOf, evaluate, magnitude, type LinearProgram } from './lp.js';

/** Default relative feasibility tolerance of the answer check. */
export const CHECK_TOLERANCE = 1e-7;
/** How far an integer variable may sit from the nearest integer. */
export const INTEGRALITY_TOLERANCE = 1e-6;

/**
 * The first way in which `values` fails the program (bounds, constraints, integrality, finiteness,
 * or a reported objective that does not match the values), or undefined when it satisfies all.
 * A constraint a·x (rel) b is met when its violation is at most tol · (1 + |b| + Σ|a_i x_i|).
 */
export function findViolation(lp: LinearProgram, values: ArrayLike<number>, objective: number, tol = CHECK_TOLERANCE): string | undefined {
  if (values.length !== lp.variables.length) return `expected ${lp.variables.length} values, got ${values.length}`;
  const label = (j: number): string => lp.variables[j]!.name ?? `x${j}`;
  for (let j = 0; j < lp.variables.length; j++) {
    const x = values[j]!;
    if (!Number.isFinite(x)) return `variable ${label(j)} is ${x}`;
    const v = lp.variables[j]!;
    const { lower, upper } = boundsOf(v);
    if (x < lower - tol * (1 + Math.abs(lower))) return `variable ${label(j)} = ${x} is below its lower bound ${lower}`;
    if (x > upper + tol * (1 + Math.abs(upper))) return `variable ${label(j)} = ${x} is above its upper bound ${upper}`;
    if ((v.kind === 'integer' || v.kind === 'binary') && Math.abs(x - Math.round(x)) > INTEGRALITY_TOLERANCE) {
      return `variable ${label(j)} = ${x} should be integral`;
    }
  }
  for (let i = 0; i < lp.constraints.length; i++) {
    const c = lp.constraints[i]!;
    const lhs = evaluate(c, values);
    const slackTol = tol * (1 + Math.abs(c.rhs) + magnitude(c, values));
    const over = lhs - c.rhs;
    const bad = c.relation === '<=' ? over > slackTol : c.relation === '>=' ? -over > slackTol : Math.abs(over) > slackTol;
    if (bad) return `constraint ${c.name ?? `#${i}`} is violated: ${lhs} ${c.relation} ${c.rhs} fails`;
  }
  const obj = evaluate(lp.objective, values);
  if (!(Math.abs(obj - objective) <= 1e-6 * (1 + Math.abs(obj) + magnitude(lp.objective, values)))) {
    return `reported objective ${objective} does not match the values (${obj})`;
  }
  return undefined;
}

/** Throws SolverError when `values` fails the program (see findViolation). */
export function assertFeasible(lp: LinearProgram, values: ArrayLike<number>, objective: number, solver: string, tol = CHECK_TOLERANCE): void {
  const why = findViolation(lp, values, objective, tol);
  if (why !== undefined) throw new SolverError(`${solver} returned a wrong solution: ${why}`);
}
