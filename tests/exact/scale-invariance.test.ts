import { describe, expect, it } from 'vitest';
import { evaluateBacklog, evaluateExact } from '../../src/exact/evaluate.js';
import { singleChangeEvaluator } from '../../src/exact/single-change.js';
import { compileGraph, type CompiledModel } from '../../src/model/compile.js';
import { checkStability } from '../../src/stability/check.js';
import { simulate } from '../../src/sim/simulate.js';
import { randomStableDesign, randomUnstableDesign, toModel } from '../helpers/designs.js';
import { Rng } from '../helpers/random.js';

// Reference, derived by hand: multiplying every rate by c > 0 is a change of time unit. The
// sequence of arrivals (which class comes next, with probabilities λ_k / Λ) does not change, so
// neither does the stationary distribution of the waiting items: backlogs, P(empty) and the share
// matched at once (PASTA) are the same; rates, match rates, headroom and slacks are multiplied by
// c; waits (Little's law: backlog / rate) are divided by c. The verdict depends on the signs of
// λ(N(I)) − λ(I) only, which do not change.

const scaled = (m: CompiledModel, c: number): CompiledModel => compileGraph(m.ids, Array.from(m.rates, (x) => x * c), edgePairsOf(m));
const edgePairsOf = (m: CompiledModel): Array<[number, number]> => Array.from({ length: m.m }, (_, e) => [m.edgeA[e]!, m.edgeB[e]!]);

const SCALES = [1e-300, 1e-200, 1e-100, 1e-10, 3.7, 1e10, 1e100, 1e200, 1e300];
/** Relative agreement: the scaled rates are themselves rounded (1e-16 each), so figures agree to about 1e-13. */
const REL = 1e-11;

function expectClose(a: ArrayLike<number>, b: ArrayLike<number>, factor: number, what: string): void {
  expect(a.length).toBe(b.length);
  for (let i = 0; i < a.length; i++) {
    const want = b[i]! * factor;
    expect(Number.isFinite(a[i]!), `${what}[${i}] finite`).toBe(Number.isFinite(want));
    if (Number.isFinite(want)) expect(Math.abs(a[i]! - want), `${what}[${i}]: ${a[i]} vs ${want}`).toBeLessThanOrEqual(REL * Math.abs(want));
  }
}

