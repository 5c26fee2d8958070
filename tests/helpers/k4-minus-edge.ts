/**
 * Closed forms for the four-class family of the harmful-flexibility checks: classes a, b, c, d with
 * every pair compatible except {a, b} ("K4 minus one edge"), and the same design with {a, b} added
 * (the complete graph K4). Derived by hand from the product form ("A product form for the general
 * stochastic matching model", J. Appl. Probab. 2021):
 *   π(w) = π(∅) ∏_ℓ λ_{w_ℓ} / λ(N({w_1..w_ℓ})).
 *
 * K4 minus {a, b}, rates λ_a, λ_b, λ_c, λ_d, Λ = their sum, g = λ_c + λ_d, s = λ_a + λ_b.
 *  1. Independent sets: ∅, {a}, {b}, {c}, {d}, {a, b} (c and d are compatible with everyone).
 *  2. Words over {a, b}: N({a}) = N({b}) = N({a, b}) = {c, d}, so every letter has denominator g and a
 *     word of length ℓ with letters in {a, b} weighs ∏ λ/g. Summing over all such words (∅ included):
 *       Σ_ℓ (s/g)^ℓ = g / (g − s)                                      (geometric series, s < g).
 *     Their total count of a-letters: Σ_ℓ ℓ (s/g)^ℓ · λ_a/s = (λ_a/s)(s/g)/(1 − s/g)² = λ_a g / (g − s)².
 *  3. Words c^m (m ≥ 1): N({c}) = {a, b, d}, ratio ρ_c = λ_c / (Λ − λ_c); Σ_m ρ_c^m = ρ_c/(1 − ρ_c),
 *     Σ_m m ρ_c^m = ρ_c/(1 − ρ_c)². Same for d.
 *  4. Z = 1/π(∅) = g/(g − s) + ρ_c/(1 − ρ_c) + ρ_d/(1 − ρ_d);
 *     L_a = λ_a g/(g − s)² / Z,  L_b = λ_b g/(g − s)² / Z,  L_c = ρ_c/(1 − ρ_c)² / Z,  L_d likewise.
 *  Stable iff s < g, λ_c < Λ − λ_c and λ_d < Λ − λ_d.
 *
 * K4: every pair compatible, states ∅ and k^m; N({k}) = all but k, ρ_k = λ_k / (Λ − λ_k);
 *  Z = 1 + Σ_k ρ_k/(1 − ρ_k), L_k = ρ_k/(1 − ρ_k)² / Z (steps 3–4 above for every class).
 *
 * Check against the numbers (Λ = 1):
 *  rates 0.1, 0.1, 0.4, 0.4: g = 0.8, s = 0.2, g/(g−s) = 4/3, ρ_c = ρ_d = 2/3 (ρ/(1−ρ) = 2, ρ/(1−ρ)² = 6):
 *    Z = 4/3 + 4 = 16/3; Σ a-letters = 0.08/0.36 = 2/9, so L_a = L_b = (2/9)(3/16) = 1/24, L_c = L_d = 18/16;
 *    total 1/12 + 9/4 = 7/3.
 *    K4: ρ_a = ρ_b = 1/9 (1/8, 9/64), ρ_c = ρ_d = 2/3 (2, 6): Z = 1 + 1/4 + 4 = 21/4,
 *    total (9/32 + 12)·4/21 = 393/168 = 131/56 > 7/3: adding {a, b} is harmful.
 *  rates 0.2, 0.2, 0.4, 0.2: g = 0.6, s = 0.4, g/(g−s) = 3; ρ_c = 2/3 (2, 6), ρ_d = 1/4 (1/3, 4/9):
 *    Z = 3 + 2 + 1/3 = 16/3; Σ a-letters = 0.12/0.04 = 3, L_a = L_b = 9/16, L_c = 9/8, L_d = 1/12; total 7/3.
 *    K4: ρ = 1/4, 1/4, 2/3, 1/4: Z = 1 + 3·(1/3) + 2 = 4, total (3·4/9 + 6)/4 = 11/6 < 7/3: helpful.
 */
export interface ClosedForm {
  readonly stable: boolean;
  readonly backlog: number[];
  readonly total: number;
}

const sum = (x: readonly number[]): number => x.reduce((s, v) => s + v, 0);

/** K4 minus {a, b}; rates in the order a, b, c, d. */
export function k4MinusEdge(rates: readonly number[]): ClosedForm {
  const [la, lb, lc, ld] = rates as [number, number, number, number];
  const L = sum(rates);
  const g = lc + ld;
  const s = la + lb;
  if (!(s < g && lc < L - lc && ld < L - ld)) return { stable: false, backlog: [], total: Infinity };
  const rc = lc / (L - lc);
  const rd = ld / (L - ld);
  const z = g / (g - s) + rc / (1 - rc) + rd / (1 - rd);
  const ab = g / (g - s) ** 2;
  const backlog = [(la * ab) / z, (lb * ab) / z, rc / (1 - rc) ** 2 / z, rd / (1 - rd) ** 2 / z];
  return { stable: true, backlog, total: sum(backlog) };
}

/** K4 (the same classes with {a, b} added). */
export function k4(rates: readonly number[]): ClosedForm {
  const L = sum(rates);
  const rho = rates.map((x) => x / (L - x));
  if (rho.some((r) => !(r < 1))) return { stable: false, backlog: [], total: Infinity };
  const z = 1 + sum(rho.map((r) => r / (1 - r)));
  const backlog = rho.map((r) => r / (1 - r) ** 2 / z);
  return { stable: true, backlog, total: sum(backlog) };
}

/** The family as scenario data: ids a, b, c, d; compatibilities as plain id pairs. */
export const K4_IDS = ['a', 'b', 'c', 'd'] as const;
export const K4_MINUS_AB_PAIRS: Array<[number, number]> = [
  [0, 2],
  [0, 3],
  [1, 2],
  [1, 3],
  [2, 3],
];

/**
 * The family as an invented scenario file ("pit crews"): classes a, b, c, d with `rates`, today's
 * compatibilities K4 minus {a, b}, the candidate {a, b} at cost 5, a budget of 10.
 */
export function pitCrews(rates: readonly number[] = [0.2, 0.2, 0.4, 0.2], timeUnit = 'minute') {
  return {
    name: 'pit crews',
    timeUnit,
    classes: K4_IDS.map((id, k) => ({ id, rate: rates[k]! })),
    compatibilities: K4_MINUS_AB_PAIRS.map(([x, y]) => [K4_IDS[x]!, K4_IDS[y]!] as [string, string]),
    candidates: [{ pair: ['a', 'b'] as [string, string], cost: 5 }],
    budget: 10,
  };
}
