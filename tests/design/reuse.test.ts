import { describe, expect, it } from 'vitest';
import { baselines } from '../../src/design/search/baselines.js';
import { DesignEvaluator, type DesignRecord } from '../../src/design/scoring/evaluator.js';
import { paretoLocalSearch, type SearchResult } from '../../src/design/search/local-search.js';
import type { ObjectiveName } from '../../src/design/space/objective.js';
import { inThreadScorer, type Scorer } from '../../src/design/scoring/scorer.js';
import type { DesignProblem } from '../../src/design/space/problem.js';
import { recommend, type Recommendation, type RecommendOptions } from '../../src/design/search/recommend.js';
import { REUSE_MIN_SETS, reuses, type ReuseMode } from '../../src/design/scoring/reuse.js';
import { scoreSpecOf } from '../../src/design/scoring/evaluator.js';
import { SHARED_TRIE_SPARSE } from '../../src/design/scoring/score.js';
import { seededRandom } from '../../src/random.js';
import { allDesigns, bruteFront } from '../helpers/design-brute.js';
import { randomProblem } from '../helpers/design-problems.js';
import { Rng } from '../helpers/random.js';

/*
 * The recommender with its single-toggle neighbours scored by reuse of the single-change evaluator
 * (forced: reuse 'always') against the same recommender scoring every design afresh (reuse 'never'),
 * on seeded random problems: the same front, the same figures for every returned design and baseline
 * (exactly: they come from fresh evaluations either way), the same counts; inside the search, every
 * scored design's figures agree to 1e-10 relative and every verdict exactly. The fronts are also
 * checked against brute force written from the definitions (tests/helpers/design-brute.ts: stability
 * by brute force over independent sets, "Stability of the stochastic matching model", J. Appl. Probab.
 * 2016; objectives from a fresh evaluateExact, itself checked against the permutation-sum product form
 * of "A product form for the general stochastic matching model", J. Appl. Probab. 2021).
 */

const REL = 1e-10;
const close = (x: number, y: number): boolean => (Number.isNaN(x) && Number.isNaN(y)) || Math.abs(x - y) <= REL * Math.max(Math.abs(x), Math.abs(y));

interface Extras {
  limits?: boolean;
  targets?: boolean;
  weights?: boolean;
  /**
   * Rates λ_k = Σ_{e∋k} a_{k,e} μ_e from flows μ_e in [0.5, 1.5] on the fixed pairs (a = 2 for a
   * self-pair): a design holding the fixed pairs is then stable unless bipartite (the edge-flow form
   * of stability, "Stability of the stochastic matching model", J. Appl. Probab. 2016).
   */
  flowRates?: boolean;
}

function problemOf(seed: number, size: { min: number; max: number; toggles: number }, extras: Extras = {}): DesignProblem {
  const rng = new Rng(seed);
  const p = randomProblem(rng, {
    minClasses: size.min,
    maxClasses: size.max,
    toggles: size.toggles,
    removableShare: rng.uniform(0.2, 0.45),
    budgetShare: rng.uniform(0.3, 0.7),
    loopProb: rng.uniform(0.1, 0.4),
  });
  if (extras.limits) for (let k = 0; k < p.n; k++) if (rng.chance(0.4)) p.maxDegree[k] = Math.max(p.fixedDegree[k]!, 3);
  if (extras.targets) for (let k = 0; k < p.n; k++) if (rng.chance(0.3)) p.waitTarget[k] = rng.uniform(0.5, 4);
  if (extras.weights) for (let k = 0; k < p.n; k++) p.weight[k] = rng.uniform(0, 3);
  if (extras.flowRates) {
    p.rates.fill(0);
    for (const [a, b] of p.fixed) {
      const mu = rng.uniform(0.5, 1.5);
      p.rates[a]! += mu;
      p.rates[b]! += mu;
    }
  }
  return p;
}

/** Everything a recommendation reports except how scoring ran. */
function reported(r: Recommendation): Omit<Recommendation, 'scoring'> {
  const { scoring: _scoring, ...rest } = r;
  return rest;
}

async function both(p: DesignProblem, objective: ObjectiveName, extra: RecommendOptions = {}): Promise<{ reuse: Recommendation; fresh: Recommendation }> {
  const reuse = await recommend(p, { objective, workerUrl: null, reuse: 'always', ...extra });
  const fresh = await recommend(p, { objective, workerUrl: null, reuse: 'never', ...extra });
  return { reuse, fresh };
}

