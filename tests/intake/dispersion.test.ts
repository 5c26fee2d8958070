import { describe, expect, it } from 'vitest';
import { dispersionTest } from '../../src/intake/dispersion.js';
import { Rng } from '../helpers/random.js';

describe('dispersionTest (index of dispersion against chi-square)', () => {
  it('computes the index and the two-sided p-value of a hand-worked case (χ²₂: P(X ≤ x) = 1 − e^{−x/2}, derived by hand)', () => {
    // 25 arrivals over [0, 5): k = 5 intervals of length 1, counts 9, 4, 4, 4, 4
    const times = [...Array.from({ length: 9 }, (_, i) => 0.05 + i / 10), ...[1, 2, 3, 4].flatMap((j) => [0.1, 0.3, 0.5, 0.7].map((x) => j + x))];
    const r = dispersionTest(times, 0, 5)!;
    expect(r.intervals).toBe(5);
    // mean 5; D = (16 + 1 + 1 + 1 + 1) / 5 = 4; index D / 4 = 1
    expect(r.index).toBeCloseTo(1, 12);
    // χ²₄: P(X ≤ x) = 1 − e^{−x/2}(1 + x/2) (derived by hand: a Gamma(2, 1/2) distribution function)
    const below = 1 - Math.exp(-2) * (1 + 2);
    expect(r.pValue).toBeCloseTo(2 * Math.min(below, 1 - below), 10);
  });

  it('has no test below 25 arrivals', () => {
    expect(dispersionTest(Array.from({ length: 24 }, (_, i) => i), 0, 24)).toBeUndefined();
  });

  it('raises few false alarms on Poisson streams (at most the 1 % level within a binomial tolerance over 400 seeded streams)', () => {
    const rng = new Rng(77);
    let alarms = 0;
    for (let k = 0; k < 400; k++) {
      const T = rng.uniform(5, 40);
      const rate = rng.uniform(1, 20);
      const times: number[] = [];
      for (let t = -Math.log(1 - rng.next()) / rate; t < T; t += -Math.log(1 - rng.next()) / rate) times.push(t);
      const r = dispersionTest(times, 0, T);
      if (r && r.pValue < 0.01) alarms++;
    }
    // 1 % of 400 is 4; 3.29 binomial standard deviations above it is about 10.5
    expect(alarms).toBeLessThanOrEqual(10);
  });

  it('flags bursts (over-dispersed) and booked slots (under-dispersed)', () => {
    const rng = new Rng(3);
    // bursts: 20 clusters of 10 arrivals at random times over [0, 100)
    const bursts = Array.from({ length: 20 }, () => rng.uniform(0, 100)).flatMap((c) => Array.from({ length: 10 }, () => c + rng.uniform(0, 0.1)));
    const b = dispersionTest(bursts, 0, 101)!;
    expect(b.index).toBeGreaterThan(1);
    expect(b.pValue).toBeLessThan(0.01);
    // slots: one arrival every 0.5 exactly
    const slots = Array.from({ length: 200 }, (_, i) => 0.25 + i * 0.5);
    const s = dispersionTest(slots, 0, 100)!;
    expect(s.index).toBeLessThan(1);
    expect(s.pValue).toBeLessThan(0.01);
  });
});
