import { describe, expect, it } from 'vitest';
import type { LinearProgram, LpVariable } from '../../src/solvers/lp.js';
import { solveWithHighs } from '../../src/solvers/highs.js';
import { solveWithJsLp } from '../../src/solvers/jslp.js';
import { findViolation } from '../../src/solvers/verify.js';
import { Rng } from '../helpers/random.js';

const both = async (lp: LinearProgram) => [solveWithJsLp(lp), await solveWithHighs(lp)] as const;
const lin = (variables: number[], coefficients: number[]) => ({ variables, coefficients });

describe('solver adapters (javascript-lp-solver, HiGHS)', () => {
  it('solve a hand-derived LP: max 3x + 2y, x + y ≤ 4, x + 3y ≤ 6, x ≤ 3 → 11 at (3, 1)', async () => {
    // Derived by hand: the vertices are (0,0) 0, (3,0) 9, (3,1) 11, (0,2) 4 (x + y = 4 and x + 3y = 6 meet at (3,1)).
    const lp: LinearProgram = {
      sense: 'max',
      objective: lin([0, 1], [3, 2]),
      variables: [{ upper: 3 }, {}],
      constraints: [
        { ...lin([0, 1], [1, 1]), relation: '<=', rhs: 4 },
        { ...lin([0, 1], [1, 3]), relation: '<=', rhs: 6 },
      ],
    };
    for (const s of await both(lp)) {
      expect(s.status).toBe('optimal');
      expect(s.objective).toBeCloseTo(11, 9);
      expect(s.values[0]).toBeCloseTo(3, 9);
      expect(s.values[1]).toBeCloseTo(1, 9);
    }
  });

  it('handle free variables, negative and upper-only bounds, equalities', async () => {
    // Derived by hand: min x + y with x free, y ∈ (−∞, 2], x − y = 1, x ≥ −5 ⇒ x = y + 1, objective 2y + 1 with
    // y ≥ −6 (from x ≥ −5): optimum −11 at (−5, −6).
    const lp: LinearProgram = {
      sense: 'min',
      objective: lin([0, 1], [1, 1]),
      variables: [{ lower: -Infinity }, { lower: -Infinity, upper: 2 }],
      constraints: [
        { ...lin([0, 1], [1, -1]), relation: '=', rhs: 1 },
        { ...lin([0], [1]), relation: '>=', rhs: -5 },
      ],
    };
    for (const s of await both(lp)) {
      expect(s.status).toBe('optimal');
      expect(s.objective).toBeCloseTo(-11, 9);
      expect(s.values[0]).toBeCloseTo(-5, 9);
      expect(s.values[1]).toBeCloseTo(-6, 9);
    }
  });

  it('solve a small 0/1 knapsack and an integer program exactly', async () => {
    // Derived by hand: values (10, 13, 7, 8), weights (3, 4, 2, 3), capacity 7. Feasible pairs: {0,1} w7 v23,
    // {0,2} 17, {0,3} 18, {1,2} 20, {1,3} 21, {2,3} 15; no triple fits except {0,2,?} (w ≥ 8): optimum 23.
    const knap: LinearProgram = {
      sense: 'max',
      objective: lin([0, 1, 2, 3], [10, 13, 7, 8]),
      variables: Array.from({ length: 4 }, (): LpVariable => ({ kind: 'binary' })),
      constraints: [{ ...lin([0, 1, 2, 3], [3, 4, 2, 3]), relation: '<=', rhs: 7 }],
    };
    for (const s of await both(knap)) {
      expect(s.status).toBe('optimal');
      expect(s.objective).toBeCloseTo(23, 9);
      expect(Array.from(s.values, Math.round)).toEqual([1, 1, 0, 0]);
    }
    // Derived by hand: max x + y, 2x + 2y ≤ 7, x, y integer ≥ 0: the LP bound 3.5 rounds down to 3.
    const ip: LinearProgram = {
      sense: 'max',
      objective: lin([0, 1], [1, 1]),
      variables: [{ kind: 'integer' }, { kind: 'integer' }],
      constraints: [{ ...lin([0, 1], [2, 2]), relation: '<=', rhs: 7 }],
    };
    const [a, b] = await both(ip);
    expect(a.objective).toBeCloseTo(3, 9);
    expect(b.objective).toBeCloseTo(3, 9);
    expect((await solveWithHighs(ip, { timeLimitSeconds: 5, mipRelativeGap: 0 })).objective).toBeCloseTo(3, 9);
  });

  it('handle 80 binaries (long rows wrap in the LP text)', async () => {
    // Derived by hand: max Σ (i+1)·x_i over 80 binaries with Σ x_i ≤ 10 takes the ten largest weights,
    // 71 + 72 + … + 80 = 10 · (71 + 80) / 2 = 755.
    const n = 80;
    const all = [...Array(n).keys()];
    const lp: LinearProgram = {
      sense: 'max',
      objective: lin(all, all.map((i) => i + 1)),
      variables: all.map((): LpVariable => ({ kind: 'binary' })),
      constraints: [{ ...lin(all, all.map(() => 1)), relation: '<=', rhs: 10 }],
    };
    for (const s of await both(lp)) {
      expect(s.status).toBe('optimal');
      expect(s.objective).toBeCloseTo(755, 9);
    }
  });

  it('report infeasible and unbounded programs', async () => {
    const infeasible: LinearProgram = {
      sense: 'max',
      objective: lin([0], [1]),
      variables: [{}],
      constraints: [{ ...lin([0], [1]), relation: '<=', rhs: -1 }],
    };
    const unbounded: LinearProgram = { sense: 'max', objective: lin([0, 1], [1, -1]), variables: [{}, { upper: 1 }], constraints: [] };
    for (const s of await both(infeasible)) expect(s.status).toBe('infeasible');
    for (const s of await both(unbounded)) {
      expect(s.status).toBe('unbounded');
      expect(s.objective).toBe(Infinity);
    }
  });

  it('agree with each other on random bounded LPs and MILPs (two independent solvers as oracles)', async () => {
    const rng = new Rng(31);
    for (let trial = 0; trial < 60; trial++) {
      const nv = rng.int(2, 7);
      const variables: LpVariable[] = Array.from({ length: nv }, () =>
        rng.chance(0.3) ? { kind: 'integer', upper: rng.int(1, 6) } : rng.chance(0.2) ? { lower: -rng.uniform(0, 3), upper: rng.uniform(1, 5) } : { upper: rng.uniform(1, 10) },
      );
      const constraints = Array.from({ length: rng.int(1, 6) }, () => {
        const vs = [...Array(nv).keys()].filter(() => rng.chance(0.7));
        return { ...lin(vs, vs.map(() => rng.uniform(-1, 3))), relation: '<=' as const, rhs: rng.uniform(1, 10) };
      });
      const lp: LinearProgram = { sense: rng.chance(0.5) ? 'max' : 'min', objective: lin([...Array(nv).keys()], Array.from({ length: nv }, () => rng.uniform(-2, 2))), variables, constraints };
      const [a, b] = await both(lp);
      // x = 0 is feasible (every rhs > 0, every lower bound ≤ 0) and every variable is bounded: both must reach the optimum
      expect(a.status).toBe('optimal');
      expect(b.status).toBe('optimal');
      {
        expect(a.objective).toBeCloseTo(b.objective, 6);
        expect(findViolation(lp, a.values, a.objective)).toBeUndefined();
        expect(findViolation(lp, b.values, b.objective)).toBeUndefined();
      }
    }
  });
});
