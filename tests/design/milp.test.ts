import * as jslpModule from 'javascript-lp-solver';
import { describe, expect, it } from 'vitest';
import { cheapestByCuts, cheapestStableDesign, flowMilp, solveFlowMilp, stableFlowFloor, maxMinFlowDesign, budgetLadder } from '../../src/design/search/milp.js';
import type { DesignProblem, Toggle } from '../../src/design/space/problem.js';
import { solveWithHighs } from '../../src/solvers/highs.js';
import { bruteStability } from '../helpers/brute-stability.js';
import { bruteCost, designModel } from '../helpers/design-brute.js';
import { randomProblem } from '../helpers/design-problems.js';
import { Rng } from '../helpers/random.js';

// The MILP stage (HiGHS) against brute force over every design: for each design, the largest
// smallest edge flow t*(design) = max t s.t. Σ_{e∋k} a_{k,e} μ_e = λ_k, μ_e ≥ t is solved with
// javascript-lp-solver called directly (an independent LP solver used as oracle), and stability is
// decided by brute force over independent sets ("Stability of the stochastic matching model",
// J. Appl. Probab. 2016).

type Jslp = { Solve(model: unknown): Record<string, unknown> };
const jslp: Jslp = (() => {
  const ns = jslpModule as unknown as Record<string, unknown>;
  for (const c of [ns, ns.default, (ns.default as Record<string, unknown> | undefined)?.default]) if (c && typeof (c as Jslp).Solve === 'function') return c as Jslp;
  throw new Error('javascript-lp-solver not loadable');
})();

/** t*(design) by javascript-lp-solver (NaN when Bμ = λ has no non-negative solution). */
function maxMinFlow(p: DesignProblem, mask: number): number {
  const model = designModel(p, mask);
  const constraints: Record<string, { equal?: number; min?: number }> = {};
  const variables: Record<string, Record<string, number>> = { t: { t: 1 } };
  for (let k = 0; k < p.n; k++) constraints[`r${k}`] = { equal: model.rates[k]! };
  for (let e = 0; e < model.m; e++) {
    const a = model.edgeA[e]!;
    const b = model.edgeB[e]!;
    constraints[`g${e}`] = { min: 0 };
    variables[`m${e}`] = a === b ? { [`r${a}`]: 2, [`g${e}`]: 1 } : { [`r${a}`]: 1, [`r${b}`]: 1, [`g${e}`]: 1 };
    variables.t![`g${e}`] = -1;
  }
  const sol = jslp.Solve({ optimize: 't', opType: 'max', constraints, variables });
  return sol.feasible === true ? (sol.result as number) : NaN;
}

interface Truth {
  mask: number;
  cost: number;
  stable: boolean;
  t: number;
}

function enumerate(p: DesignProblem): Truth[] {
  const out: Truth[] = [];
  for (let mask = 0; mask < 2 ** p.toggles.length; mask++) {
    const model = designModel(p, mask);
    out.push({ mask, cost: bruteCost(p, mask), stable: bruteStability(model).stable, t: maxMinFlow(p, mask) });
  }
  return out;
}

const maskOf = (d: Uint8Array): number => d.reduce((m, v, j) => m | (v ? 1 << j : 0), 0);

function smallProblem(seed: number): DesignProblem {
  const rng = new Rng(seed);
  return randomProblem(rng, { minClasses: 5, maxClasses: 7, toggles: rng.int(6, 8), removableShare: 0.3, budgetShare: 0.5, loopProb: 0.3 });
}

