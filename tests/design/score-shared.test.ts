import { describe, expect, it } from 'vitest';
import { UnstableDesignError } from '../../src/errors.js';
import { scoreDesign, specModel, unstableAtSight, type ScoreSpec } from '../../src/design/scoring/score.js';
import { evaluateBacklog } from '../../src/exact/evaluate.js';
import { components } from '../../src/model/components.js';
import { randomProblem } from '../helpers/design-problems.js';
import { bruteStability } from '../helpers/brute-stability.js';
import { Rng } from '../helpers/random.js';

/*
 * Total-backlog scoring goes through the shared trie of the spec's fixed pairs (score.ts,
 * src/exact/shared-trie.ts) whenever it can; the choice must change no result. Every design of seeded
 * problems (2^10–2^11 designs each, removable compatibilities, self-pairs, disconnected fixed pairs
 * with a forest of fixed pairs cut in two) is scored and compared, to the last bit, with
 * evaluateBacklog on the design's own model (the fresh path, itself checked against the
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
          expect(s.evaluated).toBe(true);
          refused++;
          continue;
        }
        stable++;
        if (components(model).members.length > 1) split++;
        expect(s.stable).toBe(true);
        expect(s.backlogTotal).toBe(want.backlogTotal);
        expect(s.independentSets).toBe(want.independentSets);
      }
      expect(stable).toBeGreaterThan(50);
      expect(refused + stable).toBeGreaterThan(100);
      // the cut problem reaches designs of two components (left to evaluateBacklog, component by component)
      if (cut) expect(split).toBeGreaterThan(10);
      else expect(split).toBe(0);
    });
  }
});
