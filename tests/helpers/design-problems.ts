import type { DesignProblem, Toggle } from '../../src/design/space/problem.js';
import { Rng } from './random.js';

/** Options of a random design problem (all class indices, no scenario file). */
export interface RandomProblemOptions {
  readonly minClasses: number;
  readonly maxClasses: number;
  /** Removable compatibilities + candidates, exactly. */
  readonly toggles: number;
  /** Share of the toggles that are removable compatibilities (the rest are candidates). */
  readonly removableShare: number;
  /** Budget as a share of the sum of candidate costs. */
  readonly budgetShare: number;
  /** Probability that a class has a self-loop among the fixed pairs. */
  readonly loopProb: number;
}

const pairId = (a: number, b: number, n: number): number => Math.min(a, b) * n + Math.max(a, b);

/**
 * A random design problem: a random spanning tree plus self-loops as fixed pairs, then distinct
 * random pairs (self-pairs included) as removable compatibilities and candidates with integer prices.
 * Rates are uniform in [0.5, 2]. Built directly as a DesignProblem (no maxCompatibilities, no
 * wait targets, unit weights) unless the caller changes it.
 */
export function randomProblem(rng: Rng, o: RandomProblemOptions): DesignProblem {
  const n = rng.int(o.minClasses, o.maxClasses);
  const used = new Set<number>();
  const fixed: Array<[number, number]> = [];
  for (let v = 1; v < n; v++) {
    const u = rng.int(0, v - 1);
    fixed.push([u, v]);
    used.add(pairId(u, v, n));
  }
  for (let k = 0; k < n; k++) {
    if (rng.chance(o.loopProb)) {
      fixed.push([k, k]);
      used.add(pairId(k, k, n));
    }
  }
  const toggles: Toggle[] = [];
  const removables = Math.round(o.toggles * o.removableShare);
  let guard = 0;
  while (toggles.length < o.toggles && guard++ < 10_000) {
    const a = rng.int(0, n - 1);
    const b = rng.chance(0.15) ? a : rng.int(0, n - 1);
    const id = pairId(a, b, n);
    if (used.has(id)) continue;
    used.add(id);
    const kind = toggles.length < removables ? 'removable' : 'candidate';
    toggles.push({ a: Math.min(a, b), b: Math.max(a, b), kind, price: rng.int(1, 20), source: toggles.length, value: 0 });
  }
  if (toggles.length < o.toggles) throw new Error('not enough free pairs for the toggles');
  const fixedDegree = new Int32Array(n);
  for (const [a, b] of fixed) {
    fixedDegree[a]++;
    if (b !== a) fixedDegree[b]++;
  }
  let candidateTotal = 0;
  for (const t of toggles) if (t.kind === 'candidate') candidateTotal += t.price;
  return {
    n,
    ids: Array.from({ length: n }, (_, k) => `c${k}`),
    rates: Float64Array.from({ length: n }, () => rng.uniform(0.5, 2)),
    timeUnit: 'minute',
    fixed,
    toggles,
    forcedOut: [],
    costOffset: 0,
    budget: Math.round(candidateTotal * o.budgetShare),
    maxDegree: new Float64Array(n).fill(Infinity),
    fixedDegree,
    waitTarget: new Float64Array(n).fill(Infinity),
    weight: new Float64Array(n).fill(1),
    today: Uint8Array.from(toggles, (t) => (t.kind === 'removable' ? 1 : 0)),
    fixedValue: new Float64Array(fixed.length),
    waitingCost: 0,
    hasValues: false,
  };
}
