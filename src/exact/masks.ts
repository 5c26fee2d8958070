import type { CompiledModel } from '../model/compile.js';

/**
 * Two-word bitmask view of one connected component (up to 64 classes): bit k of (lo, hi) is local
 * class k. Built once per component; the hot loops in src/exact/ read only these typed arrays.
 */
export interface MaskGraph {
  readonly n: number;
  readonly rate: Float64Array;
  /** 1 when class k is self-compatible. */
  readonly loop: Uint8Array;
  /** N(k) as a mask, k itself included when self-looped. */
  readonly nbLo: Int32Array;
  readonly nbHi: Int32Array;
  /** Classes that cannot wait together with k: N(k) ∪ {k}. */
  readonly conLo: Int32Array;
  readonly conHi: Int32Array;
  /** Mask of all classes. */
  readonly allLo: number;
  readonly allHi: number;
  /** λ of a mask in 8 byte-table lookups: byteSum[b * 256 + byte b of the mask]. */
  readonly byteSum: Float64Array;
}

export const MAX_COMPONENT_CLASSES = 64;

export function maskGraph(model: CompiledModel): MaskGraph {
  const n = model.n;
  if (n > MAX_COMPONENT_CLASSES) throw new RangeError(`mask graphs hold at most ${MAX_COMPONENT_CLASSES} classes`);
  const nbLo = new Int32Array(n);
  const nbHi = new Int32Array(n);
  const conLo = new Int32Array(n);
  const conHi = new Int32Array(n);
  const loop = new Uint8Array(n);
  for (let k = 0; k < n; k++) {
    loop[k] = model.selfLoop[k]!;
    for (let p = model.adjStart[k]!; p < model.adjStart[k + 1]!; p++) {
      const j = model.adj[p]!;
      if (j < 32) nbLo[k] |= 1 << j;
      else nbHi[k] |= 1 << (j - 32);
    }
    if (k < 32) conLo[k] = nbLo[k]! | (1 << k);
    else conLo[k] = nbLo[k]!;
    conHi[k] = k < 32 ? nbHi[k]! : nbHi[k]! | (1 << (k - 32));
    if (loop[k]) {
      if (k < 32) nbLo[k] |= 1 << k;
      else nbHi[k] |= 1 << (k - 32);
    }
  }
  const byteSum = new Float64Array(8 * 256);
  // bytes past the last class stay 0 (every class they would hold is ≥ n)
  for (let b = 0; b < Math.ceil(n / 8); b++) {
    for (let v = 1; v < 256; v++) {
      const low = v & -v;
      const bit = 31 - Math.clz32(low);
      const k = b * 8 + bit;
      byteSum[b * 256 + v] = byteSum[b * 256 + (v ^ low)]! + (k < n ? model.rates[k]! : 0);
    }
  }
  const allLo = n >= 32 ? -1 : (1 << n) - 1;
  const allHi = n <= 32 ? 0 : n >= 64 ? -1 : (1 << (n - 32)) - 1;
  return { n, rate: Float64Array.from(model.rates), loop, nbLo, nbHi, conLo, conHi, allLo, allHi, byteSum };
}

/** λ of the classes in mask (lo, hi). */
export function maskRate(g: MaskGraph, lo: number, hi: number): number {
  const t = g.byteSum;
  return (
    t[lo & 255]! +
    t[256 + ((lo >>> 8) & 255)]! +
    t[512 + ((lo >>> 16) & 255)]! +
    t[768 + (lo >>> 24)]! +
    t[1024 + (hi & 255)]! +
    t[1280 + ((hi >>> 8) & 255)]! +
    t[1536 + ((hi >>> 16) & 255)]! +
    t[1792 + (hi >>> 24)]!
  );
}
