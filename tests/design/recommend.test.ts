import { afterAll, describe, expect, it } from 'vitest';
import { recommend, type Recommendation } from '../../src/design/search/recommend.js';
import type { DesignProblem } from '../../src/design/space/problem.js';
import { InfeasibleDesignError } from '../../src/errors.js';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { bruteStability } from '../helpers/brute-stability.js';
import { allDesigns, bruteCost, bruteFront, bruteObjective, designModel, type BruteObjective } from '../helpers/design-brute.js';
import { randomProblem } from '../helpers/design-problems.js';
import { Rng } from '../helpers/random.js';
import { randomScenario } from '../helpers/random-scenario.js';
import { parseScenario } from '../../src/model/validate.js';
import { readDesignFields } from '../../src/model/design-fields.js';
import { designProblem } from '../../src/design/space/problem.js';

// The recommender against brute force written from the definitions (tests/helpers/design-brute.ts):
// every design enumerated, stability by brute force over independent sets ("Stability of the
// stochastic matching model", J. Appl. Probab. 2016), objectives from a fresh evaluateExact (itself
// checked against the permutation-sum oracle in tests/exact/), the flexibility penalty and the
// Pareto front by their definitions.

const maskOf = (d: Uint8Array): number => d.reduce((m, v, j) => m | (v ? 1 << j : 0), 0);
const close = (a: number, b: number, rel = 1e-9): boolean => Math.abs(a - b) <= rel * Math.max(1, Math.abs(a), Math.abs(b));

interface Tally {
  search: number;
  exhaustive: number;
  space: number;
}
const tally: Tally = { search: 0, exhaustive: 0, space: 0 };
afterAll(() => {
  if (tally.exhaustive > 0) {
    console.log(
      `recommend: local search used ${tally.search} exact evaluations where --exhaustive used ${tally.exhaustive} ` +
        `(ratio ${(tally.search / tally.exhaustive).toFixed(3)}; ${((100 * tally.search) / tally.space).toFixed(1)}% of the ${tally.space} designs)`,
    );
  }
});

function problemOf(seed: number, extras: { limits?: boolean; targets?: boolean; weights?: boolean } = {}): DesignProblem {
  const rng = new Rng(seed);
  const p = randomProblem(rng, {
    minClasses: 7,
    maxClasses: 9,
    toggles: rng.int(12, 14),
    removableShare: rng.uniform(0.15, 0.45),
    budgetShare: rng.uniform(0.2, 0.7),
    loopProb: rng.uniform(0.1, 0.4),
  });
  if (extras.limits) for (let k = 0; k < p.n; k++) if (rng.chance(0.4)) p.maxDegree[k] = Math.max(p.fixedDegree[k]!, 3);
  if (extras.targets) for (let k = 0; k < p.n; k++) if (rng.chance(0.3)) p.waitTarget[k] = rng.uniform(0.3, 3);
  if (extras.weights) for (let k = 0; k < p.n; k++) p.weight[k] = rng.uniform(0, 3);
  return p;
}

/** Checks every returned design against brute force and the front against the brute-force front. */
function checkAgainstBrute(p: DesignProblem, objective: BruteObjective, rec: Recommendation, expected: Array<{ cost: number; objective: number }>): void {
  // same cost/objective pairs as the brute-force front
  expect(rec.pareto.map((d) => d.cost)).toEqual(expected.map((e) => e.cost));
  rec.pareto.forEach((d, i) => expect(close(d.objective, expected[i]!.objective), `objective at cost ${d.cost}`).toBe(true));
  for (const d of rec.pareto) {
    const mask = maskOf(d.design);
    const model = designModel(p, mask);
    // stable by brute force, within budget (cost recomputed by hand), within limits
    expect(bruteStability(model).stable).toBe(true);
    expect(close(bruteCost(p, mask), d.cost)).toBe(true);
    expect(d.cost).toBeLessThanOrEqual(p.budget + 1e-9);
    const deg = new Array<number>(p.n).fill(0);
    for (let e = 0; e < model.m; e++) {
      deg[model.edgeA[e]!]++;
      if (model.edgeB[e] !== model.edgeA[e]) deg[model.edgeB[e]!]++;
    }
    deg.forEach((x, k) => expect(x).toBeLessThanOrEqual(p.maxDegree[k]!));
    // re-evaluates to the reported figures with a fresh evaluateExact
    const fresh = evaluateExact(model);
    expect(close(fresh.backlogTotal, d.backlogTotal)).toBe(true);
    expect(close(bruteObjective(objective, p, fresh.backlog), d.objective)).toBe(true);
    for (let k = 0; k < p.n; k++) expect(fresh.wait[k]!).toBeLessThanOrEqual(p.waitTarget[k]! * (1 + 1e-9));
  }
  // no returned design is dominated by another returned design
  for (const a of rec.pareto) {
    for (const b of rec.pareto) {
      if (a === b) continue;
      const dominated = b.cost <= a.cost && b.objective <= a.objective && (b.cost < a.cost || b.objective < a.objective);
      expect(dominated).toBe(false);
    }
  }
}

