/**
 * The stability condition straight from its definition, by enumerating every subset (n ≤ ~16):
 * "Stability of the stochastic matching model", J. Appl. Probab. 2016 (self-loop extension 2021,
 * venue from memory) — stable iff λ(I) < λ(N(I)) for every non-empty independent set I that contains
 * no self-looped class. Written independently of src/stability (bitmasks, no flows, no LPs).
 */
import type { Rng } from '../helpers/random.js';

export interface SmallGraph {
  readonly n: number;
  readonly rates: number[];
  /** Pairs of class indices, [k, k] for a self-loop. */
  readonly pairs: Array<[number, number]>;
}

export interface Enumerated {
  /** Every non-empty independent self-loop-free set, as bitmask with demand, capacity and slack. */
  readonly sets: Array<{ mask: number; neighbours: number; demand: number; capacity: number; slack: number }>;
  readonly stable: boolean;
  /** min slack over all such sets (Infinity when there is none). */
  readonly minSlack: number;
  /** min slack over the sets containing k (Infinity when none, e.g. k self-looped). */
  readonly minSlackWith: number[];
}

export function adjacencyMasks(g: SmallGraph): { nb: number[]; loops: number } {
  const nb = new Array<number>(g.n).fill(0);
  let loops = 0;
  for (const [a, b] of g.pairs) {
    nb[a]! |= 1 << b;
    nb[b]! |= 1 << a;
    if (a === b) loops |= 1 << a;
  }
  return { nb, loops };
}

export function maskRate(g: SmallGraph, mask: number): number {
  let s = 0;
  for (let k = 0; k < g.n; k++) if (mask & (1 << k)) s += g.rates[k]!;
  return s;
}

export function maskNeighbours(nb: number[], mask: number): number {
  let out = 0;
  for (let k = 0; k < nb.length; k++) if (mask & (1 << k)) out |= nb[k]!;
  return out;
}

export function enumerate(g: SmallGraph): Enumerated {
  const { nb, loops } = adjacencyMasks(g);
  const sets: Enumerated['sets'] = [];
  let minSlack = Infinity;
  const minSlackWith = new Array<number>(g.n).fill(Infinity);
  let stable = true;
  for (let mask = 1; mask < 1 << g.n; mask++) {
    if (mask & loops) continue;
    const neighbours = maskNeighbours(nb, mask);
    if (neighbours & mask) continue; // not independent
    const demand = maskRate(g, mask);
    const capacity = maskRate(g, neighbours);
    const slack = capacity - demand;
    sets.push({ mask, neighbours, demand, capacity, slack });
    if (!(demand < capacity)) stable = false;
    minSlack = Math.min(minSlack, slack);
    for (let k = 0; k < g.n; k++) if (mask & (1 << k)) minSlackWith[k] = Math.min(minSlackWith[k]!, slack);
  }
  return { sets, stable, minSlack, minSlackWith };
}

export const maskOf = (set: ArrayLike<number>): number => {
  let m = 0;
  for (let i = 0; i < set.length; i++) m |= 1 << set[i]!;
  return m;
};

export interface GraphOptions {
  readonly minN: number;
  readonly maxN: number;
}

/**
 * A random graph: n in [minN, maxN], edge density, self-loop probability and rate law drawn per
 * graph; sometimes integer rates (exact ties λ(I) = λ(N(I)) then happen), sometimes rates that make
 * the design stable by construction (λ_k = Σ_{e∋k} a_{k,e} μ_e with μ_e > 0).
 */
export function randomGraph(rng: Rng, o: GraphOptions = { minN: 2, maxN: 9 }): SmallGraph {
  const n = rng.int(o.minN, o.maxN);
  const density = rng.uniform(0.05, 0.9);
  const loopProb = rng.chance(0.4) ? 0 : rng.uniform(0, 0.4);
  const pairs: Array<[number, number]> = [];
  for (let a = 0; a < n; a++) {
    if (rng.chance(loopProb)) pairs.push([a, a]);
    for (let b = a + 1; b < n; b++) if (rng.chance(density)) pairs.push([a, b]);
  }
  const law = rng.int(0, 2);
  let rates: number[];
  if (law === 0) rates = Array.from({ length: n }, () => rng.int(1, 4));
  else if (law === 1) rates = Array.from({ length: n }, () => rng.uniform(0.05, 3));
  else {
    rates = new Array<number>(n).fill(0);
    for (const [a, b] of pairs) {
      const mu = rng.uniform(0.1, 1);
      rates[a]! += a === b ? 2 * mu : mu;
      if (a !== b) rates[b]! += mu;
    }
    rates = rates.map((r) => (r > 0 ? r : rng.uniform(0.1, 1)));
  }
  return { n, rates, pairs: rng.shuffled(pairs) };
}

/** Connected components of a small graph, as bitmasks. */
export function componentMasks(g: SmallGraph): number[] {
  const { nb } = adjacencyMasks(g);
  const seen = new Array<boolean>(g.n).fill(false);
  const out: number[] = [];
  for (let s = 0; s < g.n; s++) {
    if (seen[s]) continue;
    let mask = 0;
    const stack = [s];
    seen[s] = true;
    while (stack.length) {
      const v = stack.pop()!;
      mask |= 1 << v;
      for (let w = 0; w < g.n; w++) if (nb[v]! & (1 << w) && !seen[w]) {
        seen[w] = true;
        stack.push(w);
      }
    }
    out.push(mask);
  }
  return out;
}
