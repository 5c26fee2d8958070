/**
 * Exponential patience from censored waits. Each item that left the queue unmatched (abandoned)
 * shows its patience; each item matched (or still waiting when the log ends) shows only that its
 * patience exceeded its wait (right censoring). With d abandonments and a total time at risk S
 * (the sum of all waits), the log-likelihood of the abandonment rate θ is ℓ(θ) = d ln θ − θ S,
 * maximised at θ̂ = d / S; the mean patience is 1/θ̂ = S/d.
 *
 * The 95 % interval is the likelihood-ratio interval {θ : 2[ℓ(θ̂) − ℓ(θ)] ≤ χ²₁(0.95)}: writing
 * x = θ/θ̂, the condition is d (x − 1 − ln x) ≤ q/2 with q = χ²₁(0.95), solved here by bisection on
 * each side of x = 1. With d = 0 the likelihood e^{−θS} is largest at θ = 0 and the interval is
 * [0, q/(2S)]. References (from memory): "Analysis of Survival Data", Chapman & Hall, 1984, and
 * "Statistical Models and Methods for Lifetime Data", Wiley, 1982 (censored exponential samples and
 * likelihood-ratio intervals). Assumes exponential patience, independent of the time to a match.
 */
import { chiSquareQuantile } from './poisson-interval.js';

export interface PatienceFit {
  readonly abandoned: number;
  /** Items whose patience is only known to exceed their wait (matched or still waiting). */
  readonly censored: number;
  /** Sum of all waits (time units). */
  readonly timeAtRisk: number;
  /** θ̂ = abandoned / timeAtRisk, per time unit. */
  readonly abandonmentRate: number;
  readonly abandonmentRateCi95: [number, number];
  /** Mean patience S/d (time units); Infinity when nobody abandoned. */
  readonly mean: number;
  /** [1/θ_hi, 1/θ_lo]; the upper end is Infinity when the lower end of θ is 0. */
  readonly meanCi95: [number, number];
}

/** Root of g on [lo, hi] where g changes sign, by bisection to double precision. */
function bisect(g: (x: number) => number, lo: number, hi: number): number {
  const gLo = g(lo);
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (mid === lo || mid === hi) break;
    if (Math.sign(g(mid)) === Math.sign(gLo)) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** The likelihood-ratio interval [x_lo, x_hi] of θ/θ̂ for d ≥ 1 abandonments. */
export function likelihoodRatioRange(d: number, level = 0.95): [number, number] {
  const half = chiSquareQuantile(level, 1) / 2;
  const g = (x: number) => d * (x - 1 - Math.log(x)) - half;
  let lo = 0.5;
  while (g(lo) < 0) lo /= 2;
  let hi = 2;
  while (g(hi) < 0) hi *= 2;
  return [bisect(g, lo, 1), bisect(g, 1, hi)];
}

/** Fits exponential patience to `abandoned` abandonments among `items` waits summing to `timeAtRisk`. */
export function fitPatience(abandoned: number, items: number, timeAtRisk: number, level = 0.95): PatienceFit {
  const censored = items - abandoned;
  let rate: number;
  let ci: [number, number];
  if (abandoned === 0) {
    rate = 0;
    ci = [0, timeAtRisk > 0 ? chiSquareQuantile(level, 1) / (2 * timeAtRisk) : Infinity];
  } else {
    rate = timeAtRisk > 0 ? abandoned / timeAtRisk : Infinity;
    const [xl, xh] = likelihoodRatioRange(abandoned, level);
    ci = [rate * xl, rate * xh];
  }
  return {
    abandoned,
    censored,
    timeAtRisk,
    abandonmentRate: rate,
    abandonmentRateCi95: ci,
    mean: rate === 0 ? Infinity : 1 / rate,
    meanCi95: [1 / ci[1], ci[0] === 0 ? Infinity : 1 / ci[0]],
  };
}
