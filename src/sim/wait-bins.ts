/**
 * Bins of the wait histograms. Two kinds:
 *
 * - "arrivals": the patient engine counts, for each item matched after waiting, the number K ≥ 1 of
 *   arrivals (of any class) from its own arrival to the arrival that matched it. Bins are exact for
 *   K < 1024; above, K is grouped by its top 9 significant bits (256 bins per octave, relative
 *   width below 0.4 %, while a Gamma(K) wait spreads by 1/√K ≥ 3 % there). Bin 0 holds the items
 *   matched on arrival (K = 0). About 6 400 bins (50 kB) per class.
 * - "time": the timed engine (impatience) bins the wait w itself, scaled to x = w·Λ (Λ = total rate),
 *   in 64 bins per octave of x from 2^-32 to 2^40 (relative width 1.1 %, interpolated inside a
 *   bin), bin 0 = no wait.
 */

export const EXACT_ARRIVAL_BINS = 1024;
/** Sub-bins per octave above the exact range (2^SUB_BITS). */
const SUB_BITS = 8;
const ARRIVAL_SUB = 1 << SUB_BITS;
/** Octaves 2^10 .. 2^31 and a last bin for anything larger. */
export const ARRIVAL_BINS = EXACT_ARRIVAL_BINS + 21 * ARRIVAL_SUB + 1;

/** Bin of K ≥ 1024 (the caller handles K < 1024 as the bin K). */
export function largeArrivalBin(K: number): number {
  if (K >= 2147483648) return ARRIVAL_BINS - 1;
  const k = K | 0;
  const e = 31 - Math.clz32(k); // 10..30
  return EXACT_ARRIVAL_BINS + (e - 10) * ARRIVAL_SUB + ((k >>> (e - SUB_BITS)) & (ARRIVAL_SUB - 1));
}

export function arrivalBin(K: number): number {
  return K < EXACT_ARRIVAL_BINS ? K : largeArrivalBin(K);
}

/** [low, high) range of K in bin b (for b < 1024: [b, b + 1)). */
export function arrivalBinRange(b: number): [number, number] {
  if (b < EXACT_ARRIVAL_BINS) return [b, b + 1];
  if (b === ARRIVAL_BINS - 1) return [2147483648, 2147483648 * 2];
  const j = b - EXACT_ARRIVAL_BINS;
  const e = 10 + Math.floor(j / ARRIVAL_SUB);
  const mant = ARRIVAL_SUB + (j % ARRIVAL_SUB);
  const lo = mant * 2 ** (e - SUB_BITS);
  return [lo, lo + 2 ** (e - SUB_BITS)];
}

/** A representative K of bin b: exact below 1024, else the middle of the bin's integer range. */
export function arrivalBinValue(b: number): number {
  const [lo, hi] = arrivalBinRange(b);
  return b < EXACT_ARRIVAL_BINS ? lo : (lo + hi - 1) / 2;
}

export const TIME_PER_OCTAVE = 64;
const TIME_MIN_EXP = -32;
const TIME_MAX_EXP = 40;
export const TIME_BINS = 1 + (TIME_MAX_EXP - TIME_MIN_EXP) * TIME_PER_OCTAVE;

/** Bin of a scaled wait x = w·Λ > 0 (clamped to the range). */
export function timeBin(x: number): number {
  if (!(x > 0)) return 0;
  const b = Math.floor((Math.log2(x) - TIME_MIN_EXP) * TIME_PER_OCTAVE) + 1;
  return b < 1 ? 1 : b >= TIME_BINS ? TIME_BINS - 1 : b;
}

/** [low, high) of the scaled wait x in bin b ≥ 1. */
export function timeBinRange(b: number): [number, number] {
  const lo = 2 ** (TIME_MIN_EXP + (b - 1) / TIME_PER_OCTAVE);
  const hi = 2 ** (TIME_MIN_EXP + b / TIME_PER_OCTAVE);
  return [lo, hi];
}

/*
 * Sums over the bins of a histogram, in small functions of their own: a long loop inside a large
 * function makes V8 compile that whole function on the stack (with everything it inlines) once per
 * replication and thread, a cost that showed in `simulate --jobs 2`; these compile in a moment.
 */

/** Σ hist[from .. to). */
export function sumBins(hist: Float64Array, from: number, to: number): number {
  let s = 0;
  for (let b = from; b < to; b++) s += hist[b]!;
  return s;
}

/** into[b] += hist[from + b] for b < count. */
export function addBins(into: Float64Array, hist: Float64Array, from: number, count: number): void {
  for (let b = 0; b < count; b++) into[b] += hist[from + b]!;
}
