import { describe, expect, it } from 'vitest';
import { smallestReaching, waitQuantile } from '../../src/sim/percentiles.js';
import { ARRIVAL_BINS, arrivalBin, arrivalBinRange, arrivalBinValue, TIME_BINS, timeBin, timeBinRange } from '../../src/sim/wait-bins.js';

const arrivalsHist = (entries: Array<[number, number]>): Float64Array => {
  const h = new Float64Array(ARRIVAL_BINS);
  for (const [K, w] of entries) h[arrivalBin(K)] += w;
  return h;
};

describe('wait bins', () => {
  it('arrival bins are exact below 1024 and cover every K once above', () => {
    for (let K = 0; K < 1024; K++) expect(arrivalBin(K)).toBe(K);
    let prevHi = 1024;
    for (let b = 1024; b < ARRIVAL_BINS - 1; b++) {
      const [lo, hi] = arrivalBinRange(b);
      expect(lo).toBe(prevHi);
      expect(arrivalBin(lo)).toBe(b);
      expect(arrivalBin(hi - 1)).toBe(b);
      expect((hi - lo) / lo).toBeLessThanOrEqual(1 / 256);
      prevHi = hi;
    }
    expect(prevHi).toBe(2 ** 31);
    expect(arrivalBin(2 ** 31 - 1)).toBe(ARRIVAL_BINS - 2);
    expect(arrivalBin(2 ** 31)).toBe(ARRIVAL_BINS - 1);
  });

  it('time bins contain their values', () => {
    for (const x of [1e-6, 0.01, 1, 3.7, 1234.5]) {
      const [lo, hi] = timeBinRange(timeBin(x));
      expect(lo).toBeLessThanOrEqual(x);
      expect(x).toBeLessThan(hi);
    }
    expect(timeBin(0)).toBe(0);
  });
});

describe('wait quantiles', () => {
  const Lam = 4;
  it('K = 1 only: the wait is Exp(Λ), quantile −ln(1 − p)/Λ (derived by hand)', () => {
    const h = arrivalsHist([[1, 10]]);
    for (const p of [0.5, 0.9, 0.99]) expect(waitQuantile('arrivals', h, 0, ARRIVAL_BINS, Lam, p)).toBeCloseTo(-Math.log(1 - p) / Lam, 8);
  });

  it('K = 3 only: P(Gamma(3, Λ) ≤ w) = 1 − e^{−x}(1 + x + x²/2) with x = Λw (derived by hand)', () => {
    const h = arrivalsHist([[3, 1]]);
    for (const p of [0.5, 0.9, 0.99]) {
      const w = waitQuantile('arrivals', h, 0, ARRIVAL_BINS, Lam, p);
      const x = Lam * w;
      expect(1 - Math.exp(-x) * (1 + x + (x * x) / 2)).toBeCloseTo(p, 8);
    }
  });

  it('an atom at zero: 60 % matched at once, 40 % wait Exp(Λ) (derived by hand)', () => {
    const h = arrivalsHist([
      [0, 6],
      [1, 4],
    ]);
    expect(waitQuantile('arrivals', h, 0, ARRIVAL_BINS, Lam, 0.5)).toBe(0);
    // 0.6 + 0.4 (1 − e^{−Λw}) = 0.9  ⇒  w = ln 4 / Λ
    expect(waitQuantile('arrivals', h, 0, ARRIVAL_BINS, Lam, 0.9)).toBeCloseTo(Math.log(4) / Lam, 8);
  });

  it('large K (binned, cube-root normal): the median of Gamma(K) is close to K − 1/3 (from memory)', () => {
    const K = 5000;
    const h = arrivalsHist([[K, 1]]);
    const Krep = arrivalBinValue(arrivalBin(K));
    const med = waitQuantile('arrivals', h, 0, ARRIVAL_BINS, Lam, 0.5) * Lam;
    expect(Math.abs(med - (Krep - 1 / 3)) / K).toBeLessThan(2e-4);
  });

  it('time histograms: the quantile falls inside the bin that crosses the level', () => {
    const h = new Float64Array(TIME_BINS);
    h[0] = 5; // matched at once
    h[timeBin(2)] = 5;
    const w = waitQuantile('time', h, 0, TIME_BINS, Lam, 0.9);
    const [lo, hi] = timeBinRange(timeBin(2));
    expect(w * Lam).toBeGreaterThanOrEqual(lo);
    expect(w * Lam).toBeLessThan(hi);
    expect(waitQuantile('time', h, 0, TIME_BINS, Lam, 0.5)).toBe(0);
    expect(waitQuantile('time', new Float64Array(TIME_BINS), 0, TIME_BINS, Lam, 0.5)).toBeNaN();
  });
});

describe('the root finder of the quantiles (smallestReaching)', () => {
  /** Plain bisection to the same tolerance: the reference. */
  const bisect = (f: (x: number) => number, target: number, lo: number, hi: number): number => {
    while (hi - lo > 1e-10 * hi) {
      const mid = (lo + hi) / 2;
      if (f(mid) >= target) hi = mid;
      else lo = mid;
    }
    return hi;
  };

  it('solves 1 − e^{−x} = p to 1e-10 (closed form −ln(1 − p), derived by hand), with fewer evaluations than bisection', () => {
    for (const p of [1e-6, 0.01, 0.5, 0.9, 0.99, 0.999999]) {
      let calls = 0;
      const f = (x: number): number => {
        calls++;
        return 1 - Math.exp(-x);
      };
      const x = smallestReaching(f, p, 0, 100);
      expect(Math.abs(x - -Math.log(1 - p))).toBeLessThanOrEqual(2e-10 * Math.max(1, x));
      let bisections = 0;
      bisect((y) => (bisections++, 1 - Math.exp(-y)), p, 0, 100);
      expect(calls).toBeLessThan(bisections);
    }
  });

  it('agrees with bisection on steep, flat and kinked increasing functions', () => {
    const fs: Array<(x: number) => number> = [
      (x) => 1 / (1 + Math.exp(-50 * (x - 3))), // a steep logistic step at 3
      (x) => Math.min(1, x / 7) ** 8, // flat, then steep, then a kink at 7
      (x) => (x < 2 ? 0.1 * x : 0.2 + 0.4 * (x - 2)), // a kink at 2
    ];
    for (const f of fs) {
      for (const p of [0.05, 0.3, 0.5, 0.8, 0.95]) {
        const want = bisect(f, p, 0, 10);
        const got = smallestReaching(f, p, 0, 10);
        expect(Math.abs(got - want)).toBeLessThanOrEqual(3e-10 * want);
        expect(f(got)).toBeGreaterThanOrEqual(p); // the end returned reaches the level
      }
    }
  });
});
