import { describe, expect, it } from 'vitest';
import { recommend } from '../../src/design/search/recommend.js';
import type { DesignProblem } from '../../src/design/space/problem.js';
import { UsageError } from '../../src/errors.js';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { bruteStability } from '../helpers/brute-stability.js';
import { allDesigns, bruteCost, bruteFront, bruteNegNetValue, designModel } from '../helpers/design-brute.js';
import { randomProblem } from '../helpers/design-problems.js';
import { Rng } from '../helpers/random.js';

// recommend --objective net-value against an exhaustive enumeration written in the tests
// (tests/helpers/design-brute.ts): every subset of the toggles evaluated with a fresh evaluateExact,
// net value = Σ_pairs value · match rate − waitingCost · total backlog computed there from the
// definitions (values matched to the model's edges by class indices), stability by brute force over
// independent sets ("Stability of the stochastic matching model", J. Appl. Probab. 2016), the
// flexibility penalty and the front of cost against net value (higher is better; minimised as its
// negative) by their definitions.

const maskOf = (d: Uint8Array): number => d.reduce((m, v, j) => m | (v ? 1 << j : 0), 0);
const close = (a: number, b: number, rel = 1e-9): boolean => Math.abs(a - b) <= rel * Math.max(1, Math.abs(a), Math.abs(b));

function valuedProblem(seed: number): DesignProblem {
  const rng = new Rng(seed);
  const p = randomProblem(rng, {
    minClasses: 6,
    maxClasses: 8,
    toggles: rng.int(9, 11),
    removableShare: rng.uniform(0.15, 0.45),
    budgetShare: rng.uniform(0.3, 0.8),
    loopProb: rng.uniform(0.1, 0.4),
  });
  // values per match in [−3, 12] (a quarter of the pairs without one: 0), a waiting cost in [0.2, 3]
  const value = (): number => (rng.chance(0.25) ? 0 : Number(rng.uniform(-3, 12).toFixed(2)));
  return {
    ...p,
    fixedValue: Float64Array.from(p.fixed, value),
    toggles: p.toggles.map((t) => ({ ...t, value: value() })),
    waitingCost: Number(rng.uniform(0.2, 3).toFixed(2)),
    hasValues: true,
  };
}

describe('recommend --objective net-value: the Pareto set of cost against net value equals the exhaustive front', () => {
  for (const seed of [61, 62, 63, 64, 66, 67]) {
    it(`seed ${seed}`, async () => {
      const p = valuedProblem(seed);
      const expected = bruteFront(p, allDesigns(p, 'net-value'));
      expect(expected.length).toBeGreaterThan(0);
      for (const exhaustive of [true, false]) {
        const rec = await recommend(p, { objective: 'net-value', workerUrl: null, exhaustive });
        // same costs, same (minimised) objective = −net value, along the front
        expect(rec.pareto.map((d) => d.cost), `exhaustive ${exhaustive}`).toEqual(expected.map((e) => e.cost));
        rec.pareto.forEach((d, i) => expect(close(d.objective, expected[i]!.objective), `cost ${d.cost}`).toBe(true));
        // net value rises along the front (higher is better)
        for (let i = 1; i < rec.pareto.length; i++) expect(-rec.pareto[i]!.objective).toBeGreaterThan(-rec.pareto[i - 1]!.objective);
        for (const d of rec.pareto) {
          const mask = maskOf(d.design);
          const model = designModel(p, mask);
          expect(bruteStability(model).stable).toBe(true);
          expect(close(bruteCost(p, mask), d.cost)).toBe(true);
          const fresh = evaluateExact(model);
          // the details' value rate and objective from the definition
          expect(close(d.objective, bruteNegNetValue(p, model, fresh.backlog, fresh.matchRates))).toBe(true);
          expect(close(d.valueRate - p.waitingCost * d.backlogTotal, -d.objective)).toBe(true);
        }
      }
    });
  }

  it('refuses the objective when no pair has a value and there is no waiting cost', async () => {
    const p = { ...valuedProblem(61), hasValues: false };
    await expect(recommend(p, { objective: 'net-value', workerUrl: null })).rejects.toBeInstanceOf(UsageError);
  });

  it('the worker pool gives the same result as scoring in this thread (the spec carries the values)', async () => {
    const p = valuedProblem(63);
    const workers = await recommend(p, { objective: 'net-value', jobs: 2, workerUrl: new URL('./support/score-worker-ts.mjs', import.meta.url) });
    const inThread = await recommend(p, { objective: 'net-value', workerUrl: null });
    expect(workers.scoring).toBe('workers');
    const strip = (r: typeof inThread) => ({ ...r, scoring: null });
    expect(JSON.stringify(strip(workers), (_k, v) => (v instanceof Float64Array || v instanceof Uint8Array ? Array.from(v) : v))).toBe(
      JSON.stringify(strip(inThread), (_k, v) => (v instanceof Float64Array || v instanceof Uint8Array ? Array.from(v) : v)),
    );
  });
});
