import { describe, expect, it } from 'vitest';
import { evaluateBacklog, evaluateExact, type BacklogOnly } from '../../src/exact/evaluate.js';
import type { ExactResult } from '../../src/exact/result.js';
import { backlogOverShared, exactOverShared, sharedTrie } from '../../src/exact/shared-trie.js';
import { KERNEL_CHUNK } from '../../src/exact/trie.js';
import { compileGraph, type CompiledModel } from '../../src/model/compile.js';
import { randomPairs } from '../../src/model/generators.js';
import { permutationOracle } from '../helpers/permutation-oracle.js';
import { Rng } from '../helpers/random.js';

/**
 * The walk over a shared trie (src/exact/shared-trie.ts) against evaluateBacklog on the design's own
 * trie: the file claims the same figures to the last bit, the same set count and the same refusals,
 * so these compare with toBe / toEqual, not with a tolerance. On small designs the figures are also
 * checked against the permutation-sum closed form from the product form of "A product form for the
 * general stochastic matching model" (J. Appl. Probab. 2021), written independently in
 * tests/helpers/permutation-oracle.ts. The full evaluation over the shared trie (exactOverShared) is
 * compared with evaluateExact the same way (every per-class figure and match rate). Bases are random parts of each design's compatibilities
 * (disconnected ones included), designs random supersets of a base.
 */

const ids = (n: number): string[] => Array.from({ length: n }, (_, k) => `c${k}`);

/** Rates from positive flows on the pairs (stable when connected and not bipartite), or uniform ones (often unstable). */
function rates(n: number, pairs: ReadonlyArray<readonly [number, number]>, rng: Rng, flows: boolean): number[] {
  if (!flows) return Array.from({ length: n }, () => rng.uniform(0.2, 2));
  const out = new Array<number>(n).fill(0);
  for (const [a, b] of pairs) {
    const f = rng.uniform(0.1, 1);
    out[a]! += f;
    out[b]! += f;
  }
  return out.map((x) => x || 0.5);
}

type Outcome = BacklogOnly | ExactResult | { error: string; message: string };

function outcome(f: () => BacklogOnly | ExactResult | undefined): Outcome | undefined {
  try {
    return f();
  } catch (e) {
    return { error: (e as Error).constructor.name, message: (e as Error).message };
  }
}

/** A random superset of `base` (extra pairs with probability p, self-pairs included), connected through a path. */
function superset(n: number, base: ReadonlyArray<readonly [number, number]>, rng: Rng, p: number): Array<[number, number]> {
  const pairs = base.map(([a, b]) => [a, b] as [number, number]);
  for (let k = 1; k < n; k++) pairs.push([k - 1, k]);
  for (let a = 0; a < n; a++) for (let b = a; b < n; b++) if (rng.next() < p) pairs.push([a, b]);
  return pairs;
}

