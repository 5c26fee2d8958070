/**
 * The MILP stage of the recommender, solved with HiGHS (src/solvers/highs.ts).
 *
 * Variables: x_j ∈ {0, 1} per toggle (is the compatibility in the design?), a flow μ_e ≥ 0 per
 * possible edge (fixed pairs and toggles), and t, the smallest flow on a present edge. Rates are
 * divided by a power of two near their mean (`unit`) and costs by one near their mean size, so that
 * the coefficients stay near 1.
 *
 *   Σ_{e∋k} a_{k,e} μ_e = λ_k                 every class k (a = 2 for a self-loop, else 1)
 *   μ_e ≤ U_e x_j                             toggle j on edge e, U_e = min(λ_a, λ_b) (λ_a / 2 for a loop)
 *   μ_e ≥ t − M (1 − x_j)                     toggle j on edge e
 *   μ_e ≥ t                                   fixed edge e
 *   Σ_j p_j x_j ≤ B − offset + Σ_removable p   budget: cost = offset − Σ_removable p + Σ_j p_j x_j
 *   Σ_{j∋k} x_j ≤ maxCompatibilities_k − fixed_k
 *   0 ≤ t ≤ M
 *
 * Big-M: every class k of a feasible point has some present edge e (else its row cannot hold) and
 * t ≤ μ_e ≤ λ_k on it, so t ≤ M := min_k λ_k at every feasible point. With x_j = 0 the row
 * μ_e ≥ t − M is then slack (μ_e = 0), and with x_j = 1 it is μ_e ≥ t. U_e bounds a flow by the rate
 * of either end, so the rows μ_e ≤ U_e x_j never cut off a flow of a design.
 *
 * A strictly positive flow on every present edge (t > 0) is the edge-flow criterion of stability for
 * a connected non-bipartite component (see src/stability/check.ts), but a bipartite component whose
 * two sides have exactly equal rates also admits such a flow and is not stable. So every answer is
 * re-checked with the exact stability verdict (checkStability); an unstable answer yields a cut and
 * the MILP is solved again. The cut comes from the verdict's certificate I (λ(I) ≥ λ(N(I))): dropping
 * compatibilities never helps I, nor does adding one that touches N(I) or misses I, so every stable
 * design must switch on some toggle that is off now and joins a class of I to a class outside N(I)
 * (I itself included: a pair within I, or a self-loop): Σ_{j off, j relieves I} x_j ≥ 1. (If there is
 * none, no design is stable.)
 */
import { SolverError } from '../../errors.js';
import { compileGraph } from '../../model/compile.js';
import { checkStability } from '../../stability/check.js';
import { minEdgeFlowOf } from '../../stability/report.js';
import { powerOfTwoScale } from '../../model/rate-scale.js';
import { solveWithHighs } from '../../solvers/highs.js';
import type { LinearProgram, LpConstraint, LpVariable } from '../../solvers/lp.js';
import { degreesAllowed, designCost, designPairs, type DesignProblem } from '../space/problem.js';

/** A linear cut on the toggles: Σ coefficients · x ≥ rhs. */
export interface ToggleCut {
  readonly toggles: readonly number[];
  readonly coefficients: readonly number[];
  readonly rhs: number;
}

export interface FlowMilpOptions {
  /** Most the design may cost; Infinity (default) drops the row. */
  readonly budget?: number;
  /** 'max-flow': maximise t; 'min-cost': minimise the cost subject to t ≥ minFlow. */
  readonly goal: 'max-flow' | 'min-cost';
  /** Lower bound on t, in rate units (default 0). */
  readonly minFlow?: number;
  readonly cuts?: readonly ToggleCut[];
}

export interface FlowMilp {
  readonly lp: LinearProgram;
  /** Column of t (x_j is column j; μ of edge e, fixed pairs first then toggles, is column k + e). */
  readonly tCol: number;
  /** Rates were divided by this. */
  readonly unit: number;
  /** The big-M (in scaled units). */
  readonly bigM: number;
  /** Cost of the design with every toggle off, so cost = base + Σ p_j x_j. */
  readonly baseCost: number;
}

