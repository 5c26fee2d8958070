/**
 * The one formatting module: how every number, share, amount of money, rate, wait, pair and set is
 * written, in text (for people) and in machine output (JSON, CSV). Renderers never format a number
 * any other way.
 *
 * Text: four significant digits, no exponent for everyday magnitudes, thousands separated.
 * Machine output: numbers rounded to the significant digits the computation supports (see
 * `roundFigure`), integers untouched, intervals rounded to their own precision.
 */

/** Four significant digits for people: 0.8333 → "0.8333", 12 → "12", 1234.5 → "1,235", 2e-7 → "2.0e-7". */
export function num(x: number, digits = 4): string {
  if (!Number.isFinite(x)) return x > 0 ? '∞' : x < 0 ? '−∞' : '—';
  if (x === 0) return '0';
  const a = Math.abs(x);
  if (a >= 1e9 || a < 1e-4) return x.toExponential(Math.max(1, digits - 3)).replace(/-/g, '−').replace('e+', 'e');
  if (a >= 10 ** digits) return Math.round(x).toLocaleString('en-US').replace('-', '−');
  const s = Number(x.toPrecision(digits));
  const out = Math.abs(s) >= 1000 ? s.toLocaleString('en-US', { maximumFractionDigits: 20 }) : String(s);
  return out.replace('-', '−');
}

/** A change with its sign: "+0.42", "−1.3", "±0". */
export function signed(x: number, digits = 4): string {
  if (x === 0) return '±0';
  if (!Number.isFinite(x)) return x > 0 ? '+∞' : x < 0 ? '−∞' : '—';
  return x > 0 ? `+${num(x, digits)}` : num(x, digits);
}

/** A share as a percentage: 0.8197 → "82.0 %". */
export function pct(x: number, decimals = 1): string {
  if (!Number.isFinite(x)) return '—';
  return `${(x * 100).toFixed(decimals)} %`;
}

/** A relative change with its sign: 0.123 → "+12 %", −0.0041 → "−0.41 %". */
export function signedPct(x: number): string {
  if (!Number.isFinite(x)) return '—';
  if (x === 0) return '±0 %';
  const v = Math.abs(x * 100);
  const body = v >= 10 ? v.toFixed(0) : v >= 1 ? v.toFixed(1) : v >= 0.01 ? v.toFixed(2) : v.toExponential(0);
  return `${x > 0 ? '+' : '−'}${body} %`;
}

/** A whole count: 6185718 → "6,185,718". */
export function count(n: number): string {
  return Number.isFinite(n) ? Math.round(n).toLocaleString('en-US') : '—';
}

/** "3 designs", "1 design". */
export function counted(n: number, noun: string, pluralNoun = `${noun}s`): string {
  return `${count(n)} ${n === 1 ? noun : pluralNoun}`;
}

/** Money: "12.5 credits", "−13 credits" (a saving), or the bare number when there is no unit. */
export function money(x: number, unit?: string | null): string {
  return unit ? `${num(x)} ${unit}` : num(x);
}

// ------------------------------------------------------------------ time units and rates

/** Seconds in each time unit edgewise knows by name (singular, lower case). */
const SECONDS: Readonly<Record<string, number>> = {
  second: 1,
  minute: 60,
  hour: 3600,
  day: 86_400,
  week: 604_800,
};

const SHORT: Readonly<Record<string, string>> = { second: 's', minute: 'min', hour: 'h', day: 'd', week: 'wk' };

/** "minutes" → "minute"; "Hour" → "hour"; an unknown unit as written. */
export function unitName(unit: string): string {
  const u = unit.trim().toLowerCase();
  if (SECONDS[u] !== undefined) return u;
  if (u.endsWith('s') && SECONDS[u.slice(0, -1)] !== undefined) return u.slice(0, -1);
  return unit.trim();
}

/** "minute" → "minutes"; units that already end in s, or contain a slash or "per", stay as they are. */
export function plural(unit: string): string {
  if (unit.endsWith('s') || unit.includes('/') || unit.includes(' per ')) return unit;
  return `${unit}s`;
}

/** A rate with its unit: "3.2/hour". */
export function rate(x: number, timeUnit: string): string {
  return `${num(x)}/${unitName(timeUnit)}`;
}

/** The unit suffix of a rate column: "/hour". */
export function perUnit(timeUnit: string): string {
  return `/${unitName(timeUnit)}`;
}

/** How waits are written: in `unit`, each value multiplied by `factor` from the scenario's time unit. */
export interface WaitScale {
  readonly unit: string;
  readonly factor: number;
}

/** True when the unit is one edgewise can convert (second … week). */
export function knownTimeUnit(unit: string): boolean {
  return SECONDS[unitName(unit)] !== undefined;
}

/** The names accepted by --wait-unit. */
export const WAIT_UNITS: readonly string[] = Object.keys(SECONDS);

/**
 * The unit waits are shown in. `requested` (from --wait-unit) wins when given; otherwise, when the
 * scenario's unit is a known one, the largest unit in which the median of the non-zero `values`
 * is at least 1 (so that 0.0009735 hour reads 3.505 s); otherwise the scenario's own unit.
 */
