import { compileGraph, type CompiledModel } from '../../src/model/compile.js';
import { evaluateExact } from '../../src/exact/evaluate.js';
import type { DesignProblem } from '../../src/design/space/problem.js';
import { bruteStability } from './brute-stability.js';

/**
 * The recommender's answer by brute force, straight from the definitions of the issue, written here
 * without any code of src/design/:
 *   - a design is a subset of the toggles; its cost is Σ costs of added candidates − Σ savings of
 *     dropped removable compatibilities (+ the problem's constant for forced removals);
 *   - it is admissible when it costs at most the budget, keeps every class within its
 *     maxCompatibilities, is stable (brute force over independent sets, "Stability of the stochastic
 *     matching model", J. Appl. Probab. 2016), meets every wait target, and pays for no harmful
 *     compatibility (a paid toggle — on, price > 0 — whose removal alone leaves a stable design with a
 *     lower objective);
 *   - the front is every admissible design that no admissible design beats on both cost and
 *     objective (one design kept per cost level).
 * Objectives from a fresh evaluateExact (tested elsewhere against the permutation-sum oracle).
 * 'net-value' is minimised as its negative: waitingCost · total backlog − Σ_pairs value · match rate,
 * the value of each pair read from the problem (fixed pairs, then toggles) and paired with the
 * model's edges by class indices (not by position).
 */
export type BruteObjective = 'total' | 'weighted' | 'max-wait' | 'net-value';

export interface BruteDesign {
  readonly mask: number;
  readonly cost: number;
  readonly stable: boolean;
  readonly objective: number;
  readonly meetsTargets: boolean;
  readonly withinLimits: boolean;
}

const REL = 1e-9;

export function designModel(p: DesignProblem, mask: number): CompiledModel {
  const pairs: Array<[number, number]> = p.fixed.map(([a, b]) => [a, b]);
  p.toggles.forEach((t, j) => {
    if ((mask >>> j) & 1) pairs.push([t.a, t.b]);
  });
  return compileGraph(p.ids, p.rates, pairs);
}

export function bruteCost(p: DesignProblem, mask: number): number {
  let c = p.costOffset;
  p.toggles.forEach((t, j) => {
    const on = (mask >>> j) & 1;
    if (t.kind === 'candidate' && on) c += t.price;
    if (t.kind === 'removable' && !on) c -= t.price;
  });
  return c;
}

/** −(net value) of a design: waitingCost · Σ backlog − Σ_edges value(edge) · matchRate(edge). */
export function bruteNegNetValue(p: DesignProblem, model: CompiledModel, backlog: ArrayLike<number>, matchRates: ArrayLike<number>): number {
  const value = new Map<string, number>();
  p.fixed.forEach(([a, b], i) => value.set(`${Math.min(a, b)},${Math.max(a, b)}`, p.fixedValue[i]!));
  p.toggles.forEach((t) => value.set(`${Math.min(t.a, t.b)},${Math.max(t.a, t.b)}`, t.value));
  let v = 0;
  for (let e = 0; e < model.m; e++) v += (value.get(`${model.edgeA[e]},${model.edgeB[e]}`) ?? 0) * matchRates[e]!;
  let l = 0;
  for (let k = 0; k < p.n; k++) l += backlog[k]!;
  return p.waitingCost * l - v;
}

export function bruteObjective(o: BruteObjective, p: DesignProblem, backlog: Float64Array, model?: CompiledModel, matchRates?: Float64Array): number {
  if (o === 'net-value') return bruteNegNetValue(p, model!, backlog, matchRates!);
  let v = 0;
  for (let k = 0; k < p.n; k++) {
    if (o === 'total') v += backlog[k]!;
    else if (o === 'weighted') v += p.weight[k]! * backlog[k]!;
    else v = Math.max(v, backlog[k]! / p.rates[k]!);
  }
  return v;
}

export function bruteDesign(p: DesignProblem, o: BruteObjective, mask: number): BruteDesign {
  const cost = bruteCost(p, mask);
  const deg = new Array<number>(p.n).fill(0);
  for (const [a, b] of p.fixed) {
    deg[a]++;
    if (b !== a) deg[b]++;
  }
  p.toggles.forEach((t, j) => {
    if (!((mask >>> j) & 1)) return;
    deg[t.a]++;
    if (t.b !== t.a) deg[t.b]++;
  });
  const withinLimits = deg.every((d, k) => d <= p.maxDegree[k]!);
  const model = designModel(p, mask);
  const stable = bruteStability(model).stable;
  if (!stable) return { mask, cost, stable, objective: NaN, meetsTargets: false, withinLimits };
  const r = evaluateExact(model);
  let meets = true;
  for (let k = 0; k < p.n; k++) if (r.wait[k]! > p.waitTarget[k]! * (1 + 1e-12)) meets = false;
  return { mask, cost, stable, objective: bruteObjective(o, p, r.backlog, model, r.matchRates), meetsTargets: meets, withinLimits };
}

/** Every design of the problem (2^toggles; keep toggles <= ~14). */
export function allDesigns(p: DesignProblem, o: BruteObjective): BruteDesign[] {
  const out: BruteDesign[] = [];
  for (let mask = 0; mask < 2 ** p.toggles.length; mask++) out.push(bruteDesign(p, o, mask));
  return out;
}

/** The admissible designs (see the comment at the top). */
export function admissibleDesigns(p: DesignProblem, all: readonly BruteDesign[]): BruteDesign[] {
  return all.filter((d) => {
    if (!d.stable || !d.withinLimits || !d.meetsTargets || d.cost > p.budget + 1e-9) return false;
    for (let j = 0; j < p.toggles.length; j++) {
      if (!((d.mask >>> j) & 1) || !(p.toggles[j]!.price > 0)) continue;
      const e = all[d.mask & ~(1 << j)]!;
      if (e.stable && e.objective < d.objective - REL * Math.abs(d.objective)) return false;
    }
    return true;
  });
}

/** Cost/objective pairs of the front, by the definition (quadratic), sorted by cost. */
export function bruteFront(p: DesignProblem, all: readonly BruteDesign[]): Array<{ cost: number; objective: number }> {
  const ok = admissibleDesigns(p, all);
  const front = ok.filter(
    (d) =>
      !ok.some(
        (e) =>
          (e.cost < d.cost - 1e-9 && e.objective <= d.objective + REL * Math.abs(d.objective)) ||
          (e.cost <= d.cost + 1e-9 && e.objective < d.objective - REL * Math.abs(d.objective)),
      ),
  );
  const byCost = new Map<number, number>();
  for (const d of front) {
    const key = Math.round(d.cost * 1e6);
    byCost.set(key, Math.min(byCost.get(key) ?? Infinity, d.objective));
  }
  return [...byCost.entries()].sort((x, y) => x[0] - y[0]).map(([c, v]) => ({ cost: c / 1e6, objective: v }));
}
