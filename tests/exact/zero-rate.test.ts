import { describe, expect, it } from 'vitest';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { compileGraph } from '../../src/model/compile.js';
import { subModel } from '../../src/model/components.js';
import { checkStability } from '../../src/stability/check.js';
import { randomStableDesign } from '../helpers/designs.js';
import { Rng } from '../helpers/random.js';

// Classes of rate 0 (a demand variant in which a class has no arrivals). Reference, derived by
// hand: no item of such a class ever arrives, so it never waits (backlog, wait, matched-at-once
// and its match rates 0) and never serves anyone; the other classes evolve exactly as in the
// design without it. Its headroom is checked by its meaning (growing its rate just below the
// headroom keeps the design stable, just above does not), as in tests/stability/check.test.ts.

describe('classes of rate 0', () => {
  const rng = new Rng(31337);
  const designs = Array.from({ length: 12 }, () => randomStableDesign(rng, { minClasses: 4, maxClasses: 8, edgeProb: 0.4, loopProb: 0.3, components: 1, minSlack: 0.05 }));

  it('evaluation equals the design without them; their own figures are 0', () => {
    for (const d of designs) {
      const zero = rng.int(0, d.ids.length - 1);
      const rates = d.rates.map((x, k) => (k === zero ? 0 : x));
      const model = compileGraph(d.ids, rates, d.pairs);
      const keep = d.ids.map((_, k) => k).filter((k) => k !== zero);
      const { sub } = subModel(model, keep);
      const without = checkStability(sub);
      const r = checkStability(model);
      expect(r.stable).toBe(without.stable);
      if (!without.stable) continue;
      const e = evaluateExact(model);
      const ref = evaluateExact(sub);
      keep.forEach((k, i) => {
        expect(e.backlog[k]).toBeCloseTo(ref.backlog[i]!, 12);
        expect(e.wait[k]).toBeCloseTo(ref.wait[i]!, 12);
      });
      expect(e.backlog[zero]).toBe(0);
      expect(e.wait[zero]).toBe(0);
      expect(e.immediateMatch[zero]).toBe(0);
      for (let edge = 0; edge < model.m; edge++) if (model.edgeA[edge] === zero || model.edgeB[edge] === zero) expect(e.matchRates[edge]).toBe(0);
      expect(e.backlogTotal).toBeCloseTo(ref.backlogTotal, 12);
      expect([...e.backlog, ...e.wait, ...e.immediateMatch, ...e.matchRates].every(Number.isFinite)).toBe(true);
      // its headroom means what it says
      const h = r.headroom[zero]!;
      if (Number.isFinite(h)) {
        const grow = (x: number) => checkStability(compileGraph(d.ids, rates.map((v, k) => (k === zero ? x : v)), d.pairs)).stable;
        if (h > 0) expect(grow(0.999 * h)).toBe(true);
        expect(grow(1.001 * h + 1e-12)).toBe(false);
      } else expect(model.selfLoop[zero]).toBe(1);
    }
  });

  it('never makes the verdict fail: an isolated class of rate 0, and one whose only partner also has rate 0', () => {
    // a (self-loop) – b, plus c alone (no compatibility), plus d – e both of rate 0
    const model = compileGraph(['a', 'b', 'c', 'd', 'e'], [2, 1, 0, 0, 0], [[0, 0], [0, 1], [3, 4]]);
    const r = checkStability(model);
    expect(r.stable).toBe(true);
    expect(r.headroom[2]).toBe(0); // any arrival of c would wait for ever: N({c}) = ∅
    expect(r.headroom[3]).toBe(0); // d's only partner e brings nobody
    expect(r.headroom[1]).toBeCloseTo(1, 12); // {b}: N = {a}, 2 − 1
    const e = evaluateExact(model);
    expect(e.backlog[2]).toBe(0);
    expect(Number.isFinite(e.backlogTotal)).toBe(true);
  });
});
