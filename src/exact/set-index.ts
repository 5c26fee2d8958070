import { popcount, type SetTrie } from './trie.js';

/**
 * The trie of independent sets (trie.ts) re-packed for the single-change evaluator, four integers per
 * set so that everything a walk needs about a set sits in one place:
 *   node[4s] = index of the first child, node[4s+1], node[4s+2] = cand(s) (lo, hi word),
 *   node[4s+3] = start of the set's value block.
 * A value block holds 1 + |A| numbers: Ψ(A), then one number per member in decreasing class order
 * (the order in which the trie adds them). Keeping Ψ next to the per-member values means one memory
 * access brings both.
 */
export interface SetIndex {
  readonly count: number;
  readonly node: Int32Array;
  /** Σ_A (1 + |A|): the length of a value array. */
  readonly total: number;
}

/** child(s, c) of trie.ts on the packed array: the index of set(s) ∪ {c} (c a candidate of s). */
export function child4(node: Int32Array, s: number, c: number): number {
  const b = 4 * s;
  return c < 32
    ? node[b]! + popcount(node[b + 1]! & ((1 << c) - 1))
    : node[b]! + popcount(node[b + 1]!) + popcount(node[b + 2]! & ((1 << (c - 32)) - 1));
}

/**
 * Packs a trie. The trie is stored breadth-first, so the children of s (sets one larger) are the index
 * range [node[3s], node[3s] + popcount(cand(s))): sizes follow in one pass. Returns undefined when the
 * value arrays would not fit Int32 offsets (callers refuse such designs).
 */
export function setIndex(t: SetTrie): SetIndex | undefined {
  const { count, node: src } = t;
  const size = new Uint8Array(count);
  const node = new Int32Array(4 * count);
  let total = 0;
  for (let s = 0; s < count; s++) {
    const a = size[s]!;
    const first = src[3 * s]!;
    const lo = src[3 * s + 1]!;
    const hi = src[3 * s + 2]!;
    node[4 * s] = first;
    node[4 * s + 1] = lo;
    node[4 * s + 2] = hi;
    node[4 * s + 3] = total;
    total += 1 + a;
    if (total > 0x7fffffff) return undefined;
    const kids = popcount(lo) + popcount(hi);
    for (let c = 0; c < kids; c++) size[first + c] = a + 1;
  }
  return { count, node, total };
}
