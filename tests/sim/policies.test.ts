import { LuDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { compileGraph, type CompiledModel } from '../../src/model/compile.js';
import { POLICIES, type PolicyName } from '../../src/sim/policy.js';
import { simulate } from '../../src/sim/simulate.js';
import { expectInside, familyFactor } from './support/intervals.js';

/**
 * Complete graph K_n where the classes in S also match themselves — closed form derived by hand:
 *  1. Any two distinct classes are compatible, so all waiting items belong to one class k; if k ∈ S,
 *     at most one (a second k would match it). States: ∅, and (k, j) = j ≥ 1 items of class k.
 *  2. In (k, j) an arrival of another class (total rate Λ − λ_k) finds class k as its only non-empty
 *     compatible class, so EVERY policy (fcfm, most-waiting, ranked, random-class) takes class k, and takes its
 *     oldest item: (k, j) → (k, j − 1). An arrival of k: k ∉ S → (k, j + 1) at rate λ_k; k ∈ S → ∅.
 *  3. The chain is a star of birth–death arms around ∅, hence reversible (detailed balance per arm):
 *     k ∉ S: π(k, j) = π(∅) ρ_k^j, ρ_k = λ_k / (Λ − λ_k) (geometric queue, needs ρ_k < 1);
 *     k ∈ S: π(k, 1) = π(∅) σ_k, σ_k = λ_k / Λ (leaves at rate Λ).
 *  4. Z = 1/π(∅) = 1 + Σ_{k∉S} ρ_k/(1−ρ_k) + Σ_{k∈S} σ_k.
 *  5. L_k = Σ_j j π(k, j) = ρ_k/(1−ρ_k)² / Z  (k ∉ S; Σ j r^j = r/(1−r)²),  σ_k / Z  (k ∈ S).
 *  6. q_k = P(class k waits) = ρ_k/(1−ρ_k)/Z or σ_k/Z. By PASTA an arrival of k is matched at once
 *     unless the system is empty or (k ∉ S) class k waits: 1 − 1/Z − q_k (k ∉ S), 1 − 1/Z (k ∈ S).
 *  7. Match rates: {i, j}: λ_i q_j + λ_j q_i;  {k, k}: λ_k q_k.
 *  8. Waits. k ∉ S arriving in ∅ or (k, j) waits for j + 1 arrivals of other classes: Gamma(j+1, μ)
 *     with μ = Λ − λ_k, so with P(Gamma(j+1, μ) > t) = Σ_{i≤j} e^{−μt}(μt)^i/i!,
 *       P(W > t) = Σ_{j≥0} (ρ^j/Z) Σ_{i≤j} e^{−μt}(μt)^i/i! = (1/Z) Σ_i e^{−μt}(μt)^i/i! · ρ^i/(1−ρ)
 *                = e^{−μ(1−ρ)t} / ((1−ρ)Z) = e^{−(Λ−2λ_k)t} / ((1−ρ_k)Z).
 *     k ∈ S waits only when the system is empty, for the next arrival: P(W > t) = e^{−Λt}/Z.
 *     Mean: ∫P(W>t)dt = 1/((1−ρ)Z(Λ−2λ_k)) = L_k/λ_k (Little, as it must).
 *     p-quantile: ln(c/(1−p))/r when c > 1 − p, else 0 (c = P(W > 0), r = the exponential rate).
 */
function completeClosedForm(rates: number[], loops: Set<number>) {
  const n = rates.length;
  const Lam = rates.reduce((s, x) => s + x, 0);
  const w = rates.map((l, k) => (loops.has(k) ? l / Lam : l / (Lam - l) / (1 - l / (Lam - l))));
  const Z = 1 + w.reduce((s, x) => s + x, 0);
  const q = w.map((x) => x / Z);
  const backlog = rates.map((l, k) => {
    if (loops.has(k)) return l / Lam / Z;
    const rho = l / (Lam - l);
    return rho / (1 - rho) ** 2 / Z;
  });
  const immediate = rates.map((_, k) => (loops.has(k) ? 1 - 1 / Z : 1 - 1 / Z - q[k]!));
  const tail = rates.map((l, k) => {
    if (loops.has(k)) return { c: 1 / Z, r: Lam };
    const rho = l / (Lam - l);
    return { c: 1 / ((1 - rho) * Z), r: Lam - 2 * l };
  });
  const quantile = (k: number, p: number): number => (tail[k]!.c > 1 - p ? Math.log(tail[k]!.c / (1 - p)) / tail[k]!.r : 0);
  const pairs: Array<[number, number]> = [];
  const matchRates: number[] = [];
  for (let i = 0; i < n; i++) {
    if (loops.has(i)) {
      pairs.push([i, i]);
      matchRates.push(rates[i]! * q[i]!);
    }
    for (let j = i + 1; j < n; j++) {
      pairs.push([i, j]);
      matchRates.push(rates[i]! * q[j]! + rates[j]! * q[i]!);
    }
  }
  return { pairs, backlog, immediate, matchRates, quantile, tail, wait: backlog.map((L, k) => L / rates[k]!) };
}

describe('complete graphs: every policy gives the hand-derived closed form', () => {
  // game matchmaking lobby: four regions, any two can play; the busiest region also plays itself
  const rates = [1, 1.5, 2, 2.5];
  const loops = new Set([3]);
  const cf = completeClosedForm(rates, loops);
  const model = compileGraph(['east', 'south', 'west', 'north'], rates, cf.pairs);
  const R = 8;

  it.each(POLICIES.map((policy) => ({ policy })))('$policy', async ({ policy }) => {
    const r = await simulate(model, {
      policy: policy as PolicyName,
      ...(policy === 'ranked' ? { priority: ['north', 'west', 'south', 'east'] } : {}),
      arrivals: 400_000,
      replications: R,
      seed: 101,
    });
    const quantileChecks: Array<[number, number]> = [];
    for (let k = 0; k < model.n; k++) {
      for (const [i, p] of [0.9, 0.99].entries()) {
        // skip a level sitting on the atom at 0 (an estimate there may land on either side)
        if (Math.abs(cf.tail[k]!.c - (1 - p)) > 0.03) quantileChecks.push([k, i + 1]);
      }
    }
    const f = familyFactor(4 * model.n + model.m + quantileChecks.length, R);
    for (let k = 0; k < model.n; k++) {
      expectInside(r.backlog.byClass[k]!, cf.backlog[k]!, f, `${policy}: backlog of ${model.ids[k]}`);
      expectInside(r.wait.byClass[k]!, cf.wait[k]!, f, `${policy}: wait of ${model.ids[k]}`);
      expectInside(r.immediateMatch.byClass[k]!, cf.immediate[k]!, f, `${policy}: immediate match of ${model.ids[k]}`);
      // pooled percentile: within 2 % of the closed form
      const p90 = cf.quantile(k, 0.9);
      expect(Math.abs(r.wait.byClass[k]!.p90 - p90), `${policy}: pooled p90 of ${model.ids[k]}`).toBeLessThanOrEqual(0.02 * p90 + 1e-9);
    }
    for (const [k, slot] of quantileChecks) {
      const level = [0.5, 0.9, 0.99][slot]!;
      const c = r.wait.byClass[k]!.quantileCi95[slot]!;
      expectInside({ mean: (c[0] + c[1]) / 2, ci95: c, count: R }, cf.quantile(k, level), f, `${policy}: p${level * 100} of ${model.ids[k]}`);
    }
    for (let e = 0; e < model.m; e++) expectInside(r.matchRates[e]!, cf.matchRates[e]!, f, `${policy}: match rate of edge ${e}`);
  });
});

/**
 * A hub that pairs with two leaf classes and with itself (ride pooling: a station zone with two
 * suburbs that only share rides through the station). Count states are exact for the priority and
 * random policies (their choice depends on which classes are non-empty, not on ages), so the
 * continuous-time chain on (hub waiting) ∪ {(i, j): i items of leaf a, j of leaf b} is solved directly,
 * truncated at i, j ≤ K, with a general-purpose linear-algebra library (ml-matrix, LU).
 * Transitions, derived by hand from the rules:
 *   ∅: hub → H, a → (1,0), b → (0,1).      H: any arrival matches the waiting hub item → ∅.
 *   (i,j) ≠ (0,0): a → (i+1, j), b → (i, j+1) (dropped beyond K);
 *                  hub → (i−1, j) or (i, j−1), chosen by the policy among the non-empty leaves
 *                  (priority [a, b]: a first; random: each with probability 1/2 when both wait).
 */
function starChain(l: { hub: number; a: number; b: number }, policy: 'ranked' | 'random-class', K: number) {
  const idx = (i: number, j: number): number => 1 + i * (K + 1) + j; // 0 = H, 1 = ∅ = (0, 0)
  const N = 1 + (K + 1) * (K + 1);
  const A = Matrix.zeros(N, N); // Qᵀ
  const add = (s: number, t: number, r: number): void => {
    A.set(t, s, A.get(t, s) + r);
    A.set(s, s, A.get(s, s) - r);
  };
  add(0, idx(0, 0), l.hub + l.a + l.b);
  const takeA = new Float64Array(N); // probability that a hub arrival takes an a item in state s
  for (let i = 0; i <= K; i++) {
    for (let j = 0; j <= K; j++) {
      const s = idx(i, j);
      if (i === 0 && j === 0) {
        add(s, 0, l.hub);
        add(s, idx(1, 0), l.a);
        add(s, idx(0, 1), l.b);
        continue;
      }
      if (i < K) add(s, idx(i + 1, j), l.a);
      if (j < K) add(s, idx(i, j + 1), l.b);
      const pa = i === 0 ? 0 : j === 0 ? 1 : policy === 'ranked' ? 1 : 0.5;
      takeA[s] = pa;
      if (pa > 0) add(s, idx(i - 1, j), l.hub * pa);
      if (pa < 1) add(s, idx(i, j - 1), l.hub * (1 - pa));
    }
  }
  for (let s = 0; s < N; s++) A.set(N - 1, s, 1);
  const b = Matrix.zeros(N, 1);
  b.set(N - 1, 0, 1);
  const x = new LuDecomposition(A).solve(b);
  const pi = (s: number): number => x.get(s, 0);
  let La = 0;
  let Lb = 0;
  let toA = 0;
  let toB = 0;
  let edge = 0;
  for (let i = 0; i <= K; i++) {
    for (let j = 0; j <= K; j++) {
      const s = idx(i, j);
      La += i * pi(s);
      Lb += j * pi(s);
      if (i === K || j === K) edge += pi(s);
      if (i + j > 0) {
        toA += pi(s) * takeA[s]!;
        toB += pi(s) * (1 - takeA[s]!);
      }
    }
  }
  const pH = pi(0);
  const p0 = pi(idx(0, 0));
  return {
    boundary: edge,
    // class order: hub, a, b; edge order: hub–hub, hub–a, hub–b
    backlog: [pH, La, Lb],
    immediate: [1 - p0, pH, pH],
    matchRates: [l.hub * pH, l.a * pH + l.hub * toA, l.b * pH + l.hub * toB],
  };
}

describe('priority and random against the solved continuous-time chain (ml-matrix)', () => {
  const l = { hub: 3, a: 1, b: 0.8 };
  const model: CompiledModel = compileGraph(['station', 'north-suburb', 'south-suburb'], [l.hub, l.a, l.b], [[0, 0], [0, 1], [0, 2]]);
  it.each(['ranked', 'random-class'] as const)('%s', async (policy) => {
    const exact = starChain(l, policy, 26);
    expect(exact.boundary).toBeLessThan(1e-6);
    const R = 8;
    const r = await simulate(model, {
      policy,
      ...(policy === 'ranked' ? { priority: ['north-suburb', 'south-suburb'] } : {}),
      arrivals: 400_000,
      replications: R,
      seed: 77,
    });
    const f = familyFactor(2 * model.n + model.m, R);
    for (let k = 0; k < 3; k++) {
      expectInside(r.backlog.byClass[k]!, exact.backlog[k]!, f, `${policy}: backlog of ${model.ids[k]}`);
      expectInside(r.immediateMatch.byClass[k]!, exact.immediate[k]!, f, `${policy}: immediate match of ${model.ids[k]}`);
    }
    for (let e = 0; e < 3; e++) expectInside(r.matchRates[e]!, exact.matchRates[e]!, f, `${policy}: match rate of edge ${e}`);
  });

  it('the priority order matters: the preferred suburb waits less than under the reverse order', async () => {
    const opts = { arrivals: 100_000, replications: 4, seed: 5 } as const;
    const first = await simulate(model, { ...opts, policy: 'ranked', priority: ['north-suburb', 'south-suburb'] });
    const second = await simulate(model, { ...opts, policy: 'ranked', priority: ['south-suburb', 'north-suburb'] });
    expect(first.wait.byClass[1]!.ci95![1]).toBeLessThan(second.wait.byClass[1]!.ci95![0]);
    expect(second.wait.byClass[2]!.ci95![1]).toBeLessThan(first.wait.byClass[2]!.ci95![0]);
  });
});