/** Builds the flow MILP of a design problem (see the comment at the top of this file). */
export function flowMilp(problem: DesignProblem, options: FlowMilpOptions): FlowMilp {
  const { n, rates, fixed, toggles } = problem;
  const k = toggles.length;
  // rates in units of a power of two near their mean, costs in units of a power of two near their
  // mean size: coefficients stay near 1 whatever the scale of the file (costs of 1e15 made HiGHS fail)
  const unit = powerOfTwoScale(rates);
  const money = powerOfTwoScale(toggles.map((t) => Math.abs(t.price)));
  let bigM = Infinity;
  for (let i = 0; i < n; i++) bigM = Math.min(bigM, rates[i]! / unit);
  const edges: Array<readonly [number, number]> = [...fixed, ...toggles.map((t) => [t.a, t.b] as const)];
  const f = fixed.length;
  const tCol = k + edges.length;
  const variables: LpVariable[] = [];
  toggles.forEach((t, j) => variables.push({ name: `x${j}:${problem.ids[t.a]}-${problem.ids[t.b]}`, kind: 'binary' }));
  edges.forEach(([a, b], e) => {
    const cap = a === b ? rates[a]! / (2 * unit) : Math.min(rates[a]!, rates[b]!) / unit;
    variables.push({ name: `mu${e}:${problem.ids[a]}-${problem.ids[b]}`, lower: 0, upper: cap });
  });
  variables.push({ name: 't', lower: Math.min(options.minFlow ?? 0, bigM), upper: bigM });

  const constraints: LpConstraint[] = [];
  const rows = Array.from({ length: n }, () => ({ variables: [] as number[], coefficients: [] as number[] }));
  edges.forEach(([a, b], e) => {
    if (a === b) {
      rows[a]!.variables.push(k + e);
      rows[a]!.coefficients.push(2);
    } else {
      rows[a]!.variables.push(k + e);
      rows[a]!.coefficients.push(1);
      rows[b]!.variables.push(k + e);
      rows[b]!.coefficients.push(1);
    }
  });
  rows.forEach((r, i) => constraints.push({ name: `flow of ${problem.ids[i]}`, ...r, relation: '=', rhs: rates[i]! / unit }));
  for (let e = 0; e < f; e++) constraints.push({ name: `fixed edge ${e} carries t`, variables: [k + e, tCol], coefficients: [1, -1], relation: '>=', rhs: 0 });
  toggles.forEach((_, j) => {
    const e = f + j;
    const cap = variables[k + e]!.upper!;
    constraints.push({ name: `edge of toggle ${j} only if on`, variables: [k + e, j], coefficients: [1, -cap], relation: '<=', rhs: 0 });
    constraints.push({ name: `edge of toggle ${j} carries t if on`, variables: [k + e, tCol, j], coefficients: [1, -1, -bigM], relation: '>=', rhs: -bigM });
  });
  let removableTotal = 0;
  for (const t of toggles) if (t.kind === 'removable') removableTotal += t.price;
  const baseCost = problem.costOffset - removableTotal;
  const budget = options.budget ?? Infinity;
  if (Number.isFinite(budget) && k > 0) {
    constraints.push({
      name: 'budget',
      variables: toggles.map((_, j) => j),
      coefficients: toggles.map((t) => t.price / money),
      relation: '<=',
      rhs: (budget - baseCost + 1e-9 * (Math.abs(budget) + Math.abs(baseCost) + money)) / money,
    });
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(problem.maxDegree[i]!)) continue;
    const touching = toggles.map((t, j) => (t.a === i || t.b === i ? j : -1)).filter((j) => j >= 0);
    if (touching.length === 0) continue;
    constraints.push({
      name: `maxCompatibilities of ${problem.ids[i]}`,
      variables: touching,
      coefficients: touching.map(() => 1),
      relation: '<=',
      rhs: problem.maxDegree[i]! - problem.fixedDegree[i]!,
    });
  }
  (options.cuts ?? []).forEach((c, i) => constraints.push({ name: `stability cut ${i}`, variables: c.toggles, coefficients: c.coefficients, relation: '>=', rhs: c.rhs }));
  const objective =
    options.goal === 'max-flow'
      ? { variables: [tCol], coefficients: [1] }
      : { variables: toggles.map((_, j) => j), coefficients: toggles.map((t) => t.price / money) };
  const lp: LinearProgram = { sense: options.goal === 'max-flow' ? 'max' : 'min', objective, variables, constraints };
  return { lp, tCol, unit, bigM, baseCost };
}

