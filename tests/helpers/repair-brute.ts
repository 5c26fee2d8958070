import { compileGraph, type CompiledModel } from '../../src/model/compile.js';
import type { DesignProblem } from '../../src/design/space/problem.js';
import { bruteStability } from './brute-stability.js';

/**
 * Repairs by brute force, straight from the definitions of the task, written without any code of
 * src/design/:
 *   - today's design: the fixed pairs and every removable compatibility (a repair only adds);
 *   - a candidate may be added only if neither endpoint has reached its maxCompatibilities today, and
 *     a set of candidates only if no class then exceeds its maxCompatibilities;
 *   - a set repairs the design when today's design plus the set is stable (brute force over
 *     independent sets, "Stability of the stochastic matching model", J. Appl. Probab. 2016), and is
 *     minimal when no member can be dropped with the rest still repairing;
 *   - order: cost, then fewer pairs, then smaller sum of toggle positions, then lexicographic.
 * Keep the number of candidates small (2^k subsets).
 */
export interface BruteRepair {
  /** Toggle indices of the problem, ascending. */
  readonly added: number[];
  readonly cost: number;
}

export function todayDegree(p: DesignProblem): number[] {
  const deg = new Array<number>(p.n).fill(0);
  const count = (a: number, b: number): void => {
    deg[a]++;
    if (b !== a) deg[b]++;
  };
  for (const [a, b] of p.fixed) count(a, b);
  for (const t of p.toggles) if (t.kind === 'removable') count(t.a, t.b);
  return deg;
}

/** Candidates whose endpoints both have room today (toggle indices). */
export function individuallyAllowed(p: DesignProblem): number[] {
  const deg = todayDegree(p);
  const out: number[] = [];
  p.toggles.forEach((t, j) => {
    if (t.kind === 'candidate' && deg[t.a]! < p.maxDegree[t.a]! && deg[t.b]! < p.maxDegree[t.b]!) out.push(j);
  });
  return out;
}

/** Today's design plus the toggles `added`, compiled. */
export function modelWith(p: DesignProblem, added: readonly number[]): CompiledModel {
  const pairs: Array<[number, number]> = p.fixed.map(([a, b]) => [a, b]);
  p.toggles.forEach((t, j) => {
    if (t.kind === 'removable' || added.includes(j)) pairs.push([t.a, t.b]);
  });
  return compileGraph(p.ids, p.rates, pairs);
}

function withinLimits(p: DesignProblem, added: readonly number[]): boolean {
  const deg = todayDegree(p);
  const gained = new Array<number>(p.n).fill(0);
  for (const j of added) {
    const t = p.toggles[j]!;
    gained[t.a]++;
    if (t.b !== t.a) gained[t.b]++;
  }
  return gained.every((g, k) => g === 0 || deg[k]! + g <= p.maxDegree[k]!);
}

export function compareBrute(x: BruteRepair, y: BruteRepair): number {
  if (Math.abs(x.cost - y.cost) > 1e-9) return x.cost - y.cost;
  if (x.added.length !== y.added.length) return x.added.length - y.added.length;
  const sum = (s: number[]): number => s.reduce((a, b) => a + b, 0);
  if (sum(x.added) !== sum(y.added)) return sum(x.added) - sum(y.added);
  for (let i = 0; i < x.added.length; i++) if (x.added[i] !== y.added[i]) return x.added[i]! - y.added[i]!;
  return 0;
}

/**
 * Every minimal repair among the subsets of `pool` (toggle indices), sorted; `limits` false lifts
 * maxCompatibilities.
 */
export function bruteRepairs(p: DesignProblem, pool: readonly number[], limits = true): BruteRepair[] {
  const k = pool.length;
  if (k > 16) throw new RangeError('brute force is for few candidates');
  const stable = new Uint8Array(1 << k);
  for (let mask = 0; mask < 1 << k; mask++) {
    const added = pool.filter((_, i) => (mask >>> i) & 1);
    stable[mask] = bruteStability(modelWith(p, added)).stable ? 1 : 0;
  }
  const out: BruteRepair[] = [];
  for (let mask = 0; mask < 1 << k; mask++) {
    if (!stable[mask]) continue;
    let minimal = true;
    for (let i = 0; i < k; i++) if ((mask >>> i) & 1 && stable[mask & ~(1 << i)]) minimal = false;
    if (!minimal) continue;
    const added = pool.filter((_, i) => (mask >>> i) & 1);
    if (limits && !withinLimits(p, added)) continue;
    out.push({ added, cost: added.reduce((s, j) => s + p.toggles[j]!.price, 0) });
  }
  return out.sort(compareBrute);
}
