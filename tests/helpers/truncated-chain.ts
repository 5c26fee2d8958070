import { LuDecomposition, Matrix } from 'ml-matrix';
import type { CompiledModel } from '../../src/model/compile.js';
import { toBitGraph } from './bitgraph.js';
import type { Metrics } from './metrics.js';

/**
 * Oracle 2: the continuous-time chain on words of waiting classes, built directly from the FCFM
 * dynamics (not from the product form) and truncated at length K, solved with a general-purpose
 * linear-algebra library (ml-matrix, LU decomposition).
 *
 * Dynamics: in state w (classes of the waiting items, oldest first) an item of class k arrives at rate
 * λ_k; if some waiting item is compatible with k (its class is in N(k)), the oldest such item leaves with
 * it (one match on edge {k, j}); otherwise k is appended, unless |w| = K, in which case the arrival is
 * dropped (the truncation). States are those reachable from the empty word.
 *
 * Solve: πQ = 0 with Σπ = 1, i.e. Qᵀπᵀ = 0 with the last equation replaced by the normalisation.
 * Metrics read off π: P(empty) = π(∅); L_k = Σ_w π(w)·#_k(w); immediate match of k = Σ_w π(w)·[w has a
 * class in N(k)] (PASTA); match rate of edge e = Σ_w π(w) Σ_k λ_k [the arrival k at w matches along e].
 */
export interface TruncatedChainResult extends Metrics {
  readonly states: number;
  /** Stationary mass of the words of maximal length K (a gauge of the truncation). */
  readonly boundaryMass: number;
}

/** Counts the reachable states without solving (to keep the dense solve small). */
export function countWordStates(model: CompiledModel, K: number): number {
  return explore(model, K).words.length;
}

interface Explored {
  words: string[];
  /** Transitions: from, to, rate, edge (−1 for an append). */
  moves: Array<[number, number, number, number]>;
}

function explore(model: CompiledModel, K: number): Explored {
  const g = toBitGraph(model);
  const { n, rates, nbr } = g;
  const index = new Map<string, number>([['', 0]]);
  const words = [''];
  const moves: Explored['moves'] = [];
  for (let s = 0; s < words.length; s++) {
    const w = words[s]!;
    for (let k = 0; k < n; k++) {
      let next: string | undefined;
      let edge = -1;
      for (let p = 0; p < w.length; p++) {
        const j = w.charCodeAt(p) - 97;
        if (nbr[k]! & (1 << j)) {
          next = w.slice(0, p) + w.slice(p + 1);
          edge = g.edge(k, j);
          break;
        }
      }
      if (next === undefined) {
        if (w.length >= K) continue; // dropped arrival
        next = w + String.fromCharCode(97 + k);
      }
      let t = index.get(next);
      if (t === undefined) {
        t = words.length;
        index.set(next, t);
        words.push(next);
      }
      moves.push([s, t, rates[k]!, edge]);
    }
  }
  return { words, moves };
}

export function truncatedChain(model: CompiledModel, K: number): TruncatedChainResult {
  const g = toBitGraph(model);
  const { n, rates, nbr } = g;
  const { words, moves } = explore(model, K);
  const N = words.length;
  if (N > 2500) throw new RangeError(`${N} states is too many for a dense solve`);
  // A = Qᵀ: A[t][s] = rate s → t; A[s][s] = −(total rate out of s).
  const A = Matrix.zeros(N, N);
  for (const [s, t, r] of moves) {
    if (s === t) continue;
    A.set(t, s, A.get(t, s) + r);
    A.set(s, s, A.get(s, s) - r);
  }
  for (let s = 0; s < N; s++) A.set(N - 1, s, 1);
  const b = Matrix.zeros(N, 1);
  b.set(N - 1, 0, 1);
  const lu = new LuDecomposition(A);
  if (lu.isSingular()) throw new Error('singular generator');
  const x = lu.solve(b);
  const pi = Array.from({ length: N }, (_, s) => x.get(s, 0));

  const backlog = new Array<number>(n).fill(0);
  const immediateMatch = new Array<number>(n).fill(0);
  const matchRates = new Array<number>(model.m).fill(0);
  let boundaryMass = 0;
  for (let s = 0; s < N; s++) {
    const w = words[s]!;
    let present = 0;
    for (let p = 0; p < w.length; p++) {
      const j = w.charCodeAt(p) - 97;
      backlog[j]! += pi[s]!;
      present |= 1 << j;
    }
    for (let k = 0; k < n; k++) if (nbr[k]! & present) immediateMatch[k]! += pi[s]!;
    if (w.length === K) boundaryMass += pi[s]!;
  }
  for (const [s, , r, e] of moves) if (e >= 0) matchRates[e]! += pi[s]! * r;
  return {
    states: N,
    boundaryMass,
    emptyProbability: pi[0]!,
    backlog,
    backlogTotal: backlog.reduce((a, v) => a + v, 0),
    wait: backlog.map((v, k) => v / rates[k]!),
    immediateMatch,
    matchRates,
  };
}
