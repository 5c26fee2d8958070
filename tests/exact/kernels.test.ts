import { describe, expect, it } from 'vitest';
import { prefixSums, SaturatedSet, tailPass } from '../../src/exact/component.js';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { countIndependentSets } from '../../src/exact/count.js';
import { maskGraph } from '../../src/exact/masks.js';
import { buildTrie, KERNEL_CHUNK } from '../../src/exact/trie.js';
import { compileGraph, type CompiledModel } from '../../src/model/compile.js';
import { randomPairs, randomRegularPairs } from '../../src/model/generators.js';
import { randomStableDesign, toModel } from '../helpers/designs.js';
import { Rng } from '../helpers/random.js';
import { setRecursion, trieMasks } from '../helpers/set-recursion-oracle.js';

/**
 * The WebAssembly kernels (trie build, prefix walk, tail walk in push form) against the plain
 * recursions of tests/helpers/set-recursion-oracle.ts, set by set and metric by metric, on seeded
 * random designs: small ones with self-loops, designs of 33–40 classes (masks spanning both 32-bit
 * halves), and one with more sets than a kernel chunk (the walks resume between calls).
 */

const rel = (x: number, y: number): number => (x === y ? 0 : Math.abs(x - y) / Math.max(Math.abs(x), Math.abs(y)));

/** Rates from positive flows on every pair: stable whenever the component is not bipartite. */
function flowRates(n: number, pairs: Array<[number, number]>, rng: Rng): number[] {
  const rates = new Array<number>(n).fill(0);
  for (const [a, b] of pairs) {
    const mu = rng.uniform(0.1, 1);
    rates[a]! += mu;
    rates[b]! += mu;
  }
  return rates;
}

function checkAgainstOracle(model: CompiledModel): number {
  const g = maskGraph(model);
  const count = countIndependentSets(g);
  const t = buildTrie(g, count);
  const o = setRecursion(model);
  expect(o.psi.length).toBe(count);
  // the trie holds every independent set once; μ agrees
  const { lo, hi } = trieMasks(t.node, count);
  const at = new Int32Array(count); // trie index → oracle position
  const seen = new Uint8Array(count);
  let missing = 0;
  let twice = 0;
  let worstMu = 0;
  for (let s = 0; s < count; s++) {
    const p = o.position(lo[s]!, hi[s]!);
    if (p < 0) {
      missing++;
      continue;
    }
    if (seen[p]) twice++;
    seen[p] = 1;
    at[s] = p;
    worstMu = Math.max(worstMu, rel(t.mu[s]!, o.mu[p]!));
  }
  expect({ missing, twice }).toEqual({ missing: 0, twice: 0 });
  expect(worstMu).toBeLessThan(1e-14);
  const psi = new Float64Array(count);
  const psi1 = new Float64Array(count);
  prefixSums(g, t, psi, 1e-12, psi1);
  const tail = new Float64Array(count);
  const cm = tailPass(g, t, psi, tail);
  let worstSet = 0;
  for (let s = 0; s < count; s++) worstSet = Math.max(worstSet, rel(psi[s]!, o.psi[at[s]!]!), rel(tail[s]!, o.tail[at[s]!]!));
  expect(worstSet, 'Ψ and T per set').toBeLessThan(1e-12);
  expect(rel(cm.z, o.z)).toBeLessThan(1e-12);
  const n = model.n;
  let worst = 0;
  for (let k = 0; k < n; k++) {
    worst = Math.max(worst, rel(cm.backlog[k]!, o.backlog[k]!));
    // matched on arrival from the flows (tailPass) against 1 − Σ_{A∩N(k)=∅} Ψ(A)/Z (oracle)
    worst = Math.max(worst, rel(cm.immediateMatch[k]!, o.immediateMatch[k]!));
  }
  let support = 0; // directed pairs carrying flow in one and not the other
  for (let q = 0; q < n * n; q++) {
    if (cm.flow[q]! > 0 !== o.flow[q]! > 0) support++;
    worst = Math.max(worst, rel(cm.flow[q]!, o.flow[q]!));
  }
  expect(support).toBe(0);
  expect(worst, 'backlog, matched at once, flows').toBeLessThan(1e-10);
  // the first moment: Σ Ψ1 / Z is the mean total backlog
  let m1 = 0;
  for (let s = 0; s < count; s++) m1 += psi1[s]!;
  const total = o.backlog.reduce((a, b) => a + b, 0);
  expect(rel(m1 / o.z, total)).toBeLessThan(1e-10);
  return count;
}

