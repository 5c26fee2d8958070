import { describe, expect, it, vi } from 'vitest';
import { SolverError } from '../../src/errors.js';
import type { LinearProgram } from '../../src/solvers/lp.js';

// The solver is replaced by one that answers wrongly, to show the adapter never trusts an answer unchecked.
const answers: Array<Record<string, unknown>> = [];
vi.mock('javascript-lp-solver', () => ({ default: { Solve: () => answers.shift() } }));

const { solveWithJsLp } = await import('../../src/solvers/jslp.js');

// max x, x ≤ 2 (x ≥ 0): optimum 2. The adapter names the solver variable of x "y0_0".
const lp: LinearProgram = {
  sense: 'max',
  objective: { variables: [0], coefficients: [1] },
  variables: [{}],
  constraints: [{ variables: [0], coefficients: [1], relation: '<=', rhs: 2 }],
};

describe('javascript-lp-solver adapter with a lying solver', () => {
  it('accepts a correct answer', () => {
    answers.push({ feasible: true, bounded: true, result: 2, y0_0: 2 });
    expect(solveWithJsLp(lp).objective).toBe(2);
  });
  it('throws SolverError on an infeasible point, a wrong objective or a non-numeric value', () => {
    answers.push({ feasible: true, bounded: true, result: 5, y0_0: 5 });
    expect(() => solveWithJsLp(lp)).toThrow(SolverError);
    answers.push({ feasible: true, bounded: true, result: 3, y0_0: 2 });
    expect(() => solveWithJsLp(lp)).toThrow(/objective/);
    answers.push({ feasible: true, bounded: true, result: 2, y0_0: 'two' });
    expect(() => solveWithJsLp(lp)).toThrow(SolverError);
  });
  it('maps infeasible and unbounded answers', () => {
    answers.push({ feasible: false, bounded: true, result: 0 });
    expect(solveWithJsLp(lp).status).toBe('infeasible');
    answers.push({ feasible: true, bounded: false, result: Infinity });
    expect(solveWithJsLp(lp).status).toBe('unbounded');
  });
});