describe('figures depend only on the ratios of the rates (1e-300 … 1e300)', () => {
  const rng = new Rng(909);
  const designs = Array.from({ length: 10 }, (_, i) =>
    toModel(randomStableDesign(rng, { minClasses: 3, maxClasses: 8, edgeProb: 0.4, loopProb: 0.3, components: 1 + (i % 3 === 0 ? 1 : 0), minSlack: 0.02 })),
  );

  it('evaluateExact: backlogs, waits, matched-at-once, P(empty), match rates', () => {
    for (const base of designs) {
      const ref = evaluateExact(base);
      for (const c of SCALES) {
        const r = evaluateExact(scaled(base, c));
        expectClose(r.backlog, ref.backlog, 1, `backlog ×${c}`);
        expectClose([r.backlogTotal, r.emptyProbability], [ref.backlogTotal, ref.emptyProbability], 1, `total ×${c}`);
        expectClose(r.immediateMatch, ref.immediateMatch, 1, `immediate ×${c}`);
        expectClose(r.wait, ref.wait, 1 / c, `wait ×${c}`);
        expectClose(r.matchRates, ref.matchRates, c, `match rates ×${c}`);
        const b = evaluateBacklog(scaled(base, c));
        expectClose([b.backlogTotal, b.emptyProbability], [ref.backlogTotal, ref.emptyProbability], 1, `backlog only ×${c}`);
      }
    }
  });

  it('a power-of-two factor gives bit-identical figures, verdicts and certificates', () => {
    const unstable = Array.from({ length: 4 }, () => toModel(randomUnstableDesign(rng, { minClasses: 3, maxClasses: 7, edgeProb: 0.4, loopProb: 0.3, components: 1 })));
    for (const base of designs.slice(0, 4)) {
      const ref = evaluateExact(base);
      for (const e of [-900, -1, 7, 900]) {
        const r = evaluateExact(scaled(base, 2 ** e));
        expect(Array.from(r.backlog)).toEqual(Array.from(ref.backlog));
        expect(r.emptyProbability).toBe(ref.emptyProbability);
      }
    }
    for (const base of unstable) {
      const ref = checkStability(base).certificate!;
      for (const e of [-900, 900]) expect(Array.from(checkStability(scaled(base, 2 ** e)).certificate!.set)).toEqual(Array.from(ref.set));
    }
  });

  it('checkStability: same verdict, headroom, bottleneck and slacks times the factor; certificates too', () => {
    const unstable = Array.from({ length: 6 }, () => toModel(randomUnstableDesign(rng, { minClasses: 3, maxClasses: 7, edgeProb: 0.4, loopProb: 0.3, components: 1 })));
    for (const base of [...designs, ...unstable]) {
      const ref = checkStability(base);
      for (const c of SCALES) {
        const r = checkStability(scaled(base, c));
        expect(r.stable).toBe(ref.stable);
        expectClose(r.headroom.filter(Number.isFinite), ref.headroom.filter(Number.isFinite), c, `headroom ×${c}`);
        expect(r.tightSets.map((t) => Array.from(t.set))).toEqual(ref.tightSets.map((t) => Array.from(t.set)));
        expectClose(r.tightSets.map((t) => t.slack), ref.tightSets.map((t) => t.slack), c, `slack ×${c}`);
        if (ref.relativeSlack !== undefined) expect(Math.abs(r.relativeSlack! - ref.relativeSlack)).toBeLessThanOrEqual(REL * ref.relativeSlack);
        if (ref.certificate) {
          // several sets may be overloaded (ties are broken by rounding): any certificate must hold
          const cert = r.certificate!;
          expect(cert.demand).toBeGreaterThanOrEqual(cert.capacity * (1 - 1e-12));
          const sum = (set: Int32Array): number => Array.from(set).reduce((acc, k) => acc + base.rates[k]! * c, 0);
          expect(Math.abs(cert.demand - sum(cert.set))).toBeLessThanOrEqual(1e-12 * cert.demand);
        }
      }
    }
  });

  it('single-change evaluation: the same figures for every toggle at every factor', () => {
    const base = designs[1]!;
    const ref = singleChangeEvaluator(base);
    for (const c of [1e-300, 1e300]) {
      const ev = singleChangeEvaluator(scaled(base, c));
      for (let a = 0; a < base.n; a++) {
        for (let b = a; b < base.n; b++) {
          const x = ev.toggle(a, b);
          const y = ref.toggle(a, b);
          expect(x.stable).toBe(y.stable);
          if (!y.stable) continue;
          expectClose(x.backlog, y.backlog, 1, `toggle ${a}-${b} backlog`);
          expectClose(x.wait, y.wait, 1 / c, `toggle ${a}-${b} wait`);
        }
      }
    }
  });

  it('rates near the top of the double range (4.5e307 in a 4-class design) give finite figures and a stable verdict', () => {
    // the party finder of scenarios/harmful-candidate.json times 1e307: largest rate 4.5e307,
    // their sum 1.17e308 (a sum with a few more such classes would overflow)
    const base = compileGraph(['healer', 'tank', 'archer', 'mage'], [1.5, 4.5, 2.5, 3.2], [[0, 0], [0, 2], [0, 3], [1, 2], [1, 3]]);
    const ref = evaluateExact(base);
    for (const c of [1e307, 2.5e307]) {
      const m = scaled(base, c);
      expect(checkStability(m).stable).toBe(true);
      const r = evaluateExact(m);
      expect(Number.isFinite(r.backlogTotal)).toBe(true);
      expect(Math.abs(r.backlogTotal - ref.backlogTotal)).toBeLessThanOrEqual(REL * ref.backlogTotal);
    }
  });

  it('simulate: a power-of-two factor gives the same backlogs and the waits divided by it (seeded)', async () => {
    const base = designs[0]!;
    const opts = { arrivals: 20_000, replications: 2, seed: 5, workerUrl: null };
    const ref = await simulate(base, opts);
    for (const e of [-800, 800]) {
      const c = 2 ** e;
      const r = await simulate(scaled(base, c), opts);
      expect(r.backlog.total.mean).toBe(ref.backlog.total.mean);
      expect(r.wait.total.mean).toBe(ref.wait.total.mean / c);
      expect(r.matchRates.map((x) => x.mean)).toEqual(ref.matchRates.map((x) => x.mean * c));
    }
  });
});
