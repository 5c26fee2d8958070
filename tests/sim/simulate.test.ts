import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { compileGraph, type CompiledModel } from '../../src/model/compile.js';
import { simulate, type SimulationResult } from '../../src/sim/simulate.js';
import { bruteStability } from '../helpers/brute-stability.js';
import { randomStableDesign, toModel } from '../helpers/designs.js';
import { permutationOracle } from '../helpers/permutation-oracle.js';
import { Rng } from '../helpers/random.js';
import { expectInside, familyFactor } from './support/intervals.js';

/**
 * FCFM estimates against the exact stationary values. Reference: the product form of "A product
 * form for the general stochastic matching model" (J. Appl. Probab. 2021), summed by the
 * permutation oracle of tests/helpers/permutation-oracle.ts (its derivation is written there), which
 * shares no code with the simulator.
 */

const named = (ids: string[], rates: number[], pairs: Array<[number, number]>): CompiledModel => compileGraph(ids, rates, pairs);

const designs: Array<{ label: string; model: CompiledModel }> = [
  {
    // game matchmaking: a triangle of skill bands with a pendant band for newcomers
    label: 'triangle with a pendant',
    model: named(['bronze', 'silver', 'gold', 'rookie'], [3, 2.5, 2, 1.2], [[0, 1], [1, 2], [0, 2], [3, 0], [3, 1]]),
  },
  {
    // shift swaps: a path whose two ends also swap among themselves (self-loops)
    label: 'path with self-loops at both ends',
    model: named(['early', 'day', 'late'], [2, 1.5, 1.8], [[0, 0], [2, 2], [0, 1], [1, 2]]),
  },
  {
    // ride pooling: a five-zone ring, one zone pools with itself
    label: 'odd ring with one self-loop',
    model: named(['n', 'ne', 'se', 'sw', 'nw'], [1.2, 1, 1.4, 0.9, 1.1], [[0, 1], [1, 2], [2, 3], [3, 4], [4, 0], [2, 2]]),
  },
  {
    label: 'two components (triangle + a self-compatible class)',
    model: named(['a', 'b', 'c', 'solo'], [1, 1.3, 0.8, 0.7], [[0, 1], [1, 2], [0, 2], [3, 3]]),
  },
];
const rng = new Rng(20240603);
for (let i = 0; i < 2; i++) {
  const d = randomStableDesign(rng, { minClasses: 4, maxClasses: 6, edgeProb: 0.35, loopProb: 0.25, components: 1, minSlack: 0.25 });
  designs.push({ label: `random stable design ${i + 1} (${d.ids.length} classes)`, model: toModel(d) });
}

function checkAgainstProductForm(model: CompiledModel, r: SimulationResult): void {
  const exact = permutationOracle(model);
  const M = 3 + 3 * model.n + model.m; // quantities compared below
  const f = familyFactor(M, r.replications);
  expectInside(r.backlog.total, exact.backlogTotal, f, 'total backlog');
  let waitTotal = 0;
  let immTotal = 0;
  for (let k = 0; k < model.n; k++) {
    waitTotal += exact.backlog[k]!;
    immTotal += model.rates[k]! * exact.immediateMatch[k]!;
    expectInside(r.backlog.byClass[k]!, exact.backlog[k]!, f, `backlog of ${model.ids[k]}`);
    expectInside(r.wait.byClass[k]!, exact.wait[k]!, f, `wait of ${model.ids[k]}`);
    expectInside(r.immediateMatch.byClass[k]!, exact.immediateMatch[k]!, f, `immediate match of ${model.ids[k]}`);
  }
  // Little's law for all items: W = L / Λ
  expectInside(r.wait.total, waitTotal / model.totalRate, f, 'total wait');
  expectInside(r.immediateMatch.total, immTotal / model.totalRate, f, 'immediate match of all arrivals');
  for (let e = 0; e < model.m; e++) expectInside(r.matchRates[e]!, exact.matchRates[e]!, f, `match rate of edge ${e}`);
}

describe('FCFM: exact product-form values lie inside the intervals', () => {
  it.each(designs)('$label', async ({ model }) => {
    expect(bruteStability(model).stable).toBe(true);
    const r = await simulate(model, { arrivals: 300_000, replications: 10, seed: 11 });
    expect(r.engine).toBe('arrival-chain');
    checkAgainstProductForm(model, r);
    // nobody abandons
    expect(r.abandonRate.total.mean).toBe(0);
  });

  it('the timed engine (explicit Poisson clock) agrees too', async () => {
    const { model } = designs[2]!;
    const r = await simulate(model, { arrivals: 150_000, replications: 10, seed: 12, timed: true });
    expect(r.engine).toBe('timed');
    checkAgainstProductForm(model, r);
  });

  it('conservation (derived by hand): every arrival is matched eventually, so Σ_{e∋k} a_{k,e}·μ_e ≈ λ_k', async () => {
    // a = 1 for an ordinary edge, 2 for a self-loop (both items of a self-match are of class k)
    const { model } = designs[1]!;
    const r = await simulate(model, { arrivals: 200_000, replications: 6, seed: 5 });
    for (let k = 0; k < model.n; k++) {
      let flow = 0;
      for (let e = 0; e < model.m; e++) {
        if (model.edgeA[e] === k) flow += r.matchRates[e]!.mean;
        if (model.edgeB[e] === k) flow += r.matchRates[e]!.mean;
      }
      // items still waiting at the end are unmatched: a difference of order backlog/duration
      expect(Math.abs(flow - model.rates[k]!) / model.rates[k]!).toBeLessThan(2e-3);
    }
  });
});

describe('options', () => {
  const model = designs[0]!.model;
  it('rejects bad option values with UsageError', async () => {
    await expect(simulate(model, { arrivals: 0 })).rejects.toBeInstanceOf(UsageError);
    await expect(simulate(model, { replications: 1.5 })).rejects.toBeInstanceOf(UsageError);
    await expect(simulate(model, { seed: -1 })).rejects.toBeInstanceOf(UsageError);
    await expect(simulate(model, { policy: 'ranked' })).rejects.toThrow(/needs a ranking/);
    await expect(simulate(model, { policy: 'ranked', priority: ['gold', 'nobody'] })).rejects.toThrow(/unknown class "nobody"/);
    await expect(simulate(model, { policy: 'fcfm', priority: ['gold'] })).rejects.toThrow(/only applies/);
    await expect(simulate(model, { policy: 'oldest' as never })).rejects.toThrow(/unknown policy/);
  });

  it('one replication: means without intervals', async () => {
    const r = await simulate(model, { arrivals: 10_000, replications: 1, seed: 3 });
    expect(r.backlog.total.ci95).toBeNull();
    expect(r.backlog.total.mean).toBeGreaterThan(0);
  });

  it('the same seed gives the same result; another seed a different one', async () => {
    const a = await simulate(model, { arrivals: 20_000, replications: 3, seed: 9 });
    const b = await simulate(model, { arrivals: 20_000, replications: 3, seed: 9 });
    const c = await simulate(model, { arrivals: 20_000, replications: 3, seed: 10 });
    expect(b).toEqual(a);
    expect(c.backlog.total.mean).not.toBe(a.backlog.total.mean);
  });

  it('reports progress up to the planned total', async () => {
    const seen: Array<[number, number]> = [];
    await simulate(model, { arrivals: 5_000, warmup: 1_000, replications: 2, onProgress: (d, t) => seen.push([d, t]) });
    expect(seen.at(-1)).toEqual([12_000, 12_000]);
  });
});
