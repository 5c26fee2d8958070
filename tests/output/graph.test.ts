import { describe, expect, it } from 'vitest';
import { toGraph } from '../../src/output/graph.js';
import { compileGraph } from '../../src/model/compile.js';
import { evaluateExact } from '../../src/exact/evaluate.js';

describe('toGraph (graphology export)', () => {
  // Triangle a, b, c with a self-compatible: stable by the definition (derived by hand: {b}: 1 < 3,
  // {c}: 1.5 < 3, {b,c} is not independent; a has a self-loop so sets containing it are not constrained).
  const model = compileGraph(['a', 'b', 'c'], [2, 1, 1.5], [[0, 0], [0, 1], [0, 2], [1, 2]]);
  const result = evaluateExact(model);
  const g = toGraph(model, result);

  it('has one node per class and one edge per compatibility, self-loops included', () => {
    expect(g.order).toBe(3);
    expect(g.size).toBe(4);
    expect(g.hasEdge('a', 'a')).toBe(true);
    expect(g.getNodeAttribute('a', 'selfCompatible')).toBe(true);
    expect(g.getNodeAttribute('b', 'selfCompatible')).toBe(false);
  });

  it('carries metrics whose match rates add up at each node to its arrival rate', () => {
    // Every item is matched once in steady state: Σ over a class's compatibilities of the match
    // rate (a self-loop counted twice, since it removes two items of the class) equals λ_k.
    g.forEachNode((node, attrs) => {
      let sum = 0;
      g.forEachEdge(node, (_e, ea, s, t) => {
        sum += (ea.matchRate ?? NaN) * (s === t ? 2 : 1);
      });
      expect(sum).toBeCloseTo(attrs.rate, 10);
      expect(attrs.wait).toBeCloseTo((attrs.backlog ?? NaN) / attrs.rate, 12);
    });
  });
});