export function waitScale(timeUnit: string, values: ArrayLike<number>, requested?: string): WaitScale {
  const base = unitName(timeUnit);
  const from = SECONDS[base];
  if (requested !== undefined) {
    const to = SECONDS[unitName(requested)];
    if (from === undefined || to === undefined) return { unit: base, factor: 1 };
    return { unit: unitName(requested), factor: from / to };
  }
  if (from === undefined) return { unit: base, factor: 1 };
  const finite: number[] = [];
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i]!) && values[i]! > 0) finite.push(values[i]!);
  if (finite.length === 0) return { unit: base, factor: 1 };
  finite.sort((a, b) => a - b);
  const median = finite[Math.floor(finite.length / 2)]! * from;
  const order = Object.entries(SECONDS).sort((a, b) => b[1] - a[1]);
  for (const [name, secs] of order) {
    if (median / secs >= 1) return { unit: name, factor: from / secs };
  }
  return { unit: 'second', factor: from };
}

/** A wait in the chosen scale: "3.505 s", "2.5 h". */
export function wait(x: number, scale: WaitScale): string {
  if (!Number.isFinite(x)) return x > 0 ? 'unbounded' : '—';
  return `${num(x * scale.factor)} ${SHORT[scale.unit] ?? scale.unit}`;
}

/** Column header of a wait column: "mean wait" plus its unit when the scale's unit is not written per cell. */
export function waitUnitLabel(scale: WaitScale): string {
  return SHORT[scale.unit] ?? scale.unit;
}

// ------------------------------------------------------------------ pairs and sets

/** The one text notation of a pair of classes: "tank ↔ mage", "healer ↔ healer". */
export function pairText(pair: readonly [string, string], name: (id: string) => string = (id) => id): string {
  return `${name(pair[0])} ↔ ${name(pair[1])}`;
}

/** A set of classes: "{archer, mage}". */
export function setText(ids: readonly string[], name: (id: string) => string = (id) => id): string {
  return `{${ids.map(name).join(', ')}}`;
}

/** "a, b and c"; "nothing" for none. */
export function listWords(items: readonly string[]): string {
  if (items.length === 0) return 'nothing';
  if (items.length === 1) return items[0]!;
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

// ------------------------------------------------------------------ machine output

/**
 * Significant digits of figures in machine output when nothing else is known: the exact recursion
 * is accurate to about 1e-13 relative away from the stability boundary, linear programs to about
 * 1e-9, so nine digits keep every figure honest and drop solver noise (1.000000001 → 1).
 */
export const MACHINE_DIGITS = 9;

/** Significant digits of figures read off a linear program's solution (solver tolerance about 1e-8). */
export const LP_DIGITS = 6;

/**
 * Significant digits an exact figure supports when the bottleneck's spare capacity is `relative`
 * of its capacity: the recursion's rounding error grows like 1e-16 / relative (docs/precision),
 * so a figure at relative spare capacity 1e-8 is good to about 7 digits. Between 3 and MACHINE_DIGITS.
 */
export function supportedDigits(relative: number | null | undefined): number {
  if (relative === null || relative === undefined || !(relative > 0) || !Number.isFinite(relative)) return MACHINE_DIGITS;
  const err = 1e-15 / Math.min(1, relative);
  return Math.max(3, Math.min(MACHINE_DIGITS, Math.floor(-Math.log10(err))));
}

/** x rounded to `digits` significant digits (integers and zero unchanged). */
export function roundFigure(x: number, digits = MACHINE_DIGITS): number {
  if (!Number.isFinite(x)) throw new RangeError(`not a finite figure: ${x}`);
  if (x === 0 || Number.isSafeInteger(x)) return x === 0 ? 0 : x;
  const r = Number(x.toPrecision(digits));
  return r === 0 ? 0 : r;
}

/**
 * An estimate and its 95 % interval rounded to what the interval supports: two significant digits
 * of the half-width, the mean and both ends to the same decimal place.
 */
export function roundEstimate(mean: number, lo: number, hi: number): { mean: number; ci95: [number, number] } {
  const half = (hi - lo) / 2;
  if (!(half > 0) || !Number.isFinite(half)) return { mean: roundFigure(mean), ci95: [roundFigure(lo), roundFigure(hi)] };
  const place = Math.floor(Math.log10(half)) - 1; // keep two significant digits of the half-width
  const at = (v: number): number => {
    const scale = 10 ** -place;
    const r = place < 0 ? Math.round(v * scale) / scale : Math.round(v / 10 ** place) * 10 ** place;
    return roundFigure(r, 15);
  };
  return { mean: at(mean), ci95: [at(lo), at(hi)] };
}

/** Text of an estimate: "15.81 ± 0.66". */
export function estimate(mean: number, lo: number, hi: number, digits = 2): string {
  const half = (hi - lo) / 2;
  if (!Number.isFinite(half) || half <= 0) return num(mean);
  const r = roundEstimate(mean, lo, hi);
  return `${num(r.mean, 6)} ± ${num(half, digits)}`;
}
