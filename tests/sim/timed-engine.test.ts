import { describe, expect, it } from 'vitest';
import { TooLargeError } from '../../src/errors.js';
import { compileGraph } from '../../src/model/compile.js';
import { seedState, streamStates } from '../../src/sim/random.js';
import { simulate } from '../../src/sim/simulate.js';
import { buildSimModel } from '../../src/sim/sim-model.js';
import { TimedEngine } from '../../src/sim/timed-engine.js';
import { studentQuantile } from '../../src/sim/student-t.js';
import { DeadlineReference } from '../helpers/deadline-reference.js';
import { expectInside, familyFactor } from './support/intervals.js';

/** Class k's queue holds its live count of items in arrival order, and headVal is its oldest (Infinity when empty). */
function expectInArrivalOrder(engine: TimedEngine, k: number): number[] {
  const items = engine.queues.items(k);
  expect(items.length).toBe(engine.counts[k]);
  for (let p = 1; p < items.length; p++) expect(items[p]!).toBeGreaterThan(items[p - 1]!);
  if (items.length > 0) expect(engine.headVal[k]).toBe(items[0]);
  else expect(engine.headVal[k]).toBe(Infinity);
  return items;
}

describe('impatience: one self-compatible class (closed form derived by hand)', () => {
  /*
   * Shift swaps within one team: rate λ, each waiting request gives up after an exponential time of
   * mean θ (γ = 1/θ). Derived by hand:
   *  1. A second request matches a waiting one, so at most one waits: states 0 and 1.
   *  2. 0 → 1 at rate λ (an arrival waits); 1 → 0 at rate λ (an arrival matches it) + γ (it abandons).
   *     Balance: π1 (λ + γ) = π0 λ, so π1 = λ / (2λ + γ), π0 = (λ + γ) / (2λ + γ).
   *  3. Backlog = π1. Abandonment rate = γ π1; share of arrivals that abandon = γ π1 / λ.
   *     Matched at once (PASTA) = π1. Self-match rate = λ π1.
   *  4. Waits of matched items: with probability π1 an arrival is matched at once (wait 0); with
   *     probability π0 it waits, and leaves at rate λ + γ, matched with probability λ/(λ+γ) — and the
   *     time to the first of the two clocks is Exp(λ+γ) whichever fires. Among matched items
   *     (mass m = π1 + π0 λ/(λ+γ)): P(W > t) = π0 λ/(λ+γ) · e^{−(λ+γ)t} / m,
   *     mean = π0 λ/(λ+γ)² / m, and the p-quantile is ln(c/(1−p))/(λ+γ) with c = π0 λ/(λ+γ)/m.
   */
  const lambda = 2;
  const theta = 0.5;
  const gamma = 1 / theta;
  const pi1 = lambda / (2 * lambda + gamma);
  const pi0 = 1 - pi1;
  const waited = (pi0 * lambda) / (lambda + gamma);
  const mass = pi1 + waited;
  const c = waited / mass;
  const quantile = (p: number): number => Math.log(c / (1 - p)) / (lambda + gamma);
  const model = compileGraph(['night-team'], [lambda], [[0, 0]]);

  it('backlog, abandonment, immediate matches, match rate, waits', async () => {
    const R = 16;
    const r = await simulate(model, { patience: [theta], arrivals: 125_000, replications: R, seed: 31 });
    expect(r.engine).toBe('timed');
    const f = familyFactor(8, R);
    expectInside(r.backlog.byClass[0]!, pi1, f, 'backlog');
    expectInside(r.abandonRate.byClass[0]!, gamma * pi1, f, 'abandonment rate');
    expectInside(r.abandonShare.byClass[0]!, (gamma * pi1) / lambda, f, 'abandonment share');
    expectInside(r.immediateMatch.byClass[0]!, pi1, f, 'matched at once');
    expectInside(r.matchRates[0]!, lambda * pi1, f, 'self-match rate');
    expectInside(r.wait.byClass[0]!, (pi0 * lambda) / (lambda + gamma) ** 2 / mass, f, 'mean wait of matched items');
    for (const [slot, p] of [[1, 0.9], [2, 0.99]] as const) {
      const ci = r.wait.byClass[0]!.quantileCi95[slot]!;
      expectInside({ mean: (ci[0] + ci[1]) / 2, ci95: ci, count: R }, quantile(p), f, `p${p * 100}`);
    }
    expect(Math.abs(r.wait.byClass[0]!.p90 - quantile(0.9))).toBeLessThan(0.02 * quantile(0.9));
  });
});

