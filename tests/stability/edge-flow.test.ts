import { describe, expect, it } from 'vitest';
import { compileGraph, type CompiledModel } from '../../src/model/compile.js';
import { bipartition, components } from '../../src/model/components.js';
import { solveWithHighs } from '../../src/solvers/highs.js';
import { solveWithJsLp } from '../../src/solvers/jslp.js';
import { checkStability } from '../../src/stability/check.js';
import { leastEdgeFlow } from '../../src/stability/edge-flow.js';
import { edgeFlowProgram, readEdgeFlow } from '../../src/stability/programs.js';
import { Rng } from '../helpers/random.js';
import { randomGraph } from './brute-force.js';

const close = (a: number, b: number, rel: number): boolean => Math.abs(a - b) <= rel * Math.max(1, Math.abs(a), Math.abs(b));

/** Σ_{e∋k} a_{k,e} μ_e for every class k (a = 2 on a self-loop). */
function served(model: CompiledModel, flow: Float64Array): Float64Array {
  const got = new Float64Array(model.n);
  for (let e = 0; e < model.m; e++) {
    const a = model.edgeA[e]!;
    const b = model.edgeB[e]!;
    if (a === b) got[a]! += 2 * flow[e]!;
    else {
      got[a]! += flow[e]!;
      got[b]! += flow[e]!;
    }
  }
  return got;
}

describe('the largest least edge flow t* by minimum cuts (src/stability/edge-flow.ts)', () => {
  // Oracles: the edge-flow LP  max t s.t. Σ_{e∋k} a_{k,e} μ_e = λ_k, μ_e ≥ t  (the edge-flow form of
  // the stability condition, "Stability of the stochastic matching model", J. Appl. Probab. 2016),
  // solved by two general-purpose npm LP solvers, javascript-lp-solver and HiGHS (`highs`).
  const rng = new Rng(2026);
  const graphs = Array.from({ length: 300 }, () => randomGraph(rng, { minN: 3, maxN: 24 }));

  it('equals the LP optimum of both solvers on every non-bipartite component, stable or not', async () => {
    let compared = 0;
    let negative = 0;
    for (const g of graphs) {
      const model = compileGraph(Array.from({ length: g.n }, (_, k) => `k${k}`), g.rates, g.pairs);
      for (const members of components(model).members) {
        if (bipartition(model, members)) continue;
        if (members.length === 1 && model.selfLoop[members[0]!]) continue; // judged without t*
        const cut = leastEdgeFlow(model, members);
        expect(cut, JSON.stringify(g)).not.toBeNull();
        const p = edgeFlowProgram(model, members);
        const a = readEdgeFlow(p, solveWithJsLp(p.lp)).minEdgeFlow;
        const b = readEdgeFlow(p, await solveWithHighs(p.lp)).minEdgeFlow;
        // HiGHS agrees to about 12 digits; javascript-lp-solver's simplex was measured off by up to
        // 5e-6 relative on components of 10–30 classes (its own tolerances), hence the two margins
        expect(close(cut!.minEdgeFlow, b, 1e-9), `${cut!.minEdgeFlow} vs HiGHS ${b} on ${JSON.stringify(g)}`).toBe(true);
        expect(close(cut!.minEdgeFlow, a, 1e-5), `${cut!.minEdgeFlow} vs jslp ${a} on ${JSON.stringify(g)}`).toBe(true);
        if (cut!.minEdgeFlow < 0) negative++;
        compared++;
      }
    }
    expect(compared).toBeGreaterThan(200);
    expect(negative).toBeGreaterThan(10); // unstable components are covered too
  });

  it('gives a flow that serves every class exactly and puts at least t* on every edge', () => {
    let checked = 0;
    for (const g of graphs) {
      const model = compileGraph(Array.from({ length: g.n }, (_, k) => `k${k}`), g.rates, g.pairs);
      const report = checkStability(model);
      if (!report.stable) continue;
      const flow = report.flow!;
      const got = served(model, flow);
      for (let k = 0; k < model.n; k++) expect(close(got[k]!, model.rates[k]!, 1e-9), `class ${k} of ${JSON.stringify(g)}`).toBe(true);
      for (const c of report.components) {
        for (let e = 0; e < model.m; e++) {
          if (!c.members.includes(model.edgeA[e]!)) continue;
          expect(flow[e]!).toBeGreaterThanOrEqual(c.minEdgeFlow! * (1 - 1e-9) - 1e-12);
        }
      }
      checked++;
    }
    expect(checked).toBeGreaterThan(50);
  });

  it('hand-derived: a triangle with a pendant class, on the boundary and inside', () => {
    // Triangle a, b, c and d attached to c. The flow equations are a: μ_ab + μ_ac = λ_a,
    // b: μ_ab + μ_bc = λ_b, c: μ_ac + μ_bc + μ_cd = λ_c, d: μ_cd = λ_d, one solution per λ.
    // λ = (1, 1, 3, 1): μ_cd = 1, μ_ac + μ_bc = 2, and μ_ac = μ_bc = 1 − μ_ab give μ_ab = 0, so t* = 0:
    // {c} is tight (λ_c = 3 = λ(N(c)) = λ_a + λ_b + λ_d).
    // λ = (2, 2, 3, 1): μ_cd = 1, μ_ac = μ_bc = 2 − μ_ab, 4 − 2μ_ab = 2 ⇒ μ_ab = 1, all flows 1, t* = 1.
    const pairs: Array<[number, number]> = [[0, 1], [0, 2], [1, 2], [2, 3]];
    const all = Int32Array.from([0, 1, 2, 3]);
    const boundary = leastEdgeFlow(compileGraph(['a', 'b', 'c', 'd'], [1, 1, 3, 1], pairs), all)!;
    expect(Math.abs(boundary.minEdgeFlow)).toBeLessThan(1e-12);
    const model = compileGraph(['a', 'b', 'c', 'd'], [2, 2, 3, 1], pairs);
    const inside = leastEdgeFlow(model, all)!;
    expect(inside.minEdgeFlow).toBeCloseTo(1, 12);
    const flow = new Float64Array(model.m);
    inside.writeFlow(flow);
    for (const f of flow) expect(f).toBeCloseTo(1, 12);
  });
});