describe('evaluation over a shared trie = evaluateBacklog / evaluateExact, to the last bit', () => {
  it('random bases and designs of 3–14 classes, stable and unstable, with self-pairs', () => {
    const rng = new Rng(9090);
    let stable = 0;
    let refused = 0;
    for (let t = 0; t < 60; t++) {
      const n = 3 + Math.floor(rng.next() * 12);
      const base = [...randomPairs(n, 0.2, () => rng.next(), 0.1)];
      const flows = t % 3 !== 0;
      const baseRates = rates(n, superset(n, base, rng, 0.2), rng, flows);
      const shared = sharedTrie(compileGraph(ids(n), baseRates, base), 1e7)!;
      expect(shared).toBeDefined();
      for (let d = 0; d < 8; d++) {
        const model = compileGraph(ids(n), baseRates, superset(n, base, rng, 0.08 + 0.1 * rng.next()));
        const fresh = outcome(() => evaluateBacklog(model));
        const over = outcome(() => backlogOverShared(shared, model));
        expect(over).toEqual(fresh);
        // the full evaluation (tail walk over the same trie): every per-class figure and match rate
        expect(outcome(() => exactOverShared(shared, model))).toEqual(outcome(() => evaluateExact(model)));
        if (fresh && 'error' in fresh) refused++;
        else {
          stable++;
          if (n <= 7) {
            const o = permutationOracle(model);
            expect(Math.abs((fresh as BacklogOnly).backlogTotal - o.backlogTotal) / o.backlogTotal).toBeLessThan(1e-9);
          }
        }
      }
    }
    // both kinds were met (uniform rates overload some designs)
    expect(stable).toBeGreaterThan(100);
    expect(refused).toBeGreaterThan(20);
  });

  it('after a refused design the next one is still exact (the walk state and bitmap are reset)', () => {
    const n = 8;
    const base: Array<[number, number]> = [];
    for (let k = 0; k < n; k++) base.push([k, (k + 1) % n].sort((a, b) => a - b) as [number, number]);
    const r = [1, 1, 1, 1, 1, 1, 1, 1];
    const shared = sharedTrie(compileGraph(ids(n), r, base), 1e6)!;
    // an even ring is bipartite: refused by the recursion (saturated set), then a stable one
    const ring = compileGraph(ids(n), r, base);
    const chords = compileGraph(ids(n), r, [...base, [0, 3], [2, 2], [1, 5]]);
    expect(outcome(() => backlogOverShared(shared, ring))).toEqual(outcome(() => evaluateBacklog(ring)));
    expect(outcome(() => backlogOverShared(shared, ring))).toHaveProperty('error');
    expect(backlogOverShared(shared, chords)).toEqual(evaluateBacklog(chords));
    expect(outcome(() => exactOverShared(shared, ring))).toEqual(outcome(() => evaluateExact(ring)));
    expect(exactOverShared(shared, chords)).toEqual(evaluateExact(chords));
    expect(backlogOverShared(shared, chords)).toEqual(evaluateBacklog(chords));
  });

  it('34–40 classes (masks over both 32-bit words) and more sets than one kernel chunk', () => {
    const rng = new Rng(77);
    for (const n of [34, 40]) {
      const base = [...randomPairs(n, 0.35, () => rng.next(), 0.05)];
      for (let k = 1; k < n; k++) base.push([k - 1, k]);
      const pairs = [...base, ...randomPairs(n, 0.05, () => rng.next(), 0.05)];
      const r = rates(n, pairs, rng, true);
      const shared = sharedTrie(compileGraph(ids(n), r, base), 1e7)!;
      const model = compileGraph(ids(n), r, pairs);
      const fresh = evaluateBacklog(model);
      expect(fresh.independentSets).toBeGreaterThan(300);
      expect(backlogOverShared(shared, model)).toEqual(fresh);
      expect(exactOverShared(shared, model)).toEqual(evaluateExact(model));
    }
    // a ring of 24 classes has 103 682 independent sets (the Lucas number L24): the walk resumes between calls
    const n = 24;
    const ring: Array<[number, number]> = [];
    for (let k = 0; k < n; k++) ring.push([k, (k + 1) % n].sort((a, b) => a - b) as [number, number]);
    const r = rates(n, [...ring, [5, 5]], rng, true); // stable with and without the chord (more pairs only enlarge every N(I))
    const shared = sharedTrie(compileGraph(ids(n), r, ring), 1e7)!;
    expect(shared.count).toBe(103682);
    const model = compileGraph(ids(n), r, [...ring, [5, 5]]);
    const fresh = evaluateBacklog(model);
    expect(fresh.independentSets).toBeGreaterThan(KERNEL_CHUNK);
    expect(backlogOverShared(shared, model)).toEqual(fresh);
    const chord = compileGraph(ids(n), r, [...ring, [0, 12], [5, 5]]);
    expect(backlogOverShared(shared, chord)).toEqual(evaluateBacklog(chord));
    expect(exactOverShared(shared, chord)).toEqual(evaluateExact(chord));
  });
});

describe('where the shared trie does not serve', () => {
  const n = 6;
  const base: Array<[number, number]> = [[0, 1], [1, 2], [3, 4], [4, 5]];
  const r = [1, 1, 1, 1, 1, 1];
  const shared = sharedTrie(compileGraph(ids(n), r, base), 1e6)!;
  const model = (pairs: Array<[number, number]>, rr = r): CompiledModel => compileGraph(ids(n), rr, pairs);

  it('a design in two connected components, one without a base pair, other rates or classes: left to evaluateBacklog', () => {
    expect(backlogOverShared(shared, model([...base, [0, 0], [3, 3]]))).toBeUndefined();
    expect(exactOverShared(shared, model([...base, [0, 0], [3, 3]]))).toBeUndefined();
    expect(backlogOverShared(shared, model([[0, 1], [1, 2], [3, 4], [2, 3], [0, 0], [5, 5], [0, 5]]))).toBeUndefined();
    expect(backlogOverShared(shared, model([...base, [2, 3], [0, 2], [3, 5], [0, 0], [5, 5]], [1, 1, 1, 1, 1, 1.5]))).toBeUndefined();
    expect(backlogOverShared(shared, compileGraph(ids(7), [...r, 1], [...base, [2, 3], [5, 6], [0, 0]]))).toBeUndefined();
    const connected = model([...base, [2, 3], [0, 2], [3, 5], [0, 0], [5, 5]]);
    expect(backlogOverShared(shared, connected)).toEqual(evaluateBacklog(connected));
    expect(exactOverShared(shared, connected)).toEqual(evaluateExact(connected));
  });

  it('a base past the guard, a zero rate, more than 64 classes: no shared trie', () => {
    // the base is two paths of 3 classes, each with 5 independent sets (∅, three singletons, its two ends): 5 × 5 = 25
    expect(shared.count).toBe(25);
    expect(sharedTrie(compileGraph(ids(n), r, base), 24)).toBeUndefined();
    expect(backlogOverShared(shared, model([...base, [2, 3], [0, 2], [3, 5], [0, 0], [5, 5]]), { maxSets: 24 })).toBeUndefined();
    expect(sharedTrie(compileGraph(ids(n), [1, 1, 0, 1, 1, 1], base), 1e6)).toBeUndefined();
    const big = Array.from({ length: 65 }, (_, k) => [k, (k + 1) % 65].sort((a, b) => a - b) as [number, number]);
    expect(sharedTrie(compileGraph(ids(65), new Array<number>(65).fill(1), big), 1e9)).toBeUndefined();
  });
});
