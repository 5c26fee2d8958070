import { describe, expect, it } from 'vitest';
import { poissonRateInterval } from '../../src/intake/poisson-interval.js';

/** log P(Poisson(mu) = i), summed directly (derived by hand: e^{-mu} mu^i / i!). */
function logPmf(i: number, mu: number): number {
  let lf = 0;
  for (let j = 2; j <= i; j++) lf += Math.log(j);
  return -mu + i * Math.log(mu) - lf;
}
const cdf = (n: number, mu: number): number => {
  let s = 0;
  for (let i = 0; i <= n; i++) s += Math.exp(logPmf(i, mu));
  return s;
};

/** Root of a decreasing function on [lo, hi] by bisection. */
function solveDecreasing(f: (x: number) => number, lo: number, hi: number): number {
  for (let i = 0; i < 200; i++) {
    const m = (lo + hi) / 2;
    if (f(m) > 0) lo = m;
    else hi = m;
  }
  return (lo + hi) / 2;
}

describe('poissonRateInterval (Garwood, "Fiducial limits for the Poisson distribution", Biometrika, 1936)', () => {
  it('count 0: [0, −ln(0.025)/T] (derived by hand: P(Poisson(μ) = 0) = e^{−μ} = 0.025)', () => {
    for (const T of [1, 7.5, 1000]) {
      const [lo, hi] = poissonRateInterval(0, T);
      expect(lo).toBe(0);
      expect(hi).toBeCloseTo(-Math.log(0.025) / T, 12);
    }
  });

  it('count 1: lower −ln(0.975)/T, upper solves e^{−μ}(1 + μ) = 0.025 (derived by hand)', () => {
    const T = 4;
    const [lo, hi] = poissonRateInterval(1, T);
    // P(Poisson(μ) ≥ 1) = 1 − e^{−μ} = 0.025  ⇒  μ = −ln 0.975
    expect(lo).toBeCloseTo(-Math.log(0.975) / T, 12);
    // P(Poisson(μ) ≤ 1) = e^{−μ}(1 + μ) = 0.025, decreasing in μ
    const mu = solveDecreasing((m) => Math.exp(-m) * (1 + m) - 0.025, 0, 50);
    expect(hi).toBeCloseTo(mu / T, 10);
  });

  it('every end has tail probability 2.5 % under its Poisson mean (direct pmf sums, derived by hand)', () => {
    for (const n of [2, 5, 10, 31, 100, 400]) {
      const [lo, hi] = poissonRateInterval(n, 1);
      // lower end: P(X ≥ n) = 0.025; upper end: P(X ≤ n) = 0.025
      expect(1 - cdf(n - 1, lo)).toBeCloseTo(0.025, 9);
      expect(cdf(n, hi)).toBeCloseTo(0.025, 9);
    }
  });

  it('matches tabulated exact 95 % limits for the Poisson mean (tables from memory)', () => {
    // n: [lower, upper] of the mean, four decimals, as printed in statistical tables (from memory)
    const table: Record<number, [number, number]> = { 0: [0, 3.6889], 1: [0.0253, 5.5716], 2: [0.2422, 7.2247], 5: [1.6235, 11.6683], 10: [4.7954, 18.3904] };
    for (const [n, [lo, hi]] of Object.entries(table)) {
      const [a, b] = poissonRateInterval(Number(n), 1);
      expect(a).toBeCloseTo(lo, 4);
      expect(b).toBeCloseTo(hi, 4);
    }
  });

  it('scales with the exposure: the interval of n events over T is the interval of the mean divided by T', () => {
    const [a, b] = poissonRateInterval(17, 1);
    const [c, d] = poissonRateInterval(17, 8);
    expect(c).toBeCloseTo(a / 8, 14);
    expect(d).toBeCloseTo(b / 8, 14);
  });
});
