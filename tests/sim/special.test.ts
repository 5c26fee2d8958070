import { describe, expect, it } from 'vitest';
import { erfc, gammaCdf, logGamma, normalCdf } from '../../src/sim/special.js';

/** Composite parabolic rule, weights 1-4-2-…-4-1 (derived by hand; even panel count). */
function parabolic(f: (x: number) => number, a: number, b: number, panels = 4000): number {
  const h = (b - a) / panels;
  let s = f(a) + f(b);
  for (let i = 1; i < panels; i++) s += (i % 2 ? 4 : 2) * f(a + i * h);
  return (s * h) / 3;
}

describe('special functions', () => {
  it('logGamma: factorials and Γ(1/2) = √π (hand-derived values)', () => {
    let logFact = 0;
    for (let n = 1; n <= 40; n++) {
      expect(Math.abs(logGamma(n) - logFact)).toBeLessThan(1e-12 * Math.max(1, logFact));
      logFact += Math.log(n);
    }
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 13);
    expect(logGamma(1.5)).toBeCloseTo(0.5 * Math.log(Math.PI) - Math.log(2), 13);
    expect(logGamma(0)).toBeNaN();
  });

  it('erfc against its defining integral 2/√π ∫_x^∞ e^{−t²} dt (parabolic rule)', () => {
    for (let x = -3; x <= 4; x += 0.25) {
      const tail = (2 / Math.sqrt(Math.PI)) * parabolic((t) => Math.exp(-t * t), Math.max(x, 0), Math.max(x, 0) + 12);
      const ref = x >= 0 ? tail : 2 - (2 / Math.sqrt(Math.PI)) * parabolic((t) => Math.exp(-t * t), -x, -x + 12);
      expect(Math.abs(erfc(x) - ref) / ref).toBeLessThan(2e-7);
    }
    expect(normalCdf(0)).toBeCloseTo(0.5, 7);
  });

  it('gammaCdf, exact range: Gamma(1) is 1 − e^{−x}; integer shapes against the density integral', () => {
    for (const x of [0.1, 1, 3, 10]) expect(gammaCdf(1, x)).toBeCloseTo(1 - Math.exp(-x), 14);
    for (const a of [2, 5, 17, 60]) {
      for (const q of [0.5, 1, 1.5]) {
        const x = a * q;
        const density = (t: number): number => Math.exp((a - 1) * Math.log(t) - t - logGamma(a));
        expect(Math.abs(gammaCdf(a, x) - parabolic(density, 1e-12, x, 20000))).toBeLessThan(1e-9);
      }
    }
    expect(gammaCdf(0, 1)).toBe(1);
    expect(gammaCdf(3, 0)).toBe(0);
  });

  it('gammaCdf, cube-root normal range (shape ≥ 100): within 1e-4 of the exact Poisson sum', () => {
    // exact: P(Gamma(a,1) ≤ x) = 1 − Σ_{i<a} e^{−x} x^i / i!, each term in logarithms
    for (const a of [100, 173, 1000, 5000]) {
      for (let z = -4; z <= 4; z += 0.5) {
        const x = a + z * Math.sqrt(a);
        let below = 0;
        let logFact = 0;
        for (let i = 0; i < a; i++) {
          if (i > 0) logFact += Math.log(i);
          below += Math.exp(-x + i * Math.log(x) - logFact);
        }
        expect(Math.abs(gammaCdf(a, x) - (1 - below))).toBeLessThan(1e-4);
      }
    }
  });
});
