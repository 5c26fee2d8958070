import { describe, expect, it } from 'vitest';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { bruteStability } from '../helpers/brute-stability.js';
import { completeGraphClosedForm, completePairs, completeWithLoopsClosedForm } from '../helpers/closed-forms.js';
import { toModel, type Design } from '../helpers/designs.js';
import { maxRelativeDifference } from '../helpers/metrics.js';
import { permutationOracle } from '../helpers/permutation-oracle.js';
import { Rng } from '../helpers/random.js';

const rel = (x: number, y: number): number => Math.abs(x - y) / Math.max(Math.abs(x), Math.abs(y));

describe('complete graphs (closed forms derived by hand in tests/helpers/closed-forms.ts)', () => {
  const rng = new Rng(7031);
  const loopless: number[][] = [];
  for (let n = 3; n <= 7; n++) {
    for (let rep = 0; rep < 3; rep++) {
      // derived by hand: K_n without self-loops is stable iff every λ_k < Λ/2; keep a margin.
      let rates: number[];
      do rates = Array.from({ length: n }, () => rng.uniform(0.2, 2));
      while (Math.max(...rates) >= 0.45 * rates.reduce((s, x) => s + x, 0));
      loopless.push(rates);
    }
  }
  it.each(loopless.map((rates) => ({ rates, label: `K${rates.length} rates ${rates.map((r) => r.toFixed(2)).join(' ')}` })))(
    '$label: evaluator and permutation oracle equal the geometric closed form',
    ({ rates }) => {
      const model = toModel({ ids: rates.map((_, k) => `p${k}`), rates, pairs: completePairs(rates.length) });
      expect(bruteStability(model).stable).toBe(true);
      const closed = completeGraphClosedForm(rates);
      const e = maxRelativeDifference(evaluateExact(model), closed, 1e-12);
      expect(e.value, e.where).toBeLessThanOrEqual(1e-10);
      const oracle = permutationOracle(model);
      const o = maxRelativeDifference(oracle, closed, 1e-12);
      expect(o.value, o.where).toBeLessThanOrEqual(1e-12);
      expect(rel(oracle.normaliser, closed.normaliser)).toBeLessThanOrEqual(1e-12);
    },
  );

  const looped = [1, 2, 3, 5, 6].map((n) => Array.from({ length: n }, () => rng.uniform(0.1, 3)));
  it.each(looped.map((rates) => ({ rates, label: `K${rates.length} with every self-loop` })))(
    '$label: Z = 2, L_k = λ_k / (2Λ)',
    ({ rates }) => {
      const model = toModel({ ids: rates.map((_, k) => `p${k}`), rates, pairs: completePairs(rates.length, true) });
      const closed = completeWithLoopsClosedForm(rates);
      const e = maxRelativeDifference(evaluateExact(model), closed, 1e-12);
      expect(e.value, e.where).toBeLessThanOrEqual(1e-12);
      const oracle = permutationOracle(model);
      expect(rel(oracle.normaliser, 2)).toBeLessThanOrEqual(1e-14);
      const o = maxRelativeDifference(oracle, closed, 1e-12);
      expect(o.value, o.where).toBeLessThanOrEqual(1e-12);
    },
  );
});

