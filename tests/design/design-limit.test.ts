import { describe, expect, it } from 'vitest';
import { defaultDesignLimit, EXACT_SEARCH_MIN_DESIGNS, EXACT_SEARCH_SETS, recommend, SIMULATED_SEARCH_DESIGNS } from '../../src/design/search/recommend.js';
import { UsageError } from '../../src/errors.js';
import { DesignEvaluator } from '../../src/design/scoring/evaluator.js';
import { inThreadScorer } from '../../src/design/scoring/scorer.js';
import { scoreSpecOf } from '../../src/design/scoring/evaluator.js';
import { paretoLocalSearch } from '../../src/design/search/local-search.js';
import { seededRandom } from '../../src/random.js';
import { randomProblem } from '../helpers/design-problems.js';
import { Rng } from '../helpers/random.js';
import { evaluateBacklog } from '../../src/exact/evaluate.js';
import { compileGraph } from '../../src/model/compile.js';
import { designPairs } from '../../src/design/space/problem.js';

// The limit of designs a search may score (--max-designs): the count is a hard cap, a cut round
// and a limit the search does not reach changes nothing (the search without a limit is checked
// against brute force in recommend.test.ts).

function problem(seed: number) {
  const rng = new Rng(seed);
  return randomProblem(rng, { minClasses: 7, maxClasses: 8, toggles: 12, removableShare: 0.3, budgetShare: 0.6, loopProb: 0.3 });
}

describe('the search limit of designs scored', () => {
  it('never scores more designs than the limit, and says it stopped there', async () => {
    for (const seed of [3, 4, 5]) {
      const p = problem(seed);
      const full = await recommend(p, { workerUrl: null });
      const limit = Math.max(3, Math.floor(full.scored / 3));
      const cut = await recommend(p, { workerUrl: null, maxDesigns: limit });
      // the search itself stops at the limit (the baselines' penalty neighbours are scored after it)
      expect(cut.designLimit).toBe(limit);
      expect(cut.scored).toBeLessThan(full.scored);
      expect(full.designLimit).toBeUndefined();
      expect(cut.pareto.length).toBeGreaterThan(0);
      for (const d of cut.pareto) expect(d.stable).toBe(true);
    }
  });

  it('cuts a round by taking the neighbours of every frontier design in turn', async () => {
    const p = problem(7);
    const spec = scoreSpecOf(p, 'total', undefined);
    const ev = new DesignEvaluator(p, 'total', inThreadScorer(spec));
    const seeds = [Uint8Array.from(p.today)];
    const r = await paretoLocalSearch(ev, seeds, { random: seededRandom(1), maxDesigns: 1 + 5 });
    expect(r.limitReached).toBe(true);
    expect(ev.scored).toBe(6);
  });

  it('a limit the search does not reach changes nothing', async () => {
    const p = problem(8);
    const full = await recommend(p, { workerUrl: null });
    const roomy = await recommend(p, { workerUrl: null, maxDesigns: full.scored + 10 });
    expect(roomy.designLimit).toBeUndefined();
    expect(roomy.pareto.map((d) => [d.key, d.objective])).toEqual(full.pareto.map((d) => [d.key, d.objective]));
  });

  it('is refused with --exhaustive, which scores every design', async () => {
    await expect(recommend(problem(3), { workerUrl: null, exhaustive: true, maxDesigns: 10 })).rejects.toBeInstanceOf(UsageError);
  });

  it('by default counts independent sets when exact: the limit times the largest first design stays within the set budget', async () => {
    expect(defaultDesignLimit(true, [10])).toBe(SIMULATED_SEARCH_DESIGNS);
    // counted in arrivals: a plan of a third of the longest gives three times the designs
    expect(defaultDesignLimit(true, [], 20_000)).toBe(3 * SIMULATED_SEARCH_DESIGNS);
    expect(defaultDesignLimit(true, [], 60_000)).toBe(SIMULATED_SEARCH_DESIGNS);
    expect(defaultDesignLimit(true, [], 90_000)).toBe(SIMULATED_SEARCH_DESIGNS);
    expect(defaultDesignLimit(false, [])).toBeUndefined();
    for (const sets of [1, 5_000, 30_000, 1_112_270, 7e6, 5e7]) {
      const limit = defaultDesignLimit(false, [sets / 2, sets])!;
      expect(limit).toBeGreaterThanOrEqual(EXACT_SEARCH_MIN_DESIGNS);
      // the limit is the largest count within the budget, unless the floor of designs applies
      if (limit > EXACT_SEARCH_MIN_DESIGNS) {
        expect(limit * sets).toBeLessThanOrEqual(EXACT_SEARCH_SETS);
        expect((limit + 1) * sets).toBeGreaterThan(EXACT_SEARCH_SETS);
      } else expect(EXACT_SEARCH_MIN_DESIGNS * sets).toBeGreaterThanOrEqual(EXACT_SEARCH_SETS);
    }
    // the small problems of these tests never reach it: the search runs to its end
    const full = await recommend(problem(3), { workerUrl: null });
    expect(full.designLimit).toBeUndefined();
  });
});

describe('an interrupted exact search', () => {
  // reference: the exact recursion run afresh on each returned design (evaluateBacklog)
  it('returns the search figures of the designs it scored, exact, without per-class waits', async () => {
    const p = problem(4);
    const controller = new AbortController();
    let seen = 0;
    const r = await recommend(p, {
      workerUrl: null,
      signal: controller.signal,
      onProgress: (x) => {
        seen = x.scored;
        if (x.phase === 'search' && x.scored > 5) controller.abort();
      },
    });
    expect(seen).toBeGreaterThan(0);
    expect(r.partial).toBe(true);
    expect(r.pareto.length).toBeGreaterThan(0);
    for (const d of r.pareto) {
      expect(d.stable).toBe(true);
      const exact = evaluateBacklog(compileGraph(p.ids, p.rates, designPairs(p, d.design))).backlogTotal;
      expect(d.backlogTotal).toBeCloseTo(exact, 9);
      expect(d.wait).toBeNull();
      expect(Number.isNaN(d.maxWait)).toBe(true);
    }
  });
});
