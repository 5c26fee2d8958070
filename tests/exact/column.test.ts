import { describe, expect, it } from 'vitest';
import { exactColumn } from '../../src/exact/column.js';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { compileGraph } from '../../src/model/compile.js';
import { cyclePairs } from '../../src/model/generators.js';

const ring = (n: number) => {
  const ids = Array.from({ length: n }, (_, k) => `c${k}`);
  return { ids, rates: ids.map(() => 1), pairs: cyclePairs(n) };
};

describe("simulate's exact column (src/exact/column.ts)", () => {
  it('is the exact evaluation of the design when it can be made', () => {
    const { ids, rates, pairs } = ring(7);
    const column = exactColumn(ids, rates, pairs, {});
    expect(column.reason).toBeNull();
    expect(column.exact!.backlogTotal).toBe(evaluateExact(compileGraph(ids, rates, pairs)).backlogTotal);
  });

  it('gives the refusals for size without the advice to simulate, which the evaluation alone keeps', () => {
    // past the memory guard: the odd 25-cycle has 167,761 independent sets
    const big = ring(25);
    const sets = exactColumn(big.ids, big.rates, big.pairs, { maxSets: 1000 });
    expect(sets.exact).toBeUndefined();
    expect(sets.reason).toMatch(/more than 1,000 independent sets.*raise --max-sets if memory allows$/);
    expect(() => evaluateExact(compileGraph(big.ids, big.rates, big.pairs), { maxSets: 1000 })).toThrow(/or estimate with `edgewise simulate`/);
    // past the size of a connected group (64 classes)
    const wide = ring(65);
    const group = exactColumn(wide.ids, wide.rates, wide.pairs, {});
    expect(group.reason).toMatch(/a connected group of 65 classes is beyond exact evaluation \(at most 64 per group\)$/);
    expect(() => evaluateExact(compileGraph(wide.ids, wide.rates, wide.pairs))).toThrow(/estimate it with `edgewise simulate`/);
  });
});
