import { exitCodeOf } from '../../src/cli/exit.js';
import { describe, expect, it } from 'vitest';
import { compileGraph, type CompiledModel } from '../../src/model/compile.js';
import { assertStable, checkStability } from '../../src/stability/check.js';
import { certificateWithIds } from '../../src/stability/certificate.js';
import { TOLERANCE, flowScale } from '../../src/stability/tolerance.js';
import { UnstableDesignError } from '../../src/errors.js';
import { Rng } from '../helpers/random.js';
import { adjacencyMasks, componentMasks, enumerate, maskNeighbours, maskOf, maskRate, randomGraph, type SmallGraph } from './brute-force.js';

const toModel = (g: SmallGraph): CompiledModel => compileGraph(Array.from({ length: g.n }, (_, k) => `k${k}`), g.rates, g.pairs);

/** The sub-graph induced by a component mask, with the map local → global index. */
function restrict(g: SmallGraph, mask: number): { sub: SmallGraph; members: number[] } {
  const members: number[] = [];
  for (let k = 0; k < g.n; k++) if (mask & (1 << k)) members.push(k);
  const local = new Map(members.map((k, i) => [k, i]));
  const pairs = g.pairs.filter(([a]) => local.has(a)).map(([a, b]) => [local.get(a)!, local.get(b)!] as [number, number]);
  return { sub: { n: members.length, rates: members.map((k) => g.rates[k]!), pairs }, members };
}

const close = (a: number, b: number, rel = 1e-9): boolean =>
  a === b || Math.abs(a - b) <= rel * Math.max(1, Math.abs(a), Math.abs(b));