describe('recommend with reuse forced equals recommend scoring afresh', () => {
  const cases: Array<{ seed: number; objective: Exclude<ObjectiveName, 'abandonment'>; extras: Extras }> = [
    { seed: 41, objective: 'total', extras: {} },
    { seed: 42, objective: 'total', extras: { limits: true } },
    { seed: 43, objective: 'weighted', extras: { weights: true, targets: true } },
    { seed: 44, objective: 'weighted', extras: { weights: true, limits: true, targets: true } },
    { seed: 45, objective: 'max-wait', extras: {} },
  ];
  for (const { seed, objective, extras } of cases) {
    it(`seed ${seed}, ${objective}${Object.keys(extras).length > 0 ? ` (${Object.keys(extras).join(', ')})` : ''}: same front, figures and counts; front as brute force`, async () => {
      const p = problemOf(seed, { min: 7, max: 9, toggles: 12 }, extras);
      const { reuse, fresh } = await both(p, objective);
      expect(reported(reuse)).toEqual(reported(fresh));
      expect(reuse.evaluations).toBeGreaterThan(20);
      if (objective === 'max-wait') return; // the search is a heuristic there (see recommend.test.ts)
      const expected = bruteFront(p, allDesigns(p, objective));
      expect(reuse.pareto.map((d) => d.cost)).toEqual(expected.map((e) => e.cost));
      reuse.pareto.forEach((d, i) => expect(Math.abs(d.objective - expected[i]!.objective)).toBeLessThanOrEqual(1e-9 * expected[i]!.objective));
    });
  }
});

/** A scorer that counts the tasks it is given. */
function countingScorer(inner: Scorer): { scorer: Scorer; tally: { flipTasks: number; flips: number; singles: number } } {
  const tally = { flipTasks: 0, flips: 0, singles: 0 };
  const scorer: Scorer = {
    mode: inner.mode,
    jobs: inner.jobs,
    score: (designs) => {
      tally.singles += designs.length;
      return inner.score(designs);
    },
    scoreTasks: (tasks) => {
      for (const t of tasks) {
        if ('design' in t) tally.singles++;
        else {
          tally.flipTasks++;
          tally.flips += t.flips.length;
        }
      }
      return inner.scoreTasks(tasks);
    },
    close: () => inner.close(),
  };
  return { scorer, tally };
}

async function search(p: DesignProblem, objective: ObjectiveName, mode: ReuseMode): Promise<{ records: DesignRecord[]; result: SearchResult; evaluator: DesignEvaluator; tally: ReturnType<typeof countingScorer>['tally'] }> {
  const { scorer, tally } = countingScorer(inThreadScorer(scoreSpecOf(p, objective)));
  const evaluator = new DesignEvaluator(p, objective, scorer, undefined, mode);
  // today, the baselines and some random designs (the recommender adds MILP designs, which need HiGHS)
  const rng = new Rng(17);
  const random = Array.from({ length: 30 }, () => Uint8Array.from(p.toggles, () => (rng.chance(0.5) ? 1 : 0)));
  const seeds = [Uint8Array.from(p.today), ...baselines(p).map((b) => b.design), ...random];
  const result = await paretoLocalSearch(evaluator, seeds, { random: seededRandom(5) });
  return { records: [...evaluator.records()], result, evaluator, tally };
}

function expectSameRecords(a: readonly DesignRecord[], b: readonly DesignRecord[]): void {
  expect(a.map((r) => r.key)).toEqual(b.map((r) => r.key));
  a.forEach((x, i) => {
    const y = b[i]!;
    for (const f of ['stable', 'feasible', 'meetsTargets', 'withinLimits', 'independentSets', 'cost', 'changes'] as const) expect(x[f], `${x.key} ${f}`).toBe(y[f]);
    for (const f of ['objective', 'backlogTotal', 'maxWait', 'targetRatio'] as const) expect(close(x[f], y[f]), `${x.key} ${f}: ${x[f]} vs ${y[f]}`).toBe(true);
    expect(x.backlog === null).toBe(y.backlog === null);
    if (x.backlog && y.backlog) x.backlog.forEach((v, k) => expect(close(v, y.backlog![k]!), `${x.key} class ${k}`).toBe(true));
  });
}