describe('exact kernels = plain recursions, set by set', () => {
  const rng = new Rng(2718);
  it('small random designs with self-loops', () => {
    for (let t = 0; t < 25; t++) {
      const d = randomStableDesign(rng, { minClasses: 1, maxClasses: 9, edgeProb: 0.35, loopProb: 0.25, components: 1, minSlack: 0.02 });
      checkAgainstOracle(toModel(d));
    }
  });

  it('33–40 classes: masks spanning both 32-bit words', () => {
    for (const n of [33, 36, 40]) {
      const pairs = [...randomPairs(n, 0.4, () => rng.next(), 0.1)];
      for (let k = 1; k < n; k++) pairs.push([k - 1, k]); // connected
      const model = compileGraph(Array.from({ length: n }, (_, k) => `c${k}`), flowRates(n, pairs, rng), pairs);
      expect(checkAgainstOracle(model)).toBeGreaterThan(500);
    }
  });

  it('more sets than one kernel chunk (the walks resume between calls)', () => {
    const n = 26;
    const pairs = randomRegularPairs(n, 3, () => rng.next());
    pairs.push([0, 0]);
    const model = compileGraph(Array.from({ length: n }, (_, k) => `c${k}`), flowRates(n, pairs, rng), pairs);
    expect(checkAgainstOracle(model)).toBeGreaterThan(KERNEL_CHUNK);
  });
});

describe('saturation found by the prefix kernel', () => {
  it('reports an independent set A with μ(A) <= r(A)', () => {
    // a star: the hub (rate 1) cannot serve six leaves of rate 1 each
    const pairs: Array<[number, number]> = [1, 2, 3, 4, 5, 6].map((k) => [0, k]);
    const model = compileGraph(['hub', 'l1', 'l2', 'l3', 'l4', 'l5', 'l6'], [1, 1, 1, 1, 1, 1, 1], pairs);
    const g = maskGraph(model);
    const count = countIndependentSets(g);
    const t = buildTrie(g, count);
    let error: unknown;
    try {
      prefixSums(g, t, new Float64Array(count), 1e-12);
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(SaturatedSet);
    const { lo, hi } = error as SaturatedSet;
    expect(hi).toBe(0);
    expect(lo & 1).toBe(0); // leaves only: the hub is adjacent to all of them
    const leaves = [1, 2, 3, 4, 5, 6].filter((k) => (lo >>> k) & 1).length;
    expect(leaves).toBeGreaterThanOrEqual(1); // μ = λ(hub) = 1 <= r = number of leaves
    // increasing mask order: the first saturated set met is the single leaf {l1}
    expect(lo).toBe(2);
  });
});

describe('64 classes (the largest component): every mask bit in use', () => {
  it('relabelling the classes permutes the results and nothing else; flows balance (derived by hand: each class leaves at its arrival rate)', () => {
    const rng = new Rng(64);
    const n = 64;
    const pairs = randomPairs(n, 0.55, () => rng.next(), 0.05);
    const has = new Set(pairs.map(([x, y]) => x * n + y));
    for (let k = 1; k < n; k++) if (!has.has((k - 1) * n + k)) pairs.push([k - 1, k]); // connected, each pair once
    const rates = flowRates(n, pairs, rng);
    const perm = rng.shuffled([...Array(n).keys()]);
    const idsOf = (m: number): string[] => Array.from({ length: m }, (_, k) => `c${k}`);
    const a = evaluateExact(compileGraph(idsOf(n), rates, pairs));
    const inv = new Array<number>(n);
    perm.forEach((p, k) => (inv[p] = k));
    const b = evaluateExact(compileGraph(idsOf(n), perm.map((p) => rates[p]!), pairs.map(([x, y]) => [inv[x]!, inv[y]!] as [number, number])));
    expect(a.independentSets).toBe(b.independentSets);
    expect(a.independentSets).toBeGreaterThan(100);
    for (let k = 0; k < n; k++) {
      expect(rel(a.backlog[perm[k]!]!, b.backlog[k]!)).toBeLessThan(1e-10);
      expect(rel(a.immediateMatch[perm[k]!]!, b.immediateMatch[k]!)).toBeLessThan(1e-10);
    }
    // Σ over the edges at k of the match rate (a self-loop twice) = λ_k
    const model = compileGraph(idsOf(n), rates, pairs);
    const out = new Float64Array(n);
    for (let e = 0; e < model.m; e++) {
      out[model.edgeA[e]!] += a.matchRates[e]!;
      out[model.edgeB[e]!] += a.matchRates[e]!;
    }
    for (let k = 0; k < n; k++) expect(rel(out[k]!, rates[k]!)).toBeLessThan(1e-10);
  });
});
