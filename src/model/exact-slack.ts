/**
 * Exact slack λ(N(I)) − λ(I) of a set, from the rates as decimals. A rate read from a file is a
 * decimal number; String(x) gives the shortest decimal that reads back as x, which for a rate
 * written with up to 15 significant digits is the decimal of the file. Summing those decimals as
 * BigInt rationals (a common power of ten) decides the sign of the slack exactly, so a design on
 * the boundary (slack exactly 0, such as 0.1 + 0.2 against 0.3) is unstable and one at relative
 * slack 1e-12 is stable, whatever the rounding of floating-point sums.
 */

interface Decimal {
  readonly digits: bigint;
  /** value = digits · 10^exponent */
  readonly exponent: number;
}

const DECIMAL = /^(\d+)(?:\.(\d+))?(?:e([+-]?\d+))?$/;

/** The shortest decimal of a finite non-negative double. */
export function decimalOf(x: number): Decimal {
  const m = DECIMAL.exec(String(x));
  if (!m) throw new RangeError(`not a finite non-negative rate: ${x}`);
  const frac = m[2] ?? '';
  return { digits: BigInt(m[1]! + frac), exponent: Number(m[3] ?? 0) - frac.length };
}

/** Σ plus − Σ minus, exactly, as digits · 10^exponent. */
function exactDifference(plus: readonly number[], minus: readonly number[]): Decimal {
  const terms = [...plus.map((x) => ({ d: decimalOf(x), sign: 1n })), ...minus.map((x) => ({ d: decimalOf(x), sign: -1n }))];
  if (terms.length === 0) return { digits: 0n, exponent: 0 };
  let low = Infinity;
  for (const t of terms) if (t.d.digits !== 0n) low = Math.min(low, t.d.exponent);
  if (low === Infinity) return { digits: 0n, exponent: 0 };
  let sum = 0n;
  for (const t of terms) if (t.d.digits !== 0n) sum += t.sign * t.d.digits * 10n ** BigInt(t.d.exponent - low);
  return { digits: sum, exponent: low };
}

/** The exact slack of a set: its sign, and its value rounded to the nearest double. */
export function exactSlack(rates: ArrayLike<number>, set: ArrayLike<number>, neighbours: ArrayLike<number>): { sign: -1 | 0 | 1; value: number } {
  const d = exactDifference(Array.from(neighbours, (k) => rates[k]!), Array.from(set, (k) => rates[k]!));
  const sign = d.digits > 0n ? 1 : d.digits < 0n ? -1 : 0;
  return { sign, value: sign === 0 ? 0 : Number(`${d.digits}e${d.exponent}`) };
}
