import { describe, expect, it } from 'vitest';
import { PrecisionError, UnstableDesignError } from '../../src/errors.js';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { compileGraph } from '../../src/model/compile.js';
import { checkStability } from '../../src/stability/check.js';
import { backlogDigits } from '../../src/stability/precision.js';

// Designs on and next to the stability boundary, built by hand so that the slack λ(N(I)) − λ(I) of
// the tightest set is known exactly as a decimal. Reference: the stability condition of
// "Stability of the stochastic matching model" (J. Appl. Probab. 2016; self-loops 2021, venue from
// memory): stable iff λ(I) < λ(N(I)) for every independent set I without self-looped class.

/**
 * "pool and single": x matches its own kind and y; y matches only x. The only independent
 * self-loop-free set is {y}, with N({y}) = {x}: stable iff λy < λx, slack λx − λy.
 *
 * Closed form, derived by hand from the product form of "A product form for the general stochastic
 * matching model" (J. Appl. Probab. 2021), grouping waiting words by their letter set as in
 * docs/scenario-format.md: {x} alone (it cannot repeat) has Φ = Ψ = x / λ(N(x)) = x / (x + y);
 * {y} alone, U = λ(N(y)) = x, has Φ = y / (x − y) and Ψ = y·x / (x − y)²; {x, y} is not
 * independent. Mean backlog = ΣΨ / (1 + ΣΦ).
 */
function poolAndSingle(x: number, y: number) {
  const model = compileGraph(['x', 'y'], [x, y], [[0, 0], [0, 1]]);
  const phi = x / (x + y) + y / (x - y);
  const psi = x / (x + y) + (y * x) / (x - y) ** 2;
  return { model, backlog: psi / (1 + phi) };
}

/**
 * The co-op party finder of scenarios/harmful-candidate.json with the tank rate moved: healers h
 * (self-loop) and tanks t each match archers a and mages m. {a, m} has N = {h, t}: slack
 * h + t − a − m; {t} has N = {a, m}: slack a + m − t (large here).
 */
const party = (tank: number) => compileGraph(['healer', 'tank', 'archer', 'mage'], [1.5, tank, 2.5, 3.2], [[0, 0], [0, 2], [0, 3], [1, 2], [1, 3]]);

describe('verdicts next to the boundary are exact (rates as decimals)', () => {
  for (const [rel, y] of [
    [1e-8, 0.99999999],
    [1e-10, 0.9999999999],
    [1e-12, 0.999999999999],
  ] as const) {
    it(`pool and single at relative slack ${rel}: stable, bottleneck {y}, exact figures agree with the closed form`, () => {
      const { model, backlog } = poolAndSingle(1, y);
      const r = checkStability(model);
      expect(r.stable).toBe(true);
      expect(Array.from(r.bottleneck!.set)).toEqual([1]);
      // the decimal slack is exactly rel; the doubles of the rates are within 1e-16 of the decimals
      expect(Math.abs(r.bottleneck!.slack - rel) / rel).toBeLessThan(1e-3);
      expect(Math.abs(r.relativeSlack! - rel) / rel).toBeLessThan(1e-3);
      const e = evaluateExact(model);
      expect(Number.isFinite(e.backlogTotal)).toBe(true);
      // error bound of docs/scenario-format.md: about 1e-16 / relative slack (with a margin of 100)
      expect(Math.abs(e.backlogTotal - backlog) / backlog).toBeLessThan(1e-14 / rel);
      expect(backlogDigits(r.relativeSlack)).toBe(Math.floor(-Math.log10(1.1e-16 / r.relativeSlack!)));
    });

    it(`party finder with {archer, mage} at relative slack ${rel} of its capacity: stable`, () => {
      // h + t = 5.7 (1 + rel) written as a decimal: t = 4.2 + 5.7·rel
      const tank = Number((4.2 + 5.7 * rel).toPrecision(15));
      const r = checkStability(party(tank));
      expect(r.stable).toBe(true);
      expect(Array.from(r.bottleneck!.set)).toEqual([2, 3]);
      expect(Math.abs(r.relativeSlack! - rel) / rel).toBeLessThan(1e-2);
      expect(Number.isFinite(evaluateExact(party(tank)).backlogTotal)).toBe(true);
    });
  }

  it('slack exactly 0 is unstable, even where floating sums say otherwise (0.1 + 0.2 against 0.3)', () => {
    // z matches p and q, both self-looped: {z} is the only loop-free independent set, N = {p, q}.
    expect(0.1 + 0.2 > 0.3).toBe(true); // the floating sum leaves a spurious 5.6e-17 of slack
    const model = compileGraph(['p', 'q', 'z'], [0.1, 0.2, 0.3], [[0, 0], [1, 1], [0, 2], [1, 2]]);
    const r = checkStability(model);
    expect(r.stable).toBe(false);
    expect(Array.from(r.certificate!.set)).toEqual([2]);
    expect(() => evaluateExact(model)).toThrow(UnstableDesignError);
  });

  it('the party finder exactly on the boundary (h + t = a + m = 5.7) is unstable', () => {
    const r = checkStability(party(4.2));
    expect(r.stable).toBe(false);
    expect(Array.from(r.certificate!.set)).toEqual([2, 3]);
    expect(() => evaluateExact(party(4.2))).toThrow(UnstableDesignError);
  });

  it('just past the boundary (relative slack −1e-12) is unstable with the certificate {y}', () => {
    const { model } = poolAndSingle(1, 1.000000000001);
    const r = checkStability(model);
    expect(r.stable).toBe(false);
    expect(Array.from(r.certificate!.set)).toEqual([1]);
  });

  it('closer than double precision can resolve: the verdict is still exact, figures are refused, never wrong', () => {
    // decimal slack 1e-15 relative: stable by the condition; the recursion cannot give figures
    const { model } = poolAndSingle(1, 0.999999999999999);
    expect(checkStability(model).stable).toBe(true);
    expect(() => evaluateExact(model)).toThrow(PrecisionError);
  });
});
