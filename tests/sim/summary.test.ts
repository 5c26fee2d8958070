import { describe, expect, it } from 'vitest';
import { compileGraph } from '../../src/model/compile.js';
import { simulate } from '../../src/sim/simulate.js';
import { estimate } from '../../src/sim/summary.js';

describe('estimate across replications', () => {
  it('mean ± t·s/√R on a hand-computed example', () => {
    // values 1, 2, 3, 6: mean 3, sample variance ((−2)² + (−1)² + 0 + 3²)/3 = 14/3, so the upper end
    // is 3 + t·√(14/3)/√4 with t the 0.975 quantile for ν = 3. Recover t from the interval and check it
    // with the ν = 3 distribution function F(t) = 1/2 + (θ + sinθ cosθ)/π, θ = arctan(t/√3)
    // (derived by hand: substitute t = √3 tanθ in the density, which becomes (2/π) cos²θ dθ).
    const e = estimate([1, 2, 3, 6]);
    const t = e.ci95 ? ((e.ci95[1] - 3) * Math.sqrt(4)) / Math.sqrt(14 / 3) : NaN;
    const theta = Math.atan(t / Math.sqrt(3));
    expect(0.5 + (theta + Math.sin(theta) * Math.cos(theta)) / Math.PI).toBeCloseTo(0.975, 10);
    expect(e.mean).toBe(3);
    expect(e.ci95![0] + e.ci95![1]).toBeCloseTo(6, 12); // symmetric
    expect(e.count).toBe(4);
  });

  it('ignores non-finite values; fewer than two values give no interval', () => {
    expect(estimate([NaN, 2, Infinity, 4]).mean).toBe(3);
    expect(estimate([NaN, 2]).ci95).toBeNull();
    expect(estimate([]).count).toBe(0);
    expect(estimate([]).mean).toBeNaN();
  });
});

describe('interval widths shrink like 1/√N', () => {
  it('four times the arrivals halve the width (ratio within [1.6, 2.5])', async () => {
    // With R replications the sample standard deviation has a relative error of about 1/√(2(R−1));
    // with R = 120 the ratio of two independent widths is 2 ± 0.13 (one standard deviation), so the
    // band [1.6, 2.5] is about three standard deviations wide on each side (derived by hand).
    // Ride pooling with four zones all pairwise compatible (fast mixing: N ≫ relaxation time).
    const model = compileGraph(['a', 'b', 'c', 'd'], [1, 1.2, 1.4, 1.6], [[0, 1], [0, 2], [0, 3], [1, 2], [1, 3], [2, 3]]);
    const base = { replications: 120, seed: 4, warmup: 2_000 };
    const small = await simulate(model, { ...base, arrivals: 10_000 });
    const large = await simulate(model, { ...base, arrivals: 40_000 });
    const width = (e: { ci95: readonly [number, number] | null }): number => e.ci95![1] - e.ci95![0];
    for (const [label, s, l] of [
      ['total backlog', small.backlog.total, large.backlog.total],
      ['total wait', small.wait.total, large.wait.total],
      ['immediate matches of class a', small.immediateMatch.byClass[0]!, large.immediateMatch.byClass[0]!],
    ] as const) {
      const ratio = width(s) / width(l);
      expect(ratio, label).toBeGreaterThan(1.6);
      expect(ratio, label).toBeLessThan(2.5);
    }
    // Not every figure behaves so: without abandonment each match pairs one arrival with one waiting
    // item, so (derived by hand) #matched at once = (N − ΔW)/2, where ΔW is the change of the number
    // waiting over the window; the share of all arrivals matched at once is 1/2 − ΔW/(2N), whose
    // spread falls like 1/N, not 1/√N.
    expect(Math.abs(large.immediateMatch.total.mean - 0.5)).toBeLessThan(20 / 40_000);
    const ratio = width(small.immediateMatch.total) / width(large.immediateMatch.total);
    expect(ratio).toBeGreaterThan(3);
  });
});