/*
 * K4 minus one edge, and K4 (harmful flexibility: "Flexibility can hurt dynamic matching system
 * performance", SIGMETRICS Perform. Eval. Rev. 2022). Derived by hand from the product form.
 *
 * Classes a, b (not adjacent), c, d; edges a–c, a–d, b–c, b–d, c–d; Λ = 1 in both cases.
 * Independent sets: ∅, {a}, {b}, {c}, {d}, {a, b}. N(a) = N(b) = N({a, b}) = {c, d}; N(c) = {a, b, d};
 * N(d) = {a, b, c}. Each letter of a word contributes λ_letter / λ(N(letters so far)).
 * Sums used: Σ_{m≥1} r^m = r/(1−r);  Σ_{m≥1} m r^m = r/(1−r)².
 *
 * Case 1: λ = (a, b, c, d) = (0.1, 0.1, 0.4, 0.4).
 *   a^m: factor 0.1/0.8 = 1/8 per letter → mass Σ (1/8)^m = 1/7, count mass Σ m (1/8)^m = (1/8)/(7/8)² = 8/49. Same for b.
 *   c^m: factor 0.4/0.6 = 2/3 → mass 2, count mass (2/3)/(1/3)² = 6. Same for d.
 *   words over {a, b} using both letters: every letter has factor 0.1/0.8 = 1/8; there are 2^ℓ − 2 such
 *   words of length ℓ ≥ 2. Mass Σ_{ℓ≥2} (1/4)^ℓ − 2 Σ_{ℓ≥2} (1/8)^ℓ = 1/12 − 1/28 = 1/21.
 *   Letter-count mass Σ_{ℓ≥2} ℓ(1/4)^ℓ − 2 Σ_{ℓ≥2} ℓ(1/8)^ℓ = (4/9 − 1/4) − 2(8/49 − 1/8) = 7/36 − 15/196 = 52/441,
 *   split evenly by symmetry: 26/441 for a and for b.
 *   Z = 1 + 2/7 + 4 + 1/21 = 16/3, so P(empty) = 3/16.
 *   L_a = L_b = (8/49 + 26/441)·3/16 = (2/9)(3/16) = 1/24;  L_c = L_d = 6·3/16 = 9/8;  total 1/12 + 9/4 = 7/3.
 * Case 1 with the edge a–b added (K4): ρ_k = λ_k/(Λ − λ_k): ρ_a = ρ_b = 1/9, ρ_c = ρ_d = 2/3.
 *   Z = 1 + 2·(1/9)/(8/9) + 2·(2/3)/(1/3) = 21/4, P(empty) = 4/21.
 *   ρ/(1−ρ)²: a, b → (1/9)/(64/81) = 9/64; c, d → 6. L_a = L_b = (9/64)(4/21) = 3/112; L_c = L_d = 6·4/21 = 8/7;
 *   total 6/112 + 256/112 = 131/56 > 7/3: the added compatibility raises the backlog.
 *
 * Case 2: λ = (0.2, 0.2, 0.4, 0.2).
 *   a^m: factor 0.2/0.6 = 1/3 → mass 1/2, count mass (1/3)/(2/3)² = 3/4. Same for b.
 *   c^m: factor 0.4/0.6 = 2/3 → mass 2, count mass 6.   d^m: factor 0.2/0.8 = 1/4 → mass 1/3, count mass (1/4)/(3/4)² = 4/9.
 *   both a and b: every letter factor 0.2/0.6 = 1/3; mass Σ_{ℓ≥2} (2/3)^ℓ − 2 Σ_{ℓ≥2} (1/3)^ℓ = 4/3 − 1/3 = 1;
 *   count mass (6 − 2/3) − 2(3/4 − 1/3) = 16/3 − 5/6 = 9/2, i.e. 9/4 each for a and b.
 *   Z = 1 + 1/2 + 1/2 + 2 + 1/3 + 1 = 16/3, P(empty) = 3/16.
 *   L_a = L_b = (3/4 + 9/4)·3/16 = 9/16;  L_c = 9/8;  L_d = (4/9)(3/16) = 1/12;  total 9/8 + 9/8 + 1/12 = 7/3.
 * Case 2 in K4: ρ_a = ρ_b = ρ_d = 0.2/0.8 = 1/4, ρ_c = 2/3. Z = 1 + 3·(1/4)/(3/4) + 2 = 4, P(empty) = 1/4.
 *   ρ/(1−ρ)²: 1/4 → (1/4)/(9/16) = 4/9; 2/3 → 6. L_a = L_b = L_d = (4/9)/4 = 1/9; L_c = 6/4 = 3/2; total 11/6 < 7/3.
 */
const BASE_PAIRS: Array<[number, number]> = [[0, 2], [0, 3], [1, 2], [1, 3], [2, 3]];
const K4_PAIRS: Array<[number, number]> = [...BASE_PAIRS, [0, 1]];
const HAND_CASES = [
  { label: 'rates 0.1/0.1/0.4/0.4, K4 minus a–b', rates: [0.1, 0.1, 0.4, 0.4], pairs: BASE_PAIRS, total: 7 / 3, empty: 3 / 16, backlog: [1 / 24, 1 / 24, 9 / 8, 9 / 8] },
  { label: 'rates 0.1/0.1/0.4/0.4, K4', rates: [0.1, 0.1, 0.4, 0.4], pairs: K4_PAIRS, total: 131 / 56, empty: 4 / 21, backlog: [3 / 112, 3 / 112, 8 / 7, 8 / 7] },
  { label: 'rates 0.2/0.2/0.4/0.2, K4 minus a–b', rates: [0.2, 0.2, 0.4, 0.2], pairs: BASE_PAIRS, total: 7 / 3, empty: 3 / 16, backlog: [9 / 16, 9 / 16, 9 / 8, 1 / 12] },
  { label: 'rates 0.2/0.2/0.4/0.2, K4', rates: [0.2, 0.2, 0.4, 0.2], pairs: K4_PAIRS, total: 11 / 6, empty: 1 / 4, backlog: [1 / 9, 1 / 9, 3 / 2, 1 / 9] },
];

describe('K4 minus one edge vs K4: hand-derived values (derived by hand, see the comment above)', () => {
  it.each(HAND_CASES)('$label', ({ rates, pairs, total, empty, backlog }) => {
    const design: Design = { ids: ['a', 'b', 'c', 'd'], rates, pairs };
    const model = toModel(design);
    for (const r of [evaluateExact(model), permutationOracle(model)]) {
      expect(rel(r.backlogTotal, total)).toBeLessThanOrEqual(1e-12);
      expect(rel(r.emptyProbability, empty)).toBeLessThanOrEqual(1e-12);
      for (let k = 0; k < 4; k++) expect(rel(r.backlog[k]!, backlog[k]!), `class ${k}`).toBeLessThanOrEqual(1e-12);
    }
  });

  it('adding a–b raises the backlog at rates 0.1/0.1/0.4/0.4 and lowers it at 0.2/0.2/0.4/0.2', () => {
    const total = (rates: number[], pairs: Array<[number, number]>): number =>
      evaluateExact(toModel({ ids: ['a', 'b', 'c', 'd'], rates, pairs })).backlogTotal;
    expect(total([0.1, 0.1, 0.4, 0.4], K4_PAIRS)).toBeGreaterThan(total([0.1, 0.1, 0.4, 0.4], BASE_PAIRS));
    expect(total([0.2, 0.2, 0.4, 0.2], K4_PAIRS)).toBeLessThan(total([0.2, 0.2, 0.4, 0.2], BASE_PAIRS));
  });
});
