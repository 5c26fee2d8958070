/**
 * Sequential allocation of the re-score (src/design/search/allocation.ts) and the merge of extra
 * replications (sim-score.ts `mergeFigures`, score.ts `extendedScore`).
 *
 * References: (1) a design simulated 10 + 10 replications must have exactly the figures of one
 * 20-replication run (the extra replications continue the seed's streams), checked against the
 * simulator run once; (2) the allocation's rule on synthetic paired data whose verdicts follow from
 * the Student t interval computed here by hand (mean ± t · s / √R; the quantile t from
 * src/sim/student-t.ts, itself checked against the closed forms of 1, 2 and 4 degrees of freedom in
 * tests/sim/student-t.test.ts), not from the allocation's code.
 */
import { describe, expect, it } from 'vitest';
import { compileGraph } from '../../src/model/compile.js';
import { mergeFigures, simulateDesign, type SimPlan } from '../../src/design/scoring/sim-score.js';
import { extendedScore, scoreDesign, type Score, type ScoreSpec } from '../../src/design/scoring/score.js';
import { allocateReplications, allocationPlan, limitInsideInterval, negligibleDifference, replicationsOf } from '../../src/design/search/allocation.js';
import { Rng } from '../helpers/random.js';
import { t975 } from '../../src/sim/student-t.js';

const plan = (replications: number, firstReplication = 0): SimPlan => ({ arrivals: 8_000, warmup: 1_000, replications, seed: 5, maxWaiting: 1_000_000, firstReplication });

describe('extra replications continue the same streams', () => {
  // a triangle with a self-loop: stable and non-bipartite
  const model = compileGraph(['a', 'b', 'c'], [1, 0.8, 0.6], [[0, 1], [1, 2], [0, 2], [0, 0]]);
  for (const patience of [undefined, [2, 0, 1.5]]) {
    it(`10 + 10 replications give the figures of one run of 20${patience ? ' (with patience)' : ''}`, () => {
      const whole = simulateDesign(model, plan(20), patience);
      const merged = mergeFigures(simulateDesign(model, plan(10), patience), simulateDesign(model, plan(10, 10), patience));
      expect(Array.from(merged.perReplication)).toEqual(Array.from(whole.perReplication));
      expect(merged.replications).toBe(20);
      expect(merged.backlogTotal).toBeCloseTo(whole.backlogTotal, 12);
      expect(merged.backlogCi95![0]).toBeCloseTo(whole.backlogCi95![0], 12);
      expect(merged.backlogCi95![1]).toBeCloseTo(whole.backlogCi95![1], 12);
      for (let k = 0; k < 3; k++) {
        expect(merged.backlog[k]).toBeCloseTo(whole.backlog[k]!, 12);
        expect(merged.abandonShare[k]).toBeCloseTo(whole.abandonShare[k]!, 12);
        expect(merged.abandonShareHi[k]).toBeCloseTo(whole.abandonShareHi[k]!, 12);
      }
      for (let e = 0; e < model.m; e++) expect(merged.matchRates[e]).toBeCloseTo(whole.matchRates[e]!, 10);
    });
  }

  it('refuses replications that do not follow on', () => {
    expect(() => mergeFigures(simulateDesign(model, plan(5)), simulateDesign(model, plan(5, 6)))).toThrow(/do not continue/);
  });

  it('extendedScore merges scores of the scorer (per-class figures kept)', () => {
    const spec: ScoreSpec = { ids: ['a', 'b', 'c'], rates: [1, 0.8, 0.6], fixed: [[0, 1], [1, 2], [0, 2]], toggles: [[0, 0]], perClass: true, method: 'simulation', sim: plan(10) };
    const first = scoreDesign(spec, [1]);
    const more = scoreDesign({ ...spec, sim: plan(10, 10) }, [1]);
    const whole = scoreDesign({ ...spec, sim: plan(20) }, [1]);
    const merged = extendedScore(spec, first, more);
    expect(replicationsOf(merged)).toBe(20);
    expect(merged.backlogTotal).toBeCloseTo(whole.backlogTotal, 12);
    expect(Array.from(merged.backlogHi!)).toEqual(Array.from(whole.backlogHi!).map((x) => expect.closeTo(x, 12)));
  });
});

/** A synthetic simulated score: only what the allocation reads. */
function fake(values: number[]): Score {
  return { stable: true, backlogTotal: values.reduce((s, x) => s + x, 0) / values.length, backlog: null, valueRate: NaN, independentSets: 0, evaluated: true, method: 'simulation', perReplication: Float64Array.from(values) };
}

/** The paired 95 % interval by hand: mean ± t(0.975, R − 1) · s / √R. */
function handInterval(a: ArrayLike<number>, b: ArrayLike<number>): [number, number] {
  const R = Math.min(a.length, b.length);
  const d = Array.from({ length: R }, (_, i) => a[i]! - b[i]!);
  const mean = d.reduce((s, x) => s + x, 0) / R;
  const sd = Math.sqrt(d.reduce((s, x) => s + (x - mean) ** 2, 0) / (R - 1));
  const half = (t975(R) * sd) / Math.sqrt(R);
  return [mean - half, mean + half];
}

