import { describe, expect, it } from 'vitest';
import { dominates, frontValueAt, paretoFront, paretoLayers, type ParetoPoint } from '../../src/design/space/pareto.js';
import { Rng } from '../helpers/random.js';

// The archive against the definition (quadratic check): a point is on the front when no other point
// is no worse on both cost and objective and strictly better on one; among exact ties one point is
// kept, the one with fewer changes, then the smaller key.

function randomPoints(rng: Rng, count: number): ParetoPoint[] {
  return Array.from({ length: count }, (_, i) => ({
    cost: rng.int(0, 12), // few cost levels: many ties
    objective: rng.chance(0.3) ? 5 : rng.int(1, 40) / 4, // exact objective ties too
    changes: rng.int(0, 3),
    key: `k${String(i).padStart(3, '0')}`,
  }));
}

const beats = (a: ParetoPoint, b: ParetoPoint): boolean => a.cost <= b.cost && a.objective <= b.objective && (a.cost < b.cost || a.objective < b.objective);

describe('paretoFront', () => {
  it('keeps exactly the non-dominated cost/objective pairs, one point each, whatever the input order', () => {
    const rng = new Rng(7);
    for (let round = 0; round < 200; round++) {
      const pts = randomPoints(rng, rng.int(1, 40));
      const front = paretoFront(pts);
      const expected = [...new Set(pts.filter((p) => !pts.some((q) => beats(q, p))).map((p) => `${p.cost}:${p.objective}`))].sort();
      expect(front.map((p) => `${p.cost}:${p.objective}`).sort()).toEqual(expected);
      // sorted by cost, objective strictly decreasing
      for (let i = 1; i < front.length; i++) {
        expect(front[i]!.cost).toBeGreaterThan(front[i - 1]!.cost);
        expect(front[i]!.objective).toBeLessThan(front[i - 1]!.objective);
      }
      // ties resolved by (changes, key), independently of the order of the input
      for (const f of front) {
        const tied = pts.filter((p) => p.cost === f.cost && p.objective === f.objective);
        const first = [...tied].sort((a, b) => a.changes - b.changes || (a.key < b.key ? -1 : 1))[0]!;
        expect(f.key).toBe(first.key);
      }
      expect(paretoFront(rng.shuffled(pts)).map((p) => p.key)).toEqual(front.map((p) => p.key));
    }
  });

  it('treats objectives within a relative 1e-9 as equal', () => {
    const a = { cost: 1, objective: 2, changes: 0, key: 'a' };
    const b = { cost: 2, objective: 2 * (1 - 1e-12), changes: 0, key: 'b' };
    const c = { cost: 3, objective: 2 * (1 - 1e-6), changes: 0, key: 'c' };
    expect(paretoFront([a, b, c]).map((p) => p.key)).toEqual(['a', 'c']);
    expect(dominates(a, b)).toBe(true);
    expect(dominates(a, c)).toBe(false);
    expect(dominates(c, a)).toBe(false);
  });

  it('peels layers and reads the front value at a cost', () => {
    const pts: ParetoPoint[] = [
      { cost: 0, objective: 10, changes: 0, key: 'a' },
      { cost: 5, objective: 4, changes: 1, key: 'b' },
      { cost: 5, objective: 6, changes: 1, key: 'c' },
      { cost: 8, objective: 5, changes: 2, key: 'd' },
      { cost: 9, objective: 1, changes: 2, key: 'e' },
    ];
    const layers = paretoLayers(pts, 3);
    expect(layers.map((l) => l.map((p) => p.key))).toEqual([['a', 'b', 'e'], ['c', 'd']]);
    expect(frontValueAt(layers[0]!, -1)).toBe(Infinity);
    expect(frontValueAt(layers[0]!, 4.9)).toBe(10);
    expect(frontValueAt(layers[0]!, 5)).toBe(4);
    expect(frontValueAt(layers[0]!, 100)).toBe(1);
  });
});