export interface MilpDesign {
  readonly design: Uint8Array;
  readonly cost: number;
  /** Smallest flow on a present edge in the MILP's answer, in rate units. */
  readonly minFlow: number;
  /** Smallest edge flow of the design by the exact stability verdict (min over components of t*). */
  readonly verifiedMinFlow: number;
  /** True when HiGHS proved optimality (false when it stopped at its time limit). */
  readonly proven: boolean;
  /** MILP solves it took (1 + number of stability cuts). */
  readonly solves: number;
  /** The stability cuts this solve added (valid for every design of the problem, so reusable). */
  readonly stabilityCuts?: readonly ToggleCut[];
}

export interface MilpSolveOptions {
  readonly timeLimitSeconds?: number;
  /** Stop adding stability cuts after this many (default 50). */
  readonly maxCuts?: number;
  /** HiGHS's relative MIP gap (its default, 1e-4, when absent). */
  readonly mipRelativeGap?: number;
}

/** The cut a non-stable design yields (see the top of this file), or undefined when nothing can fix it. */
function stabilityCut(problem: DesignProblem, design: Uint8Array): { cut?: ToggleCut; stable: boolean; minFlow: number } {
  const model = compileGraph(problem.ids, problem.rates, designPairs(problem, design));
  const report = checkStability(model);
  if (report.stable) {
    const minFlow = minEdgeFlowOf(report);
    return { stable: true, minFlow };
  }
  const cut = relievingCut(problem, design, report.certificate!);
  return cut ? { stable: false, minFlow: NaN, cut } : { stable: false, minFlow: NaN };
}

/**
 * The cut of an overloaded set I of `design` (see the top of this file): some toggle off in the
 * design that joins a class of I to a class outside N(I) must be on. Undefined when there is none.
 */
function relievingCut(problem: DesignProblem, design: ArrayLike<number>, overloaded: { readonly set: ArrayLike<number>; readonly neighbours: ArrayLike<number> }): ToggleCut | undefined {
  const inI = new Uint8Array(problem.n);
  const inN = new Uint8Array(problem.n);
  for (let i = 0; i < overloaded.set.length; i++) inI[overloaded.set[i]!] = 1;
  for (let i = 0; i < overloaded.neighbours.length; i++) inN[overloaded.neighbours[i]!] = 1;
  const off: number[] = [];
  problem.toggles.forEach((t, j) => {
    if (!design[j] && ((inI[t.a] && !inN[t.b]) || (inI[t.b] && !inN[t.a]))) off.push(j);
  });
  return off.length === 0 ? undefined : { toggles: off, coefficients: off.map(() => 1), rhs: 1 };
}

/**
 * Relative tolerance of the check of every HiGHS answer against the MILP's rows (HiGHS itself
 * accepts a MIP point within 1e-6 of feasibility by default, on the rate-scaled problem).
 */
export const MILP_CHECK_TOLERANCE = 1e-5;

/** Reads and checks the design of a MILP answer against the problem's own constraints. */
function readDesign(problem: DesignProblem, values: Float64Array, budget: number): Uint8Array {
  const design = Uint8Array.from({ length: problem.toggles.length }, (_, j) => (values[j]! > 0.5 ? 1 : 0));
  if (designCost(problem, design) > budget + 1e-6 * (1 + Math.abs(budget))) {
    throw new SolverError(`HiGHS returned a design costing ${designCost(problem, design)}, above the budget ${budget}`);
  }
  if (!degreesAllowed(problem, design)) throw new SolverError('HiGHS returned a design that exceeds maxCompatibilities');
  return design;
}

/**
 * Solves the flow MILP, re-checking every answer with checkStability and cutting off unstable ones.
 * Returns undefined when no design satisfies the MILP (or none with a positive smallest flow).
 */