describe('MILP stage (HiGHS) against brute force', () => {
  it('cheapest stable design and max-min-flow designs on a budget ladder match brute force', async () => {
    let checked = 0;
    for (const seed of [101, 102, 103, 104, 105, 106]) {
      const p = smallProblem(seed);
      const truth = enumerate(p);
      const stable = truth.filter((d) => d.stable);
      const cheapest = await cheapestStableDesign(p);
      if (stable.length === 0) {
        expect(cheapest).toBeUndefined();
        continue;
      }
      expect(cheapest).toBeDefined();
      const minCost = Math.min(...stable.map((d) => d.cost));
      expect(cheapest!.cost).toBeCloseTo(minCost, 9);
      expect(bruteStability(designModel(p, maskOf(cheapest!.design))).stable).toBe(true);
      const maxCost = Math.max(...truth.map((d) => d.cost));
      for (const budget of budgetLadder(minCost, maxCost, 4)) {
        const got = await maxMinFlowDesign(p, budget);
        const within = stable.filter((d) => d.cost <= budget + 1e-9 && d.t > 0);
        const best = Math.max(...within.map((d) => d.t));
        expect(got).toBeDefined();
        const mine = truth[maskOf(got!.design)]!;
        expect(mine.stable).toBe(true);
        expect(mine.cost).toBeLessThanOrEqual(budget + 1e-9);
        expect(got!.minFlow).toBeCloseTo(best, 5);
        expect(mine.t).toBeGreaterThanOrEqual(best * (1 - 1e-5));
        expect(got!.verifiedMinFlow).toBeCloseTo(mine.t, 6);
        // the second solve returns no design dearer than an optimal one
        const optimalCosts = within.filter((d) => d.t >= best * (1 - 1e-9)).map((d) => d.cost);
        expect(mine.cost).toBeLessThanOrEqual(Math.min(...optimalCosts) + 1e-9);
        checked++;
      }
    }
    expect(checked).toBeGreaterThanOrEqual(12);
  });

  it('when the design with every toggle off is stable, it is returned as the cheapest without a solve, at the brute-force minimum cost', async () => {
    // Every price is ≥ 0, so no design costs less than the one with only the fixed pairs (derived by
    // hand from the cost formula: cost = offset − Σ savings of all removable + Σ prices of toggles on).
    let shortcut = 0;
    for (let seed = 201; seed <= 240 && shortcut < 3; seed++) {
      const rng = new Rng(seed);
      const p = randomProblem(rng, { minClasses: 5, maxClasses: 7, toggles: rng.int(5, 7), removableShare: 0.4, budgetShare: 0.5, loopProb: 0.9 });
      if (!bruteStability(designModel(p, 0)).stable) continue;
      shortcut++;
      const truth = enumerate(p).filter((d) => d.stable);
      const cheapest = await cheapestStableDesign(p);
      expect(cheapest).toBeDefined();
      expect(cheapest!.solves).toBe(0);
      expect(cheapest!.proven).toBe(true);
      expect(cheapest!.cost).toBeCloseTo(Math.min(...truth.map((d) => d.cost)), 9);
      expect(cheapest!.verifiedMinFlow).toBeCloseTo(maxMinFlow(p, 0), 6);
    }
    expect(shortcut).toBeGreaterThanOrEqual(3);
  });

  it('the uniform-cost search over stability cuts finds the brute-force cheapest stable design without HiGHS', async () => {
    let searched = 0;
    for (let seed = 301; seed <= 330; seed++) {
      const rng = new Rng(seed);
      const p = randomProblem(rng, { minClasses: 5, maxClasses: 7, toggles: rng.int(6, 8), removableShare: 0.4, budgetShare: 0.5, loopProb: 0.2 });
      if (bruteStability(designModel(p, 0)).stable) continue; // the other shortcut's case
      const stable = enumerate(p).filter((d) => d.stable && d.t > 0);
      const got = cheapestByCuts(p);
      if (stable.length === 0) {
        expect(got).toBeUndefined();
        continue;
      }
      if (!got) continue; // left to HiGHS (node limit or a margin below the floor)
      searched++;
      expect(got.solves).toBe(0);
      expect(bruteStability(designModel(p, maskOf(got.design))).stable).toBe(true);
      expect(got.cost).toBeCloseTo(bruteCost(p, maskOf(got.design)), 9);
      expect(got.cost).toBeCloseTo(Math.min(...stable.map((d) => d.cost)), 9);
    }
    expect(searched).toBeGreaterThanOrEqual(8);
  });

  it("HiGHS's answer satisfies every row of the MILP (checked here, independently of the adapter's check)", async () => {
    const p = smallProblem(107);
    for (const goal of ['max-flow', 'min-cost'] as const) {
      const milp = flowMilp(p, { goal, budget: p.budget, minFlow: goal === 'min-cost' ? 1e-6 : 0 });
      const sol = await solveWithHighs(milp.lp, { checkTolerance: 1e-5 });
      if (sol.status === 'infeasible') continue;
      expect(sol.status).toBe('optimal');
      const k = p.toggles.length;
      const x = Array.from({ length: k }, (_, j) => sol.values[j]!);
      x.forEach((v) => expect(Math.min(Math.abs(v), Math.abs(v - 1))).toBeLessThan(1e-6));
      const edges: Array<readonly [number, number]> = [...p.fixed, ...p.toggles.map((t) => [t.a, t.b] as const)];
      const mu = edges.map((_, e) => sol.values[k + e]! * milp.unit);
      const t = sol.values[milp.tCol]! * milp.unit;
      const flowAt = new Array<number>(p.n).fill(0);
      edges.forEach(([a, b], e) => {
        if (a === b) flowAt[a] += 2 * mu[e]!;
        else {
          flowAt[a] += mu[e]!;
          flowAt[b] += mu[e]!;
        }
        const on = e < p.fixed.length ? 1 : Math.round(x[e - p.fixed.length]!);
        expect(mu[e]!).toBeGreaterThanOrEqual(-1e-6);
        if (!on) expect(Math.abs(mu[e]!)).toBeLessThan(1e-5);
        else expect(mu[e]!).toBeGreaterThanOrEqual(t - 1e-5);
      });
      flowAt.forEach((f, i) => expect(f).toBeCloseTo(p.rates[i]!, 5));
      const cost = bruteCost(p, maskOf(Uint8Array.from(x, (v) => Math.round(v))));
      expect(cost).toBeLessThanOrEqual(p.budget + 1e-9);
    }
  });

  it('cuts off a balanced bipartite design and moves on (derived by hand)', async () => {
    // Classes a, b, c, all rate 1, no compatibility today. Candidates a–b (1), c–c (0.5), a–c (1),
    // b–c (1). {a–b, c–c} (cost 1.5) carries the positive flow μ_ab = 1, μ_cc = 1/2, but its
    // component {a, b} is bipartite with equal sides: not stable. Any design holding a–c but not the
    // triangle fails: {a–b, a–c, (c–c)} forces μ_ac = 1 − μ_ab = 0; {a–c, b–c, (c–c)} needs
    // μ_ac + μ_bc = 2 > λ_c. The triangle (cost 3) carries 1/2 on each edge and is stable (odd cycle).
    const toggles: Toggle[] = [
      { a: 0, b: 1, kind: 'candidate', price: 1, source: 0, value: 0 },
      { a: 2, b: 2, kind: 'candidate', price: 0.5, source: 1, value: 0 },
      { a: 0, b: 2, kind: 'candidate', price: 1, source: 2, value: 0 },
      { a: 1, b: 2, kind: 'candidate', price: 1, source: 3, value: 0 },
    ];
    const p: DesignProblem = {
      n: 3,
      ids: ['a', 'b', 'c'],
      rates: Float64Array.from([1, 1, 1]),
      timeUnit: 'hour',
      fixed: [],
      toggles,
      forcedOut: [],
      costOffset: 0,
      budget: 10,
      maxDegree: new Float64Array(3).fill(Infinity),
      fixedDegree: new Int32Array(3),
      waitTarget: new Float64Array(3).fill(Infinity),
      weight: new Float64Array(3).fill(1),
      today: new Uint8Array(4),
      fixedValue: new Float64Array(0),
      waitingCost: 0,
      hasValues: false,
    };
    // the MILP's own loop (HiGHS, then a cut), and the search over the same cuts without HiGHS
    const cheapest = await solveFlowMilp(p, { goal: 'min-cost', minFlow: stableFlowFloor(p) });
    expect(cheapest!.cost).toBe(3);
    expect(Array.from(cheapest!.design)).toEqual([1, 0, 1, 1]);
    expect(cheapest!.solves).toBeGreaterThanOrEqual(2);
    const byCuts = await cheapestStableDesign(p);
    expect(byCuts!.cost).toBe(3);
    expect(Array.from(byCuts!.design)).toEqual([1, 0, 1, 1]);
    expect(cheapest!.verifiedMinFlow).toBeCloseTo(0.5, 9);
    // with a budget of 2 no stable design exists (the triangle costs 3)
    expect(await maxMinFlowDesign(p, 2)).toBeUndefined();

    // the same problem with costs ×1e15 and rates ×1e-300 or ×1e300 (only ratios matter: the MILP
    // works on normalised rates and costs; costs of 1e15 once made HiGHS fail)
    for (const [money, rate] of [
      [1e15, 1],
      [1e15, 1e-300],
      [1e15, 1e300],
    ] as const) {
      const q: DesignProblem = { ...p, rates: p.rates.map((x) => x * rate), toggles: toggles.map((t) => ({ ...t, price: t.price * money })), budget: 10 * money };
      const c = await cheapestStableDesign(q);
      expect(c!.cost).toBe(3 * money);
      expect(Array.from(c!.design)).toEqual([1, 0, 1, 1]);
      expect(c!.verifiedMinFlow / rate).toBeCloseTo(0.5, 9);
      expect(await maxMinFlowDesign(q, 2 * money)).toBeUndefined();
      const best = await maxMinFlowDesign(q, 10 * money);
      expect(Array.from(best!.design)).toEqual([1, 0, 1, 1]);
    }
  });
});
