import { describe, expect, it } from 'vitest';
import { growthLimit } from '../../src/design/sweep/growth-limit.js';
import { sweep } from '../../src/design/sweep/sweep.js';
import { UnstableDesignError, UsageError } from '../../src/errors.js';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { compileGraph, withRates, type CompiledModel } from '../../src/model/compile.js';
import { isIndependent, neighbourhood, rateOf, toBitGraph } from '../helpers/bitgraph.js';
import { randomStableDesign, toModel } from '../helpers/designs.js';
import { k4, k4MinusEdge, K4_IDS, K4_MINUS_AB_PAIRS } from '../helpers/k4-minus-edge.js';
import { Rng } from '../helpers/random.js';

const family = (rates: readonly number[]): CompiledModel => compileGraph([...K4_IDS], rates, K4_MINUS_AB_PAIRS);
const grownRates = (rates: readonly number[], grow: readonly number[], s: number): number[] => rates.map((x, k) => (grow.includes(k) ? x * s : x));

/**
 * Brute-force limit, derived by hand from the stability condition ("Stability of the stochastic
 * matching model", J. Appl. Probab. 2016; self-loop extension 2021, venue from memory): with the
 * classes of G scaled by s, an independent self-loop-free set I stays feasible iff
 *   λ(I) + (s − 1) λ_G(I) < λ(N(I)) + (s − 1) λ_G(N(I)),
 * i.e. (s − 1)(λ_G(I) − λ_G(N(I))) < λ(N(I)) − λ(I). Sets with λ_G(I) <= λ_G(N(I)) never fail for s >= 1;
 * the others fail at s = 1 + slack(I) / (λ_G(I) − λ_G(N(I))). The limit is the least such s.
 */
function bruteLimit(model: CompiledModel, grow: readonly number[]): number {
  const g = toBitGraph(model);
  let gm = 0;
  for (const k of grow) gm |= 1 << k;
  let best = Infinity;
  for (let mask = 1; mask < 1 << g.n; mask++) {
    if (!isIndependent(g, mask) || mask & g.loopMask) continue;
    const nb = neighbourhood(g, mask);
    const slope = rateOf(g, mask & gm) - rateOf(g, nb & gm);
    if (slope > 0) best = Math.min(best, 1 + (rateOf(g, nb) - rateOf(g, mask)) / slope);
  }
  return best;
}

/** Root of f on [lo, hi] (f(lo) and f(hi) of opposite signs) by bisection. */
function root(f: (s: number) => number, lo: number, hi: number): number {
  let a = lo;
  let b = hi;
  const fa = Math.sign(f(a));
  for (let k = 0; k < 200 && b - a > 1e-14; k++) {
    const m = (a + b) / 2;
    if (Math.sign(f(m)) === fa) a = m;
    else b = m;
  }
  return (a + b) / 2;
}

