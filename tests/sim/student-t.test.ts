import { describe, expect, it } from 'vitest';
import { studentCdf, studentQuantile, t975 } from '../../src/sim/student-t.js';

describe('Student t quantiles', () => {
  it('ν = 1: F(t) = 1/2 + arctan(t)/π, so t_p = tan(π(p − 1/2)) (derived by hand)', () => {
    for (const p of [0.6, 0.9, 0.975, 0.995]) expect(studentQuantile(p, 1)).toBeCloseTo(Math.tan(Math.PI * (p - 0.5)), 8);
  });

  it('ν = 2: F(t) = 1/2 + t / (2√(2 + t²)), so t_p = a√(2/(1 − a²)) with a = 2p − 1 (derived by hand)', () => {
    for (const p of [0.75, 0.95, 0.975, 0.999]) {
      const a = 2 * p - 1;
      expect(studentQuantile(p, 2)).toBeCloseTo(a * Math.sqrt(2 / (1 - a * a)), 9);
    }
  });

  it('ν = 4: with s = t/√(4 + t²) the density becomes (3/4)(1 − s²) ds, so F(t) = 1/2 + (3s − s³)/4 (derived by hand)', () => {
    for (const t of [0.3, 1, 2.776, 6]) {
      const s = t / Math.sqrt(4 + t * t);
      expect(studentCdf(t, 4)).toBeCloseTo(0.5 + (3 * s - s ** 3) / 4, 11);
    }
    const q = studentQuantile(0.975, 4);
    const s = q / Math.sqrt(4 + q * q);
    expect(0.5 + (3 * s - s ** 3) / 4).toBeCloseTo(0.975, 11);
  });

  it('ν = ∞ is the normal quantile 1.959963984540054 (from memory) and large ν approach it from above', () => {
    expect(studentQuantile(0.975, Infinity)).toBeCloseTo(1.959963984540054, 9);
    let prev = Infinity;
    for (const nu of [1, 2, 3, 5, 10, 30, 100, 1000, 1e6]) {
      const t = studentQuantile(0.975, nu);
      expect(t).toBeLessThan(prev);
      expect(t).toBeGreaterThan(1.959963984540054);
      prev = t;
    }
    expect(t975(8)).toBe(studentQuantile(0.975, 7));
  });

  it('rejects levels and degrees of freedom out of range', () => {
    expect(() => studentQuantile(0.4, 3)).toThrow(RangeError);
    expect(() => studentQuantile(0.975, 0)).toThrow(RangeError);
  });
});