describe('allocation rule on synthetic paired data', () => {
  // design "x" then three others: "far" clearly lower (significant at once), "same" equal to x up to
  // tiny noise (negligible at once), "close" a small true difference hidden by the noise
  const rng = new Rng(17);
  const normal = (): number => Math.sqrt(-2 * Math.log(1 - rng.next())) * Math.cos(2 * Math.PI * rng.next());
  const streams = Array.from({ length: 40 }, () => 10 + normal()); // the common part of every design
  const series = (shift: number, noise: number): number[] => streams.map((c) => c + shift + noise * normal());
  const full: Record<string, number[]> = { x: series(0, 0.02), far: series(-3, 0.02), same: series(0, 0.001), close: series(-0.15, 0.4) };
  const take = (key: string, first: number, count: number): Score => fake(full[key]!.slice(first, first + count));
  const open = (sc: ReadonlyMap<string, Score>): string[][] =>
    ['far', 'same', 'close'].flatMap((k) => {
      const a = sc.get(k)!.perReplication!;
      const b = sc.get('x')!.perReplication!;
      const [lo, hi] = handInterval(a, b);
      const zone = 0.01 * sc.get('x')!.backlogTotal;
      return lo > 0 || hi < 0 || (lo >= -zone && hi <= zone) ? [] : [['x', k]];
    });

  it('extends only the open pair, both designs to the same count, and stops when settled or at the most', async () => {
    const calls: Array<{ keys: string[]; first: number; count: number }> = [];
    const start = new Map(Object.keys(full).map((k) => [k, take(k, 0, 10)] as const));
    const initiallyOpen = open(start);
    const { scores, record } = await allocateReplications({
      plan: allocationPlan(10),
      scores: start,
      open,
      extend: async (keys, first, count) => {
        calls.push({ keys, first, count });
        return keys.map((k) => take(k, first, count));
      },
      merge: (a, b) => fake([...a.perReplication!, ...b.perReplication!]),
      stopped: () => false,
    });
    // far and same are settled by the first 10 replications (checked by hand above): never extended
    // (the data are made so: far significant, same negligible, close open after 10 replications)
    expect(initiallyOpen).toEqual([['x', 'close']]);
    expect(replicationsOf(scores.get('far'))).toBe(10);
    expect(replicationsOf(scores.get('same'))).toBe(10);
    // every extension continued where the design stood, in steps of 10
    for (const c of calls) expect(c.count).toBe(10);
    const closeReps = replicationsOf(scores.get('close'));
    expect(replicationsOf(scores.get('x'))).toBe(closeReps);
    const settled = open(scores).length === 0;
    // either the pair is settled now, or both designs reached the most (40)
    expect(settled || closeReps === 40).toBe(true);
    expect(closeReps).toBeGreaterThan(10);
    expect(record.extraReplications).toBe(2 * (closeReps - 10));
    expect(record.extended).toBe(closeReps > 10 ? 2 : 0);
    expect(record.unresolved).toBe(open(scores).length);
    expect(record.openAtStart).toBe(1);
    expect(record.rounds).toBe((closeReps - 10) / 10);
    // the merged figures are those of the longer series
    expect(Array.from(scores.get('close')!.perReplication!)).toEqual(full.close!.slice(0, closeReps));
  });

  it('a stopped run keeps the figures it has', async () => {
    const start = new Map(Object.keys(full).map((k) => [k, take(k, 0, 10)] as const));
    const forced = (): string[][] => [['x', 'close']];
    const { scores, record } = await allocateReplications({
      plan: allocationPlan(10),
      scores: start,
      open: forced,
      extend: async (keys, first, count) => keys.map((k) => take(k, first, count)),
      merge: (a, b) => fake([...a.perReplication!, ...b.perReplication!]),
      stopped: () => true,
    });
    expect(record.stopped).toBe(true);
    expect(record.extraReplications).toBe(0);
    expect(replicationsOf(scores.get('close'))).toBe(10);
  });
});

describe('the two tests of a settled question', () => {
  it('negligible: the whole interval within ±share of the reference', () => {
    expect(negligibleDifference({ mean: 0.01, ci95: [-0.05, 0.08], significant: false }, 10, 0.01)).toBe(true);
    expect(negligibleDifference({ mean: 0.01, ci95: [-0.05, 0.11], significant: false }, 10, 0.01)).toBe(false);
    expect(negligibleDifference({ mean: 0.01, ci95: null, significant: false }, 10, 0.01)).toBe(false);
  });
  it('a limit inside an interval (NaN: no limit)', () => {
    expect(limitInsideInterval([0.1, NaN], [0.08, 0], [0.12, 1])).toBe(true);
    expect(limitInsideInterval([0.1, NaN], [0.11, 0], [0.12, 1])).toBe(false);
    expect(limitInsideInterval(undefined, [0], [1])).toBe(false);
  });
});
