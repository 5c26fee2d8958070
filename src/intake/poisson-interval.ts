/**
 * Exact (Garwood) confidence interval for a Poisson rate: with n events over an exposure T, the
 * two-sided interval at level 1 − α is
 *
 *   [ G⁻¹(α/2; n, 1) / T ,  G⁻¹(1 − α/2; n + 1, 1) / T ]
 *
 * where G⁻¹(p; a, 1) is the quantile of the Gamma(a, 1) distribution (the lower end is 0 when
 * n = 0). It follows from P(Poisson(μ) ≥ n) = P(Gamma(n, 1) ≤ μ). Reference: "Fiducial limits for
 * the Poisson distribution", Biometrika, 1936. Quantiles from @stdlib's gamma quantile (the inverse
 * regularised incomplete gamma function).
 */
import gammaQuantile from '@stdlib/stats-base-dists-gamma-quantile';

/** [lo, hi] for the rate of `count` events over `exposure` (> 0) time units. */
export function poissonRateInterval(count: number, exposure: number, level = 0.95): [number, number] {
  const alpha = 1 - level;
  const lo = count === 0 ? 0 : gammaQuantile(alpha / 2, count, 1) / exposure;
  const hi = gammaQuantile(1 - alpha / 2, count + 1, 1) / exposure;
  return [lo, hi];
}

/** The 1 − α quantile of the chi-square distribution with `df` degrees of freedom (Gamma(df/2, rate 1/2)). */
export function chiSquareQuantile(p: number, df: number): number {
  return gammaQuantile(p, df / 2, 0.5);
}