async function compareWithBrute(p: DesignProblem, objective: BruteObjective, countRatio: boolean): Promise<void> {
  const expected = bruteFront(p, allDesigns(p, objective));
  if (countRatio) expect(expected.length).toBeGreaterThanOrEqual(10); // a front worth searching for
  if (expected.length === 0) {
    await expect(recommend(p, { objective, workerUrl: null })).rejects.toBeInstanceOf(InfeasibleDesignError);
    return;
  }
  const search = await recommend(p, { objective, workerUrl: null });
  const exhaustive = await recommend(p, { objective, workerUrl: null, exhaustive: true });
  checkAgainstBrute(p, objective, exhaustive, expected);
  checkAgainstBrute(p, objective, search, expected);
  expect(search.evaluations).toBeLessThan(exhaustive.evaluations);
  if (countRatio) {
    tally.search += search.evaluations;
    tally.exhaustive += exhaustive.evaluations;
    tally.space += search.designSpace;
  }
}

describe('recommend: total backlog on seeded random problems with 12–14 toggles', () => {
  for (const seed of [11, 12, 13, 14, 15, 16, 17, 18, 19, 20]) {
    it(`seed ${seed}: the search front equals the brute-force and --exhaustive fronts`, async () => {
      await compareWithBrute(problemOf(seed), 'total', true);
    });
  }
});

describe('recommend: constraints and other objectives', () => {
  it('weighted backlog with maxCompatibilities and wait targets (seeds 21–22)', async () => {
    for (const seed of [21, 22]) await compareWithBrute(problemOf(seed, { limits: true, targets: true, weights: true }), 'weighted', false);
  });

  it('largest mean wait: --exhaustive equals brute force; the search returns admissible, non-dominated designs', async () => {
    const p = problemOf(31);
    const all = allDesigns(p, 'max-wait');
    const expected = bruteFront(p, all);
    expect(expected.length).toBeGreaterThan(0);
    const exhaustive = await recommend(p, { objective: 'max-wait', workerUrl: null, exhaustive: true });
    checkAgainstBrute(p, 'max-wait', exhaustive, expected);
    const search = await recommend(p, { objective: 'max-wait', workerUrl: null });
    // each design the search returns is on or above the true front, and at most as many as there are levels
    for (const d of search.pareto) {
      const best = Math.min(...expected.filter((e) => e.cost <= d.cost + 1e-9).map((e) => e.objective));
      expect(d.objective).toBeGreaterThanOrEqual(best * (1 - 1e-9));
      expect(d.cost).toBeLessThanOrEqual(p.budget + 1e-9);
    }
  });
});

// Scenario files like the ones analysts bring (tests/helpers/random-scenario.ts: groups of classes
// joined along a chain, stable today by construction), with 10–13 candidates and a few removable
// compatibilities or none. The default search (no MILP budget ladder; the cheapest stable design
// often known without a solve) must return the front of every subset enumerated here, each scored
// by a fresh evaluateExact and judged by brute force (tests/helpers/design-brute.ts: stability over
// independent sets, the flexibility penalty and the Pareto filter written from their definitions).
describe('recommend: the default search returns the enumerated front on seeded scenario files with 10–13 candidates', () => {
  const cases = [
    { seed: 61, groups: 3, perGroup: 4, candidates: 10, removableShare: 0, budgetShare: 0.5 },
    { seed: 62, groups: 4, perGroup: 3, candidates: 12, removableShare: 0, budgetShare: 0.4 },
    { seed: 63, groups: 3, perGroup: 4, candidates: 11, removableShare: 0.1, budgetShare: 0.6 },
    { seed: 64, groups: 4, perGroup: 3, candidates: 13, removableShare: 0, budgetShare: 1 },
  ];
  for (const c of cases) {
    it(`seed ${c.seed}: ${c.groups * c.perGroup} classes, ${c.candidates} candidates`, async () => {
      const s = parseScenario(JSON.stringify(randomScenario(c.seed, c).doc));
      const p = designProblem(s, readDesignFields(s));
      expect(p.toggles.length).toBeGreaterThanOrEqual(10);
      expect(p.toggles.length).toBeLessThanOrEqual(14);
      const expected = bruteFront(p, allDesigns(p, 'total'));
      expect(expected.length).toBeGreaterThanOrEqual(3);
      const search = await recommend(p, { workerUrl: null });
      checkAgainstBrute(p, 'total', search, expected);
    });
  }
});
