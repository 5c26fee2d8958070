/**
 * Alias table for O(1) sampling of a class in proportion to its rate (the alias method, "A linear
 * algorithm for generating random numbers with a given distribution", IEEE Trans. Softw. Eng. 1991,
 * from memory). One 32-bit draw u picks a column c = ⌊u·n/2^32⌋ and, from the fractional part f of
 * u·n/2^32, keeps c when f < keep[c], else takes alias[c].
 */
export interface AliasTable {
  readonly n: number;
  /** Probability of keeping column c (in [0, 1]). */
  readonly keep: Float64Array;
  /** Class used when column c is not kept. */
  readonly alias: Int32Array;
}

/** Builds the table for non-negative weights with a positive sum. */
export function buildAlias(weights: ArrayLike<number>): AliasTable {
  const n = weights.length;
  let total = 0;
  for (let k = 0; k < n; k++) {
    const w = weights[k]!;
    if (!(w >= 0) || !Number.isFinite(w)) throw new RangeError(`weight ${k} must be finite and >= 0, found ${w}`);
    total += w;
  }
  if (!(total > 0)) throw new RangeError('weights must have a positive sum');
  const keep = new Float64Array(n);
  const alias = new Int32Array(n);
  const scaled = new Float64Array(n);
  const small: number[] = [];
  const large: number[] = [];
  for (let k = 0; k < n; k++) {
    scaled[k] = (weights[k]! * n) / total;
    alias[k] = k;
    (scaled[k]! < 1 ? small : large).push(k);
  }
  while (small.length > 0 && large.length > 0) {
    const s = small.pop()!;
    const l = large[large.length - 1]!;
    keep[s] = scaled[s]!;
    alias[s] = l;
    scaled[l] = scaled[l]! + scaled[s]! - 1;
    if (scaled[l]! < 1) {
      large.pop();
      small.push(l);
    }
  }
  // what is left is 1 up to rounding
  for (const k of large) keep[k] = 1;
  for (const k of small) keep[k] = 1;
  return { n, keep, alias };
}

/** The class chosen by a 32-bit draw (the same arithmetic as the inlined hot loops). */
export function sampleAlias(t: AliasTable, u32: number): number {
  const x = u32 * t.n * 2.3283064365386963e-10;
  const c = x | 0;
  return x - c < t.keep[c]! ? c : t.alias[c]!;
}

/** Exact probability of each class under the table (for tests and checks): Σ over columns. */
export function aliasProbabilities(t: AliasTable): Float64Array {
  const p = new Float64Array(t.n);
  for (let c = 0; c < t.n; c++) {
    p[c] += t.keep[c]! / t.n;
    p[t.alias[c]!] += (1 - t.keep[c]!) / t.n;
  }
  return p;
}