describe('inside the search: every scored design, by reuse or afresh', () => {
  it('forced reuse: every record equal to 1e-10, every verdict and count exact, the same front and refusals', async () => {
    for (const [seed, objective, extras] of [
      [51, 'total', {}],
      [52, 'weighted', { weights: true, targets: true }],
    ] as const) {
      const p = problemOf(seed, { min: 8, max: 10, toggles: 12 }, extras);
      const reuse = await search(p, objective, 'always');
      const fresh = await search(p, objective, 'never');
      expectSameRecords(reuse.records, fresh.records);
      expect(reuse.result.front.map((r) => r.key)).toEqual(fresh.result.front.map((r) => r.key));
      expect([...reuse.result.harmful]).toEqual([...fresh.result.harmful]);
      expect([reuse.result.rounds, reuse.result.kicks]).toEqual([fresh.result.rounds, fresh.result.kicks]);
      expect([reuse.evaluator.evaluations, reuse.evaluator.scored]).toEqual([fresh.evaluator.evaluations, fresh.evaluator.scored]);
      // reuse did the work of most single-toggle neighbours; the fresh run none
      expect(reuse.tally.flips).toBeGreaterThan(reuse.records.length / 10);
      expect(fresh.tally.flipTasks).toBe(0);
    }
  });

  it("'auto' reuses on a per-class objective with designs above the set threshold, and changes nothing", async () => {
    // 16–17 classes on a sparse tree, rates from positive flows on the fixed pairs so that most designs
    // are stable: a few thousand independent sets per design
    const p = problemOf(61, { min: 16, max: 17, toggles: 10 }, { weights: true, flowRates: true });
    const auto = await search(p, 'weighted', 'auto');
    const fresh = await search(p, 'weighted', 'never');
    expect(Math.min(...auto.records.filter((r) => r.stable).map((r) => r.independentSets))).toBeGreaterThan(REUSE_MIN_SETS);
    expect(auto.tally.flips).toBeGreaterThan(auto.records.length / 10);
    expectSameRecords(auto.records, fresh.records);
    expect(auto.result.front.map((r) => r.key)).toEqual(fresh.result.front.map((r) => r.key));
    // the total backlog alone: reuse measured slower at every size, so 'auto' never uses it
    const total = await search(p, 'total', 'auto');
    expect(total.tally.flipTasks).toBe(0);
    // and the whole recommendation is the same
    const a = await recommend(p, { objective: 'weighted', workerUrl: null });
    const f = await recommend(p, { objective: 'weighted', workerUrl: null, reuse: 'never' });
    expect(reported(a)).toEqual(reported(f));
  });

  it('reuse on two worker threads gives the in-thread recommendation', async () => {
    const p = problemOf(43, { min: 7, max: 9, toggles: 12 }, { weights: true, targets: true });
    const workers = await recommend(p, { objective: 'weighted', jobs: 2, workerUrl: new URL('./support/score-worker-ts.mjs', import.meta.url), reuse: 'always' });
    const inThread = await recommend(p, { objective: 'weighted', workerUrl: null, reuse: 'always' });
    expect(workers.scoring).toBe('workers');
    expect(reported(workers)).toEqual(reported(inThread));
  });
});

describe('the reuse policy (thresholds measured in bench/_incremental-crossover.ts)', () => {
  it("'auto' only for per-class scoring, from the set threshold, with enough flips; 'always' and 'never' as named", () => {
    expect(reuses('auto', false, 1e6, 40)).toBe(false);
    expect(reuses('auto', true, REUSE_MIN_SETS - 1, 40)).toBe(false);
    expect(reuses('auto', true, 5_000, 3)).toBe(true);
    expect(reuses('auto', true, 5_000, 2)).toBe(false);
    expect(reuses('auto', true, 500_000, 7)).toBe(false);
    expect(reuses('auto', true, 500_000, 8)).toBe(true);
    expect(reuses('auto', true, 5e6, 40)).toBe(false); // beyond the single-change memory guard
    expect(reuses('always', false, 10, 1)).toBe(true);
    expect(reuses('never', true, 5_000, 40)).toBe(false);
  });

  it("'auto' scores afresh where the fixed pairs' shared trie serves the base (at least 1/SHARED_TRIE_SPARSE of its sets)", () => {
    expect(reuses('auto', true, 5_000, 40, 5_000 * SHARED_TRIE_SPARSE)).toBe(false);
    expect(reuses('auto', true, 5_000, 40, 5_000 * SHARED_TRIE_SPARSE + 1)).toBe(true);
    expect(reuses('auto', true, 5_000, 40, undefined)).toBe(true);
    expect(reuses('always', true, 5_000, 40, 5_000)).toBe(true);
  });
});