describe('growth limit (edge-flow LP along the growth direction)', () => {
  it('K4 minus {a, b}, rates 0.2, 0.2, 0.4, 0.2: limits derived by hand', () => {
    const m = family([0.2, 0.2, 0.4, 0.2]);
    // grow c: {c} saturates when 0.4 s = λ_a + λ_b + λ_d = 0.6 → s* = 1.5 (other sets only gain)
    expect(growthLimit(m, [2])).toBeCloseTo(1.5, 7);
    // grow c and d: {c} needs 0.4 s < 0.4 + 0.2 s → s < 2; {d}: 0.2 s < 0.4 + 0.4 s always → s* = 2
    expect(growthLimit(m, [2, 3])).toBeCloseTo(2, 7);
    // grow a and b: {a, b} needs 0.4 s < λ_c + λ_d = 0.6 → s* = 1.5
    expect(growthLimit(m, [0, 1])).toBeCloseTo(1.5, 7);
    // grow d alone: {d} needs 0.2 s < 0.8 → 4; no other set contains d → s* = 4
    expect(growthLimit(m, [3])).toBeCloseTo(4, 7);
  });

  it('a self-looped class absorbs its own growth: no limit', () => {
    // a triangle with a self-loop on x: growing x alone never overloads a set (x is never in one)
    const m = compileGraph(['x', 'y', 'z'], [1, 1, 1], [[0, 1], [1, 2], [0, 2], [0, 0]]);
    expect(growthLimit(m, [0])).toBe(Infinity);
  });

  it('agrees with the brute-force limit on seeded random designs', () => {
    const rng = new Rng(31337);
    let finite = 0;
    for (let d = 0; d < 25; d++) {
      const model = toModel(randomStableDesign(rng, { minClasses: 3, maxClasses: 9, edgeProb: 0.35, loopProb: 0.2, components: d % 5 === 0 ? 2 : 1, minSlack: 0.01 }));
      const grow = rng.shuffled([...Array(model.n).keys()]).slice(0, rng.int(1, Math.min(3, model.n)));
      const want = bruteLimit(model, grow);
      const got = growthLimit(model, grow);
      if (!Number.isFinite(want)) {
        expect(got).toBe(Infinity);
        continue;
      }
      finite++;
      expect(Math.abs(got - want)).toBeLessThan(1e-7 * want);
    }
    expect(finite).toBeGreaterThan(10);
  });
});

