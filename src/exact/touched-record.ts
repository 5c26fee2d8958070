/**
 * Work arrays of the incremental evaluation (src/exact/variant.ts), sized for one component and
 * reused from change to change: Ψ and the adjoint accumulators of the touched sets under their store
 * index, and a record of every touched set in the order it was computed (its members, where each
 * A ∖ x lives, λ_x Ψ(A ∖ x) and the base values Ψ_x(A ∖ p)), which the reverse pass (touched-adjoint.ts) replays backwards.
 */
export class VariantScratch {
  /**
   * Store 0: touched sets holding one endpoint, under their base index s (set-index.ts):
   * vst[2s] = Ψ'(A), vst[2s + 1] = the adjoint accumulator (side by side: one cache line for both).
   */
  vst = new Float64Array(0);
  /** Store 1: new sets {i, j} ∪ B of a removal, under the base index of B, same layout. */
  nst = new Float64Array(0);

  /** Per recorded set. */
  sets = 0;
  hStore = new Int32Array(0);
  hKind = new Uint8Array(0);
  hDen = new Float64Array(0);
  hPsi = new Float64Array(0);
  hStart = new Int32Array(0);
  hSize = new Uint8Array(0);
  /** p for a set {p} ∪ B, or -1. */
  hP = new Int8Array(0);

  /** Per recorded member, in decreasing class order within each set. */
  members = 0;
  mCls = new Uint8Array(0);
  /** Store index of A ∖ x when it is a touched set, else -1 (a base set). */
  mTarget = new Int32Array(0);
  mKind = new Uint8Array(0);
  /** λ_x Ψ(A ∖ x). */
  mVal = new Float64Array(0);
  /** For a set {p} ∪ B: Ψ_x(B) of the base for each member x of B (0 for p). */
  mBase = new Float64Array(0);

  /** Makes room for a component with `count` sets (store 1 only when `pairs`). */
  ensure(count: number, pairs: boolean): void {
    if (this.vst.length < 2 * count) this.vst = new Float64Array(2 * count);
    if (pairs && this.nst.length < 2 * count) this.nst = new Float64Array(2 * count);
    this.sets = 0;
    this.members = 0;
  }

  /** Room for one more set of `size` members. */
  reserve(size: number): void {
    if (this.sets + 1 > this.hStore.length) {
      const cap = Math.max(1024, this.hStore.length * 2);
      this.hStore = grow(this.hStore, new Int32Array(cap));
      this.hKind = grow(this.hKind, new Uint8Array(cap));
      this.hDen = grow(this.hDen, new Float64Array(cap));
      this.hPsi = grow(this.hPsi, new Float64Array(cap));
      this.hStart = grow(this.hStart, new Int32Array(cap));
      this.hSize = grow(this.hSize, new Uint8Array(cap));
      this.hP = grow(this.hP, new Int8Array(cap));
    }
    if (this.members + size > this.mCls.length) {
      const cap = Math.max(8192, this.mCls.length * 2, this.members + size);
      this.mCls = grow(this.mCls, new Uint8Array(cap));
      this.mTarget = grow(this.mTarget, new Int32Array(cap));
      this.mKind = grow(this.mKind, new Uint8Array(cap));
      this.mVal = grow(this.mVal, new Float64Array(cap));
      this.mBase = grow(this.mBase, new Float64Array(cap));
    }
  }
}

function grow<T extends Int32Array | Uint8Array | Int8Array | Float64Array>(old: T, bigger: T): T {
  bigger.set(old as never);
  return bigger;
}
