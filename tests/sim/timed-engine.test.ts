import { describe, expect, it } from 'vitest';
import { TooLargeError } from '../../src/errors.js';
import { compileGraph } from '../../src/model/compile.js';
import { seedState } from '../../src/sim/random.js';
import { simulate } from '../../src/sim/simulate.js';
import { buildSimModel } from '../../src/sim/sim-model.js';
import { TimedEngine } from '../../src/sim/timed-engine.js';
import { expectInside, familyFactor } from './support/intervals.js';

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

  it('keeps each queue in arrival order through abandonments and compactions', () => {
    // a heavier variant: about 900 attackers wait, nine abandon per time unit for one served at the head
    const heavy = compileGraph(['attacker', 'defender'], [10, 1], [[0, 1]]);
    const sim = buildSimModel(heavy, { patience: [100, 1] });
    const engine = new TimedEngine(sim, seedState(3), 1e6);
    let lazy = 0;
    for (let i = 0; i < 50; i++) {
      engine.run(997);
      if (engine.queues.span[0]! > engine.counts[0]!) lazy++;
      // compaction keeps the gone slots bounded by the live ones (plus a constant)
      expect(engine.queues.span[0]!).toBeLessThanOrEqual(2 * engine.counts[0]! + 16);
      for (let k = 0; k < 2; k++) {
        const items = engine.queues.items(k);
        expect(items.length).toBe(engine.counts[k]);
        for (let p = 1; p < items.length; p++) expect(items[p]!).toBeGreaterThan(items[p - 1]!);
        if (items.length > 0) expect(engine.headVal[k]).toBe(items[0]);
        else expect(engine.headVal[k]).toBe(Infinity);
      }
    }
    expect(lazy).toBeGreaterThan(10); // gone slots were really left in the rings
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

describe('timed engine: the FCFM loop = the loop of every policy, event by event', () => {
  /*
   * run(n, true) forces the generic loop (selectPartner and the shared queue methods, the plain
   * reading of the rules); the FCFM loop for at most 32 classes inlines the same steps with the same
   * random draws (see runAny in src/sim/timed-engine.ts), so both must end in the same state.
   */
  const designs = [
    { label: 'two classes, one impatient, deep queues', model: compileGraph(['a', 'b'], [10, 1], [[0, 1]]), patience: [100, 1] },
    {
      label: '7-ring with a chord and self-loops, every class impatient',
      model: compileGraph(['z0', 'z1', 'z2', 'z3', 'z4', 'z5', 'z6'], [1, 1.2, 1.4, 1.6, 1.8, 2, 2.2], [[0, 1], [1, 2], [2, 3], [3, 4], [4, 5], [5, 6], [6, 0], [0, 3], [2, 2], [5, 5]]),
      patience: [3, 5, 2, 8, 4, 6, 1],
    },
    { label: 'the same ring with patient classes only (no abandonment draws)', model: compileGraph(['z0', 'z1', 'z2'], [1, 1, 1], [[0, 1], [1, 2], [2, 0]]), patience: [0, 0, 0] },
  ];
  for (const { label, model, patience } of designs) {
    it(label, () => {
      const sim = buildSimModel(model, { patience });
      const fast = new TimedEngine(sim, seedState(77), 1e6);
      const plain = new TimedEngine(sim, seedState(77), 1e6);
      fast.startMeasuring();
      plain.startMeasuring();
      for (const chunk of [1_000, 7_777, 20_000]) {
        fast.run(chunk);
        plain.run(chunk, true);
      }
      fast.finish();
      plain.finish();
      expect(fast.clock).toBe(plain.clock);
      expect(fast.arrivalsDone).toBe(plain.arrivalsDone);
      for (let k = 0; k < model.n; k++) expect(fast.queues.items(k), `queue ${k}`).toEqual(plain.queues.items(k));
      for (const key of ['arrivals', 'immediate', 'waitedMatched', 'waitSum', 'abandoned', 'area', 'edgeMatches', 'hist'] as const) {
        expect(Array.from(fast.counters[key]), key).toEqual(Array.from(plain.counters[key]));
      }
      if (patience.some((p) => p > 0)) expect(fast.counters.abandoned.reduce((a, b) => a + b, 0)).toBeGreaterThan(100);
    });
  }
});
