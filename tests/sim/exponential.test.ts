import { describe, expect, it } from 'vitest';
import { nextExp } from '../../src/sim/exponential.js';
import { fastTimeBin } from '../../src/sim/fast-time-bin.js';
import { seedState } from '../../src/sim/random.js';
import { TIME_BINS, timeBin } from '../../src/sim/wait-bins.js';
import { Rng } from '../helpers/random.js';

describe('ziggurat Exp(1) sampler', () => {
  const n = 400_000;
  const s = seedState(2024);
  const xs = Float64Array.from({ length: n }, () => nextExp(s)).sort();

  it('mean and variance 1 (Exp(1) moments, derived by hand: E X = 1, Var X = 1)', () => {
    let sum = 0;
    let sq = 0;
    for (const x of xs) {
      sum += x;
      sq += x * x;
    }
    const mean = sum / n;
    const variance = sq / n - mean * mean;
    // standard errors: 1/√n for the mean, √(E X⁴ − 1)/√n = √8/√n for the variance; 5 of them
    expect(Math.abs(mean - 1)).toBeLessThan(5 / Math.sqrt(n));
    expect(Math.abs(variance - 1)).toBeLessThan((5 * Math.sqrt(8)) / Math.sqrt(n));
  });

  it('Kolmogorov–Smirnov distance to 1 − e^−x below the 0.1 % critical value 1.95/√n (from memory)', () => {
    let d = 0;
    for (let i = 0; i < n; i++) {
      const F = 1 - Math.exp(-xs[i]!);
      d = Math.max(d, Math.abs(F - i / n), Math.abs(F - (i + 1) / n));
    }
    expect(d).toBeLessThan(1.95 / Math.sqrt(n));
  });

  it('the tail beyond the last layer (x > 7.69711747…) has its share e^−7.69711747', () => {
    const tail = xs.length - xs.findIndex((x) => x > 7.69711747013104972);
    const expected = n * Math.exp(-7.69711747013104972);
    expect(Math.abs(tail - expected)).toBeLessThan(5 * Math.sqrt(expected));
    expect(xs[n - 1]!).toBeGreaterThan(9); // the tail step really ran
  });
});

describe('fastTimeBin = timeBin', () => {
  it('on log-uniform waits over the whole range and beyond, and the edge cases', () => {
    const rng = new Rng(31);
    let differ = 0;
    for (let t = 0; t < 200_000; t++) {
      const x = 2 ** rng.uniform(-45, 50);
      if (fastTimeBin(x) !== timeBin(x)) differ++;
    }
    expect(differ).toBe(0);
    for (const x of [0, -1, NaN, Infinity, 2 ** -40, 2 ** -32, 1, 2, 3, 2 ** 39.99, 2 ** 41, Number.MIN_VALUE]) {
      expect(fastTimeBin(x), String(x)).toBe(timeBin(x));
    }
    expect(fastTimeBin(Infinity)).toBe(TIME_BINS - 1);
  });

  it('just inside every bin edge of a few octaves (relative distance 1e-9)', () => {
    let checked = 0;
    for (let e = -3; e <= 3; e++) {
      for (let j = 0; j < 64; j++) {
        const edge = 2 ** (e + j / 64);
        for (const x of [edge * (1 + 1e-9), edge * (1 - 1e-9)]) {
          expect(fastTimeBin(x)).toBe(timeBin(x));
          checked++;
        }
      }
    }
    expect(checked).toBe(7 * 64 * 2);
  });
});