describe('checkStability against the definition (brute-force enumeration of independent sets)', () => {
  // 640 seeded random graphs: n 2–9, densities 0.05–0.9, self-loops, any number of components,
  // integer rates (exact ties), uniform rates and rates built from positive edge flows.
  const rng = new Rng(20240611);
  const graphs = Array.from({ length: 640 }, () => randomGraph(rng));

  it('covers stable, unstable, disconnected and self-looped designs', () => {
    let stable = 0;
    let disconnected = 0;
    let loops = 0;
    for (const g of graphs) {
      if (enumerate(g).stable) stable++;
      if (componentMasks(g).length > 1) disconnected++;
      if (g.pairs.some(([a, b]) => a === b)) loops++;
    }
    expect(stable).toBeGreaterThan(60);
    expect(graphs.length - stable).toBeGreaterThan(60);
    expect(disconnected).toBeGreaterThan(60);
    expect(loops).toBeGreaterThan(60);
  });

  it('gives the verdict of the definition, whole design and each component', () => {
    for (const g of graphs) {
      const model = toModel(g);
      const report = checkStability(model);
      // Reference: stability condition of "Stability of the stochastic matching model" (J. Appl. Probab. 2016), by enumeration.
      expect(report.stable, JSON.stringify(g)).toBe(enumerate(g).stable);
      const masks = componentMasks(g);
      expect(report.components.length).toBe(masks.length);
      for (const c of report.components) {
        const mask = maskOf(c.members);
        expect(masks).toContain(mask);
        const brute = enumerate(restrict(g, mask).sub).stable;
        expect(c.stable, JSON.stringify(g)).toBe(brute);
        // the LP verdict on its own (before any cut is consulted): t* > TOLERANCE · σ_C iff stable
        if (!c.bipartite) expect(c.minEdgeFlow! > TOLERANCE * flowScale(model, c.members), JSON.stringify(g)).toBe(brute);
      }
    }
  });

  it('returns certificates that are overloaded independent sets of the first unstable component', () => {
    let checked = 0;
    for (const g of graphs) {
      const report = checkStability(toModel(g));
      if (report.stable) {
        expect(report.certificate).toBeUndefined();
        continue;
      }
      const { nb, loops } = adjacencyMasks(g);
      for (const c of report.components) {
        if (c.stable) continue;
        const cert = c.certificate!;
        const set = maskOf(cert.set);
        // brute-force recomputation: non-empty, independent, self-loop free, inside its component, λ(I) ≥ λ(N(I))
        expect(set).not.toBe(0);
        expect(set & loops).toBe(0);
        expect(maskNeighbours(nb, set) & set).toBe(0);
        expect(set & ~maskOf(c.members)).toBe(0);
        expect(maskOf(cert.neighbours)).toBe(maskNeighbours(nb, set));
        const demand = maskRate(g, set);
        const capacity = maskRate(g, maskNeighbours(nb, set));
        expect(close(cert.demand, demand, 1e-12)).toBe(true);
        expect(close(cert.capacity, capacity, 1e-12)).toBe(true);
        expect(demand >= capacity * (1 - 1e-12), JSON.stringify(g)).toBe(true);
        expect(cert.reason).toBe(c.bipartite ? 'bipartite' : 'overloaded');
        checked++;
      }
      const first = report.components.find((c) => !c.stable)!;
      expect(report.certificate).toBe(first.certificate);
    }
    expect(checked).toBeGreaterThan(100);
  });

  it('headroom_k equals the brute-force min slack over independent sets containing k; bottleneck = global min', () => {
    // Reference: enumeration of the component's independent sets (the headroom of k is the largest growth of λ_k
    // keeping every λ(I) < λ(N(I)), i.e. min over I ∋ k of the slack; the next test checks that meaning directly).
    let finite = 0;
    for (const g of graphs) {
      const report = checkStability(toModel(g));
      for (const c of report.components) {
        const { sub, members } = restrict(g, maskOf(c.members));
        const brute = enumerate(sub);
        members.forEach((k, i) => {
          const h = report.headroom[k]!;
          if (!c.stable) expect(h).toBeNaN();
          else if (brute.minSlackWith[i] === Infinity) expect(h).toBe(Infinity);
          else {
            expect(close(h, brute.minSlackWith[i]!), `${JSON.stringify(g)} class ${k}: ${h} vs ${brute.minSlackWith[i]}`).toBe(true);
            finite++;
          }
        });
      }
      if (report.stable) {
        const brute = enumerate(g);
        if (brute.minSlack === Infinity) expect(report.bottleneck).toBeUndefined();
        else expect(close(report.bottleneck!.slack, brute.minSlack)).toBe(true);
      } else expect(report.bottleneck).toBeUndefined();
    }
    expect(finite).toBeGreaterThan(500);
  });

  it('headroom means what it says: growing λ_k by 0.999·h keeps the design stable, by 1.001·h does not', () => {
    let checked = 0;
    for (const g of graphs.slice(0, 300)) {
      const report = checkStability(toModel(g));
      if (!report.stable) continue;
      for (let k = 0; k < g.n; k++) {
        const h = report.headroom[k]!;
        if (!Number.isFinite(h)) continue;
        const grown = (f: number): SmallGraph => ({ ...g, rates: g.rates.map((r, j) => (j === k ? r + f * h : r)) });
        // Reference: the definition, by enumeration, on the modified rates.
        expect(enumerate(grown(0.999)).stable).toBe(true);
        expect(enumerate(grown(1.001)).stable).toBe(false);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(200);
  });

  it('lists distinct tight sets, each a correct independent set, sorted by slack then size', () => {
    // Reference: brute-force recomputation of independence, N(I) and λ(N(I)) − λ(I) from bitmasks.
    for (const g of graphs) {
      const report = checkStability(toModel(g));
      const { nb, loops } = adjacencyMasks(g);
      const seen = new Set<number>();
      report.tightSets.forEach((t, i) => {
        const set = maskOf(t.set);
        expect(seen.has(set)).toBe(false);
        seen.add(set);
        expect(set & loops).toBe(0);
        expect(maskNeighbours(nb, set) & set).toBe(0);
        expect(maskOf(t.neighbours)).toBe(maskNeighbours(nb, set));
        expect(close(t.slack, maskRate(g, maskNeighbours(nb, set)) - maskRate(g, set))).toBe(true);
        if (i > 0) {
          const prev = report.tightSets[i - 1]!;
          expect(prev.slack <= t.slack + 1e-9).toBe(true);
          if (close(prev.slack, t.slack, 1e-12)) expect(prev.set.length >= t.set.length).toBe(true);
        }
      });
      if (report.stable) expect(report.bottleneck).toBe(report.tightSets[0]);
    }
  });

  it('gives a strictly positive edge flow that matches every arrival rate when stable', () => {
    for (const g of graphs) {
      const model = toModel(g);
      const report = checkStability(model);
      if (!report.stable) {
        expect(report.flow).toBeUndefined();
        continue;
      }
      const flow = report.flow!;
      const got = new Float64Array(model.n);
      for (let e = 0; e < model.m; e++) {
        expect(flow[e]).toBeGreaterThan(0);
        const a = model.edgeA[e]!;
        const b = model.edgeB[e]!;
        if (a === b) got[a] += 2 * flow[e]!;
        else {
          got[a] += flow[e]!;
          got[b] += flow[e]!;
        }
      }
      // Reference: Σ_{e∋k} a_{k,e} μ_e = λ_k (a = 2 on a self-loop), the edge-flow form of the condition.
      for (let k = 0; k < model.n; k++) expect(close(got[k]!, model.rates[k]!, 1e-6)).toBe(true);
      for (const c of report.components) {
        let least = Infinity;
        for (let e = 0; e < model.m; e++) if (c.members.includes(model.edgeA[e]!)) least = Math.min(least, flow[e]!);
        expect(close(least, c.minEdgeFlow!, 1e-6)).toBe(true);
      }
    }
  });
});

describe('bipartite designs are never stable', () => {
  it('random bipartite graphs with any rates are unstable, certificate = the heavier side', () => {
    // Reference: the 2016 paper's result that bipartite compatibility graphs are never stable; derived by hand:
    // with sides S, T (connected, no self-loop), N(S) = T and N(T) = S, so λ(S) < λ(T) and λ(T) < λ(S) cannot both hold.
    const rng = new Rng(77);
    for (let trial = 0; trial < 150; trial++) {
      const s = rng.int(1, 5);
      const t = rng.int(1, 5);
      const pairs: Array<[number, number]> = [];
      for (let j = s; j < s + t; j++) pairs.push([rng.int(0, s - 1), j]); // every T class has a neighbour
      for (let i = 0; i < s; i++) pairs.push([i, rng.int(s, s + t - 1)]); // every S class too
      for (let i = 0; i < s; i++) for (let j = s; j < s + t; j++) if (rng.chance(0.3)) pairs.push([i, j]);
      const unique = [...new Map(pairs.map((p) => [`${p[0]},${p[1]}`, p])).values()];
      const rates = Array.from({ length: s + t }, () => (rng.chance(0.3) ? rng.int(1, 3) : rng.uniform(0.01, 10)));
      const g: SmallGraph = { n: s + t, rates, pairs: unique };
      const report = checkStability(toModel(g));
      expect(report.stable).toBe(false);
      expect(enumerate(g).stable).toBe(false);
      for (const c of report.components) {
        expect(c.bipartite).toBe(true);
        expect(c.stable).toBe(false);
        expect(c.certificate!.demand >= c.certificate!.capacity).toBe(true);
      }
    }
  });

  it('an isolated class without self-loop has nobody to match: N(I) = ∅', () => {
    const report = checkStability(compileGraph(['solo', 'a', 'b', 'c'], [0.5, 1, 1, 1], [[1, 2], [2, 3], [1, 3]]));
    expect(report.stable).toBe(false);
    expect(Array.from(report.certificate!.set)).toEqual([0]);
    expect(Array.from(report.certificate!.neighbours)).toEqual([]);
    expect(report.certificate!.capacity).toBe(0);
    // the triangle is still a stable subsystem with its own headroom (1 each, see below)
    expect(Array.from(report.headroom.slice(1))).toEqual([1, 1, 1]);
    expect(report.headroom[0]).toBeNaN();
  });
});

describe('hand-derived cases', () => {
  it('triangle with rates (1, 1, 1): stable, t* = 1/2, every headroom 1', () => {
    // Derived by hand: the only independent sets are singletons; slack({k}) = λ(N(k)) − λ_k = 2 − 1 = 1, so
    // headroom_k = 1 (λ_k + s < 2 iff s < 1). The edge flows solve μ_ab + μ_ac = μ_ab + μ_bc = μ_ac + μ_bc = 1,
    // whose only solution is μ = 1/2 on every edge, so t* = 1/2.
    const report = checkStability(compileGraph(['a', 'b', 'c'], [1, 1, 1], [[0, 1], [1, 2], [0, 2]]));
    expect(report.stable).toBe(true);
    expect(report.components[0]!.minEdgeFlow).toBeCloseTo(0.5, 9);
    expect(Array.from(report.flow!)).toEqual([0.5, 0.5, 0.5].map((x) => expect.closeTo(x, 9)));
    for (const h of report.headroom) expect(h).toBeCloseTo(1, 9);
    expect(report.bottleneck!.slack).toBeCloseTo(1, 9);
    expect(report.tightSets).toHaveLength(3);
  });

  it('triangle a, b, c with pendant d on c, rates (2, 2, 3, 1): every headroom 2, bottleneck {a, d}', () => {
    // Derived by hand. Independent sets and slacks λ(N(I)) − λ(I): {a}: 2+3−2 = 3, {b}: 3, {c}: 2+2+1−3 = 2,
    // {d}: 3−1 = 2, {a,d}: λ(b,c) − 3 = 2, {b,d}: 2. So headroom a = min(3, 2) = 2, b = 2, c = 2, d = 2, the
    // minimum slack is 2 and the larger tied sets {a,d}, {b,d} come first ({a,d} before {b,d}).
    // Edge flows: μ_cd = λ_d = 1, then μ_ac + μ_bc = 2, μ_ab + μ_ac = 2, μ_ab + μ_bc = 2 ⇒ all μ = 1, t* = 1.
    const report = checkStability(compileGraph(['a', 'b', 'c', 'd'], [2, 2, 3, 1], [[0, 1], [0, 2], [1, 2], [2, 3]]));
    expect(report.stable).toBe(true);
    for (const h of report.headroom) expect(h).toBeCloseTo(2, 9);
    expect(Array.from(report.bottleneck!.set)).toEqual([0, 3]);
    expect(report.bottleneck!.slack).toBeCloseTo(2, 9);
    expect(report.components[0]!.minEdgeFlow).toBeCloseTo(1, 9);
    for (const f of report.flow!) expect(f).toBeCloseTo(1, 9);
  });

  it('path a – b – c with a self-loop on b: headroom of b is infinite', () => {
    // Derived by hand, rates (1, 3, 1): sets {a}: 3−1 = 2, {c}: 2, {a,c}: 3−2 = 1 (b is self-looped, in no set);
    // headroom a = c = 1; growing λ_b only adds capacity (its own loop absorbs it): headroom ∞.
    const report = checkStability(compileGraph(['a', 'b', 'c'], [1, 3, 1], [[0, 1], [1, 1], [1, 2]]));
    expect(report.stable).toBe(true);
    expect(report.headroom[0]).toBeCloseTo(1, 9);
    expect(report.headroom[2]).toBeCloseTo(1, 9);
    expect(report.headroom[1]).toBe(Infinity);
    expect(Array.from(report.bottleneck!.set)).toEqual([0, 2]);
  });

  it('boundary case λ(I) = λ(N(I)) exactly is unstable (the condition is strict)', () => {
    // Derived by hand: rates (1, 2, 1) on a – b – c with a loop on b: {a, c} has demand 2 = capacity λ_b = 2.
    const report = checkStability(compileGraph(['a', 'b', 'c'], [1, 2, 1], [[0, 1], [1, 1], [1, 2]]));
    expect(report.stable).toBe(false);
    expect(Array.from(report.certificate!.set)).toEqual([0, 2]);
    expect(report.certificate!.demand).toBe(2);
    expect(report.certificate!.capacity).toBe(2);
    expect(report.certificate!.reason).toBe('overloaded');
  });

  it('boundary inside a larger non-bipartite component (triangle plus pendant, rates (1,1,1,1))', () => {
    // Derived by hand: {a, d} (a in the triangle a, b, c; d hanging on c) has N = {b, c}: 2 = 2 → unstable.
    // The plain minimum cut cannot see a zero-slack set; the per-class forced cuts must find it.
    const report = checkStability(compileGraph(['a', 'b', 'c', 'd'], [1, 1, 1, 1], [[0, 1], [1, 2], [0, 2], [2, 3]]));
    expect(report.stable).toBe(false);
    const c = report.certificate!;
    expect(c.demand).toBe(c.capacity);
    expect([[0, 3], [1, 3]]).toContainEqual(Array.from(c.set));
  });

  it('a star centre with a self-loop overloaded by its leaves', () => {
    // Derived by hand: leaves north 10 and east 8 can only be matched with centre 15.5: 18 ≥ 15.5.
    const model = compileGraph(['centre', 'north', 'east'], [15.5, 10, 8], [[0, 0], [0, 1], [0, 2]]);
    const report = checkStability(model);
    expect(report.stable).toBe(false);
    const cert = certificateWithIds(model, report.certificate!);
    expect(cert).toEqual({ set: ['north', 'east'], neighbours: ['centre'], demand: 18, capacity: 15.5, reason: 'overloaded' });
    expect(() => assertStable(model, 'hour')).toThrow(UnstableDesignError);
    try {
      assertStable(model, 'hour');
    } catch (e) {
      expect((e as UnstableDesignError).message).toBe('unstable: items from north and east (18.0/hour) can only be matched with centre (15.5/hour)');
      expect(exitCodeOf(e)).toBe(3);
    }
  });

  it('assertStable returns the report of a stable design', () => {
    const model = compileGraph(['a', 'b', 'c'], [1, 1, 1], [[0, 1], [1, 2], [0, 2]]);
    expect(assertStable(model).stable).toBe(true);
  });
});
