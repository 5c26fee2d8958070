import type { Metrics } from './metrics.js';

/**
 * Oracle 3a: complete graph K_n without self-loops, derived by hand from the product form.
 *
 * Derived by hand:
 *  1. Any two distinct classes are compatible, so an independent set has at most one class: the states
 *     are ∅ and k^m (m ≥ 1 items of a single class k).
 *  2. N({k}) = all classes but k, so each letter of k^m contributes λ_k / (Λ − λ_k) =: ρ_k and
 *     π(k^m) = π(∅) ρ_k^m (class k's queue is geometric with ratio ρ_k; stable iff every ρ_k < 1,
 *     i.e. λ_k < Λ/2).
 *  3. Z = 1/π(∅) = 1 + Σ_k Σ_{m≥1} ρ_k^m = 1 + Σ_k ρ_k / (1 − ρ_k).
 *  4. L_k = Σ_{m≥1} m π(k^m) = π(∅) ρ_k / (1 − ρ_k)²  (using Σ_{m≥1} m r^m = r / (1 − r)²).
 *  5. P(k^m for some m ≥ 1) = π(∅) ρ_k / (1 − ρ_k) =: q_k. An arrival of k waits only in the states ∅ and
 *     k^m, so immediateMatch_k = 1 − π(∅) − q_k.
 *  6. A waiting item of class j is the oldest (indeed the only) compatible one for any arrival i ≠ j, so the
 *     match rate of {i, j} is λ_i q_j + λ_j q_i.
 */
export function completeGraphClosedForm(rates: readonly number[]): Metrics & { normaliser: number } {
  const n = rates.length;
  const L = rates.reduce((s, x) => s + x, 0);
  const rho = rates.map((x) => x / (L - x));
  const Z = 1 + rho.reduce((s, r) => s + r / (1 - r), 0);
  const backlog = rho.map((r) => r / (1 - r) ** 2 / Z);
  const q = rho.map((r) => r / (1 - r) / Z);
  const matchRates: number[] = [];
  for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) matchRates.push(rates[i]! * q[j]! + rates[j]! * q[i]!);
  return {
    normaliser: Z,
    emptyProbability: 1 / Z,
    backlog,
    backlogTotal: backlog.reduce((s, x) => s + x, 0),
    wait: backlog.map((x, k) => x / rates[k]!),
    immediateMatch: q.map((qk) => 1 - 1 / Z - qk),
    matchRates,
  };
}

/**
 * Edge list of K_n (with every self-loop when asked) in the order the closed forms' match rates use:
 * for each i, (i, i) first when looped, then (i, j) for j > i. The generator of src/model is only
 * bookkeeping here, not the computation under test.
 */
export { completePairs } from '../../src/model/generators.js';

/**
 * Oracle 3b: complete graph with every self-loop, derived by hand.
 *  1. Every class is compatible with every class, itself included, so at most one item waits:
 *     the states are ∅ and the single letters k.
 *  2. N({k}) = all classes, so π(k) = π(∅) λ_k / Λ; Z = 1 + Σ_k λ_k/Λ = 2, π(∅) = 1/2, L_k = λ_k / (2Λ).
 *  3. Any waiting item is compatible with any arrival: immediateMatch_k = P(not empty) = 1/2.
 *  4. Match rates: {i, j} with i ≠ j: λ_i π(j) + λ_j π(i) = λ_i λ_j / Λ; self-loop {i, i}: λ_i π(i) = λ_i² / (2Λ).
 *     (Check: Σ_{j≠i} λ_iλ_j/Λ + 2·λ_i²/(2Λ) = λ_i.)
 * Edge order: completePairs(n, true).
 */
export function completeWithLoopsClosedForm(rates: readonly number[]): Metrics & { normaliser: number } {
  const n = rates.length;
  const L = rates.reduce((s, x) => s + x, 0);
  const backlog = rates.map((x) => x / (2 * L));
  const matchRates: number[] = [];
  for (let i = 0; i < n; i++) {
    matchRates.push((rates[i]! * rates[i]!) / (2 * L));
    for (let j = i + 1; j < n; j++) matchRates.push((rates[i]! * rates[j]!) / L);
  }
  return {
    normaliser: 2,
    emptyProbability: 0.5,
    backlog,
    backlogTotal: 0.5,
    wait: backlog.map((x, k) => x / rates[k]!),
    immediateMatch: rates.map(() => 0.5),
    matchRates,
  };
}
