import { describe, expect, it } from 'vitest';
import { UnstableDesignError } from '../../src/errors.js';
import { scoreDesign, sharedTrieSets, SHARED_TRIE_MAX_SETS, specModel, unstableAtSight, type ScoreSpec } from '../../src/design/scoring/score.js';
import { evaluateBacklog, evaluateExact } from '../../src/exact/evaluate.js';
import { components } from '../../src/model/components.js';
import { randomProblem } from '../helpers/design-problems.js';
import { bruteStability } from '../helpers/brute-stability.js';
import { Rng } from '../helpers/random.js';

/*
 * Exact scoring (total backlog, and per-class figures) goes through the shared trie of the spec's fixed pairs (score.ts,
 * src/exact/shared-trie.ts) whenever it can; the choice must change no result. Every design of seeded
 * problems (2^10–2^11 designs each, removable compatibilities, self-pairs, disconnected fixed pairs
 * with a forest of fixed pairs cut in two) is scored and compared, to the last bit, with
 * evaluateBacklog and evaluateExact on the design's own model (the fresh paths, themselves checked against the
 * permutation-sum product form of "A product form for the general stochastic matching model",
 * J. Appl. Probab. 2021, in tests/exact/backlog-only.test.ts); stability verdicts also against the
 * brute-force definition ("Stability of the stochastic matching model", J. Appl. Probab. 2016).
 */

function designs(k: number): Uint8Array[] {
  return Array.from({ length: 2 ** k }, (_, x) => Uint8Array.from({ length: k }, (_, j) => (x >> j) & 1));
}

describe('scoring over the shared trie = scoring afresh', () => {
  for (const [seed, cut] of [
    [11, false],
    [12, false],
    [14, true],
  ] as const) {
    it(`every design of a seeded problem (seed ${seed}${cut ? ', fixed pairs in two parts' : ''})`, () => {
      const rng = new Rng(seed);
      const p = randomProblem(rng, { minClasses: 7, maxClasses: 10, toggles: cut ? 10 : 11, removableShare: 0.3, budgetShare: 1, loopProb: 0.3 });
      // cut: drop one fixed tree pair so that designs without a toggle across are disconnected
      const fixed = cut ? p.fixed.filter((_, i) => i !== 0) : p.fixed;
      const spec: ScoreSpec = { ids: p.ids, rates: Array.from(p.rates), fixed, toggles: p.toggles.map((t) => [t.a, t.b] as const), perClass: false };
      // per-class figures (evaluateExact afresh, the tail walk over the shared trie otherwise)
      const full: ScoreSpec = { ...spec, perClass: true };
      let stable = 0;
      let refused = 0;
      let split = 0;
      for (const d of designs(p.toggles.length)) {
        const s = scoreDesign(spec, d);
        const model = specModel(spec, d);
        if (unstableAtSight(model)) {
          expect(s.evaluated).toBe(false);
          continue;
        }
        let want: ReturnType<typeof evaluateBacklog> | undefined;
        try {
          want = evaluateBacklog(model);
        } catch (e) {
          if (!(e instanceof UnstableDesignError)) throw e;
        }
        if (p.n <= 12) expect(s.stable).toBe(bruteStability(model).stable);
        if (!want) {
          expect(s.stable).toBe(false);
          expect(scoreDesign(full, d).stable).toBe(false);
          expect(s.evaluated).toBe(true);
          refused++;
          continue;
        }
        stable++;
        if (components(model).members.length > 1) split++;
        expect(s.stable).toBe(true);
        expect(s.backlogTotal).toBe(want.backlogTotal);
        expect(s.independentSets).toBe(want.independentSets);
        const f = scoreDesign(full, d);
        const exact = evaluateExact(model);
        expect(f.backlog).toEqual(exact.backlog);
        expect(f.backlogTotal).toBe(exact.backlogTotal);
        expect(f.independentSets).toBe(exact.independentSets);
      }
      expect(stable).toBeGreaterThan(50);
      expect(refused + stable).toBeGreaterThan(100);
      // the cut problem reaches designs of two components (left to evaluateBacklog, component by component)
      if (cut) expect(split).toBeGreaterThan(10);
      else expect(split).toBe(0);
    });
  }
});

describe('sharedTrieSets (the count reuse.ts decides from)', () => {
  /** Independent sets (∅ included) by definition: every subset checked pair by pair (self-pairs do not count). */
  function bruteCount(n: number, pairs: ReadonlyArray<readonly [number, number]>): number {
    let count = 0;
    for (let x = 0; x < 2 ** n; x++) if (pairs.every(([a, b]) => a === b || !((x >> a) & 1 && (x >> b) & 1))) count++;
    return count;
  }

  it('the fixed pairs\' independent sets, counted by definition; undefined past the guard, at a zero rate or past 64 classes', () => {
    const rng = new Rng(31);
    for (let t = 0; t < 8; t++) {
      const p = randomProblem(rng, { minClasses: 5, maxClasses: 12, toggles: 6, removableShare: 0.3, budgetShare: 1, loopProb: 0.3 });
      const spec: ScoreSpec = { ids: p.ids, rates: Array.from(p.rates), fixed: p.fixed, toggles: p.toggles.map((x) => [x.a, x.b] as const), perClass: true };
      const want = bruteCount(p.n, p.fixed);
      expect(sharedTrieSets(spec)).toBe(want);
      expect(sharedTrieSets({ ...spec, maxSets: want - 1 })).toBeUndefined();
      expect(sharedTrieSets({ ...spec, rates: spec.rates.map((r, k) => (k === 0 ? 0 : r)) })).toBeUndefined();
    }
    // 21 classes without any fixed pair: 2^21 sets, past SHARED_TRIE_MAX_SETS
    expect(2 ** 21).toBeGreaterThan(SHARED_TRIE_MAX_SETS);
    const ids = Array.from({ length: 21 }, (_, k) => `c${k}`);
    expect(sharedTrieSets({ ids, rates: ids.map(() => 1), fixed: [], toggles: [], perClass: true })).toBeUndefined();
    const wide = Array.from({ length: 65 }, (_, k) => `c${k}`);
    expect(sharedTrieSets({ ids: wide, rates: wide.map(() => 1), fixed: wide.map((_, k) => [k, k] as const), toggles: [], perClass: true })).toBeUndefined();
  });
});
