import type { CompiledModel } from '../../src/model/compile.js';

/**
 * A test-side view of a compiled model built only from its rates and edge list (edgeA/edgeB), so the
 * oracles do not depend on the model's CSR adjacency. Sets of classes are bitmasks (n <= 30).
 */
export interface BitGraph {
  readonly n: number;
  readonly rates: readonly number[];
  /** loop[k]: class k has a self-loop. */
  readonly loop: readonly boolean[];
  /** Bitmask of the self-looped classes (S). */
  readonly loopMask: number;
  /** N(k): compatible classes of k, k itself included when self-looped. */
  readonly nbr: readonly number[];
  /** Neighbours of k other than k (the graph without self-loops). */
  readonly adj: readonly number[];
  /** Edge index of {i, j} (model edge order), or -1. */
  edge(i: number, j: number): number;
}

export function toBitGraph(model: CompiledModel): BitGraph {
  const n = model.n;
  if (n > 30) throw new RangeError('bit graphs hold at most 30 classes');
  const rates = Array.from(model.rates);
  const loop = new Array<boolean>(n).fill(false);
  const nbr = new Array<number>(n).fill(0);
  const adj = new Array<number>(n).fill(0);
  const edgeIndex = new Map<number, number>();
  for (let e = 0; e < model.m; e++) {
    const a = model.edgeA[e]!;
    const b = model.edgeB[e]!;
    edgeIndex.set(a * n + b, e);
    edgeIndex.set(b * n + a, e);
    nbr[a] |= 1 << b;
    nbr[b] |= 1 << a;
    if (a === b) loop[a] = true;
    else {
      adj[a] |= 1 << b;
      adj[b] |= 1 << a;
    }
  }
  let loopMask = 0;
  for (let k = 0; k < n; k++) if (loop[k]) loopMask |= 1 << k;
  return { n, rates, loop, loopMask, nbr, adj, edge: (i, j) => edgeIndex.get(i * n + j) ?? -1 };
}

/** λ(A). */
export function rateOf(g: BitGraph, mask: number): number {
  let s = 0;
  for (let k = 0; k < g.n; k++) if (mask & (1 << k)) s += g.rates[k]!;
  return s;
}

/** N(A) = union of N(k) over k in A. */
export function neighbourhood(g: BitGraph, mask: number): number {
  let s = 0;
  for (let k = 0; k < g.n; k++) if (mask & (1 << k)) s |= g.nbr[k]!;
  return s;
}

/** True when no two distinct members of A are adjacent (self-loops ignored). */
export function isIndependent(g: BitGraph, mask: number): boolean {
  for (let k = 0; k < g.n; k++) if (mask & (1 << k) && g.adj[k]! & mask) return false;
  return true;
}

export function membersOf(mask: number, n: number): number[] {
  const out: number[] = [];
  for (let k = 0; k < n; k++) if (mask & (1 << k)) out.push(k);
  return out;
}

export function maskOf(members: Iterable<number>): number {
  let m = 0;
  for (const k of members) m |= 1 << k;
  return m;
}
