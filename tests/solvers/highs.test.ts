import { describe, expect, it, vi } from 'vitest';
import { SolverError } from '../../src/errors.js';
import type { LinearProgram } from '../../src/solvers/lp.js';

// HiGHS is replaced by one that answers wrongly, to show the adapter never trusts an answer unchecked.
const answers: unknown[] = [];
const seen: Array<{ text: string; options: unknown }> = [];
vi.mock('highs', () => ({
  default: async () => ({
    solve: (text: string, options: unknown) => {
      seen.push({ text, options });
      return answers.shift();
    },
  }),
}));

const { solveWithHighs } = await import('../../src/solvers/highs.js');

// max x + y, x + y ≤ 2, x binary, y ≥ 0: optimum 2.
const lp: LinearProgram = {
  sense: 'max',
  objective: { variables: [0, 1], coefficients: [1, 1] },
  variables: [{ kind: 'binary' }, {}],
  constraints: [{ variables: [0, 1], coefficients: [1, 1], relation: '<=', rhs: 2 }],
};
const cols = (x: number, y: number) => ({ x0: { Primal: x }, x1: { Primal: y } });

describe('HiGHS adapter with a lying solver', () => {
  it('accepts a correct answer and passes the time limit through', async () => {
    answers.push({ Status: 'Optimal', ObjectiveValue: 2, Columns: cols(1, 1), Rows: [] });
    const s = await solveWithHighs(lp, { timeLimitSeconds: 3 });
    expect(s.objective).toBe(2);
    expect(seen.at(-1)!.options).toMatchObject({ time_limit: 3 });
  });
  it('throws SolverError on a point that breaks a row, integrality, or the reported objective', async () => {
    answers.push({ Status: 'Optimal', ObjectiveValue: 3, Columns: cols(1, 2), Rows: [] });
    await expect(solveWithHighs(lp)).rejects.toThrow(SolverError);
    answers.push({ Status: 'Optimal', ObjectiveValue: 2, Columns: cols(0.5, 1.5), Rows: [] });
    await expect(solveWithHighs(lp)).rejects.toThrow(/integral/);
    answers.push({ Status: 'Optimal', ObjectiveValue: 1, Columns: cols(1, 1), Rows: [] });
    await expect(solveWithHighs(lp)).rejects.toThrow(/objective/);
    answers.push({ Status: 'Optimal', ObjectiveValue: 2, Columns: { x0: { Primal: 1 } }, Rows: [] });
    await expect(solveWithHighs(lp)).rejects.toThrow(SolverError);
  });
  it('returns a checked incumbent when the time limit stops the search, and rejects a bad one', async () => {
    answers.push({ Status: 'Time limit reached', ObjectiveValue: 1.5, Columns: cols(0, 1.5), Rows: [] });
    const s = await solveWithHighs(lp);
    expect(s.status).toBe('limit');
    expect(s.objective).toBe(1.5);
    answers.push({ Status: 'Time limit reached', ObjectiveValue: 4, Columns: cols(1, 3), Rows: [] });
    await expect(solveWithHighs(lp)).rejects.toThrow(SolverError);
  });
  it('retries an ambiguous "infeasible or unbounded" without presolve, and maps statuses', async () => {
    answers.push({ Status: 'Primal infeasible or unbounded', ObjectiveValue: 0, Columns: {}, Rows: [] });
    answers.push({ Status: 'Unbounded', ObjectiveValue: 0, Columns: {}, Rows: [] });
    expect((await solveWithHighs(lp)).status).toBe('unbounded');
    expect(seen.at(-1)!.options).toMatchObject({ presolve: 'off' });
    answers.push({ Status: 'Infeasible', ObjectiveValue: 0, Columns: {}, Rows: [] });
    expect((await solveWithHighs(lp)).status).toBe('infeasible');
    answers.push({ Status: 'Solve error', ObjectiveValue: 0, Columns: {}, Rows: [] });
    const e = await solveWithHighs(lp);
    expect(e.status).toBe('error');
    expect(e.message).toBe('Solve error');
  });
});
