import { describe, expect, it } from 'vitest';
import { TooLargeError } from '../../src/errors.js';
import { createScorer, inThreadScorer } from '../../src/design/scoring/scorer.js';
import { flipped, scoreFlips } from '../../src/design/scoring/score-flips.js';
import { scoreDesign, specModel, type Score, type ScoreSpec } from '../../src/design/scoring/score.js';
import type { ScoreTask } from '../../src/design/scoring/score-task.js';
import type { DesignProblem } from '../../src/design/space/problem.js';
import { bruteStability } from '../helpers/brute-stability.js';
import { randomProblem } from '../helpers/design-problems.js';
import { Rng } from '../helpers/random.js';

/*
 * Scoring by reuse of the single-change evaluator (src/design/score-flips.ts) against a fresh scoring
 * of each flipped design (scoreDesign: evaluateBacklog / evaluateExact, themselves checked against the
 * permutation-sum product form of "A product form for the general stochastic matching model",
 * J. Appl. Probab. 2021, in tests/exact/): same verdicts, counts and refusals exactly, backlogs to
 * 1e-10 relative. Stability verdicts are also checked against the brute-force definition ("Stability
 * of the stochastic matching model", J. Appl. Probab. 2016; self-loop extension 2021, venue from
 * memory).
 */

const REL = 1e-10;
const close = (x: number, y: number): boolean => Math.abs(x - y) <= REL * Math.max(Math.abs(x), Math.abs(y));

function specOf(p: DesignProblem, perClass: boolean, maxSets?: number): ScoreSpec {
  return {
    ids: p.ids,
    rates: Array.from(p.rates),
    fixed: p.fixed,
    toggles: p.toggles.map((t) => [t.a, t.b] as const),
    perClass,
    ...(maxSets === undefined ? {} : { maxSets }),
  };
}

/** Tally of what the comparisons went through (so that the test is known to reach every branch). */
interface Seen {
  stable: number;
  unstableEvaluated: number;
  refusedAtSight: number;
}

function expectSameScores(spec: ScoreSpec, base: Uint8Array, got: readonly Score[], flips: readonly number[], seen: Seen): void {
  expect(got.length).toBe(flips.length);
  flips.forEach((j, i) => {
    const design = flipped(base, j);
    const want = scoreDesign(spec, design);
    const s = got[i]!;
    const where = `flip ${j} of ${Array.from(base).join('')}`;
    expect(s.stable, where).toBe(want.stable);
    expect(s.evaluated, where).toBe(want.evaluated);
    expect(s.independentSets, where).toBe(want.independentSets);
    if (spec.ids.length <= 12) expect(s.stable, `${where}: brute-force stability`).toBe(bruteStability(specModel(spec, design)).stable);
    if (!want.stable) {
      expect(Number.isNaN(s.backlogTotal), where).toBe(true);
      expect(s.backlog).toBeNull();
      if (want.evaluated) seen.unstableEvaluated++;
      else seen.refusedAtSight++;
      return;
    }
    seen.stable++;
    expect(close(s.backlogTotal, want.backlogTotal), `${where}: ${s.backlogTotal} vs ${want.backlogTotal}`).toBe(true);
    if (!spec.perClass) {
      expect(s.backlog).toBeNull();
      return;
    }
    for (let k = 0; k < spec.ids.length; k++) expect(close(s.backlog![k]!, want.backlog![k]!), `${where}, class ${k}`).toBe(true);
  });
}

