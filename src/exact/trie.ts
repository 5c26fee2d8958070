import { maskRate, type MaskGraph } from './masks.js';

/**
 * The independent sets of one component (graph without self-loops) as a trie in which the children
 * of a set A are A ∪ {c} for the addable classes c below min(A), stored breadth-first so that the
 * children of a node are contiguous and ordered by c. Then
 *   child(s, c) = first[s] + popcount(cand(s) & bits below c)
 * finds A ∪ {c} in O(1) without any hashing, and a depth-first walk with children in ascending c
 * visits the sets in increasing mask order (every subset before its supersets).
 *
 * node[3s] = index of the first child, node[3s+1], node[3s+2] = cand(s) (lo, hi word);
 * mu[s] = λ(N(set s)).
 */
export interface SetTrie {
  readonly count: number;
  readonly node: Int32Array;
  readonly mu: Float64Array;
}

export function popcount(x: number): number {
  x -= (x >>> 1) & 0x55555555;
  x = (x & 0x33333333) + ((x >>> 2) & 0x33333333);
  return Math.imul((x + (x >>> 4)) & 0x0f0f0f0f, 0x01010101) >>> 24;
}

/** Index of set(s) ∪ {c}; c must be a candidate of s (addable and below its minimum). */
export function child(node: Int32Array, s: number, c: number): number {
  const b = 3 * s;
  return c < 32
    ? node[b]! + popcount(node[b + 1]! & ((1 << c) - 1))
    : node[b]! + popcount(node[b + 1]!) + popcount(node[b + 2]! & ((1 << (c - 32)) - 1));
}

/**
 * Depth-first walks keep, per depth d, the children still to visit as a two-word mask
 * (todoLo[d], todoHi[d]). These take the next one off — the lowest (walks in increasing mask order)
 * or the highest (the reverse walk) — and return its class, or -1 when none is left.
 */
export function nextLowest(todoLo: Int32Array, todoHi: Int32Array, d: number): number {
  let x = todoLo[d]!;
  if (x !== 0) {
    const b = x & -x;
    todoLo[d] = x ^ b;
    return 31 - Math.clz32(b);
  }
  x = todoHi[d]!;
  if (x === 0) return -1;
  const b = x & -x;
  todoHi[d] = x ^ b;
  return 63 - Math.clz32(b);
}

export function nextHighest(todoLo: Int32Array, todoHi: Int32Array, d: number): number {
  let x = todoHi[d]!;
  if (x !== 0) {
    const c = 63 - Math.clz32(x);
    todoHi[d] = x ^ (1 << (c - 32));
    return c;
  }
  x = todoLo[d]!;
  if (x === 0) return -1;
  const c = 31 - Math.clz32(x);
  todoLo[d] = x ^ (1 << c);
  return c;
}

/** Builds the trie of all `count` independent sets (count from countIndependentSets). */
export function buildTrie(g: MaskGraph, count: number): SetTrie {
  const n = g.n;
  const node = new Int32Array(3 * count);
  const mu = new Float64Array(count);
  // masks are needed only while building
  const lo = new Int32Array(count);
  const hi = new Int32Array(count);
  const { conLo, conHi, nbLo, nbHi, allLo, allHi } = g;
  let size = 1;
  for (let s = 0; s < size; s++) {
    const sLo = lo[s]!;
    const sHi = hi[s]!;
    let bLo = 0;
    let bHi = 0;
    let nLo = 0;
    let nHi = 0;
    for (let w = 0; w < 2; w++) {
      let x = w === 0 ? sLo : sHi;
      while (x !== 0) {
        const b = x & -x;
        const i = (w << 5) + 31 - Math.clz32(b);
        x ^= b;
        bLo |= conLo[i]!;
        bHi |= conHi[i]!;
        nLo |= nbLo[i]!;
        nHi |= nbHi[i]!;
      }
    }
    // the smallest element (n for ∅)
    const min = sLo !== 0 ? 31 - Math.clz32(sLo & -sLo) : sHi !== 0 ? 63 - Math.clz32(sHi & -sHi) : n;
    // candidates: not blocked and below min
    const belowLo = min >= 32 ? -1 : (1 << min) - 1;
    const belowHi = min <= 32 ? 0 : min >= 64 ? -1 : (1 << (min - 32)) - 1;
    const cLo = allLo & ~bLo & belowLo;
    const cHi = allHi & ~bHi & belowHi;
    node[3 * s] = size;
    node[3 * s + 1] = cLo;
    node[3 * s + 2] = cHi;
    for (let w = 0; w < 2; w++) {
      let x = w === 0 ? cLo : cHi;
      while (x !== 0) {
        const b = x & -x;
        const c = (w << 5) + 31 - Math.clz32(b);
        x ^= b;
        lo[size] = w === 0 ? sLo | b : sLo;
        hi[size] = w === 0 ? sHi : sHi | b;
        mu[size] = maskRate(g, nLo | nbLo[c]!, nHi | nbHi[c]!);
        size++;
      }
    }
    if (size > count) throw new Error(`internal: more independent sets than the ${count} counted`);
  }
  if (size !== count) throw new Error(`internal: enumerated ${size} independent sets, counted ${count}`);
  return { count, node, mu };
}
