import { compileGraph, type CompiledModel } from '../../src/model/compile.js';
import { bruteStability } from './brute-stability.js';
import type { Rng } from './random.js';

/** A design as plain data: class ids, rates and compatibility pairs (class indices). */
export interface Design {
  readonly ids: string[];
  readonly rates: number[];
  readonly pairs: Array<[number, number]>;
}

export function toModel(d: Design): CompiledModel {
  return compileGraph(d.ids, d.rates, d.pairs);
}

export interface DesignOptions {
  readonly minClasses: number;
  readonly maxClasses: number;
  /** Probability of each extra edge beyond a random spanning tree of a component. */
  readonly edgeProb: number;
  /** Probability that a class has a self-loop (a one-class component always gets one). */
  readonly loopProb: number;
  /** Number of connected components (1 = connected). */
  readonly components: number;
  /** Keep only designs whose brute-force slack min (λ(N(I)) − λ(I)) / λ(N(I)) is at least this. */
  readonly minSlack: number;
  /** Optionally keep only designs whose slack is at most this (heavy load, near the stability boundary). */
  readonly maxSlack?: number;
}

/** Edges of one random connected component on `size` local classes. */
function randomComponent(rng: Rng, size: number, edgeProb: number, loopProb: number): Array<[number, number]> {
  const pairs: Array<[number, number]> = [];
  for (let v = 1; v < size; v++) pairs.push([rng.int(0, v - 1), v]); // random spanning tree
  const has = new Set(pairs.map(([a, b]) => a * size + b));
  for (let a = 0; a < size; a++)
    for (let b = a + 1; b < size; b++) if (!has.has(a * size + b) && rng.chance(edgeProb)) pairs.push([a, b]);
  for (let a = 0; a < size; a++) if (size === 1 || rng.chance(loopProb)) pairs.push([a, a]);
  return pairs;
}

/** Splits n into `parts` positive sizes. */
function splitSizes(rng: Rng, n: number, parts: number): number[] {
  const sizes = new Array<number>(parts).fill(1);
  for (let r = n - parts; r > 0; r--) sizes[rng.int(0, parts - 1)]!++;
  return sizes;
}

/** One random design (not necessarily stable). Rates come either from positive edge weights or uniformly. */
export function randomDesign(rng: Rng, o: Omit<DesignOptions, 'minSlack' | 'maxSlack'>): Design {
  const n = rng.int(Math.max(o.minClasses, o.components), o.maxClasses);
  const perm = rng.shuffled([...Array(n).keys()]); // interleave component members in index order
  const pairs: Array<[number, number]> = [];
  let offset = 0;
  for (const size of splitSizes(rng, n, o.components)) {
    for (const [a, b] of randomComponent(rng, size, o.edgeProb, o.loopProb)) pairs.push([perm[offset + a]!, perm[offset + b]!]);
    offset += size;
  }
  let rates: number[];
  if (rng.chance(0.5)) {
    // λ_k = Σ_{e∋k} a_{k,e} μ_e with μ_e > 0: stable whenever each component is non-bipartite.
    rates = new Array<number>(n).fill(0);
    for (const [a, b] of pairs) {
      const mu = rng.uniform(0.1, 1);
      rates[a]! += mu;
      rates[b]! += mu;
    }
  } else {
    rates = Array.from({ length: n }, () => rng.uniform(0.05, 1));
  }
  const scale = rng.uniform(0.3, 4);
  rates = rates.map((r) => r * scale);
  const shuffledPairs = rng.shuffled(pairs).map(([a, b]) => (rng.chance(0.5) ? [a, b] : [b, a]) as [number, number]);
  return { ids: [...Array(n).keys()].map((k) => `q${k}`), rates, pairs: shuffledPairs };
}

/** Draws designs until one is stable by brute force with at least the requested slack. */
export function randomStableDesign(rng: Rng, o: DesignOptions): Design {
  for (let attempt = 0; attempt < 100_000; attempt++) {
    const d = randomDesign(rng, o);
    const s = bruteStability(toModel(d));
    if (s.stable && s.minSlack >= o.minSlack && s.minSlack <= (o.maxSlack ?? Infinity)) return d;
  }
  throw new Error('no stable design found; loosen the options');
}

/** Draws designs until one is unstable by brute force. */
export function randomUnstableDesign(rng: Rng, o: Omit<DesignOptions, 'minSlack' | 'maxSlack'>): Design {
  for (let attempt = 0; attempt < 100_000; attempt++) {
    const d = randomDesign(rng, o);
    if (!bruteStability(toModel(d)).stable) return d;
  }
  throw new Error('no unstable design found');
}

/** Connected components of a design (self-loops ignored), each a sorted list of class indices. */
export function designComponents(d: Design): number[][] {
  const n = d.ids.length;
  const parent = [...Array(n).keys()];
  const find = (x: number): number => (parent[x] === x ? x : (parent[x] = find(parent[x]!)));
  for (const [a, b] of d.pairs) parent[find(a)] = find(b);
  const groups = new Map<number, number[]>();
  for (let k = 0; k < n; k++) {
    const r = find(k);
    if (!groups.has(r)) groups.set(r, []);
    groups.get(r)!.push(k);
  }
  return [...groups.values()];
}

/** The sub-design on some classes (renumbered in the given order); keeps the pairs inside them, in order. */
export function subDesign(d: Design, members: readonly number[]): Design {
  const local = new Map(members.map((k, i) => [k, i] as const));
  return {
    ids: members.map((k) => d.ids[k]!),
    rates: members.map((k) => d.rates[k]!),
    pairs: d.pairs.filter(([a, b]) => local.has(a) && local.has(b)).map(([a, b]) => [local.get(a)!, local.get(b)!] as [number, number]),
  };
}
