/**
 * Special functions for the statistics of the simulator, written from textbook formulas (all from
 * memory; tests/sim/special.test.ts checks them against hand-derived values and numerical
 * integration).
 */

/** ln Γ(x) for x > 0: shift to x ≥ 15 by Γ(x+1) = xΓ(x), then the asymptotic series of ln Γ to x^-9. */
export function logGamma(x: number): number {
  if (!(x > 0)) return NaN;
  let shift = 0;
  while (x < 15) {
    shift += Math.log(x);
    x += 1;
  }
  const z = 1 / (x * x);
  const series = (1 / x) * (1 / 12 - z * (1 / 360 - z * (1 / 1260 - z * (1 / 1680 - z / 1188))));
  return (x - 0.5) * Math.log(x) - x + 0.5 * Math.log(2 * Math.PI) + series - shift;
}

/**
 * Complementary error function, a fitted exponential-polynomial form with fractional error below
 * 1.2e-7 everywhere (a classic fit, coefficients from memory).
 */
export function erfc(x: number): number {
  const z = Math.abs(x);
  const t = 1 / (1 + 0.5 * z);
  const r =
    t *
    Math.exp(
      -z * z -
        1.26551223 +
        t * (1.00002368 + t * (0.37409196 + t * (0.09678418 + t * (-0.18628806 + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277)))))))),
    );
  return x >= 0 ? r : 2 - r;
}

/** Standard normal distribution function Φ(z). */
export function normalCdf(z: number): number {
  return 0.5 * erfc(-z / Math.SQRT2);
}

/** Below this shape the gamma distribution function is summed exactly. */
export const GAMMA_EXACT_SHAPE = 100;

/**
 * P(Gamma(a, 1) ≤ x), the regularised lower incomplete gamma function.
 * - a an integer below 100: exactly, as P(Poisson(x) ≥ a) = 1 − Σ_{i<a} e^{−x} x^i / i!
 *   (a Gamma(a, 1) time is the a-th epoch of a unit-rate Poisson process).
 * - larger a: the cube-root normal approximation ("The distribution of chi-square", Proc. Natl.
 *   Acad. Sci. 1931, from memory): (X/a)^{1/3} is close to normal with mean 1 − 1/(9a) and variance
 *   1/(9a); its error in the distribution function is far below 1e-3 for a ≥ 100.
 */
export function gammaCdf(a: number, x: number): number {
  if (a <= 0) return 1;
  if (!(x > 0)) return 0;
  if (a < GAMMA_EXACT_SHAPE && Number.isInteger(a)) {
    let term = Math.exp(-x);
    let below = 0;
    for (let i = 0; i < a; i++) {
      below += term;
      term *= x / (i + 1);
    }
    return Math.min(1, Math.max(0, 1 - below));
  }
  const v = 1 / (9 * a);
  return normalCdf((Math.cbrt(x / a) - (1 - v)) / Math.sqrt(v));
}
