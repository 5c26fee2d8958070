/**
 * Objective weights that break ties inside the MILP. Every price p_j gets a small positive addition
 *
 *   ε_j = u · (1 + (j + 1) / (K + 1)²),   u = r / (2 (K + 1)),
 *
 * where K is the number of toggles and r the price resolution: the largest step of which every price
 * is a whole multiple (a power of ten down to 1e-6, times the gcd of the scaled prices), so that two
 * sets of different cost differ by at least r. Derived by hand:
 *   - a set S of s toggles has Σ_{j∈S} ε_j = u·s + u·Σ_{j∈S}(j+1)/(K+1)², and the second term is below
 *     u·s·K/(K+1)² < u, so Σ ε lies in [u·s, u·(s+1)): fewer pairs always weigh less;
 *   - Σ ε < u·(K+1) = r/2 for any set, so the weighted order never reverses two different costs;
 *   - within one cost and size, the set with the smaller Σ (j+1), i.e. earlier pairs, weighs less
 *     (a difference of at least u/(K+1)², resolved while it stays above HiGHS's absolute gap, 1e-6).
 * All weights are positive, so every proper subset of a set weighs less: an optimal stabilising set is
 * minimal.
 */

/** Largest r (see above) with every price a whole multiple of r; 1 when every price is 0. */
export function priceResolution(prices: readonly number[]): number {
  for (let d = 0; d <= 6; d++) {
    const scale = 10 ** d;
    const ints = prices.map((p) => p * scale);
    if (!ints.every((v) => Math.abs(v - Math.round(v)) <= 1e-9 * Math.max(1, Math.abs(v)))) continue;
    let g = 0;
    for (const v of ints) g = gcd(g, Math.round(Math.abs(v)));
    return g === 0 ? 1 : g / scale;
  }
  return 1e-6;
}

function gcd(a: number, b: number): number {
  while (b > 0) [a, b] = [b, a % b];
  return a;
}

/** The weighted prices p_j + ε_j (see above). */
export function tieWeights(prices: readonly number[]): number[] {
  const k = prices.length;
  const u = priceResolution(prices) / (2 * (k + 1));
  return prices.map((p, j) => p + u * (1 + (j + 1) / (k + 1) ** 2));
}
