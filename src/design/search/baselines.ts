/**
 * Baseline designs shown beside the Pareto set, each built from the pairs the scenario makes
 * available (fixed pairs, today's removable compatibilities and the candidates that are not
 * forbidden). Forbidden removable compatibilities are dropped from every baseline, as from every
 * design; maxCompatibilities is respected whenever a baseline adds a candidate.
 *
 * - today: today's design.
 * - all candidates: today's design plus every candidate.
 * - long chain: one cycle through all classes and nothing else that can be dropped ("Principles on
 *   the benefits of manufacturing process flexibility", Management Science 1995: a single long chain
 *   captures most of the benefit of full flexibility). Fixed compatibilities stay (they cannot be
 *   dropped); today's removable compatibilities on the cycle are kept, the others are dropped (their
 *   savings count); candidates on the cycle are funded. The cycle is searched depth-first from the
 *   first class over the available pairs (self-loops ignored), trying pairs that cost nothing first
 *   (fixed ones), then by increasing price (a kept removable pair costs its forgone saving, a
 *   candidate its cost), ties by class order; the cheapest cycle found within a fixed number of steps
 *   is used, or, when no cycle through every class exists, the longest path found from any class
 *   (ties: cheaper, then the first found).
 * - two per class: every class gets two compatibilities ("A staffing algorithm for call centers
 *   with skill-based routing", Manufacturing & Service Operations Management 2005: agents with two
 *   skills capture most of the benefit of cross-training). Start from the fixed compatibilities only
 *   (every removable one dropped); classes are taken by decreasing rate (ties: class order); while a
 *   class has fewer than two compatibilities (a self-loop counts once), the cheapest pair touching it
 *   is switched on (a removable pair costs its forgone saving, a candidate its cost), ties to the
 *   partner with fewer compatibilities, then to class order.
 */
import { degrees, type DesignProblem } from '../space/problem.js';

export type BaselineName = 'today' | 'all candidates' | 'long chain' | 'two per class';

export interface Baseline {
  readonly name: BaselineName;
  readonly design: Uint8Array;
  /** How the design was built, for people (e.g. "cycle through all 10 classes"). */
  readonly note: string;
}

/** Steps of the depth-first cycle search before it settles for the best found. */
export const CHAIN_SEARCH_STEPS = 200_000;

/** Adds candidate j to `design` when the class limits allow it; returns whether it did. */
function tryAdd(problem: DesignProblem, design: Uint8Array, deg: Int32Array, j: number): boolean {
  if (design[j]) return true;
  const t = problem.toggles[j]!;
  if (deg[t.a]! + 1 > problem.maxDegree[t.a]! || (t.b !== t.a && deg[t.b]! + 1 > problem.maxDegree[t.b]!)) return false;
  design[j] = 1;
  deg[t.a]++;
  if (t.b !== t.a) deg[t.b]++;
  return true;
}

export function todayBaseline(problem: DesignProblem): Baseline {
  return { name: 'today', design: Uint8Array.from(problem.today), note: 'the current design' };
}

export function allCandidatesBaseline(problem: DesignProblem): Baseline {
  const design = Uint8Array.from(problem.today);
  const deg = degrees(problem, design);
  let skipped = 0;
  problem.toggles.forEach((t, j) => {
    if (t.kind === 'candidate' && !tryAdd(problem, design, deg, j)) skipped++;
  });
  const count = problem.toggles.filter((t) => t.kind === 'candidate').length;
  return { name: 'all candidates', design, note: `all ${count} candidates${skipped ? ` (${skipped} skipped: maxCompatibilities)` : ''}` };
}

interface Arc {
  readonly to: number;
  readonly cost: number;
  /** Toggle index of a removable or candidate pair, or -1 for a fixed pair. */
  readonly toggle: number;
}

/** Available non-loop pairs per class, cheapest first (fixed pairs cost 0), ties by class. */
function availableArcs(problem: DesignProblem): Arc[][] {
  const best = new Map<number, Arc>();
  const put = (a: number, b: number, cost: number, toggle: number): void => {
    for (const [x, y] of [
      [a, b],
      [b, a],
    ] as const) {
      const key = x * problem.n + y;
      const prev = best.get(key);
      if (!prev || cost < prev.cost) best.set(key, { to: y, cost, toggle });
    }
  };
  for (const [a, b] of problem.fixed) if (a !== b) put(a, b, 0, -1);
  problem.toggles.forEach((t, j) => {
    if (t.a === t.b) return;
    put(t.a, t.b, t.price, j);
  });
  const arcs: Arc[][] = Array.from({ length: problem.n }, () => []);
  for (const [key, arc] of best) arcs[Math.floor(key / problem.n)]!.push(arc);
  for (const list of arcs) list.sort((x, y) => x.cost - y.cost || x.to - y.to);
  return arcs;
}

