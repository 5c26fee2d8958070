import type { Scenario } from './scenario.js';

/**
 * A validated design compiled once into typed arrays. Hot loops work on class indices 0..n-1 and
 * edge indices 0..m-1; class ids come back only at the boundary (`ids[k]`).
 */
export interface CompiledModel {
  /** Number of classes. */
  readonly n: number;
  /** Class id of each index. */
  readonly ids: readonly string[];
  /** Index of each class id. */
  readonly index: ReadonlyMap<string, number>;
  /** Arrival rate λ_k of each class. */
  readonly rates: Float64Array;
  /** λ of all classes. */
  readonly totalRate: number;
  /** 1 when items of class k match each other (a self-loop [k, k]). */
  readonly selfLoop: Uint8Array;
  /** Number of compatibilities (edges), self-loops included. */
  readonly m: number;
  /** Edge e joins edgeA[e] and edgeB[e] (edgeA[e] <= edgeB[e]; equal for a self-loop). */
  readonly edgeA: Int32Array;
  readonly edgeB: Int32Array;
  /** Neighbours of k other than k itself: adj[adjStart[k] .. adjStart[k+1]), ascending. */
  readonly adjStart: Int32Array;
  readonly adj: Int32Array;
  /** adjEdge[p] is the edge index of the adjacency entry adj[p]. */
  readonly adjEdge: Int32Array;
  /** Edge index of the self-loop of k, or -1. */
  readonly selfEdge: Int32Array;
}

let scratch = new Int32Array(64);

/** A zeroed scratch array of n integers (compileGraph's counters; not re-entrant, never kept). */
function scratchInts(n: number): Int32Array {
  if (scratch.length < n) scratch = new Int32Array(Math.max(n, 2 * scratch.length));
  const out = scratch.subarray(0, n);
  out.fill(0);
  return out;
}

/** Compiles from indices: `pairs` are [a, b] class indices (a may equal b). Pairs must be distinct. */
export function compileGraph(ids: readonly string[], rates: ArrayLike<number>, pairs: ReadonlyArray<readonly [number, number]>): CompiledModel {
  const n = ids.length;
  const m = pairs.length;
  const r = Float64Array.from(rates);
  let loops = 0;
  for (let e = 0; e < m; e++) if (pairs[e]![0] === pairs[e]![1]) loops++;
  const entries = 2 * (m - loops);
  // the integer arrays are views of one buffer: a search compiles thousands of small designs, and
  // every ArrayBuffer costs an allocation and garbage-collector bookkeeping of its own
  const ints = new Int32Array(2 * m + n + (n + 1) + 2 * entries);
  let at = 0;
  const view = (length: number): Int32Array => ints.subarray(at, (at += length));
  const edgeA = view(m);
  const edgeB = view(m);
  const selfEdge = view(n).fill(-1);
  const adjStart = view(n + 1);
  const adj = view(entries);
  const adjEdge = view(entries);
  const selfLoop = new Uint8Array(n);
  const deg = scratchInts(n);
  for (let e = 0; e < m; e++) {
    const [x, y] = pairs[e]!;
    if (!(x >= 0 && x < n && y >= 0 && y < n)) throw new RangeError(`pair ${e} has a class index out of range`);
    edgeA[e] = Math.min(x, y);
    edgeB[e] = Math.max(x, y);
    if (x === y) {
      selfLoop[x] = 1;
      selfEdge[x] = e;
    } else {
      deg[x]++;
      deg[y]++;
    }
  }
  for (let k = 0; k < n; k++) adjStart[k + 1] = adjStart[k]! + deg[k]!;
  // deg becomes the next free position of each list
  const fill = deg;
  for (let k = 0; k < n; k++) fill[k] = adjStart[k]!;
  for (let e = 0; e < m; e++) {
    const a = edgeA[e]!;
    const b = edgeB[e]!;
    if (a === b) continue;
    adj[fill[a]!] = b;
    adjEdge[fill[a]!++] = e;
    adj[fill[b]!] = a;
    adjEdge[fill[b]!++] = e;
  }
  // sort each neighbour list ascending: insertion sort for short lists, a comparison sort for long
  // ones (a hub with thousands of neighbours would make insertion sort quadratic)
  for (let k = 0; k < n; k++) {
    const from = adjStart[k]!;
    const to = adjStart[k + 1]!;
    if (to - from > 32) {
      const order = Array.from({ length: to - from }, (_, i) => from + i).sort((x, y) => adj[x]! - adj[y]!);
      const a = order.map((q) => adj[q]!);
      const ae = order.map((q) => adjEdge[q]!);
      adj.set(a, from);
      adjEdge.set(ae, from);
      continue;
    }
    for (let p = adjStart[k]! + 1; p < adjStart[k + 1]!; p++) {
      const v = adj[p]!;
      const ev = adjEdge[p]!;
      let q = p - 1;
      while (q >= adjStart[k]! && adj[q]! > v) {
        adj[q + 1] = adj[q]!;
        adjEdge[q + 1] = adjEdge[q]!;
        q--;
      }
      adj[q + 1] = v;
      adjEdge[q + 1] = ev;
    }
  }
  let total = 0;
  for (let k = 0; k < n; k++) total += r[k]!;
  const { ids: own, index } = idsOf(ids);
  return { n, ids: own, index, rates: r, totalRate: total, selfLoop, m, edgeA, edgeB, adjStart, adj, adjEdge, selfEdge };
}