export async function solveFlowMilp(problem: DesignProblem, options: FlowMilpOptions, solve: MilpSolveOptions = {}): Promise<MilpDesign | undefined> {
  const cuts: ToggleCut[] = [...(options.cuts ?? [])];
  const budget = options.budget ?? Infinity;
  const maxCuts = solve.maxCuts ?? 50;
  for (let round = 0; round <= maxCuts; round++) {
    const milp = flowMilp(problem, { ...options, cuts });
    const sol = await solveWithHighs(milp.lp, {
      checkTolerance: MILP_CHECK_TOLERANCE,
      ...(solve.timeLimitSeconds === undefined ? {} : { timeLimitSeconds: solve.timeLimitSeconds }),
      ...(solve.mipRelativeGap === undefined ? {} : { mipRelativeGap: solve.mipRelativeGap }),
    });
    if (sol.status === 'infeasible') return undefined;
    if (!(sol.status === 'optimal' || (sol.status === 'limit' && sol.values.every(Number.isFinite)))) {
      if (sol.status === 'limit') return undefined;
      throw new SolverError(`HiGHS could not solve the design MILP: ${sol.status}${sol.message ? ` (${sol.message})` : ''}`);
    }
    const t = sol.values[milp.tCol]!;
    if (!(t > 1e-9 * milp.bigM)) return undefined;
    const design = readDesign(problem, sol.values, budget);
    const verdict = stabilityCut(problem, design);
    if (verdict.stable) {
      return {
        design,
        cost: designCost(problem, design),
        minFlow: t * milp.unit,
        verifiedMinFlow: verdict.minFlow,
        proven: sol.status === 'optimal',
        solves: round + 1,
        stabilityCuts: cuts.slice(options.cuts?.length ?? 0),
      };
    }
    if (!verdict.cut) return undefined;
    cuts.push(verdict.cut);
  }
  throw new SolverError(`the design MILP kept returning unstable designs after ${maxCuts} stability cuts`);
}

/** Relative floor on t for "stable" in the cheapest-design MILP (t ≥ FLOOR · M). */
export const CHEAPEST_FLOW_FLOOR = 1e-6;

/**
 * The cheapest design with a strictly positive flow on every present edge (t ≥ 1e-6 · min_k λ_k),
 * verified stable; the budget is ignored (maxCompatibilities and the fixed pairs are not). Designs
 * stable only with a smaller margin than that floor are not considered.
 */
export async function cheapestStableDesign(problem: DesignProblem, solve: MilpSolveOptions = {}): Promise<MilpDesign | undefined> {
  return leanestIfStable(problem) ?? cheapestByCuts(problem) ?? solveFlowMilp(problem, { goal: 'min-cost', minFlow: stableFlowFloor(problem) }, solve);
}

/** Designs the cut search of cheapestByCuts may judge before it leaves the question to HiGHS. */
export const CUT_SEARCH_NODES = 300;

/**
 * The cheapest stable design by a uniform-cost search over the stability cuts, without HiGHS, when it
 * ends within CUT_SEARCH_NODES stability verdicts (undefined otherwise, or when a design is stable
 * only with a smaller edge flow than the MILP's floor: the MILP decides then).
 *
 * From the design with every toggle off, a node that is unstable with certificate I branches on the
 * toggles of its cut (off, and joining a class of I to one outside N(I), or within I): child i
 * switches on the i-th of them and forbids the ones before it. Nodes are taken cheapest first (ties:
 * the order they were made). Exactness: every stable design S holds the cut of every design it
 * contains that is unstable (see the top of this file: dropping compatibilities never relieves I,
 * nor does adding one that misses I or touches N(I)), so following, from the root, the child whose
 * switched toggle is the first of the cut in S gives a chain of nodes contained in S, each allowed
 * by its forbidden toggles, ending at a stable node; prices are ≥ 0, so every node of the chain
 * costs at most cost(S), and the first stable node taken costs at most any stable design's cost.
 * Nodes beyond maxCompatibilities are dropped (adding toggles only raises degrees).
 */