describe('impatience: two classes that only match each other (series derived by hand)', () => {
  /*
   * Game matchmaking: attackers (rate λa, patience θa) only play defenders (λb, θb). Without patience
   * this bipartite design is unstable; abandonment keeps it bounded. Derived by hand:
   *  1. Attackers and defenders never wait together: states ∅, (a, i), (b, j).
   *  2. (a, i) → (a, i+1) at rate λa; (a, i) → (a, i−1) at rate λb (a defender takes the oldest
   *     attacker) + i γa (each of the i waiting attackers abandons at γa). Same for b.
   *  3. Two birth–death arms around ∅, reversible: π(a, i) = π∅ ∏_{l=1..i} λa / (λb + l γa), and the
   *     same with a and b swapped; the terms fall faster than geometrically, so the series converge.
   *  4. L_a = Σ i π(a, i); abandonment rate of a = γa L_a; an attacker is matched at once iff a
   *     defender waits (PASTA): P(b waits); match rate = λa P(b waits) + λb P(a waits).
   * Attackers queue about ten deep, so abandonments often hit the middle of their queue (lazy removal).
   */
  const la = 2;
  const lb = 1.5;
  const ga = 0.05;
  const gb = 0.5;
  const arm = (up: number, other: number, g: number): number[] => {
    const w = [1];
    for (let i = 1; i < 2000; i++) w.push((w[i - 1]! * up) / (other + i * g));
    return w;
  };
  const wa = arm(la, lb, ga);
  const wb = arm(lb, la, gb);
  const Z = wa.reduce((s, x) => s + x, 0) + wb.reduce((s, x) => s + x, 0) - 1;
  const La = wa.reduce((s, x, i) => s + i * x, 0) / Z;
  const Lb = wb.reduce((s, x, i) => s + i * x, 0) / Z;
  const Pa = (wa.reduce((s, x) => s + x, 0) - 1) / Z;
  const Pb = (wb.reduce((s, x) => s + x, 0) - 1) / Z;
  const model = compileGraph(['attacker', 'defender'], [la, lb], [[0, 1]]);

  it('backlogs, abandonment rates, immediate matches, match rate', async () => {
    const R = 16;
    const r = await simulate(model, { patience: [1 / ga, 1 / gb], arrivals: 150_000, replications: R, seed: 8 });
    const f = familyFactor(7, R);
    expectInside(r.backlog.byClass[0]!, La, f, 'attacker backlog');
    expectInside(r.backlog.byClass[1]!, Lb, f, 'defender backlog');
    expectInside(r.abandonRate.byClass[0]!, ga * La, f, 'attacker abandonment rate');
    expectInside(r.abandonRate.byClass[1]!, gb * Lb, f, 'defender abandonment rate');
    expectInside(r.immediateMatch.byClass[0]!, Pb, f, 'attacker matched at once');
    expectInside(r.immediateMatch.byClass[1]!, Pa, f, 'defender matched at once');
    expectInside(r.matchRates[0]!, la * Pb + lb * Pa, f, 'match rate');
  });

  it('competing events: keeps each queue in arrival order through abandonments and compactions', () => {
    // a heavier variant: about 900 attackers wait, nine abandon per time unit for one served at the head
    const heavy = compileGraph(['attacker', 'defender'], [10, 1], [[0, 1]]);
    const sim = buildSimModel(heavy, { patience: [100, 1] });
    const engine = new TimedEngine(sim, seedState(3), 1e6, undefined, { events: true });
    expect(engine.deadlines).toBe(false);
    let lazy = 0;
    for (let i = 0; i < 50; i++) {
      engine.run(997);
      if (engine.queues.span[0]! > engine.counts[0]!) lazy++;
      // compaction keeps the gone slots bounded by the live ones (plus a constant)
      expect(engine.queues.span[0]!).toBeLessThanOrEqual(2 * engine.counts[0]! + 16);
      for (let k = 0; k < 2; k++) expectInArrivalOrder(engine, k);
    }
    expect(lazy).toBeGreaterThan(10); // gone slots were really left in the rings
  });

  it('deadlines: keeps each queue in arrival order with expired items left in place', () => {
    const heavy = compileGraph(['attacker', 'defender'], [10, 1], [[0, 1]]);
    const sim = buildSimModel(heavy, { patience: [100, 1] });
    const engine = new TimedEngine(sim, seedState(3), 1e6);
    expect(engine.deadlines).toBe(true);
    const due = (k: number, i: number): number => {
      const q = engine.queues;
      return q.due![q.off[k]! + ((q.head[k]! + i) & q.mask[k]!)]!;
    };
    let lazy = 0;
    for (let i = 0; i < 50; i++) {
      engine.run(997);
      for (let k = 0; k < 2; k++) {
        const items = expectInArrivalOrder(engine, k);
        let expired = 0;
        for (let p = 0; p < items.length; p++) if (due(k, p) <= engine.clock) expired++;
        if (expired > 0) lazy++;
      }
      // the rings stay within their capacity, with a free slot
      for (let k = 0; k < 2; k++) expect(engine.queues.span[k]!).toBeLessThan(engine.queues.cap[k]!);
    }
    expect(lazy).toBeGreaterThan(10); // expired items were really left in the rings
  });

  it('a patient overloaded class hits the memory cap cleanly', () => {
    const sim = buildSimModel(model, { patience: [Infinity, 1] });
    const engine = new TimedEngine(sim, seedState(3), 2_000);
    let error: unknown;
    try {
      engine.run(1_000_000);
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(TooLargeError);
    expect((error as Error).message).toMatch(/more than 2,000 items were waiting at once \(2,001 of class attacker\)/);
  });
});

describe('timed engine, deadlines: the kernel = a plain reference, arrival by arrival', () => {
  /*
   * tests/helpers/deadline-reference.ts simulates the same model (FCFM, one exponential deadline per
   * waiting item) with the same random draws in the plainest way: every expired item removed at
   * each arrival, the integrals summed item by item. The kernel finds expired items lazily and
   * derives arrivals, matches, abandonments and the integrals from identities (the class comment of
   * src/sim/timed-engine.ts), so both must end with the same live items and the same counts; the
   * integrals agree to rounding. A small cap makes the kernel drop expired items for its cap checks
   * (without reaching the cap), which must change nothing either.
   */
  const ring = compileGraph(['z0', 'z1', 'z2', 'z3', 'z4', 'z5', 'z6'], [1, 1.2, 1.4, 1.6, 1.8, 2, 2.2], [[0, 1], [1, 2], [2, 3], [3, 4], [4, 5], [5, 6], [6, 0], [0, 3], [2, 2], [5, 5]]);
  // 40 zones in a ring, each also compatible with the zone 7 ahead, every fifth with itself
  const wideIds = Array.from({ length: 40 }, (_, k) => `w${k}`);
  const widePairs: Array<[number, number]> = [];
  for (let k = 0; k < 40; k++) widePairs.push([k, (k + 1) % 40], [k, (k + 7) % 40]);
  for (let k = 0; k < 40; k += 5) widePairs.push([k, k]);
  const wideRing = compileGraph(wideIds, wideIds.map((_, k) => 1 + (k % 4) * 0.25), widePairs);
  const designs = [
    { label: 'two classes, one impatient, deep queues', model: compileGraph(['a', 'b'], [10, 1], [[0, 1]]), patience: [100, 1], cap: 1e6 },
    { label: 'two impatient classes, cap checks on the way', model: compileGraph(['a', 'b'], [10, 1], [[0, 1]]), patience: [1.5, 1], cap: 40 },
    { label: '7-ring with a chord and self-loops, every class impatient', model: ring, patience: [3, 5, 2, 8, 4, 6, 1], cap: 1e6 },
    { label: 'the same ring, some classes patient', model: ring, patience: [0, 5, 0, 8, 4, 0, 1], cap: 1e6 },
    { label: '40 classes (the scan of candidate lists, past the 32-class mask), some patient', model: wideRing, patience: Array.from({ length: 40 }, (_, k) => (k % 3 === 0 ? 0 : 2 + (k % 5))), cap: 1e6 },
    { label: 'a triangle with patient classes only (no patience draws)', model: compileGraph(['z0', 'z1', 'z2'], [1, 1, 1], [[0, 1], [1, 2], [2, 0]]), patience: [0, 0, 0], cap: 1e6 },
  ];
  for (const { label, model, patience, cap } of designs) {
    it(label, () => {
      const sim = buildSimModel(model, { patience });
      const fast = new TimedEngine(sim, seedState(77), cap);
      const plain = new DeadlineReference(sim, seedState(77));
      expect(fast.deadlines).toBe(true);
      fast.run(2_000);
      plain.run(2_000);
      fast.startMeasuring();
      plain.startMeasuring();
      for (const chunk of [1_000, 7_777, 20_000]) {
        fast.run(chunk);
        plain.run(chunk);
        fast.finish(); // repeatable: the counts below are those of the whole window
      }
      expect(fast.clock).toBe(plain.clock);
      expect(fast.arrivalsDone).toBe(2_000 + 28_777);
      const ref = plain.counts();
      for (let k = 0; k < model.n; k++) {
        const q = fast.queues;
        const live = q.items(k).filter((_, i) => q.due![q.off[k]! + ((q.head[k]! + i) & q.mask[k]!)]! > fast.clock);
        expect(live, `queue ${k}`).toEqual(plain.queues[k]!.map((it) => it.born));
      }
      for (const key of ['arrivals', 'immediate', 'waitedMatched', 'waitSum', 'abandoned', 'edgeMatches'] as const) {
        expect(Array.from(fast.counters[key]), key).toEqual(ref[key]);
      }
      expect(Array.from(fast.counters.hist)).toEqual(Array.from(ref.hist));
      for (let k = 0; k < model.n; k++) expect(fast.counters.area[k]!).toBeCloseTo(ref.area[k]!, 6);
      if (patience.some((p) => p > 0)) expect(fast.counters.abandoned.reduce((a, b) => a + b, 0)).toBeGreaterThan(100);
    });
  }
});

describe('timed engine: deadlines and competing events agree in distribution', () => {
  /*
   * Two exact simulations of one model that share no draws: per-item exponential deadlines, and
   * competing exponential clocks with a uniform abandoning item (memorylessness, derived by hand:
   * the first of n_k independent Exp(γ_k) patiences fires at rate n_k γ_k and is each item with
   * probability 1/n_k). Each figure's mean over R replications of each engine must agree within a
   * Welch interval widened for the M figures compared at once (union bound, as familyFactor).
   */
  const model = compileGraph(['z0', 'z1', 'z2', 'z3', 'z4', 'z5', 'z6'], [1, 1.2, 1.4, 1.6, 1.8, 2, 2.2], [[0, 1], [1, 2], [2, 3], [3, 4], [4, 5], [5, 6], [6, 0], [0, 3], [2, 2], [5, 5]]);
  const patience = [3, 5, 2, 8, 4, 6, 1];
  const R = 12;
  const figures = (events: boolean, seed: number): number[][] => {
    const sim = buildSimModel(model, { patience });
    return streamStates(seed, R).map((state) => {
      const e = new TimedEngine(sim, state, 1e6, undefined, { events });
      e.run(5_000);
      e.startMeasuring();
      const t0 = e.clock;
      e.run(40_000);
      e.finish();
      const c = e.counters;
      const out: number[] = [];
      for (let k = 0; k < model.n; k++) {
        out.push(c.area[k]! / (e.clock - t0), c.abandoned[k]! / c.arrivals[k]!, c.immediate[k]! / c.arrivals[k]!, c.waitSum[k]! / (c.immediate[k]! + c.waitedMatched[k]!));
      }
      return out;
    });
  };
  it('backlog, abandonment share, matched at once and mean wait of every class', () => {
    const a = figures(false, 5);
    const b = figures(true, 6);
    const M = a[0]!.length;
    const q = studentQuantile(1 - 0.01 / (2 * M), 2 * R - 2);
    const stats = (rows: number[][], i: number): [number, number] => {
      const xs = rows.map((r) => r[i]!);
      const mean = xs.reduce((s, x) => s + x, 0) / xs.length;
      return [mean, xs.reduce((s, x) => s + (x - mean) ** 2, 0) / (xs.length - 1)];
    };
    let abandonShare = 0;
    for (let i = 0; i < M; i++) {
      const [ma, va] = stats(a, i);
      const [mb, vb] = stats(b, i);
      expect(Math.abs(ma - mb), `figure ${i}: ${ma} vs ${mb}`).toBeLessThanOrEqual(q * Math.sqrt(va / R + vb / R));
      if (i % 4 === 1) abandonShare += ma;
    }
    expect(abandonShare / model.n).toBeGreaterThan(0.02); // abandonment is really exercised
  });
});
