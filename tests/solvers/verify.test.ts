import { describe, expect, it } from 'vitest';
import { SolverError } from '../../src/errors.js';
import type { LinearProgram } from '../../src/solvers/lp.js';
import { solveWithJsLp } from '../../src/solvers/jslp.js';
import { assertFeasible, findViolation } from '../../src/solvers/verify.js';

// Derived by hand: max x + 2y, x + y ≤ 4, y ≤ 3 (y integer), x free ≥ −1 via bound → optimum 7 at (1, 3).
const lp: LinearProgram = {
  sense: 'max',
  objective: { variables: [0, 1], coefficients: [1, 2] },
  variables: [{ lower: -1 }, { kind: 'integer', upper: 3 }],
  constraints: [{ variables: [0, 1], coefficients: [1, 1], relation: '<=', rhs: 4 }],
};

describe('the answer check every adapter runs', () => {
  it('accepts the hand-derived optimum and the solver answer', () => {
    expect(findViolation(lp, [1, 3], 7)).toBeUndefined();
    const s = solveWithJsLp(lp);
    expect(s.objective).toBeCloseTo(7, 9);
    expect(findViolation(lp, s.values, s.objective)).toBeUndefined();
  });

  it('rejects corrupted solutions: constraint, bound, integrality, non-finite value, objective', () => {
    const s = solveWithJsLp(lp);
    const corrupt = (j: number, x: number): Float64Array => {
      const v = s.values.slice();
      v[j] = x;
      return v;
    };
    expect(findViolation(lp, corrupt(0, 2), 8)).toMatch(/constraint/); // 2 + 3 > 4
    expect(findViolation(lp, corrupt(0, -2), 4)).toMatch(/lower bound/);
    expect(findViolation(lp, [0.5, 2.5], 5.5)).toMatch(/integral/);
    expect(findViolation(lp, corrupt(1, NaN), 7)).toMatch(/NaN/);
    expect(findViolation(lp, s.values, 9)).toMatch(/objective/);
    expect(findViolation(lp, [1], 1)).toMatch(/expected 2 values/);
    expect(() => assertFeasible(lp, corrupt(0, 2), 8, 'test')).toThrow(SolverError);
  });

  it('tolerates rounding at the relative tolerance, not beyond', () => {
    expect(findViolation(lp, [1 + 1e-9, 3], 7 + 1e-9)).toBeUndefined();
    expect(findViolation(lp, [1 + 1e-5, 3], 7 + 1e-5)).toMatch(/constraint/);
  });
});
