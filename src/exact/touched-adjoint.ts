import type { VariantScratch } from './touched-record.js';

/**
 * Per-class sums Σ_{A touched} Ψ'_k(A) of a changed design in O(|A|) per touched set, by the adjoint
 * of the forward recursion (derived for this project).
 *
 * For a fixed class k, forward.ts gives Ψ_k(A) den(A) = Σ_{x∈A} λ_x Ψ_k(A∖x) + [k∈A] λ_k Ψ(A∖k)
 * + [k∈A∖S] λ_k Ψ(A) (the term x = k vanishes since k ∉ A∖k). On the touched sets this is the linear
 * system (D − M) Ψ_k = src_k with the same matrix for every k:
 *   D = diag(den),  (M v)(A) = Σ_{x∈A, A∖x touched} λ_x v(A∖x),
 *   src_k(A) = Σ_{x∈A, A∖x a base set} λ_x Ψ_k^base(A∖x) + [k∈A] λ_k (Ψ'(A∖k) + [k∉S'] Ψ'(A)).
 * So Σ_A Ψ'_k(A) = 1ᵀ (D − M)⁻¹ src_k = Σ_A τ(A) src_k(A) with (D − M)ᵀ τ = 1, i.e.
 *   τ(A) = [1 + Σ_{y: A∪y touched} λ_y τ(A ∪ y)] / den(A),
 * the tail sums T restricted to the touched sets. Touched sets are closed under taking supersets in
 * the changed design (a superset still holds the endpoint), so τ needs nothing else. It is computed
 * by replaying the record backwards (supersets first), pushing λ_x τ(A) into the accumulator of every
 * touched A ∖ x. The only base set A ∖ x of a touched set is B = A ∖ p (P = {p}), whose Ψ_k values
 * the forward walk copied into the record (mBase).
 */
export function touchedClassSums(rate: Float64Array, loop: Uint8Array, sc: VariantScratch, out: Float64Array): void {
  const { vst, nst, hStore, hKind, hDen, hPsi, hStart, hSize, hP, mCls, mTarget, mKind, mVal, mBase } = sc;
  for (let h = sc.sets - 1; h >= 0; h--) {
    const s = hStore[h]!;
    const tau = (1 + (hKind[h] ? nst[2 * s + 1]! : vst[2 * s + 1]!)) / hDen[h]!;
    const ps = hPsi[h]!;
    const p = hP[h]!;
    const lp = p >= 0 ? rate[p]! : 0; // boundary term λ_p Ψ_k(B) of a set {p} ∪ B
    const start = hStart[h]!;
    const end = start + hSize[h]!;
    for (let m = start; m < end; m++) {
      const k = mCls[m]!;
      const lk = rate[k]!;
      out[k] += tau * (mVal[m]! + (loop[k] ? 0 : lk * ps) + lp * mBase[m]!);
      const target = mTarget[m]!;
      if (target >= 0) {
        if (mKind[m]) nst[2 * target + 1] += lk * tau;
        else vst[2 * target + 1] += lk * tau;
      }
    }
  }
}
