import { TooLargeError } from '../errors.js';
import type { MaskGraph } from './masks.js';

/**
 * The WebAssembly memory of one component's evaluation (read by the kernels of kernel-code.ts).
 * Everything sized by the number of classes (at most 64) sits at a fixed address, so the kernels
 * reach it through constant offsets and keep their registers for the loop; only the four arrays
 * sized by the number of sets are placed after them, their offsets in the header:
 *   the trie (same record layout as SetTrie.node: first child, candidate mask lo, hi), μ, Ψ, T.
 * Memories are never grown, so the typed-array views taken here never detach.
 *
 * Small components (the recommender evaluates thousands of them) share one pooled memory of
 * POOL_BYTES and its kernel instance: creating a WebAssembly memory costs far more than evaluating a
 * few hundred sets. A pooled layout is valid until the next kernelMemory call (`current` tells);
 * larger components get a memory of their own.
 */
const MAX_N = 64;
const MAX_D = MAX_N + 1;

/** Byte addresses. Stacks are indexed by depth d (0..n); rem has a row of 64 entries per depth. */
export const A = (() => {
  let at = 0;
  const take = (bytes: number): number => {
    const p = at;
    at += bytes;
    return p;
  };
  const a = {
    // header (scalars)
    n: take(4),
    count: take(4),
    node: take(4), // i32 offsets of the arrays sized by the number of sets
    mu: take(4),
    psi: take(4),
    tail: take(4), // T; the i64 masks of the sets while the trie is built; Ψ1 for backlog-only
    depth: take(4), // walk state between calls (chunks)
    buildS: take(4), // trie build state: next set to expand, sets so far
    buildSize: take(4),
    moment: take(4), // 1 = the prefix walk also fills Ψ1 (in the tail slot)
    visits: take(4), // sets the walk over a shared trie has reached, ∅ not included
    bitmap: take(4), // a memory of its own: byte offset of a bitmap of the sets (the walk over a shared trie)
    all: take(8), // i64: mask of all classes
    sat: take(8), // i64: a saturated set found by the prefix walk
    tol: take(8), // f64
    // per class
    rate: take(8 * MAX_N), // f64
    rnl: take(8 * MAX_N), // f64: λ_k when k is not self-compatible, else 0 (its share of r(A))
    nb: take(8 * MAX_N), // i64: N(k), k itself when self-compatible
    con: take(8 * MAX_N), // i64: N(k) ∪ {k} without the self-loop (cannot wait together with k)
    backlog: take(8 * MAX_N), // f64
    bytes: take(8 * 256 * 8), // f64[8·256]: λ of each byte of a mask (masks.ts byteSum)
    // per depth of the walk
    idx: take(4 * MAX_D + 4), // i32: trie index of the set on the stack at depth d
    elem: take(4 * MAX_D + 4), // i32: class added at depth d
    erate: take(8 * MAX_D), // f64: λ of the class added at depth d (the walk over a shared trie)
    sums: take(16), // f64 × 2: Σ Ψ and Σ Ψ1 of the walk over a shared trie
    r: take(8 * MAX_D), // f64: r(A_d)
    todo: take(8 * MAX_D), // i64: children still to visit
    smask: take(8 * MAX_D), // i64: A_d
    nmask: take(8 * MAX_D), // i64: N(A_d)
    omask: take(8 * MAX_D), // i64: classes with exactly one neighbour in A_d
    bmask: take(8 * MAX_D), // i64: classes in conflict with A_d in the design (the tail walk over a shared trie)
    rem: take(4 * MAX_D * MAX_N), // i32: rem[64 d + j] = index of A_d ∖ {elem[j+1]}
    // partners: N(k) at pclass[pstart[k] .. pstart[k+1]); pflow: flow from each into k, unscaled
    pstart: take(4 * MAX_D + 4),
    pclass: take(4 * MAX_N * MAX_N),
    pflow: take(8 * MAX_N * MAX_N),
    end: 0,
  };
  a.end = at;
  return a;
})();

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

/**
 * Lays out and fills the memory of one component (graph, header; the arrays are left as they are).
 * `own`: a memory of its own even when the pool would hold it (a trie kept across evaluations,
 * shared-trie.ts).
 */
export function kernelMemory(g: MaskGraph, count: number, own = false): KernelMemory {
  const n = g.n;
  if (n > MAX_N) throw new RangeError(`kernels hold at most ${MAX_N} classes`);
  const mu = A.end;
  const psi = mu + 8 * count;
  const tail = psi + 8 * count;
  const node = tail + 8 * count;
  // a memory of its own also holds a bitmap of the sets (shared-trie.ts), 8-byte aligned
  const bitmap = node + 12 * count + ((12 * count) % 8);
  const end = own ? bitmap + 8 * Math.ceil(count / 64) : node + 12 * count;
  const pages = Math.ceil(end / PAGE);
  if (pages > MAX_PAGES) {
    throw new TooLargeError(`a connected group with ${count.toLocaleString('en-US')} independent sets needs more than 4 GiB for exact evaluation`, count, Math.floor((MAX_PAGES * PAGE) / 36));
  }
  let memory: WebAssembly.Memory;
  let current: () => boolean;
  if (end <= POOL_BYTES && !own) {
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
  i32[A.n >> 2] = n;
  i32[A.count >> 2] = count;
  i32[A.node >> 2] = node;
  i32[A.mu >> 2] = mu;
  i32[A.psi >> 2] = psi;
  i32[A.tail >> 2] = tail;
  i32[A.bitmap >> 2] = own ? bitmap : 0;
  let t = 0;
  for (let k = 0; k < n; k++) {
    f64[(A.rate >> 3) + k] = g.rate[k]!;
    f64[(A.rnl >> 3) + k] = g.loop[k] ? 0 : g.rate[k]!;
    i32[(A.nb >> 2) + 2 * k] = g.nbLo[k]!; // i64 masks, little-endian words
    i32[(A.nb >> 2) + 2 * k + 1] = g.nbHi[k]!;
    i32[(A.con >> 2) + 2 * k] = g.conLo[k]!;
    i32[(A.con >> 2) + 2 * k + 1] = g.conHi[k]!;
    i32[(A.pstart >> 2) + k] = t;
    for (let i = 0; i < n; i++) if (i < 32 ? (g.nbLo[k]! >>> i) & 1 : (g.nbHi[k]! >>> (i - 32)) & 1) i32[(A.pclass >> 2) + t++] = i;
  }
  i32[(A.pstart >> 2) + n] = t;
  f64.set(g.byteSum, A.bytes >> 3);
  i32[A.all >> 2] = g.allLo;
  i32[(A.all >> 2) + 1] = g.allHi;
  return {
    memory,
    current,
    n,
    count,
    node: new Int32Array(buf, node, 3 * count),
    mu: new Float64Array(buf, mu, count),
    psi: new Float64Array(buf, psi, count),
    tail: new Float64Array(buf, tail, count),
    i32,
    f64,
  };
}

/** Reads an i64 slot as (lo, hi) words. */
export function mask64(m: KernelMemory, at: number): { lo: number; hi: number } {
  return { lo: m.i32[at >> 2]! | 0, hi: m.i32[(at >> 2) + 1]! | 0 };
}

/** Writes (lo, hi) words into an i64 slot. */
export function setMask64(m: KernelMemory, at: number, lo: number, hi: number): void {
  m.i32[at >> 2] = lo;
  m.i32[(at >> 2) + 1] = hi;
}
