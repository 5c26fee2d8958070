import { describe, expect, it } from 'vitest';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { bruteStability } from '../helpers/brute-stability.js';
import { toModel, type Design } from '../helpers/designs.js';
import { maxRelativeDifference } from '../helpers/metrics.js';
import { permutationOracle } from '../helpers/permutation-oracle.js';
import { truncatedChain } from '../helpers/truncated-chain.js';

// Reference: the FCFM continuous-time chain on words, built from the dynamics alone, truncated at length K and
// solved with ml-matrix (a general-purpose linear-algebra library from npm, LU decomposition); see
// tests/helpers/truncated-chain.ts. As K grows the truncated chain's metrics must approach the exact
// ones: the error at a larger K is smaller, and below a tolerance at the largest K. The same chain also
// checks the product form that the permutation oracle rests on (self-loops and two components included).

interface ChainCase {
  readonly label: string;
  readonly design: Design;
  /** Increasing truncation lengths (state counts stay in the hundreds to ~1000 for a dense solve). */
  readonly ks: readonly number[];
  /** Relative tolerance at the largest K. */
  readonly tol: number;
}

const CASES: readonly ChainCase[] = [
  {
    label: 'two light classes sharing two self-looped hubs (K4 minus an edge)',
    design: { ids: ['a', 'b', 'c', 'd'], rates: [0.06, 0.06, 0.44, 0.44], pairs: [[0, 2], [0, 3], [1, 2], [1, 3], [2, 3], [2, 2], [3, 3]] },
    ks: [4, 6, 8],
    tol: 1e-5,
  },
  {
    label: 'triangle without self-loops',
    design: { ids: ['a', 'b', 'c'], rates: [0.25, 0.35, 0.4], pairs: [[0, 1], [1, 2], [2, 0]] },
    ks: [10, 30, 60],
    tol: 1e-8,
  },
  {
    label: 'path of 4 with self-looped ends',
    design: { ids: ['a', 'b', 'c', 'd'], rates: [0.3, 0.2, 0.2, 0.3], pairs: [[0, 1], [1, 2], [2, 3], [0, 0], [3, 3]] },
    ks: [6, 12, 24],
    tol: 1e-7,
  },
  {
    label: 'triangle plus a lone self-looped class (two components)',
    design: { ids: ['a', 'b', 'c', 'd'], rates: [0.3, 0.3, 0.3, 0.5], pairs: [[0, 1], [1, 2], [0, 2], [3, 3]] },
    ks: [8, 16, 24],
    tol: 1e-5,
  },
];

describe('truncated word chain (ml-matrix) converges to the exact metrics', () => {
  it.each(CASES)('$label', ({ design, ks, tol }) => {
    const model = toModel(design);
    expect(bruteStability(model).stable).toBe(true);
    const exact = evaluateExact(model);
    const oracle = permutationOracle(model);
    const errors: number[] = [];
    const oracleErrors: number[] = [];
    for (const K of ks) {
      const chain = truncatedChain(model, K);
      errors.push(maxRelativeDifference(chain, exact, 1e-12).value);
      oracleErrors.push(maxRelativeDifference(chain, oracle, 1e-12).value);
    }
    for (let i = 1; i < ks.length; i++) {
      expect(errors[i], `K=${ks[i]} vs K=${ks[i - 1]}: ${errors.join(', ')}`).toBeLessThan(errors[i - 1]!);
      expect(oracleErrors[i]).toBeLessThan(oracleErrors[i - 1]!);
    }
    expect(errors[errors.length - 1], `errors ${errors.join(', ')}`).toBeLessThan(tol);
    expect(oracleErrors[oracleErrors.length - 1]).toBeLessThan(tol);
    // The truncation must matter at the smallest K, or the test would show nothing.
    expect(errors[0]).toBeGreaterThan(10 * tol);
  });
});