export function cheapestByCuts(problem: DesignProblem, maxNodes = CUT_SEARCH_NODES): MilpDesign | undefined {
  const k = problem.toggles.length;
  if (problem.toggles.some((t) => !(t.price >= 0))) return undefined;
  let mean = 0;
  for (let i = 0; i < problem.n; i++) mean += problem.rates[i]! / problem.n;
  const floor = stableFlowFloor(problem) * mean;
  interface Node {
    readonly design: Uint8Array;
    readonly forbidden: Uint8Array;
    readonly cost: number;
    readonly order: number;
  }
  let made = 0;
  const open: Node[] = [{ design: new Uint8Array(k), forbidden: new Uint8Array(k), cost: designCost(problem, new Uint8Array(k)), order: made++ }];
  for (let judged = 0; judged < maxNodes && open.length > 0; judged++) {
    let at = 0;
    for (let i = 1; i < open.length; i++) {
      const a = open[i]!;
      const b = open[at]!;
      if (a.cost < b.cost || (a.cost === b.cost && a.order < b.order)) at = i;
    }
    const node = open.splice(at, 1)[0]!;
    if (!degreesAllowed(problem, node.design)) continue;
    const model = compileGraph(problem.ids, problem.rates, designPairs(problem, node.design));
    const report = checkStability(model);
    if (report.stable) {
      const minFlow = minEdgeFlowOf(report);
      if (!(minFlow >= floor)) return undefined;
      return { design: node.design, cost: node.cost, minFlow, verifiedMinFlow: minFlow, proven: true, solves: 0 };
    }
    const cut = relievingCut(problem, node.design, report.certificate!);
    if (!cut) continue;
    const forbidden = Uint8Array.from(node.forbidden);
    for (const j of cut.toggles) {
      if (forbidden[j]) continue;
      const design = Uint8Array.from(node.design);
      design[j] = 1;
      open.push({ design, forbidden: Uint8Array.from(forbidden), cost: designCost(problem, design), order: made++ });
      forbidden[j] = 1;
    }
  }
  return undefined;
}

/**
 * The design with every toggle off (only the fixed pairs) when it is stable with a smallest edge flow
 * at least the MILP's floor (stableFlowFloor, in units of the mean rate), within maxCompatibilities:
 * then it is a cheapest stable design without any solve. Proof: a design costs
 * baseCost + Σ_j p_j x_j with every price p_j ≥ 0 (see flowMilp), so no design costs less than the
 * one with every x_j = 0, and it satisfies every row of the min-cost MILP (flows from its stability
 * verdict, t = its smallest edge flow ≥ the floor). Undefined otherwise (the MILP decides).
 */
export function leanestIfStable(problem: DesignProblem): MilpDesign | undefined {
  if (problem.toggles.some((t) => !(t.price >= 0))) return undefined;
  const design = new Uint8Array(problem.toggles.length);
  if (!degreesAllowed(problem, design)) return undefined;
  const verdict = stabilityCut(problem, design);
  let mean = 0;
  for (let i = 0; i < problem.n; i++) mean += problem.rates[i]! / problem.n;
  if (!verdict.stable || !(verdict.minFlow >= stableFlowFloor(problem) * mean)) return undefined;
  return { design, cost: designCost(problem, design), minFlow: verdict.minFlow, verifiedMinFlow: verdict.minFlow, proven: true, solves: 0 };
}

/** The floor on t that counts as stable in the min-cost MILPs, in scaled rate units: FLOOR · M. */
export function stableFlowFloor(problem: DesignProblem): number {
  let total = 0;
  for (let i = 0; i < problem.n; i++) total += problem.rates[i]!;
  let m = Infinity;
  for (let i = 0; i < problem.n; i++) m = Math.min(m, problem.rates[i]! / (total / problem.n));
  return CHEAPEST_FLOW_FLOOR * m;
}

/**
 * Within a budget: the design maximising the smallest edge flow t, then (second solve) the cheapest
 * design reaching that t up to a relative 1e-6.
 */
export async function maxMinFlowDesign(problem: DesignProblem, budget: number, solve: MilpSolveOptions = {}): Promise<MilpDesign | undefined> {
  const best = await solveFlowMilp(problem, { goal: 'max-flow', budget }, solve);
  if (!best) return undefined;
  const unit = flowMilp(problem, { goal: 'max-flow' }).unit;
  const floor = (best.minFlow / unit) * (1 - 1e-6);
  const cheaper = await solveFlowMilp(problem, { goal: 'min-cost', budget, minFlow: floor }, solve);
  if (!cheaper) return best;
  return { ...cheaper, solves: best.solves + cheaper.solves, proven: best.proven && cheaper.proven };
}

/** Budget levels of the ladder: `levels` evenly spaced values from `low` to `high` (deduplicated). */
export function budgetLadder(low: number, high: number, levels: number): number[] {
  if (!(high > low) || levels <= 1) return [Math.max(low, Math.min(high, low))];
  const out: number[] = [];
  for (let i = 0; i < levels; i++) {
    const v = low + ((high - low) * i) / (levels - 1);
    const r = Math.round(v * 1e9) / 1e9;
    if (out.length === 0 || r > out[out.length - 1]!) out.push(r);
  }
  return out;
}
