import { exitCodeOf } from '../../src/cli/exit.js';
import { describe, expect, it } from 'vitest';
import { TooLargeError, UnstableDesignError } from '../../src/errors.js';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { maskOf, toBitGraph } from '../helpers/bitgraph.js';
import { bruteStability, certificateProblem } from '../helpers/brute-stability.js';
import { designComponents, randomStableDesign, randomUnstableDesign, subDesign, toModel, type Design } from '../helpers/designs.js';
import { Rng } from '../helpers/random.js';

// Reference: the stability condition checked by brute force from its definition ("Stability of the
// stochastic matching model", J. Appl. Probab. 2016; self-loop extension 2021, venue from memory), see
// tests/helpers/brute-stability.ts: a certificate must name a non-empty independent set I without
// self-looped class, its neighbourhood N(I), λ(I) and λ(N(I)), with λ(I) ≥ λ(N(I)).

function thrown(f: () => unknown): unknown {
  try {
    f();
  } catch (e) {
    return e;
  }
  return undefined;
}

/** Evaluates, expects UnstableDesignError, and checks its certificate by brute force. */
function expectValidCertificate(design: Design): UnstableDesignError {
  const model = toModel(design);
  const err = thrown(() => evaluateExact(model));
  expect(err).toBeInstanceOf(UnstableDesignError);
  const e = err as UnstableDesignError;
  expect(exitCodeOf(e)).toBe(3);
  const c = e.certificate;
  const index = (id: string): number => {
    const k = design.ids.indexOf(id);
    expect(k, `unknown class id ${id}`).toBeGreaterThanOrEqual(0);
    return k;
  };
  const problem = certificateProblem(toBitGraph(model), maskOf(c.set.map(index)), {
    neighbours: maskOf(c.neighbours.map(index)),
    demand: c.demand,
    capacity: c.capacity,
  });
  expect(problem, JSON.stringify(c)).toBeUndefined();
  return e;
}

describe('the brute-force reference itself', () => {
  it('agrees with the hand-derived triangle condition (stable iff each rate is below the sum of the other two)', () => {
    // derived by hand: the independent sets of a triangle are the single classes, N({k}) = the other two.
    const rng = new Rng(77);
    let stable = 0;
    for (let i = 0; i < 200; i++) {
      const r = [rng.uniform(0.1, 2), rng.uniform(0.1, 2), rng.uniform(0.1, 2)];
      const hand = r.every((x, k) => x < r[(k + 1) % 3]! + r[(k + 2) % 3]!);
      expect(bruteStability(toModel({ ids: ['a', 'b', 'c'], rates: r, pairs: [[0, 1], [1, 2], [2, 0]] })).stable).toBe(hand);
      if (hand) stable++;
    }
    expect(stable).toBeGreaterThan(20);
    expect(stable).toBeLessThan(180);
  });

  it('rejects a certificate naming a set that is not violating', () => {
    const model = toModel({ ids: ['night', 'weekend', 'day'], rates: [6, 2, 3], pairs: [[0, 1], [1, 2], [0, 2]] });
    const g = toBitGraph(model);
    expect(certificateProblem(g, 0b010, { neighbours: 0b101, demand: 2, capacity: 9 })).toBeDefined();
    expect(certificateProblem(g, 0b001, { neighbours: 0b110, demand: 6, capacity: 5 })).toBeUndefined();
    expect(certificateProblem(g, 0b001, { neighbours: 0b010, demand: 6, capacity: 2 })).toBeDefined();
  });
});

describe('unstable designs throw UnstableDesignError with a valid certificate', () => {
  it('a triangle with one overloaded class (night shifts offered faster than both others can take)', () => {
    const design: Design = { ids: ['night', 'weekend', 'day'], rates: [6, 2, 3], pairs: [[0, 1], [1, 2], [0, 2]] };
    expect(bruteStability(toModel(design)).stable).toBe(false);
    const e = expectValidCertificate(design);
    expect(e.certificate.set).toEqual(['night']); // derived by hand: the only violating set, 6 ≥ 2 + 3
    expect(e.certificate.reason).toBe('overloaded');
  });

  it('a class whose only compatibility is with a self-looped class it outweighs', () => {
    // derived by hand: {solo} is independent without self-loop, N = {pool}, λ = 3 ≥ 2.
    const design: Design = { ids: ['solo', 'pool'], rates: [3, 2], pairs: [[0, 1], [1, 1]] };
    const e = expectValidCertificate(design);
    expect(e.certificate.set).toEqual(['solo']);
  });

  const rng = new Rng(4242);
  const unstable = Array.from({ length: 24 }, (_, i) =>
    randomUnstableDesign(rng, { edgeProb: 0.4, loopProb: i % 2 ? 0.3 : 0, components: 1 + (i % 3 === 0 ? 1 : 0), minClasses: 3, maxClasses: 8 }),
  );
  it.each(unstable.map((design, i) => ({ design, label: `seeded unstable design #${i} (${design.ids.length} classes)` })))('$label', ({ design }) => {
    expectValidCertificate(design);
  });
});

