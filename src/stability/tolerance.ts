/**
 * Numerical tolerance of the stability verdict.
 *
 * For a connected non-bipartite component C, the optimum t* of the edge-flow LP (max t s.t.
 * Σ_{e∋k} a_{k,e} μ_e = λ_k, μ_e ≥ t) can never exceed σ_C = min_{k∈C} λ_k / d_k, where
 * d_k = Σ_{e∋k} a_{k,e} (every one of the d_k flow units at k is at least t). σ_C is the natural unit
 * of t*, so the component is declared stable when t* > TOLERANCE · σ_C.
 *
 * The same margin is used for sets: an independent set I with λ(N(I)) − λ(I) ≤ TOLERANCE · σ_C is
 * accepted as a certificate of instability. This keeps both views consistent: every such I forces
 * t* ≤ λ(N(I)) − λ(I) (some edge touches N(I) but not I in a non-bipartite component, and its flow
 * is at least t*), so a verified certificate always agrees with an "unstable" LP verdict.
 */
import type { CompiledModel } from '../model/compile.js';

/** Relative tolerance of the verdict (see above). */
export const TOLERANCE = 1e-9;

/** σ_C = min_{k∈C} λ_k / d_k (Infinity for a class without any compatibility). */
export function flowScale(model: CompiledModel, members: ArrayLike<number>): number {
  let s = Infinity;
  for (let i = 0; i < members.length; i++) {
    const k = members[i]!;
    const d = model.adjStart[k + 1]! - model.adjStart[k]! + 2 * model.selfLoop[k]!;
    if (d > 0) s = Math.min(s, model.rates[k]! / d);
  }
  return s;
}
