import { compileGraph, type CompiledModel } from './compile.js';

/** Connected components (self-loops do not matter). */
export interface Components {
  readonly count: number;
  /** Component of each class, numbered by smallest member. */
  readonly of: Int32Array;
  /** Members of each component, ascending. */
  readonly members: ReadonlyArray<Int32Array>;
}

export function components(model: CompiledModel): Components {
  const { n, adjStart, adj } = model;
  const of = new Int32Array(n).fill(-1);
  const members: Int32Array[] = [];
  const stack = new Int32Array(n);
  for (let s = 0; s < n; s++) {
    if (of[s] !== -1) continue;
    const c = members.length;
    const list: number[] = [];
    let top = 0;
    stack[top++] = s;
    of[s] = c;
    while (top > 0) {
      const v = stack[--top]!;
      list.push(v);
      for (let p = adjStart[v]!; p < adjStart[v + 1]!; p++) {
        const w = adj[p]!;
        if (of[w] === -1) {
          of[w] = c;
          stack[top++] = w;
        }
      }
    }
    members.push(Int32Array.from(list.sort((a, b) => a - b)));
  }
  return { count: members.length, of, members };
}

/**
 * Two-colouring of one component, or undefined when it has an odd cycle or a self-loop
 * (only bipartite components can be coloured). `side` may be a reused n-array (time then stays in
 * the size of the component); only the entries of `members` are meaningful afterwards.
 */
export function bipartition(model: CompiledModel, members: ArrayLike<number>, side: Int8Array = new Int8Array(model.n)): { side: Int8Array } | undefined {
  const { adjStart, adj, selfLoop } = model;
  // members is a whole component: the search below reads and writes the sides of members only
  for (let i = 0; i < members.length; i++) side[members[i]!] = -1;
  for (let i = 0; i < members.length; i++) if (selfLoop[members[i]!]) return undefined;
  const queue: number[] = [];
  for (let i = 0; i < members.length; i++) {
    const s = members[i]!;
    if (side[s] !== -1) continue;
    side[s] = 0;
    queue.push(s);
    while (queue.length > 0) {
      const v = queue.pop()!;
      for (let p = adjStart[v]!; p < adjStart[v + 1]!; p++) {
        const w = adj[p]!;
        if (side[w] === -1) {
          side[w] = 1 - side[v]!;
          queue.push(w);
        } else if (side[w] === side[v]) return undefined;
      }
    }
  }
  return { side };
}

/** The sub-model induced by `members` (classes renumbered 0..k-1 in the given order). */
export function subModel(model: CompiledModel, members: ArrayLike<number>): { sub: CompiledModel; edgeMap: Int32Array } {
  const local = new Int32Array(model.n).fill(-1);
  for (let i = 0; i < members.length; i++) local[members[i]!] = i;
  const pairs: Array<[number, number]> = [];
  const edgeMap: number[] = [];
  for (let e = 0; e < model.m; e++) {
    const a = local[model.edgeA[e]!]!;
    const b = local[model.edgeB[e]!]!;
    if (a >= 0 && b >= 0) {
      pairs.push([a, b]);
      edgeMap.push(e);
    }
  }
  const ids = Array.from({ length: members.length }, (_, i) => model.ids[members[i]!]!);
  const rates = Array.from({ length: members.length }, (_, i) => model.rates[members[i]!]!);
  return { sub: compileGraph(ids, rates, pairs), edgeMap: Int32Array.from(edgeMap) };
}
