/** Small wording helpers for units and numbers in the report (plain English). */

/** "minute" → "minutes"; units that already end in s, or contain a slash, stay as they are. */
export function plural(unit: string): string {
  if (unit.endsWith('s') || unit.includes('/') || unit.includes(' per ')) return unit;
  return `${unit}s`;
}

/** Three significant digits, no exponent for everyday magnitudes: 0.01234 → "0.0123", 1234.5 → "1,235". */
export function fmt(x: number, digits = 3): string {
  if (!Number.isFinite(x)) return x > 0 ? '∞' : x < 0 ? '−∞' : '—';
  if (x === 0) return '0';
  const a = Math.abs(x);
  if (a >= 1000) return Math.round(x).toLocaleString('en-US');
  if (a < 1e-4) return x.toExponential(1);
  return Number(x.toPrecision(digits)).toString();
}

/** Signed change: "+0.42", "−1.3" (true minus sign). */
export function signed(x: number, digits = 3): string {
  if (x === 0) return '±0';
  return x > 0 ? `+${fmt(x, digits)}` : `−${fmt(-x, digits)}`;
}

/** Relative change in percent with sign: 0.123 → "+12.3 %" (a no-break space before %, so it never wraps alone). */
export function percent(x: number): string {
  if (!Number.isFinite(x)) return '—';
  const v = Math.abs(x * 100);
  const body = v >= 10 ? v.toFixed(0) : v >= 1 ? v.toFixed(1) : v.toFixed(2);
  return `${x > 0 ? '+' : x < 0 ? '−' : '±'}${body}\u00a0%`;
}

/** "a, b and c". */
export function listWords(items: readonly string[]): string {
  if (items.length === 0) return 'nothing';
  if (items.length === 1) return items[0]!;
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}