/**
 * The model's copy of the class ids and their index, shared by every model compiled from the same
 * id list: a search compiles thousands of designs of one problem, and building the map each time
 * cost more than compiling the graph of a small design. The list itself is the key (its entries are
 * compared on every use, in case a caller changed it since).
 */
const idCache = new WeakMap<readonly string[], { readonly ids: readonly string[]; readonly index: ReadonlyMap<string, number> }>();

function sameIds(a: readonly string[], b: readonly string[]): boolean {
  if (a.length !== b.length) return false;
  for (let k = 0; k < a.length; k++) if (a[k] !== b[k]) return false;
  return true;
}

function idsOf(ids: readonly string[]): { readonly ids: readonly string[]; readonly index: ReadonlyMap<string, number> } {
  let entry = idCache.get(ids);
  if (!entry || !sameIds(entry.ids, ids)) {
    const own = Object.freeze([...ids]);
    entry = { ids: own, index: new Map(own.map((id, k) => [id, k] as const)) };
    idCache.set(ids, entry);
    idCache.set(own, entry);
  }
  return entry;
}

/** Compiles a validated scenario (its compatibilities, in file order). */
export function compileModel(scenario: Scenario): CompiledModel {
  const ids = scenario.classes.map((c) => c.id);
  const index = new Map(ids.map((id, k) => [id, k] as const));
  const pairs = scenario.compatibilities.map((c) => [index.get(c.pair[0])!, index.get(c.pair[1])!] as const);
  return compileGraph(ids, scenario.classes.map((c) => c.rate), pairs);
}

/** The same classes with another edge list (edge indices follow `pairs`). */
export function withPairs(model: CompiledModel, pairs: ReadonlyArray<readonly [number, number]>): CompiledModel {
  return compileGraph(model.ids, model.rates, pairs);
}

/** The same graph with other rates. */
export function withRates(model: CompiledModel, rates: ArrayLike<number>): CompiledModel {
  return compileGraph(model.ids, rates, edgePairs(model));
}

/** Edge list as index pairs, in edge order. */
export function edgePairs(model: CompiledModel): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  for (let e = 0; e < model.m; e++) out.push([model.edgeA[e]!, model.edgeB[e]!]);
  return out;
}

/** Index of the edge {a, b}, or -1. */
export function findEdge(model: CompiledModel, a: number, b: number): number {
  if (a === b) return model.selfEdge[a]!;
  for (let p = model.adjStart[a]!; p < model.adjStart[a + 1]!; p++) if (model.adj[p] === b) return model.adjEdge[p]!;
  return -1;
}
