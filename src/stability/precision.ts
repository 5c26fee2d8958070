/**
 * How many significant digits an exact figure supports near the stability boundary. The exact
 * recursion divides by λ(N(A)) − λ(A ∖ S) for every set A; with double precision (unit roundoff
 * about 1.1e-16) the relative error of backlog figures grows like 1e-16 / relative slack of the
 * bottleneck (a first-order bound: the terms of the tightest set dominate the sums and carry the
 * rounding of their denominator). Far from the boundary figures hold about 15 digits.
 */
export function backlogDigits(relativeSlack: number | undefined): number {
  if (relativeSlack === undefined || !(relativeSlack > 0)) return 15;
  const digits = Math.floor(-Math.log10(1.1e-16 / Math.min(1, relativeSlack)));
  return Math.max(0, Math.min(15, digits));
}
