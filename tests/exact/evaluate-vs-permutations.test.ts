import { describe, expect, it } from 'vitest';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { toBitGraph } from '../helpers/bitgraph.js';
import { bruteStability } from '../helpers/brute-stability.js';
import { designComponents, randomStableDesign, toModel, type Design, type DesignOptions } from '../helpers/designs.js';
import { maxRelativeDifference } from '../helpers/metrics.js';
import { permutationOracle } from '../helpers/permutation-oracle.js';
import { Rng } from '../helpers/random.js';

// Reference: the permutation-sum closed form of "A product form for the general stochastic matching
// model", J. Appl. Probab. 2021, derived by hand in tests/helpers/permutation-oracle.ts (a sum over every
// independent set and every ordering of it, no recursion shared with the evaluator).

// `least`: smallest size the kind allows (a loopless component needs an odd cycle, so 3 classes).
const KINDS: ReadonlyArray<{ name: string; least: number; options: Omit<DesignOptions, 'minClasses' | 'maxClasses'> }> = [
  { name: 'connected, no self-loop', least: 3, options: { edgeProb: 0.4, loopProb: 0, components: 1, minSlack: 0.02 } },
  { name: 'connected with self-loops', least: 2, options: { edgeProb: 0.35, loopProb: 0.35, components: 1, minSlack: 0.02 } },
  { name: 'two components', least: 2, options: { edgeProb: 0.5, loopProb: 0.3, components: 2, minSlack: 0.02 } },
  { name: 'three components', least: 3, options: { edgeProb: 0.5, loopProb: 0.3, components: 3, minSlack: 0.02 } },
  { name: 'dense', least: 3, options: { edgeProb: 0.8, loopProb: 0.2, components: 1, minSlack: 0.02 } },
  { name: 'sparse', least: 2, options: { edgeProb: 0.15, loopProb: 0.5, components: 1, minSlack: 0.02 } },
  { name: 'tree with self-loops', least: 2, options: { edgeProb: 0, loopProb: 0.4, components: 1, minSlack: 0.02 } },
  { name: 'heavy load', least: 3, options: { edgeProb: 0.4, loopProb: 0.25, components: 1, minSlack: 0.01, maxSlack: 0.08 } },
];

const COUNT = 128;
const rng = new Rng(20240611);
const cases: Array<{ label: string; design: Design }> = [];
for (let i = 0; i < COUNT; i++) {
  const kind = KINDS[i % KINDS.length]!;
  const n = Math.max(kind.least, 2 + (i % 7)); // sizes 2..8 in rotation with the kinds
  const design = randomStableDesign(rng, { ...kind.options, minClasses: n, maxClasses: n });
  cases.push({ label: `#${i} ${kind.name}, ${design.ids.length} classes, ${design.pairs.length} edges`, design });
}

// Hand-picked shapes with large independent sets (many orderings) or several components.
const star = (leaves: number): Design => ({
  ids: ['hub', ...Array.from({ length: leaves }, (_, k) => `spoke${k}`)],
  rates: [1.1 * leaves * 0.3, ...Array.from({ length: leaves }, (_, k) => 0.2 + 0.02 * k)],
  pairs: [[0, 0], ...Array.from({ length: leaves }, (_, k) => [0, k + 1] as [number, number])],
});
const structured: Array<{ label: string; design: Design }> = [
  { label: 'star of 7 spokes around a self-looped hub', design: star(7) },
  { label: 'star of 6 spokes around a self-looped hub', design: star(6) },
  {
    label: 'odd cycle of 7',
    design: { ids: [...'abcdefg'], rates: [0.5, 0.6, 0.7, 0.5, 0.6, 0.7, 0.4], pairs: [0, 1, 2, 3, 4, 5, 6].map((k) => [k, (k + 1) % 7] as [number, number]) },
  },
  {
    label: 'two triangles and a lone self-looped class',
    design: {
      ids: [...'abcdefg'],
      rates: [0.3, 1, 0.4, 1.2, 0.5, 1.5, 0.7],
      pairs: [[0, 2], [2, 4], [4, 0], [1, 3], [3, 5], [5, 1], [6, 6]],
    },
  },
  {
    label: 'path of 8 with self-loops at both ends',
    design: {
      ids: [...'abcdefgh'],
      rates: [0.9, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.9],
      pairs: [[0, 0], [7, 7], ...[0, 1, 2, 3, 4, 5, 6].map((k) => [k, k + 1] as [number, number])],
    },
  },
];

describe('evaluateExact against the permutation-sum oracle', () => {
  it.each(structured)('$label', ({ design }) => {
    const model = toModel(design);
    expect(bruteStability(model).stable).toBe(true);
    const oracle = permutationOracle(model);
    const diff = maxRelativeDifference(evaluateExact(model), oracle, 1e-12);
    expect(diff.value, diff.where).toBeLessThanOrEqual(1e-9);
  });

  it('the seeded sample covers sizes 2..8, self-loops and disconnected designs', () => {
    const sizes = new Set(cases.map((c) => c.design.ids.length));
    expect([...sizes].sort()).toEqual([2, 3, 4, 5, 6, 7, 8]);
    const withLoops = cases.filter((c) => c.design.pairs.some(([a, b]) => a === b)).length;
    const disconnected = cases.filter((c) => designComponents(c.design).length > 1).length;
    const eightClasses = cases.filter((c) => c.design.ids.length === 8).length;
    expect(cases.length).toBeGreaterThanOrEqual(100);
    expect(withLoops).toBeGreaterThanOrEqual(40);
    expect(disconnected).toBeGreaterThanOrEqual(30);
    expect(eightClasses).toBeGreaterThanOrEqual(15);
  });

  it.each(cases)('$label', ({ design }) => {
    const model = toModel(design);
    const exact = evaluateExact(model);
    const oracle = permutationOracle(model);
    const diff = maxRelativeDifference(exact, oracle, 1e-12);
    expect(diff.value, diff.where).toBeLessThanOrEqual(1e-9);
    // The oracle visits every independent set; sanity-check that against the graph itself.
    expect(oracle.independentSets).toBeGreaterThanOrEqual(1 + toBitGraph(model).n);
  });
});