describe('load sweep on K4 minus {a, b} (closed forms in tests/helpers/k4-minus-edge.ts)', () => {
  it('rates 0.2, 0.2, 0.4, 0.2, c grows: adding {a, b} helps today and starts to hurt near saturation', () => {
    const rates = [0.2, 0.2, 0.4, 0.2];
    const grow = [2];
    const r = sweep(family(rates), { grow, variants: [{ name: 'with a-b', add: [[0, 1]], remove: [] }], steps: 10 });
    expect(r.limit).toBeCloseTo(1.5, 7);
    expect(r.factors[0]).toBe(1);
    expect(r.factors[10]).toBeCloseTo(1 + 0.98 * 0.5, 7);
    const v = r.variants[0]!;
    r.factors.forEach((s, t) => {
      const x = grownRates(rates, grow, s);
      const base = k4MinusEdge(x).total;
      const withAb = k4(x).total;
      expect(Math.abs(r.base.backlog[t]! - base)).toBeLessThan(1e-10 * base);
      expect(Math.abs(v.backlog[t]! - withAb)).toBeLessThan(1e-10 * withAb);
      // slack by hand: base min({a, b}: 0.4 s − 0.2, {c}: 0.6 − 0.4 s, {a}: 0.4 s, {d}: 0.2 + 0.4 s);
      // with {a, b}: min over classes of Λ − 2 λ_k, i.e. {c}: 0.6 − 0.4 s
      expect(r.base.slack[t]).toBeCloseTo(Math.min(0.4 * s - 0.2, 0.6 - 0.4 * s), 7);
      expect(v.slack[t]).toBeCloseTo(0.6 - 0.4 * s, 7);
    });
    // today the addition helps (11/6 < 7/3); near the limit {c} is the only bottleneck and a, b
    // are its neighbours, so the harm of the published near-saturation result shows up
    expect(v.backlog[0]!).toBeLessThan(r.base.backlog[0]!);
    expect(v.backlog[10]!).toBeGreaterThan(r.base.backlog[10]!);
    expect(r.crossovers).toHaveLength(1);
    const c = r.crossovers[0]!;
    expect(c.direction).toBe('starts-to-hurt');
    expect(c.how).toBe('interpolated');
    const exact = root((s) => k4(grownRates(rates, grow, s)).total - k4MinusEdge(grownRates(rates, grow, s)).total, 1, 1.49);
    expect(exact).toBeGreaterThan(r.factors[c.after]!);
    expect(exact).toBeLessThan(r.factors[c.after + 1]!);
    // linear interpolation of the relative difference between steps 0.049 apart: within a tenth of a step
    expect(Math.abs(c.factor - exact)).toBeLessThan(0.005);
  });

  it('rates 0.1, 0.1, 0.4, 0.4, a and b grow: the harmful addition starts to help once {a, b} is the bottleneck', () => {
    const rates = [0.1, 0.1, 0.4, 0.4];
    const grow = [0, 1];
    const r = sweep(family(rates), { grow, variants: [{ name: 'with a-b', add: [[0, 1]], remove: [] }], steps: 12 });
    // by hand: {a, b} needs 0.2 s < λ_c + λ_d = 0.8 (s < 4), {a} needs 0.1 s < 0.8 (s < 8), and {c}, {d}
    // only gain (0.4 < 0.2 s + 0.4); so the base limit is 4
    expect(r.limit).toBeCloseTo(4, 7);
    expect(r.crossovers).toHaveLength(1);
    const c = r.crossovers[0]!;
    expect(c.direction).toBe('starts-to-help');
    const exact = root((s) => k4(grownRates(rates, grow, s)).total - k4MinusEdge(grownRates(rates, grow, s)).total, 1, 3.9);
    expect(Math.abs(c.factor - exact)).toBeLessThan((r.factors[1]! - r.factors[0]!) / 5);
  });

  it('a variant that turns unstable before the base: its crossover is found by bisection', () => {
    // the co-op quest design with healer–tank added; without that pair tank has only archer and mage
    // (5.7) to match with, so growing tank (4.5 s) breaks it at s = 5.7/4.5, while the base holds up to
    // 7.2/4.5 = 1.6 (by hand); the removal helps today (it undoes a harmful addition)
    const ids = ['healer', 'tank', 'archer', 'mage'];
    const m = compileGraph(ids, [1.5, 4.5, 2.5, 3.2], [[0, 0], [0, 2], [0, 3], [1, 2], [1, 3], [0, 1]]);
    const r = sweep(m, { grow: [1], variants: [{ name: 'without healer-tank', add: [], remove: [[0, 1]] }], steps: 2 });
    expect(r.limit).toBeCloseTo(1.6, 7);
    const v = r.variants[0]!;
    expect(v.limit).toBeCloseTo(5.7 / 4.5, 7);
    expect(v.backlog[0]!).toBeLessThan(r.base.backlog[0]!);
    expect(v.backlog[1]).toBe(Infinity);
    expect(r.crossovers).toHaveLength(1);
    const c = r.crossovers[0]!;
    expect(c.how).toBe('bisection');
    expect(c.direction).toBe('starts-to-hurt');
    // fresh exact evaluations on both sides of the crossover disagree in sign
    const without = compileGraph(ids, [1.5, 4.5, 2.5, 3.2], [[0, 0], [0, 2], [0, 3], [1, 2], [1, 3]]);
    const diff = (s: number): number => {
      const x = grownRates([1.5, 4.5, 2.5, 3.2], [1], s);
      return evaluateExact(withRates(without, x)).backlogTotal - evaluateExact(withRates(m, x)).backlogTotal;
    };
    expect(diff(c.factor * (1 - 1e-6))).toBeLessThan(0);
    expect(diff(c.factor * (1 + 1e-6))).toBeGreaterThan(0);
  });

  it('refuses an unstable base, impossible variants and empty growth', () => {
    const unstable = compileGraph(['x', 'y'], [1, 2], [[0, 1]]); // bipartite
    expect(() => sweep(unstable, { grow: [0] })).toThrow(UnstableDesignError);
    const m = family([0.2, 0.2, 0.4, 0.2]);
    expect(() => sweep(m, { grow: [2], variants: [{ name: 'v', add: [[2, 3]], remove: [] }] })).toThrow(UsageError);
    expect(() => sweep(m, { grow: [2], variants: [{ name: 'v', add: [], remove: [[0, 1]] }] })).toThrow(UsageError);
    expect(() => sweep(m, { grow: [] })).toThrow(UsageError);
  });
});
