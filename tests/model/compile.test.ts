import { describe, expect, it } from 'vitest';
import { compileGraph } from '../../src/model/compile.js';
import { Rng } from '../helpers/random.js';

// The compiled adjacency (src/model/compile.ts) against its definition: neighbours of k ascending,
// adjEdge[p] the edge joining k and adj[p]. Checked on a hub with many neighbours given in a shuffled
// order (the long-list path of the sort) and on small random graphs.

function expectAdjacency(n: number, pairs: Array<[number, number]>): void {
  const m = compileGraph(Array.from({ length: n }, (_, k) => `c${k}`), new Array(n).fill(1), pairs);
  for (let k = 0; k < n; k++) {
    const want = pairs.flatMap(([a, b], e) => (a === b ? [] : a === k ? [[b, e]] : b === k ? [[a, e]] : [])).sort((x, y) => x[0]! - y[0]!);
    const got = Array.from({ length: m.adjStart[k + 1]! - m.adjStart[k]! }, (_, i) => [m.adj[m.adjStart[k]! + i]!, m.adjEdge[m.adjStart[k]! + i]!]);
    expect(got).toEqual(want);
  }
}

describe('compileGraph adjacency', () => {
  it('a hub with 3 000 neighbours listed in shuffled order', () => {
    const rng = new Rng(8);
    const leaves = rng.shuffled(Array.from({ length: 3000 }, (_, i) => i + 1));
    expectAdjacency(3001, leaves.map((l) => [0, l] as [number, number]));
  });

  it('small random graphs with self-loops', () => {
    const rng = new Rng(9);
    for (let t = 0; t < 50; t++) {
      const n = rng.int(1, 40);
      const pairs: Array<[number, number]> = [];
      const seen = new Set<number>();
      for (let i = 0; i < n * 3; i++) {
        const a = rng.int(0, n - 1);
        const b = rng.int(0, n - 1);
        const key = Math.min(a, b) * n + Math.max(a, b);
        if (seen.has(key)) continue;
        seen.add(key);
        pairs.push([a, b]);
      }
      expectAdjacency(n, pairs);
    }
  });
});
