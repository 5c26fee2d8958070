import { describe, expect, it } from 'vitest';
import { fitPatience } from '../../src/intake/patience-fit.js';
import { Rng } from '../helpers/random.js';

// χ²₁(0.95) = z²_{0.975}: a chi-square with one degree of freedom is the square of a standard normal
// (derived by hand), and z_{0.975} = 1.959963984540054 (standard normal tables, from memory).
const Q = 1.959963984540054 ** 2;

/** Censored exponential log-likelihood ℓ(θ) = d ln θ − θ S (derived by hand: density θe^{−θx} for each abandonment, survival e^{−θc} for each censored wait). */
const loglik = (theta: number, d: number, s: number): number => d * Math.log(theta) - theta * s;

describe('fitPatience (censored exponential, likelihood-ratio interval)', () => {
  it('the estimate is abandonments over time at risk, the mean its inverse (derived by hand)', () => {
    const f = fitPatience(4, 10, 20);
    expect(f.abandonmentRate).toBe(0.2);
    expect(f.mean).toBe(5);
    expect(f.censored).toBe(6);
  });

  it('both ends of the interval sit where twice the log-likelihood drop equals χ²₁(0.95)', () => {
    for (const [d, s] of [[1, 3], [4, 20], [37, 12.5], [500, 1000]] as const) {
      const f = fitPatience(d, d + 5, s);
      const top = loglik(d / s, d, s);
      for (const end of f.abandonmentRateCi95) expect(2 * (top - loglik(end, d, s))).toBeCloseTo(Q, 8);
      expect(f.abandonmentRateCi95[0]).toBeLessThan(d / s);
      expect(f.abandonmentRateCi95[1]).toBeGreaterThan(d / s);
      expect(f.meanCi95[0]).toBeCloseTo(1 / f.abandonmentRateCi95[1], 12);
      expect(f.meanCi95[1]).toBeCloseTo(1 / f.abandonmentRateCi95[0], 12);
    }
  });

  it('with no abandonment: rate 0, interval [0, χ²₁(0.95)/(2S)] (ℓ(θ) = −θS, derived by hand), mean patience unbounded', () => {
    const f = fitPatience(0, 12, 8);
    expect(f.abandonmentRate).toBe(0);
    expect(f.abandonmentRateCi95[0]).toBe(0);
    expect(f.abandonmentRateCi95[1]).toBeCloseTo(Q / 16, 10);
    expect(f.mean).toBe(Infinity);
    expect(f.meanCi95[1]).toBe(Infinity);
    expect(f.meanCi95[0]).toBeCloseTo(16 / Q, 10);
  });

  it('covers the true mean patience at about 95 % on seeded samples censored by independent match times', () => {
    const rng = new Rng(2024);
    const exp = (rate: number) => -Math.log(1 - rng.next()) / rate;
    const trials = 400;
    let covered = 0;
    for (let k = 0; k < trials; k++) {
      const patience = rng.uniform(0.2, 3);
      const matchRate = rng.uniform(0.3, 3);
      const items = rng.int(40, 200);
      let d = 0;
      let s = 0;
      for (let i = 0; i < items; i++) {
        const p = exp(1 / patience);
        const m = exp(matchRate);
        if (p < m) d++;
        s += Math.min(p, m);
      }
      const f = fitPatience(d, items, s);
      if (f.meanCi95[0] <= patience && patience <= f.meanCi95[1]) covered++;
    }
    // binomial tolerance: 3.29 standard deviations of a 95 % proportion over 400 trials (99.9 % two-sided)
    const tol = 3.29 * Math.sqrt((0.95 * 0.05) / trials);
    expect(Math.abs(covered / trials - 0.95)).toBeLessThan(tol);
  });
});
