import { TooLargeError } from '../errors.js';
import type { MaskGraph } from './masks.js';

/**
 * The WebAssembly memory of one component's evaluation: a header of byte offsets (i32 slots at fixed
 * addresses, read by the kernels of kernel-code.ts), the component's graph as 64-bit masks, the trie
 * of its independent sets (same record layout as SetTrie.node: first child, candidate mask lo, hi),
 * μ, Ψ and T per set, the walk stacks and the per-class outputs. Memories are never grown, so the
 * typed-array views taken here never detach.
 *
 * Small components (the recommender evaluates thousands of them) share one pooled memory of
 * POOL_BYTES and its kernel instance: creating a WebAssembly memory costs far more than evaluating a
 * few hundred sets. A pooled layout is valid until the next kernelMemory call (`current` tells);
 * larger components get a memory of their own.
 */
export const H = {
  n: 0,
  count: 4,
  rate: 8, // f64[n]
  rnl: 12, // f64[n]: λ_k when k is not self-compatible, else 0 (its share of r(A))
  nb: 16, // i64[n]: N(k), k itself when self-compatible
  con: 20, // i64[n]: N(k) ∪ {k} without the self-loop (cannot wait together with k)
  bytes: 24, // f64[8·256]: λ of each byte of a mask (masks.ts byteSum)
  node: 28, // i32[3·count]
  mu: 32, // f64[count]
  psi: 36, // f64[count]
  tail: 40, // f64[count]; i64 masks of the sets while the trie is built; Ψ1 for backlog-only
  idx: 44, // i32[D]: trie index of the set on the stack at depth d
  elem: 48, // i32[D]: class added at depth d
  rem: 52, // i32[D·n]: rem[d·n + j] = index of A_d ∖ {elem[j+1]}
  r: 56, // f64[D]: r(A_d)
  todo: 60, // i64[D]: children still to visit
  smask: 64, // i64[D]: A_d
  nmask: 68, // i64[D]: N(A_d)
  omask: 72, // i64[D]: classes with exactly one neighbour in A_d
  backlog: 76, // f64[n]
  flow: 80, // f64[n·n]
  depth: 84, // walk state between calls (chunks)
  buildS: 88, // trie build state: next set to expand, sets so far
  buildSize: 92,
  all: 96, // i64: mask of all classes
  sat: 104, // i64: a saturated set found by the prefix walk
  tol: 112, // f64
  moment: 120, // i32: 1 = the prefix walk also fills Ψ1 (in the tail slot)
  end: 128,
} as const;

export interface KernelMemory {
  readonly memory: WebAssembly.Memory;
  /** False once a later kernelMemory call has reused the pooled memory. */
  current(): boolean;
  readonly n: number;
  readonly count: number;
  /** Views on the memory (never detached: the memory is not grown). */
  readonly node: Int32Array;
  readonly mu: Float64Array;
  readonly psi: Float64Array;
  readonly tail: Float64Array;
  readonly i32: Int32Array;
  readonly f64: Float64Array;
}

const PAGE = 65536;
const MAX_PAGES = 65536; // 4 GiB, the limit of 32-bit WebAssembly memories
export const POOL_BYTES = 4 << 20;
let pool: { memory: WebAssembly.Memory; generation: number } | undefined;

/** Lays out and fills the memory of one component (graph, header; the arrays are left as they are). */
export function kernelMemory(g: MaskGraph, count: number): KernelMemory {
  const n = g.n;
  const D = n + 1;
  let at = H.end;
  const take = (bytes: number): number => {
    const p = at;
    at += Math.ceil(bytes / 8) * 8;
    return p;
  };
  const off = {
    rate: take(8 * n),
    rnl: take(8 * n),
    nb: take(8 * n),
    con: take(8 * n),
    bytes: take(8 * 2048),
    idx: take(4 * D),
    elem: take(4 * D),
    rem: take(4 * D * n),
    r: take(8 * D),
    todo: take(8 * D),
    smask: take(8 * D),
    nmask: take(8 * D),
    omask: take(8 * D),
    backlog: take(8 * n),
    flow: take(8 * n * n),
    mu: take(8 * count),
    psi: take(8 * count),
    tail: take(8 * count),
    node: take(12 * count),
  };
  const pages = Math.ceil(at / PAGE);
  if (pages > MAX_PAGES) {
    throw new TooLargeError(`a connected group with ${count.toLocaleString('en-US')} independent sets needs more than 4 GiB for exact evaluation`, count, Math.floor((MAX_PAGES * PAGE) / 36));
  }
  let memory: WebAssembly.Memory;
  let current: () => boolean;
  if (at <= POOL_BYTES) {
    pool ??= { memory: new WebAssembly.Memory({ initial: POOL_BYTES / PAGE }), generation: 0 };
    const p = pool;
    const generation = ++p.generation;
    memory = p.memory;
    current = () => p.generation === generation;
  } else {
    memory = new WebAssembly.Memory({ initial: pages });
    current = () => true;
  }
  const buf = memory.buffer;
  const i32 = new Int32Array(buf);
  const f64 = new Float64Array(buf);
  i32[H.n >> 2] = n;
  i32[H.count >> 2] = count;
  for (const [k, v] of Object.entries(off)) i32[H[k as keyof typeof off] >> 2] = v;
  for (let k = 0; k < n; k++) {
    f64[(off.rate >> 3) + k] = g.rate[k]!;
    f64[(off.rnl >> 3) + k] = g.loop[k] ? 0 : g.rate[k]!;
    i32[(off.nb >> 2) + 2 * k] = g.nbLo[k]!; // i64 masks, little-endian words
    i32[(off.nb >> 2) + 2 * k + 1] = g.nbHi[k]!;
    i32[(off.con >> 2) + 2 * k] = g.conLo[k]!;
    i32[(off.con >> 2) + 2 * k + 1] = g.conHi[k]!;
  }
  f64.set(g.byteSum, off.bytes >> 3);
  i32[H.all >> 2] = g.allLo;
  i32[(H.all >> 2) + 1] = g.allHi;
  return {
    memory,
    current,
    n,
    count,
    node: new Int32Array(buf, off.node, 3 * count),
    mu: new Float64Array(buf, off.mu, count),
    psi: new Float64Array(buf, off.psi, count),
    tail: new Float64Array(buf, off.tail, count),
    i32,
    f64,
  };
}

/** Reads an i64 header slot as (lo, hi) words. */
export function headerMask(m: KernelMemory, slot: number): { lo: number; hi: number } {
  return { lo: m.i32[slot >> 2]! | 0, hi: m.i32[(slot >> 2) + 1]! | 0 };
}

/** A view of an array whose offset sits in header slot `slot`. */
export function f64Array(m: KernelMemory, slot: number, length: number): Float64Array {
  return new Float64Array(m.memory.buffer, m.i32[slot >> 2]! >>> 0, length);
}
