import { kernels, type Kernels } from './kernel-code.js';
import { A, kernelMemory, type KernelMemory } from './kernel-layout.js';
import type { MaskGraph } from './masks.js';

/**
 * The independent sets of one component (graph without self-loops) as a trie in which the children
 * of a set A are A ∪ {c} for the addable classes c below min(A), stored breadth-first so that the
 * children of a node are contiguous and ordered by c. Then
 *   child(s, c) = first[s] + popcount(cand(s) & bits below c)
 * finds A ∪ {c} in O(1) without any hashing, and a depth-first walk with children in ascending c
 * visits the sets in increasing mask order (every subset before its supersets).
 *
 * node[3s] = index of the first child, node[3s+1], node[3s+2] = cand(s) (lo, hi word);
 * mu[s] = λ(N(set s)). Both are views on the WebAssembly memory in which the kernels of
 * kernel-code.ts build the trie and then walk it (prefixSums, tailPass in component.ts). The trie of
 * a small component lives in a pooled memory and is valid only until the next buildTrie call (see
 * kernel-layout.ts): use it, or copy it (setIndex), before building another.
 */
export interface SetTrie {
  readonly count: number;
  readonly node: Int32Array;
  readonly mu: Float64Array;
  readonly kernel: { readonly memory: KernelMemory; readonly run: Kernels };
}

export function popcount(x: number): number {
  x -= (x >>> 1) & 0x55555555;
  x = (x & 0x33333333) + ((x >>> 2) & 0x33333333);
  return Math.imul((x + (x >>> 4)) & 0x0f0f0f0f, 0x01010101) >>> 24;
}

/**
 * The JavaScript depth-first walks (forward.ts, touched-walk.ts) keep, per depth d, the children
 * still to visit as a two-word mask (todoLo[d], todoHi[d]). This takes the lowest one off (walks in
 * increasing mask order) and returns its class, or -1 when none is left.
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

/** Sets per kernel call (see kernel-code.ts: the optimising tier only takes over between calls). */
export const KERNEL_CHUNK = 1 << 16;

/**
 * Builds the trie of all `count` independent sets (count from countIndependentSets). `own`: in a
 * memory of its own, valid for as long as it is held (see kernelMemory).
 */
export function buildTrie(g: MaskGraph, count: number, own = false): SetTrie {
  const memory = kernelMemory(g, count, own);
  const run = kernels(memory.memory);
  memory.i32[A.buildS >> 2] = 0;
  memory.i32[A.buildSize >> 2] = 1; // ∅ is there from the start
  memory.mu[0] = 0;
  memory.tail[0] = 0; // the mask of ∅ (the tail slot holds the masks while building)
  let status: number;
  while ((status = run.build(KERNEL_CHUNK)) === 1);
  const size = memory.i32[A.buildSize >> 2]!;
  if (status < 0) throw new Error(`internal: more independent sets than the ${count} counted`);
  if (size !== count) throw new Error(`internal: enumerated ${size} independent sets, counted ${count}`);
  return { count, node: memory.node, mu: memory.mu, kernel: { memory, run } };
}
