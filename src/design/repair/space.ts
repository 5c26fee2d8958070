/**
 * The space a repair searches: today's design (fixed pairs and every removable compatibility: a
 * repair only adds) becomes the fixed part, the allowed candidates become the toggles. A candidate is
 * allowed when the rules do not forbid it (problem.ts already leaves forbidden ones out) and neither
 * endpoint is at its maxCompatibilities today; together the added candidates must keep every class
 * within its limit (the MILP's degree rows). A class already over its limit today takes no addition.
 */
import type { DesignProblem, Toggle } from '../space/problem.js';

/** A candidate kept out because an endpoint is at its maxCompatibilities today. */
export interface LimitBlock {
  /** Toggle index in the original problem. */
  readonly toggle: number;
  /** The endpoints at their limit. */
  readonly full: readonly number[];
}

export interface RepairSpace {
  /**
   * A design problem whose fixed pairs are today's design (so its fixedDegree is today's degree) and
   * whose toggles are the allowed candidates (in problem order); cost offset 0 and no budget, so a
   * design's cost is the repair's.
   */
  readonly sub: DesignProblem;
  /** Original toggle index of each toggle of `sub` (ascending). */
  readonly toggleOf: Int32Array;
  readonly limitBlocked: readonly LimitBlock[];
}

/** Today's pairs: the fixed pairs, then the removable compatibilities (on today). */
function todayPairs(problem: DesignProblem): Array<readonly [number, number]> {
  const out: Array<readonly [number, number]> = [...problem.fixed];
  for (const t of problem.toggles) if (t.kind === 'removable') out.push([t.a, t.b]);
  return out;
}

function degreeOf(n: number, pairs: ReadonlyArray<readonly [number, number]>): Int32Array {
  const deg = new Int32Array(n);
  for (const [a, b] of pairs) {
    deg[a]++;
    if (b !== a) deg[b]++;
  }
  return deg;
}

/** The sub-problem over the given candidates (original toggle indices) with the given limits. */
function subProblem(problem: DesignProblem, fixed: ReadonlyArray<readonly [number, number]>, toggles: readonly number[], maxDegree: Float64Array): DesignProblem {
  const picked: Toggle[] = toggles.map((j) => problem.toggles[j]!);
  return {
    ...problem,
    fixed,
    toggles: picked,
    forcedOut: [],
    costOffset: 0,
    budget: Infinity,
    maxDegree,
    fixedDegree: degreeOf(problem.n, fixed),
    today: new Uint8Array(picked.length),
  };
}

/** The repair space of a problem (see the top of this file). */
export function repairSpace(problem: DesignProblem): RepairSpace {
  const fixed = todayPairs(problem);
  const todayDegree = degreeOf(problem.n, fixed);
  const allowed: number[] = [];
  const limitBlocked: LimitBlock[] = [];
  problem.toggles.forEach((t, j) => {
    if (t.kind !== 'candidate') return;
    const ends = t.a === t.b ? [t.a] : [t.a, t.b];
    const full = ends.filter((k) => todayDegree[k]! >= problem.maxDegree[k]!);
    if (full.length > 0) limitBlocked.push({ toggle: j, full });
    else allowed.push(j);
  });
  const maxDegree = Float64Array.from(problem.maxDegree, (m, k) => Math.max(m, todayDegree[k]!));
  return { sub: subProblem(problem, fixed, allowed, maxDegree), toggleOf: Int32Array.from(allowed), limitBlocked };
}

/** The same space with every candidate allowed and no limits (to show what the limits cost). */
export function unlimitedSpace(problem: DesignProblem): RepairSpace {
  const fixed = todayPairs(problem);
  const all: number[] = [];
  problem.toggles.forEach((t, j) => {
    if (t.kind === 'candidate') all.push(j);
  });
  const maxDegree = new Float64Array(problem.n).fill(Infinity);
  return { sub: subProblem(problem, fixed, all, maxDegree), toggleOf: Int32Array.from(all), limitBlocked: [] };
}
