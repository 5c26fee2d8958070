import { describe, expect, it } from 'vitest';
import { compileGraph } from '../../src/model/compile.js';
import { bipartition, components } from '../../src/model/components.js';
import { solveWithHighs } from '../../src/solvers/highs.js';
import { solveWithJsLp } from '../../src/solvers/jslp.js';
import { checkStability } from '../../src/stability/check.js';
import { edgeFlowProgram, headroomProgram, readEdgeFlow, readHeadroom } from '../../src/stability/programs.js';
import { Rng } from '../helpers/random.js';
import { enumerate, randomGraph } from './brute-force.js';

const agree = (a: number, b: number, rel = 1e-6): boolean => a === b || Math.abs(a - b) <= rel * Math.max(1, Math.abs(a), Math.abs(b));

describe('the stability LPs, solved by javascript-lp-solver and by HiGHS (second solver, npm `highs`)', () => {
  const rng = new Rng(99);
  const graphs = Array.from({ length: 160 }, () => randomGraph(rng, { minN: 3, maxN: 8 }));

  it('agree on t* of every non-bipartite component', async () => {
    let compared = 0;
    for (const g of graphs) {
      const model = compileGraph(Array.from({ length: g.n }, (_, k) => `k${k}`), g.rates, g.pairs);
      for (const members of components(model).members) {
        if (bipartition(model, members)) continue;
        const p = edgeFlowProgram(model, members);
        const a = solveWithJsLp(p.lp);
        const b = await solveWithHighs(p.lp);
        expect(a.status).toBe('optimal');
        expect(b.status).toBe('optimal');
        const ta = readEdgeFlow(p, a).minEdgeFlow;
        const tb = readEdgeFlow(p, b).minEdgeFlow;
        expect(agree(ta, tb), `${ta} vs ${tb}`).toBe(true);
        compared++;
      }
    }
    expect(compared).toBeGreaterThan(100);
  });

  it('agree on the headroom LP of every class of a stable component, and match the cut-based headroom and brute force', async () => {
    let finite = 0;
    let infinite = 0;
    for (const g of graphs) {
      const model = compileGraph(Array.from({ length: g.n }, (_, k) => `k${k}`), g.rates, g.pairs);
      const report = checkStability(model);
      for (const c of report.components) {
        if (!c.stable) continue;
        for (const k of c.members) {
          const lp = headroomProgram(model, c.members, k);
          const ha = readHeadroom(solveWithJsLp(lp));
          const hb = readHeadroom(await solveWithHighs(lp));
          expect(agree(ha, hb), `${ha} vs ${hb}`).toBe(true);
          expect(agree(ha, report.headroom[k]!)).toBe(true);
          // the claim "infinite exactly for self-looped classes"
          expect(ha === Infinity).toBe(model.selfLoop[k] === 1);
          if (ha === Infinity) infinite++;
          else finite++;
        }
      }
      // brute force (definition): min slack over independent sets containing k, for stable designs
      if (report.stable) {
        const brute = enumerate(g);
        for (let k = 0; k < g.n; k++) if (model.selfLoop[k] === 0) expect(agree(report.headroom[k]!, brute.minSlackWith[k]!, 1e-9)).toBe(true);
      }
    }
    expect(finite).toBeGreaterThan(150);
    expect(infinite).toBeGreaterThan(10);
  });
});
