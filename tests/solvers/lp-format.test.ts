import { describe, expect, it } from 'vitest';
import { toLpFormat } from '../../src/solvers/lp-format.js';

const lin = (variables: number[], coefficients: number[]) => ({ variables, coefficients });

describe('LP text writer (input of the HiGHS adapter)', () => {
  it('writes the CPLEX LP text format with every column named in the objective', () => {
    // Expected text derived by hand from the format's sections (objective, Subject To, Bounds, General, Binary, End).
    const text = toLpFormat({
      sense: 'min',
      objective: lin([1], [-2.5]),
      variables: [{ lower: -Infinity }, { lower: 1, upper: 4, kind: 'integer' }, { kind: 'binary' }],
      constraints: [{ ...lin([0, 2], [1, -1e-7]), relation: '>=', rhs: 3 }],
    });
    expect(text).toBe(
      ['Minimize', ' obj: - 2.5 x1 + 0 x0 + 0 x2', 'Subject To', ' c0: + 1 x0 - 1e-7 x2 >= 3', 'Bounds', ' x0 free', ' 1 <= x1 <= 4', 'General', ' x1', 'Binary', ' x2', 'End', ''].join('\n'),
    );
  });
});
