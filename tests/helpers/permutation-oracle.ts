import type { CompiledModel } from '../../src/model/compile.js';
import { toBitGraph } from './bitgraph.js';
import type { Metrics } from './metrics.js';

/**
 * Oracle 1: the permutation-sum closed form (reference: "A product form for the general stochastic
 * matching model", J. Appl. Probab. 2021). It sums over every independent set and every ordering of
 * it, with no memoisation over sets, so it shares no recursion with the evaluator under test.
 *
 * Derived by hand from the product form
 *   π(w) = π(∅) ∏_{ℓ=1}^{|w|} λ_{w_ℓ} / λ(N({w_1..w_ℓ})),
 * over words w whose letter set is independent in the graph without self-loops and whose self-looped
 * letters (the set S) occur at most once.
 *
 * Step 1 (grouping). Group words by σ = (a_1, …, a_p), the order in which their distinct letters first
 *   appear; I = {a_1..a_p} is an independent set. Write A_i = {a_1..a_i} and D_i = λ(N(A_i)). Each word
 *   with first-appearance order σ is uniquely  w = a_1 B_1 a_2 B_2 … a_p B_p,  where B_i is any word over
 *   A_i ∖ S (letters of S cannot repeat). Every letter of a_i B_i has prefix set A_i, hence denominator D_i.
 * Step 2 (geometric sums). Summing over the blocks B_i independently:
 *   Σ_{w ~ σ} π(w)/π(∅) = ∏_i (λ_{a_i}/D_i) Σ_{j≥0} (λ(A_i∖S)/D_i)^j = ∏_i λ_{a_i} / (D_i − λ(A_i∖S)) =: T(σ).
 *   The series converge under stability: if A_i∖S ≠ ∅ it is an independent set without self-loops, so
 *   λ(A_i∖S) < λ(N(A_i∖S)) ≤ D_i; otherwise λ(A_i∖S) = 0 < D_i (a self-looped class is its own neighbour).
 * Step 3 (normalisation). Z = 1/π(∅) = Σ_I Σ_{orderings σ of I} T(σ), the empty ordering counting 1.
 * Step 4 (mean counts). Give letter k the weight λ_k x_k / D. Then
 *   T_σ(x) = ∏_i (λ_{a_i} x_{a_i} / D_i) / (1 − Σ_{b ∈ A_i∖S} λ_b x_b / D_i),
 *   and Σ_{w~σ} π(w)·#_k(w) / π(∅) = ∂T_σ/∂x_k at x = 1
 *     = T(σ) · ( [k ∈ I] + [k ∉ S] Σ_{i ≥ t_k} λ_k / (D_i − λ(A_i∖S)) ),   t_k = position of k in σ.
 *   L_k = (1/Z) Σ_σ of that.
 * Step 5 (first compatible letter). In w = a_1 B_1 a_2 …, B_t only uses letters of A_t, so the first
 *   occurrence of every letter is its first appearance. Hence the oldest waiting item compatible with an
 *   arrival of class i is the first a_t of σ in N(i), and
 *   P(first letter in N(i) is j) = (1/Z) Σ_{σ whose first element in N(i) is j} T(σ),
 *   P(state meets N(k)) = (1/Z) Σ_{σ with I ∩ N(k) ≠ ∅} T(σ).
 *   Match rate of {i, j}: λ_i P(first in N(i) is j) + λ_j P(first in N(j) is i); self-loop {i, i}: λ_i P(first in N(i) is i).
 */
export interface PermutationOracleResult extends Metrics {
  /** Z = 1 / π(∅). */
  readonly normaliser: number;
  /** Number of orderings summed (the empty one included). */
  readonly orderings: number;
  /** Number of independent sets (the empty one included). */
  readonly independentSets: number;
}

export function permutationOracle(model: CompiledModel): PermutationOracleResult {
  const g = toBitGraph(model);
  const { n, rates, loop, adj, nbr } = g;
  if (n > 10) throw new RangeError('the permutation oracle is for at most 10 classes');
  let Z = 0;
  let orderings = 0;
  const setsSeen = new Set<number>();
  const L = new Float64Array(n); // Σ_σ ∂T_σ/∂x_k
  const meets = new Float64Array(n); // Σ_{σ: I ∩ N(k) ≠ ∅} T(σ)
  const flow = new Float64Array(model.m); // Σ λ_i T(σ) over (σ, i) whose first element in N(i) is j, per edge {i, j}
  const seq = new Int32Array(n); // σ
  const c = new Float64Array(n); // c_i = 1 / (D_i − λ(A_i∖S))
  const suffix = new Float64Array(n + 1);

  const visit = (depth: number, set: number, T: number, freeRate: number): void => {
    Z += T;
    orderings++;
    setsSeen.add(set);
    if (depth > 0) {
      suffix[depth] = 0;
      for (let i = depth - 1; i >= 0; i--) suffix[i] = suffix[i + 1]! + c[i]!;
      for (let t = 0; t < depth; t++) {
        const k = seq[t]!;
        L[k] += T * (1 + (loop[k] ? 0 : rates[k]! * suffix[t]!));
      }
      for (let i = 0; i < n; i++) {
        for (let t = 0; t < depth; t++) {
          const j = seq[t]!;
          if (nbr[i]! & (1 << j)) {
            meets[i] += T;
            flow[g.edge(i, j)] += rates[i]! * T;
            break;
          }
        }
      }
    }
    for (let a = 0; a < n; a++) {
      if (set & (1 << a) || adj[a]! & set) continue; // distinct, and independent of the prefix
      const next = set | (1 << a);
      let D = 0; // D = λ(N(A ∪ {a}))
      let nb = 0;
      for (let k = 0; k < n; k++) if (next & (1 << k)) nb |= nbr[k]!;
      for (let k = 0; k < n; k++) if (nb & (1 << k)) D += rates[k]!;
      const free = freeRate + (loop[a] ? 0 : rates[a]!);
      const gap = D - free;
      if (!(gap > 0)) throw new RangeError('unstable design: a geometric series diverges');
      seq[depth] = a;
      c[depth] = 1 / gap;
      visit(depth + 1, next, (T * rates[a]!) / gap, free);
    }
  };
  visit(0, 0, 1, 0);

  const backlog = Array.from(L, (x) => x / Z);
  return {
    normaliser: Z,
    orderings,
    independentSets: setsSeen.size,
    emptyProbability: 1 / Z,
    backlog,
    backlogTotal: backlog.reduce((s, x) => s + x, 0),
    wait: backlog.map((x, k) => x / rates[k]!),
    immediateMatch: Array.from(meets, (x) => x / Z),
    matchRates: Array.from(flow, (x) => x / Z),
  };
}
