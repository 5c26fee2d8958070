import { describe, expect, it } from 'vitest';
import { evaluateBacklog, evaluateExact } from '../../src/exact/evaluate.js';
import { permutationOracle } from '../helpers/permutation-oracle.js';
import { randomStableDesign, toModel } from '../helpers/designs.js';
import { Rng } from '../helpers/random.js';

/**
 * evaluateBacklog computes the mean total backlog from the prefix sums Ψ and their first moment Ψ1
 * only (no tail pass). Reference: the permutation-sum closed form obtained from the product form of
 * "A product form for the general stochastic matching model" (J. Appl. Probab. 2021), written
 * independently in tests/helpers/permutation-oracle.ts, and the full recursion of evaluateExact.
 */
describe('evaluateBacklog (forward pass only)', () => {
  const rng = new Rng(4242);
  for (let t = 0; t < 40; t++) {
    const d = randomStableDesign(rng, {
      minClasses: 2,
      maxClasses: 8,
      edgeProb: 0.35,
      loopProb: 0.2,
      components: t % 5 === 0 ? 2 : 1,
      minSlack: 0.02,
    });
    it(`design ${t}: ${d.ids.length} classes, ${d.pairs.length} compatibilities`, () => {
      const model = toModel(d);
      const fast = evaluateBacklog(model);
      const oracle = permutationOracle(model);
      const full = evaluateExact(model);
      expect(fast.backlogTotal).toBeGreaterThan(0);
      expect(Math.abs(fast.backlogTotal - oracle.backlogTotal) / oracle.backlogTotal).toBeLessThan(1e-9);
      expect(Math.abs(fast.emptyProbability - oracle.emptyProbability) / oracle.emptyProbability).toBeLessThan(1e-9);
      expect(fast.independentSets).toBe(full.independentSets);
      expect(Math.abs(fast.backlogTotal - full.backlogTotal) / full.backlogTotal).toBeLessThan(1e-10);
    });
  }
});
