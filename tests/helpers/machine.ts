import { expect } from 'vitest';

/**
 * Checks on machine output (JSON, CSV) read back as numbers, against a reference value computed
 * independently by the test.
 */

/** Significant digits of a number as JSON writes it (integers count their digits without trailing zeros). */
export function significantDigits(x: number): number {
  if (x === 0 || !Number.isFinite(x)) return 0;
  const [mantissa] = Math.abs(x).toExponential().split('e');
  return mantissa!.replace('.', '').replace(/0+$/, '').length || 1;
}

/**
 * `actual` is `expected` rounded to `digits` significant digits: at most that many digits, and within
 * half a unit of the last one (plus 1e-12 relative for the reference's own rounding).
 */
export function expectRounded(actual: number, expected: number, digits: number, what = ''): void {
  expect(typeof actual, what).toBe('number');
  if (expected === 0) {
    expect(Math.abs(actual), what).toBeLessThan(1e-12);
    return;
  }
  const unit = 10 ** (Math.floor(Math.log10(Math.abs(expected))) - digits + 1);
  expect(Math.abs(actual - expected), `${what}: ${actual} vs ${expected} at ${digits} digits`).toBeLessThanOrEqual(unit / 2 + 1e-12 * Math.abs(expected));
  if (!Number.isSafeInteger(actual)) expect(significantDigits(actual), `${what}: ${actual} has more than ${digits} digits`).toBeLessThanOrEqual(digits);
}

/** Every number anywhere in a JSON document, with its path. */
export function numbersIn(doc: unknown, path = ''): Array<{ path: string; value: number }> {
  if (typeof doc === 'number') return [{ path, value: doc }];
  if (Array.isArray(doc)) return doc.flatMap((v, i) => numbersIn(v, `${path}[${i}]`));
  if (doc && typeof doc === 'object') return Object.entries(doc).flatMap(([k, v]) => numbersIn(v, path ? `${path}.${k}` : k));
  return [];
}
