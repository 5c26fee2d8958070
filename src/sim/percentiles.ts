import { gammaCdf, GAMMA_EXACT_SHAPE } from './special.js';
import { arrivalBinValue, sumBins, timeBinRange } from './wait-bins.js';

/**
 * Wait percentiles from a histogram (one class, or several summed). The p-quantile is the smallest
 * wait w with P(W ≤ w) ≥ p; abandoned items are not in the histograms (waits of matched items only).
 *
 * "arrivals" histograms count K, the arrivals an item waited for (bin 0 = matched on arrival). Given
 * K its wait is Gamma(K, Λ) exactly (K independent Exp(Λ) gaps of the merged Poisson stream), so
 *   P(W ≤ w) = Σ_K h_K · P(Gamma(K, 1) ≤ Λw) / Σ_K h_K,
 * solved for w by bisection (the mixture is continuous and increasing for w > 0).
 * "time" histograms count the scaled wait Λw in logarithmic bins; inside a bin the distribution
 * function is interpolated linearly in log w (relative error below the 1.1 % bin width).
 */
export function waitQuantile(
  kind: 'arrivals' | 'time',
  hist: Float64Array,
  start: number,
  bins: number,
  totalRate: number,
  p: number,
): number {
  const total = sumBins(hist, start, start + bins);
  if (!(total > 0)) return NaN;
  const target = p * total;
  if (hist[start]! >= target) return 0;
  return kind === 'arrivals' ? arrivalsQuantile(hist, start, bins, target) / totalRate : timeQuantile(hist, start, bins, target) / totalRate;
}

/** The non-empty bins b ≥ 1 of an arrivals histogram: their representative K and their counts. */
function nonEmptyBins(hist: Float64Array, start: number, bins: number): [number[], number[]] {
  const ks: number[] = [];
  const ws: number[] = [];
  for (let b = 1; b < bins; b++) {
    const h = hist[start + b]!;
    if (h > 0) {
      ks.push(arrivalBinValue(b));
      ws.push(h);
    }
  }
  return [ks, ws];
}

/** Quantile of the scaled wait x = Λw for an arrivals histogram. */
function arrivalsQuantile(hist: Float64Array, start: number, bins: number, target: number): number {
  const [ks, ws] = nonEmptyBins(hist, start, bins);
  const zero = hist[start]!;
  // before[i] = Σ_{j<i} ws[j]
  const before = new Float64Array(ks.length + 1);
  for (let i = 0; i < ks.length; i++) before[i + 1] = before[i]! + ws[i]!;
  const firstAtLeast = (v: number): number => {
    let lo = 0;
    let hi = ks.length;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (ks[mid]! < v) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
  // F(x)·total. Only shapes K within x ± (8√x + 12) are evaluated: below that window
  // P(Gamma(K) ≤ x) = P(Poisson(x) ≥ K) differs from 1, and above it from 0, by far less than 1e-12.
  const mass = (x: number): number => {
    const reach = 8 * Math.sqrt(x) + 12;
    const i0 = firstAtLeast(x - reach);
    const i1 = firstAtLeast(x + reach + 1);
    let s = zero + before[i0]!;
    let j = i0;
    if (j < i1 && ks[j]! < GAMMA_EXACT_SHAPE) {
      // exact small shapes share one pass of Poisson terms
      let term = Math.exp(-x);
      let below = 0;
      let i = 0;
      for (; j < i1 && ks[j]! < GAMMA_EXACT_SHAPE; j++) {
        const k = ks[j]!;
        while (i < k) {
          below += term;
          term *= x / (i + 1);
          i++;
        }
        s += ws[j]! * Math.min(1, Math.max(0, 1 - below));
      }
    }
    for (; j < i1; j++) s += ws[j]! * gammaCdf(ks[j]!, x);
    return s;
  };
  // Bracket around Kp, the p-quantile of K itself: below Kp − (10√Kp + 20) the mixture is under the
  // level (the bins from Kp up are still ~0) and above Kp + (10√Kp + 20) it has reached it (the bins
  // up to Kp are ~1). The loops below widen the bracket should rounding say otherwise.
  let at = 0;
  while (at < ks.length - 1 && zero + before[at + 1]! < target) at++;
  const kp = ks[at]!;
  let lo = Math.max(0, kp - 10 * Math.sqrt(kp) - 20);
  let hi = kp + 10 * Math.sqrt(kp) + 20;
  while (mass(hi) < target && hi < 1e300) hi *= 2;
  if (lo > 0 && mass(lo) >= target) lo = 0;
  for (let it = 0; it < 100 && hi - lo > 1e-10 * hi; it++) {
    const mid = (lo + hi) / 2;
    if (mass(mid) >= target) hi = mid;
    else lo = mid;
  }
  return hi;
}

/** Quantile of the scaled wait for a time histogram. */
function timeQuantile(hist: Float64Array, start: number, bins: number, target: number): number {
  let cum = hist[start]!;
  for (let b = 1; b < bins; b++) {
    const h = hist[start + b]!;
    if (h > 0 && cum + h >= target) {
      const [lo, hi] = timeBinRange(b);
      const f = (target - cum) / h;
      return lo * Math.pow(hi / lo, f);
    }
    cum += h;
  }
  return timeBinRange(bins - 1)[1];
}