describe('scoreFlips: every flip of a base design equals a fresh scoring', () => {
  it('seeded random problems (10–12 classes, 14 toggles, self-pairs), total and per-class, every toggle flipped', () => {
    const seen: Seen = { stable: 0, unstableEvaluated: 0, refusedAtSight: 0 };
    let stableBases = 0;
    for (let seed = 1; seed <= 12; seed++) {
      const rng = new Rng(7000 + seed);
      const p = randomProblem(rng, { minClasses: 10, maxClasses: 12, toggles: 14, removableShare: 0.4, budgetShare: 1, loopProb: 0.3 });
      const flips = p.toggles.map((_, j) => j);
      for (let trial = 0; trial < 3; trial++) {
        const base = Uint8Array.from(p.toggles, () => (rng.chance(0.5) ? 1 : 0));
        const perClass = trial !== 1;
        const spec = specOf(p, perClass);
        if (scoreDesign(spec, base).stable) stableBases++;
        expectSameScores(spec, base, scoreFlips(spec, base, flips), flips, seen);
      }
    }
    // the comparisons went through stable bases (reuse proper) and flips the recursion refuses
    expect(stableBases).toBeGreaterThan(10);
    expect(seen.stable).toBeGreaterThan(200);
    expect(seen.unstableEvaluated).toBeGreaterThan(10);
  });

  it('flips that join two components, split one, or switch a self-pair; and an unstable base (fresh fallback)', () => {
    // two triangles {0,1,2} and {3,4,5}; toggles: a bridge 2–3, a second bridge 0–4, a self-pair at 1,
    // and the triangle edge 3–5 (removable)
    const spec: ScoreSpec = {
      ids: ['a', 'b', 'c', 'd', 'e', 'f'],
      rates: [1, 1.4, 0.8, 1.1, 0.9, 1.3],
      fixed: [
        [0, 1],
        [1, 2],
        [0, 2],
        [3, 4],
        [4, 5],
      ],
      toggles: [
        [2, 3],
        [0, 4],
        [1, 1],
        [3, 5],
      ],
      perClass: true,
    };
    const seen: Seen = { stable: 0, unstableEvaluated: 0, refusedAtSight: 0 };
    const flips = [0, 1, 2, 3];
    for (const base of [
      [0, 0, 0, 1], // two triangles: bridges join them
      [1, 0, 1, 1], // one component: the bridge 2–3 removed splits it
      [1, 1, 0, 1],
      [0, 0, 0, 0], // the second component is a path (bipartite): unstable base, every flip scored afresh
    ]) {
      const d = Uint8Array.from(base);
      expectSameScores(spec, d, scoreFlips(spec, d, flips), flips, seen);
    }
    expect(seen.stable).toBeGreaterThan(5);
    expect(seen.refusedAtSight).toBeGreaterThan(0);
  });

  it('refuses a flipped design beyond --max-sets exactly as a fresh scoring does (TooLargeError)', () => {
    const rng = new Rng(91);
    const p = randomProblem(rng, { minClasses: 9, maxClasses: 9, toggles: 8, removableShare: 1, budgetShare: 1, loopProb: 0 });
    const base = Uint8Array.from(p.toggles, () => 1);
    const count = scoreDesign(specOf(p, true), base).independentSets;
    expect(count).toBeGreaterThan(0);
    // the guard at the base's own count: dropping a compatibility (not a self-pair) adds independent
    // sets (those holding both of its ends), so every such flip exceeds the guard
    const spec = specOf(p, true, count);
    const j = p.toggles.findIndex((t) => t.a !== t.b);
    expect(j).toBeGreaterThanOrEqual(0);
    let fresh: unknown;
    try {
      scoreDesign(spec, flipped(base, j));
    } catch (e) {
      fresh = e;
    }
    expect(fresh).toBeInstanceOf(TooLargeError);
    let reused: unknown;
    try {
      scoreFlips(spec, base, [j]);
    } catch (e) {
      reused = e;
    }
    expect(reused).toBeInstanceOf(TooLargeError);
    expect((reused as TooLargeError).message).toBe((fresh as TooLargeError).message);
    expect((reused as TooLargeError).count).toBe((fresh as TooLargeError).count);
  });
});

describe('scoring tasks on worker threads', () => {
  it('mixed tasks on two workers give the in-thread scores, in order; a triangle derived by hand', async () => {
    // A triangle with unit rates and a self-pair at a (toggle 0), and the pair b–c removable (toggle 1).
    // Derived by hand from the product form (J. Appl. Probab. 2021): with the self-pair, the non-empty
    // states are "a" (weight λ_a/λ(N(a)) = 1/3; a cannot repeat) and b^j, c^j (weight (1/2)^j), so
    // Z = 1 + 1/3 + 2·Σ_j (1/2)^j = 10/3 and Σ_w π(w)|w|·Z = 1/3 + 2·Σ_j j(1/2)^j = 13/3: backlog 1.3.
    // Without it, "a^j" replaces "a": Z = 4, Σ = 6, backlog 1.5.
    const spec: ScoreSpec = {
      ids: ['a', 'b', 'c'],
      rates: [1, 1, 1],
      fixed: [
        [0, 1],
        [0, 2],
      ],
      toggles: [
        [0, 0],
        [1, 2],
      ],
      perClass: true,
    };
    const tasks: ScoreTask[] = [
      { design: Uint8Array.from([0, 1]) },
      { base: Uint8Array.from([0, 1]), flips: [0, 1] },
      { design: Uint8Array.from([1, 1]) },
      { base: Uint8Array.from([1, 1]), flips: [1, 0] },
    ];
    const scorer = createScorer(spec, 2, new URL('./support/score-worker-ts.mjs', import.meta.url));
    expect(scorer.mode).toBe('workers');
    let got: Score[][];
    try {
      got = await scorer.scoreTasks(tasks);
    } finally {
      await scorer.close();
    }
    const want = await inThreadScorer(spec).scoreTasks(tasks);
    expect(got.map((s) => s.length)).toEqual([1, 2, 1, 2]);
    got.forEach((scores, t) =>
      scores.forEach((s, q) => {
        expect(s.stable).toBe(want[t]![q]!.stable);
        expect(s.backlogTotal).toBe(want[t]![q]!.backlogTotal);
        expect(Array.from(s.backlog ?? [])).toEqual(Array.from(want[t]![q]!.backlog ?? []));
      }),
    );
    expect(got[0]![0]!.backlogTotal).toBeCloseTo(1.5, 12);
    expect(got[1]![0]!.backlogTotal).toBeCloseTo(1.3, 12); // self-pair added by reuse
    expect(got[2]![0]!.backlogTotal).toBeCloseTo(1.3, 12);
    expect(got[3]![1]!.backlogTotal).toBeCloseTo(1.5, 12); // self-pair removed by reuse
    // without b–c (and no self-pair) the design is the path b–a–c: bipartite, unstable, by reuse too
    expect(got[1]![1]!.stable).toBe(bruteStability(specModel(spec, Uint8Array.from([0, 0]))).stable);
  });
});