describe('bipartite designs are unstable whatever the rates', () => {
  const cases: Array<{ label: string; design: Design }> = [
    { label: 'square with equal rates (both sides exactly balanced)', design: { ids: ['n', 'e', 's', 'w'], rates: [1, 1, 1, 1], pairs: [[0, 1], [1, 2], [2, 3], [3, 0]] } },
    { label: 'single compatibility between two classes', design: { ids: ['rider', 'driver'], rates: [1, 1], pairs: [[0, 1]] } },
    { label: 'path of 3', design: { ids: ['a', 'b', 'c'], rates: [1, 2.5, 1], pairs: [[0, 1], [1, 2]] } },
    {
      label: 'a balanced bipartite component next to a stable triangle',
      design: { ids: ['x', 'y', 'p', 'q', 'r'], rates: [2, 2, 1, 1, 1], pairs: [[0, 1], [2, 3], [3, 4], [4, 2]] },
    },
  ];
  it.each(cases)('$label', ({ design }) => {
    expect(bruteStability(toModel(design)).stable).toBe(false);
    expectValidCertificate(design);
  });
});

describe('maxSets', () => {
  const rng = new Rng(5150);
  const design = randomStableDesign(rng, { edgeProb: 0.2, loopProb: 0.3, components: 2, minSlack: 0.02, minClasses: 10, maxClasses: 10 });

  it('counts the independent sets of each component (empty set included), summed over components', () => {
    // Brute force on each component separately; the documented count is their sum.
    const expected = designComponents(design).reduce((s, members) => s + bruteStability(toModel(subDesign(design, members))).independentSets, 0);
    expect(evaluateExact(toModel(design)).independentSets).toBe(expected);
  });

  it('a limit below the count throws TooLargeError; a limit equal to it does not', () => {
    const model = toModel(design);
    const count = evaluateExact(model).independentSets;
    const err = thrown(() => evaluateExact(model, { maxSets: count - 1 }));
    expect(err).toBeInstanceOf(TooLargeError);
    const e = err as TooLargeError;
    expect(exitCodeOf(e)).toBe(4);
    expect(e.limit).toBe(count - 1);
    expect(e.count).toBeGreaterThan(e.limit);
    expect(evaluateExact(model, { maxSets: count }).independentSets).toBe(count);
  });

  it(
    'a 41-cycle with a small limit stops early instead of enumerating ~3.7e8 independent sets',
    () => {
      // Stable, derived by hand: with equal rates, each member of an independent set I of a cycle has 2
      // neighbours and each class outside I touches at most 2 members, so |N(I)| ≥ |I|, with equality only
      // when the cycle alternates I / N(I) all the way round, impossible for odd length; so λ(I) < λ(N(I)).
      // Its independent sets number φ^41 + (−1/φ)^41 ≈ 3.7e8 (φ the golden ratio; from memory, checked by hand
      // for the 3-cycle: 4 sets, and the 4-cycle: 7 sets), far beyond this test's timeout to enumerate.
      const n = 41;
      const model = toModel({
        ids: Array.from({ length: n }, (_, k) => `seat${k}`),
        rates: new Array<number>(n).fill(1),
        pairs: Array.from({ length: n }, (_, k) => [k, (k + 1) % n] as [number, number]),
      });
      const err = thrown(() => evaluateExact(model, { maxSets: 1000 }));
      expect(err).toBeInstanceOf(TooLargeError);
      expect((err as TooLargeError).limit).toBe(1000);
      expect((err as TooLargeError).count).toBeGreaterThan(1000);
    },
    10_000,
  );
});
