import { describe, expect, it } from 'vitest';
import { TooLargeError } from '../../src/errors.js';
import { compileGraph, type CompiledModel } from '../../src/model/compile.js';
import { sampleAlias } from '../../src/sim/alias.js';
import { ChainEngine } from '../../src/sim/chain-engine.js';
import { POLICIES, priorityRanks, type PolicyName } from '../../src/sim/policy.js';
import { nextUint32, seedState } from '../../src/sim/random.js';
import { buildSimModel, type SimModel } from '../../src/sim/sim-model.js';
import { arrivalBin } from '../../src/sim/wait-bins.js';
import { Rng } from '../helpers/random.js';

/**
 * Differential test of the hot loops against a plain reference written straight from the rules of
 * issue 3 (JavaScript arrays as FIFO queues, no typed arrays, no bit tricks), driven by the same
 * random stream: the class of each arrival is sampleAlias(next 32 bits) and the random policy,
 * when two or more classes qualify, picks the ⌊u·c/2^32⌋-th of them in candidate-list order
 * (the class itself first when self-looped, then ascending) with the next 32 bits u.
 * Both must end with the very same queues and counters.
 */
function reference(model: SimModel, policy: PolicyName, rank: Int32Array, seed: number, arrivals: number) {
  const rng = seedState(seed);
  const queues: number[][] = Array.from({ length: model.n }, () => []);
  const edgeMatches = new Array<number>(model.m).fill(0);
  const waitSum = new Array<number>(model.n).fill(0);
  const immediate = new Array<number>(model.n).fill(0);
  const arrived = new Array<number>(model.n).fill(0);
  const hist = new Map<string, number>();
  for (let t = 0; t < arrivals; t++) {
    const k = sampleAlias(model.alias, nextUint32(rng));
    arrived[k]!++;
    const cands: Array<{ j: number; edge: number }> = [];
    for (let p = model.nbrStart[k]!; p < model.nbrStart[k + 1]!; p++) {
      if (queues[model.nbr[p]!]!.length > 0) cands.push({ j: model.nbr[p]!, edge: model.nbrEdge[p]! });
    }
    if (cands.length === 0) {
      queues[k]!.push(t);
      continue;
    }
    const head = (c: { j: number }): number => queues[c.j]![0]!;
    let pick = cands[0]!;
    if (policy === 'fcfm') for (const c of cands) pick = head(c) < head(pick) ? c : pick;
    else if (policy === 'most-waiting') {
      for (const c of cands) {
        const lc = queues[c.j]!.length;
        const lp = queues[pick.j]!.length;
        if (lc > lp || (lc === lp && head(c) < head(pick))) pick = c;
      }
    } else if (policy === 'ranked') {
      for (const c of cands) if (rank[c.j]! < rank[pick.j]! || (rank[c.j] === rank[pick.j] && head(c) < head(pick))) pick = c;
    } else if (cands.length > 1) pick = cands[Math.floor((nextUint32(rng) * cands.length) / 4294967296)]!;
    const born = queues[pick.j]!.shift()!;
    immediate[k]!++;
    edgeMatches[pick.edge]!++;
    waitSum[pick.j]! += t - born;
    const key = `${pick.j}:${arrivalBin(t - born)}`;
    hist.set(key, (hist.get(key) ?? 0) + 1);
  }
  return { queues, edgeMatches, waitSum, immediate, arrived, hist };
}

function ring(n: number, chords: number, loops: number[], rates: (k: number) => number): CompiledModel {
  const pairs: Array<[number, number]> = [];
  for (let k = 0; k < n; k++) pairs.push([k, (k + 1) % n]);
  for (let k = 0; k < chords; k++) pairs.push([k, (k + Math.floor(n / 2)) % n]);
  for (const k of loops) pairs.push([k, k]);
  return compileGraph(Array.from({ length: n }, (_, k) => `z${k}`), Array.from({ length: n }, (_, k) => rates(k)), pairs);
}

const rng = new Rng(99);
const designs: Array<{ label: string; model: CompiledModel }> = [
  { label: '7-ring with chords and self-loops (mask path)', model: ring(7, 2, [0, 3], (k) => 1 + 0.2 * k) },
  { label: '40-ring with chords (more than 32 classes: scan path)', model: ring(40, 6, [5, 17], () => rng.uniform(0.5, 1.5)) },
  {
    // unstable on purpose: a weak hub with six leaves; queues outgrow their first rings
    label: 'overloaded star (ring growth and compaction)',
    model: compileGraph(['hub', 'l1', 'l2', 'l3', 'l4', 'l5', 'l6'], [1, 1, 1, 1, 1, 1, 1], [[0, 1], [0, 2], [0, 3], [0, 4], [0, 5], [0, 6]]),
  },
];

describe('patient engine = plain reference, arrival by arrival', () => {
  for (const { label, model } of designs) {
    it.each(POLICIES.map((p) => ({ policy: p })))(`${label}: $policy`, ({ policy }) => {
      const order = [3, 1, 4, 0, 2].filter((k) => k < model.n);
      const sim = buildSimModel(model, { policy, priority: order });
      const rank = policy === 'ranked' ? priorityRanks(model.n, order) : new Int32Array(model.n);
      const N = 30_000;
      const ref = reference(sim, policy, rank, 4242, N);
      const engine = new ChainEngine(sim, seedState(4242), 1e9);
      engine.startMeasuring();
      // in uneven chunks, to cover resuming
      engine.run(1_234);
      engine.run(N - 1_234 - 5_000);
      engine.run(5_000);
      engine.finish();
      const c = engine.counters;
      for (let k = 0; k < model.n; k++) expect(engine.queues.items(k), `queue ${k}`).toEqual(ref.queues[k]);
      expect(Array.from(c.edgeMatches)).toEqual(ref.edgeMatches);
      expect(Array.from(c.waitSum)).toEqual(ref.waitSum);
      expect(Array.from(c.immediate)).toEqual(ref.immediate);
      expect(Array.from(c.arrivals)).toEqual(ref.arrived);
      for (const [key, count] of ref.hist) {
        const [j, b] = key.split(':').map(Number);
        expect(c.hist[j! * c.bins + b!]).toBe(count);
      }
      // the integral of the counts equals Σ over items of their time in queue within the window
      let area = 0;
      for (let k = 0; k < model.n; k++) area += c.area[k]!;
      let expected = 0;
      for (let k = 0; k < model.n; k++) expected += ref.waitSum[k]!;
      for (const q of ref.queues) for (const born of q) expected += N - born;
      expect(area).toBe(expected);
    });
  }
});

describe('memory cap', () => {
  it('stops cleanly with TooLargeError naming the longest queue', () => {
    const model = designs[2]!.model;
    const engine = new ChainEngine(buildSimModel(model), seedState(1), 500);
    let error: unknown;
    try {
      engine.run(1_000_000);
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(TooLargeError);
    expect((error as Error).message).toMatch(/more than 500 items were waiting at once \(\d+ of class l\d\)/);
    expect((error as TooLargeError).count).toBe(501);
    expect(engine.clock).toBeLessThan(1_000_000);
  });
});
