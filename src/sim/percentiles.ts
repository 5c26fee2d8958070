import { gammaCdf, GAMMA_EXACT_SHAPE } from './special.js';
import { arrivalBinValue, sumBins, timeBinRange } from './wait-bins.js';

/**
 * Wait percentiles from a histogram (one class, or several summed). The p-quantile is the smallest
 * wait w with P(W ≤ w) ≥ p; abandoned items are not in the histograms (waits of matched items only).
 *
 * "arrivals" histograms count K, the arrivals an item waited for (bin 0 = matched on arrival). Given
 * K its wait is Gamma(K, Λ) exactly (K independent Exp(Λ) gaps of the merged Poisson stream), so
 *   P(W ≤ w) = Σ_K h_K · P(Gamma(K, 1) ≤ Λw) / Σ_K h_K,
 * solved for w by a safeguarded regula falsi (the mixture is continuous and increasing for w > 0).
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
  return smallestReaching(mass, target, lo, hi);
}

/**
 * The smallest x in [lo, hi] with f(x) ≥ target, for f continuous and increasing with f(lo) < target
 * ≤ f(hi), to 1e-10 of hi: the end `hi` of a bracket narrowed by the Illinois variant of regula
 * falsi (an end kept twice in a row has its excess halved, so both ends move). As in Brent's method,
 * a trial point is kept at least the tolerance away from both ends, so that once the root is within
 * the tolerance of an end the next step closes the bracket; a step that leaves more than half of
 * the bracket twice in a row is followed by a bisection. It needs a third to a half of the
 * evaluations of plain bisection (each one a sum of Gamma distribution functions).
 */
export function smallestReaching(f: (x: number) => number, target: number, lo: number, hi: number): number {
  let flo = f(lo) - target;
  let fhi = f(hi) - target;
  if (flo >= 0) return lo;
  let side = 0;
  let slow = 0;
  for (let it = 0; it < 200; it++) {
    const width = hi - lo;
    const tol = 1e-10 * hi;
    if (width <= tol) break;
    let x: number;
    if (slow >= 2) {
      x = lo + width / 2;
      slow = 0;
    } else {
      x = fhi > flo ? hi - (fhi * width) / (fhi - flo) : lo + width / 2;
      const step = Math.min(tol, width / 2) * 0.999;
      x = Math.min(hi - step, Math.max(lo + step, x));
    }
    const fx = f(x) - target;
    if (fx >= 0) {
      hi = x;
      fhi = fx;
      if (side === -1) flo /= 2;
      side = -1;
    } else {
      lo = x;
      flo = fx;
      if (side === 1) fhi /= 2;
      side = 1;
    }
    slow = hi - lo > width / 2 ? slow + 1 : 0;
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