export function longChainBaseline(problem: DesignProblem): Baseline {
  const n = problem.n;
  const arcs = availableArcs(problem);
  const onPath = new Uint8Array(n);
  const path: number[] = [];
  const used: number[] = [];
  let steps = 0;
  let bestCycle: { toggles: number[]; cost: number } | undefined;
  let bestPath: { toggles: number[]; cost: number; length: number } = { toggles: [], cost: 0, length: Math.min(n, 1) };
  let cost = 0;
  let start = 0;
  const dfs = (v: number, closeCycle: boolean): void => {
    if (steps++ > CHAIN_SEARCH_STEPS) return;
    if (path.length > bestPath.length || (path.length === bestPath.length && cost < bestPath.cost)) {
      bestPath = { toggles: [...used], cost, length: path.length };
    }
    if (closeCycle && path.length === n && n >= 3) {
      const close = arcs[v]!.find((a) => a.to === start);
      if (close && (!bestCycle || cost + close.cost < bestCycle.cost)) {
        bestCycle = { toggles: close.toggle >= 0 ? [...used, close.toggle] : [...used], cost: cost + close.cost };
      }
      return;
    }
    for (const a of arcs[v]!) {
      if (onPath[a.to]) continue;
      if (bestCycle && cost + a.cost >= bestCycle.cost) continue;
      onPath[a.to] = 1;
      path.push(a.to);
      if (a.toggle >= 0) used.push(a.toggle);
      cost += a.cost;
      dfs(a.to, closeCycle);
      cost -= a.cost;
      if (a.toggle >= 0) used.pop();
      path.pop();
      onPath[a.to] = 0;
      if (steps > CHAIN_SEARCH_STEPS) return;
    }
  };
  const from = (s: number, closeCycle: boolean): void => {
    start = s;
    onPath[s] = 1;
    path.push(s);
    dfs(s, closeCycle);
    path.pop();
    onPath[s] = 0;
  };
  // a cycle through every class passes through class 0; without one, paths from every class
  if (n >= 2) from(0, true);
  if (!bestCycle) for (let s = 1; s < n && steps <= CHAIN_SEARCH_STEPS && bestPath.length < n; s++) from(s, false);
  const chosen = bestCycle ? bestCycle.toggles : bestPath.toggles;
  const design = new Uint8Array(problem.toggles.length);
  const deg = degrees(problem, design);
  let skipped = 0;
  for (const j of [...chosen].sort((x, y) => x - y)) if (!tryAdd(problem, design, deg, j)) skipped++;
  const added = chosen.filter((j) => problem.toggles[j]!.kind === 'candidate' && design[j]).length;
  const dropped = problem.toggles.filter((t, j) => t.kind === 'removable' && !design[j]).length;
  const shape = bestCycle ? `one cycle through all ${n} classes` : `one path through ${bestPath.length} of ${n} classes (no cycle through all)`;
  return {
    name: 'long chain',
    design,
    note: `${shape}: ${added} candidate${added === 1 ? '' : 's'} added, ${dropped} removable dropped${skipped ? `, ${skipped} skipped (maxCompatibilities)` : ''}`,
  };
}

export function twoPerClassBaseline(problem: DesignProblem): Baseline {
  const n = problem.n;
  const design = new Uint8Array(problem.toggles.length);
  const deg = degrees(problem, design);
  const order = Array.from({ length: n }, (_, k) => k).sort((x, y) => problem.rates[y]! - problem.rates[x]! || x - y);
  for (const k of order) {
    while (deg[k]! < 2) {
      let pick = -1;
      problem.toggles.forEach((t, j) => {
        if (design[j] || (t.a !== k && t.b !== k)) return;
        const other = t.a === k ? t.b : t.a;
        if (deg[t.a]! + 1 > problem.maxDegree[t.a]! || (t.b !== t.a && deg[t.b]! + 1 > problem.maxDegree[t.b]!)) return;
        if (pick < 0) {
          pick = j;
          return;
        }
        const p = problem.toggles[pick]!;
        const pOther = p.a === k ? p.b : p.a;
        const better = t.price < p.price || (t.price === p.price && (deg[other]! < deg[pOther]! || (deg[other] === deg[pOther] && other < pOther)));
        if (better) pick = j;
      });
      if (pick < 0) break;
      tryAdd(problem, design, deg, pick);
    }
  }
  const added = problem.toggles.filter((t, j) => t.kind === 'candidate' && design[j]).length;
  const dropped = problem.toggles.filter((t, j) => t.kind === 'removable' && !design[j]).length;
  return {
    name: 'two per class',
    design,
    note: `two compatibilities per class where possible: ${added} candidate${added === 1 ? '' : 's'} added, ${dropped} removable dropped`,
  };
}

/** The four baselines, in display order. */
export function baselines(problem: DesignProblem): Baseline[] {
  return [todayBaseline(problem), allCandidatesBaseline(problem), longChainBaseline(problem), twoPerClassBaseline(problem)];
}
