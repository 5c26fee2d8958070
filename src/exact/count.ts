import type { MaskGraph } from './masks.js';

/**
 * Number of independent sets (∅ included) of the graph without self-loops, stopping as soon as the
 * count exceeds `limit` (then returns limit + 1). Depth-first, no allocation: a few seconds at most
 * for the limits edgewise uses.
 */
export function countIndependentSets(g: MaskGraph, limit = Number.MAX_SAFE_INTEGER): number {
  const n = g.n;
  const { conLo, conHi } = g;
  // explicit stack: candidate position and blocked masks per depth
  const next = new Int32Array(n + 1);
  const bLo = new Int32Array(n + 1);
  const bHi = new Int32Array(n + 1);
  let depth = 0;
  let count = 1;
  next[0] = 0;
  while (depth >= 0) {
    let k = next[depth]!;
    const lo = bLo[depth]!;
    const hi = bHi[depth]!;
    while (k < n && (k < 32 ? (lo >>> k) & 1 : (hi >>> (k - 32)) & 1)) k++;
    if (k >= n) {
      depth--;
      continue;
    }
    next[depth] = k + 1;
    count++;
    if (count > limit) return limit + 1;
    depth++;
    next[depth] = k + 1;
    bLo[depth] = lo | conLo[k]!;
    bHi[depth] = hi | conHi[k]!;
  }
  return count;
}
