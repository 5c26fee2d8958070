import { describe, expect, it } from 'vitest';
import { compileGraph } from '../../src/model/compile.js';
import { components } from '../../src/model/components.js';
import { DoubleCover } from '../../src/stability/double-cover.js';
import { measure, stripNeighbours } from '../../src/stability/sets.js';
import { Rng } from '../helpers/random.js';
import { adjacencyMasks, maskNeighbours, maskOf, maskRate, randomGraph } from './brute-force.js';

describe('cuts of the bipartite double cover (the derivation in src/stability/double-cover.ts)', () => {
  const rng = new Rng(4242);
  const graphs = Array.from({ length: 200 }, () => randomGraph(rng, { minN: 2, maxN: 8 }));

  it('for every set A, I = A ∖ N(A) is independent, self-loop free, and slack(I) ≤ slack(A)', () => {
    // Checked by enumerating every subset A of every graph (the lemma behind certificates and headroom).
    for (const g of graphs) {
      const { nb, loops } = adjacencyMasks(g);
      for (let a = 1; a < 1 << g.n; a++) {
        const nA = maskNeighbours(nb, a);
        const i = a & ~nA;
        expect(i & loops).toBe(0);
        expect(maskNeighbours(nb, i) & i).toBe(0);
        const slackA = maskRate(g, nA) - maskRate(g, a);
        const slackI = maskRate(g, maskNeighbours(nb, i)) - maskRate(g, i);
        expect(slackI).toBeLessThanOrEqual(slackA + 1e-12);
      }
    }
  });

  it('maximum flow = λ(C) + min(0, min over all sets A of slack(A)); forced cuts give min slack over I ∋ v', () => {
    let forced = 0;
    for (const g of graphs) {
      const model = compileGraph(Array.from({ length: g.n }, (_, k) => `k${k}`), g.rates, g.pairs);
      const { nb } = adjacencyMasks(g);
      for (const members of components(model).members) {
        const cover = new DoubleCover(model, members);
        const cm = maskOf(members);
        let minA = 0;
        for (let a = cm; a > 0; a = (a - 1) & cm) minA = Math.min(minA, maskRate(g, maskNeighbours(nb, a)) - maskRate(g, a));
        expect(cover.maxFlow - cover.demand).toBeCloseTo(minA, 9);
        // brute force over the component's independent self-loop-free sets
        const minWith = new Map<number, number>();
        const { loops } = adjacencyMasks(g);
        for (let i = cm; i > 0; i = (i - 1) & cm) {
          if (i & loops || maskNeighbours(nb, i) & i) continue;
          const slack = maskRate(g, maskNeighbours(nb, i)) - maskRate(g, i);
          for (const v of members) if (i & (1 << v)) minWith.set(v, Math.min(minWith.get(v) ?? Infinity, slack));
        }
        members.forEach((v, i) => {
          if (model.selfLoop[v]) return;
          const got = cover.tightestWith(i);
          const strip = measure(model, stripNeighbours(model, got.set));
          expect(strip.set).toContain(v);
          expect(strip.slack).toBeCloseTo(minWith.get(v)!, 9);
          expect(got.flowSlack).toBeCloseTo(minWith.get(v)!, 9);
          forced++;
        });
        const a = cover.minimumSlackSet();
        const slackOfA = maskRate(g, maskNeighbours(nb, maskOf(a))) - maskRate(g, maskOf(a));
        expect(slackOfA).toBeCloseTo(minA, 9);
      }
    }
    expect(forced).toBeGreaterThan(500);
  });
});
