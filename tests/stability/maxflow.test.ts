import { describe, expect, it } from 'vitest';
import { FlowNetwork } from '../../src/stability/maxflow.js';
import { Rng } from '../helpers/random.js';

/** Minimum s–t cut by enumerating every source side (the max-flow min-cut theorem makes it the max flow). */
function bruteMinCut(nodes: number, arcs: Array<[number, number, number]>, s: number, t: number): number {
  let best = Infinity;
  const others = [...Array(nodes).keys()].filter((v) => v !== s && v !== t);
  for (let mask = 0; mask < 1 << others.length; mask++) {
    const side = new Set([s, ...others.filter((_, i) => mask & (1 << i))]);
    let cut = 0;
    for (const [u, v, c] of arcs) if (side.has(u) && !side.has(v)) cut += c;
    best = Math.min(best, cut);
  }
  return best;
}

function build(nodes: number, arcs: Array<[number, number, number]>): { net: FlowNetwork; ids: number[] } {
  const net = new FlowNetwork(nodes, arcs.length, 1e-12);
  return { net, ids: arcs.map(([u, v, c]) => net.addArc(u, v, c)) };
}

describe('FlowNetwork (level-graph blocking flows on real capacities)', () => {
  it('hand-derived network: maximum flow 5', () => {
    // Derived by hand: s→a 3, s→b 2, a→b 1, a→t 2, b→t 3. Paths s-a-t (2), s-a-b-t (1), s-b-t (2) carry 5;
    // the cut {s, a} | {b, t} has capacity 2 + 1 + 2 = 5, so 5 is maximum.
    const { net } = build(4, [[0, 1, 3], [0, 2, 2], [1, 2, 1], [1, 3, 2], [2, 3, 3]]);
    expect(net.augment(0, 3)).toBeCloseTo(5, 12);
  });

  it('equals the brute-force minimum cut on random networks, and its residual cut is a minimum cut', () => {
    // Reference: max-flow min-cut theorem; the minimum cut is found by enumerating all 2^(n−2) source sides.
    const rng = new Rng(5);
    for (let trial = 0; trial < 300; trial++) {
      const nodes = rng.int(2, 8);
      const arcs: Array<[number, number, number]> = [];
      for (let u = 0; u < nodes; u++)
        for (let v = 0; v < nodes; v++) if (u !== v && rng.chance(0.35)) arcs.push([u, v, rng.chance(0.2) ? rng.int(1, 3) : rng.uniform(0.01, 5)]);
      const { net } = build(nodes, arcs);
      const flow = net.augment(0, nodes - 1);
      const cut = bruteMinCut(nodes, arcs, 0, nodes - 1);
      expect(flow).toBeCloseTo(cut, 9);
      const reach = net.reachesSink(nodes - 1);
      expect(reach[0]).toBe(0);
      let capacity = 0;
      for (const [u, v, c] of arcs) if (!reach[u] && reach[v]) capacity += c;
      expect(capacity).toBeCloseTo(cut, 9);
    }
  });

  it('warm start: raising capacities and augmenting again gives the maximum flow of the new network', () => {
    const rng = new Rng(6);
    for (let trial = 0; trial < 100; trial++) {
      const nodes = rng.int(3, 8);
      const arcs: Array<[number, number, number]> = [];
      for (let u = 0; u < nodes; u++) for (let v = 0; v < nodes; v++) if (u !== v && rng.chance(0.4)) arcs.push([u, v, rng.uniform(0.1, 4)]);
      if (arcs.length === 0) continue;
      const { net, ids } = build(nodes, arcs);
      const first = net.augment(0, nodes - 1);
      const snap = net.snapshot();
      const which = rng.int(0, arcs.length - 1);
      const extra = rng.uniform(0.5, 3);
      net.addCapacity(ids[which]!, extra);
      const more = net.augment(0, nodes - 1);
      const grown = arcs.map((a, i) => (i === which ? ([a[0], a[1], a[2] + extra] as [number, number, number]) : a));
      expect(first + more).toBeCloseTo(bruteMinCut(nodes, grown, 0, nodes - 1), 9);
      net.restore(snap);
      net.addCapacity(ids[which]!, -extra); // back to the first network: the snapshot flow is still maximum
      expect(net.augment(0, nodes - 1)).toBeCloseTo(0, 12);
    }
  });
});
