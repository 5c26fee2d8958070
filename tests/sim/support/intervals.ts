import { expect } from 'vitest';
import type { Estimate } from '../../../src/sim/summary.js';
import { studentQuantile } from '../../../src/sim/student-t.js';

/**
 * Widening of the reported 95 % intervals when one test compares M quantities at once
 * (union bound, derived by hand): each interval is stretched from the 0.975 to the 1 − α/(2M)
 * Student quantile with R − 1 degrees of freedom, so that all M checks hold together with
 * probability ≥ 1 − α. With α = 0.01 a correct simulator fails a test with at most 1 % chance (for
 * the fixed seeds used, the outcome is of course deterministic).
 */
export function familyFactor(M: number, replications: number, alpha = 0.01): number {
  const nu = replications - 1;
  return studentQuantile(1 - alpha / (2 * M), nu) / studentQuantile(0.975, nu);
}

/** |mean − exact| ≤ factor · (half-width of the 95 % interval). */
export function expectInside(e: Estimate, exact: number, factor: number, label: string): void {
  expect(e.ci95, `${label}: no interval`).not.toBeNull();
  const half = (e.ci95![1] - e.ci95![0]) / 2;
  const err = Math.abs(e.mean - exact);
  expect(err, `${label}: estimate ${e.mean} ± ${half} (×${factor.toFixed(2)}) vs exact ${exact}`).toBeLessThanOrEqual(factor * half);
}
