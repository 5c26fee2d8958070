/**
 * The design space of the recommender, compiled once from a scenario and its recommender fields.
 *
 * Compatibilities are split into:
 * - fixed pairs, present in every design (not removable, or protected by `mustKeep`);
 * - toggles, which a design switches on or off: removable compatibilities (on today, dropping one
 *   saves its `saving`) and candidates (off today, adding one costs its `cost`);
 * - forced removals: removable compatibilities listed in `forbidden`, absent from every design (their
 *   savings are always counted). Forbidden candidates are simply not toggles.
 *
 * A design is a Uint8Array over the toggles (1 = the compatibility is present). Its cost is
 * Σ costs of added candidates − Σ savings of dropped compatibilities, rounded to 1e-9 so that equal
 * sums compare equal.
 */
import { pairKey, type Scenario } from '../../model/scenario.js';
import type { DesignFields } from '../../model/design-fields.js';
import { pairValues } from '../../model/values.js';

export type ToggleKind = 'candidate' | 'removable';

export interface Toggle {
  /** Class indices, a <= b (equal for a self-loop). */
  readonly a: number;
  readonly b: number;
  readonly kind: ToggleKind;
  /** Cost of adding (candidate) or saving of dropping (removable), >= 0. */
  readonly price: number;
  /** Index in scenario.candidates or scenario.compatibilities. */
  readonly source: number;
  /** Value per match along the pair (0 when the file gives none). */
  readonly value: number;
}

export interface ForcedRemoval {
  readonly a: number;
  readonly b: number;
  readonly saving: number;
  readonly source: number;
}

export interface DesignProblem {
  readonly n: number;
  readonly ids: readonly string[];
  readonly rates: Float64Array;
  readonly timeUnit: string;
  /** Pairs present in every design. */
  readonly fixed: ReadonlyArray<readonly [number, number]>;
  readonly toggles: readonly Toggle[];
  readonly forcedOut: readonly ForcedRemoval[];
  /** Cost of every design's forced removals (−Σ their savings). */
  readonly costOffset: number;
  /** Most a design may cost (Infinity when unlimited). */
  readonly budget: number;
  /** Per class: most compatibilities allowed (Infinity when unlimited). */
  readonly maxDegree: Float64Array;
  /** Per class: compatibilities of the fixed pairs (a self-loop counts once). */
  readonly fixedDegree: Int32Array;
  /** Per class: mean wait target (Infinity when none). */
  readonly waitTarget: Float64Array;
  /** Per class: weight of the weighted objective. */
  readonly weight: Float64Array;
  /**
   * Per class: most share of its arrivals that may abandon (NaN when none). Judged on simulated
   * figures with patience only (the exact figures have no abandonment); absent: no limit.
   */
  readonly maxAbandonment?: Float64Array;
  /** Today's design: removable compatibilities on, candidates off. */
  readonly today: Uint8Array;
  /** Value per match of each fixed pair (0 when the file gives none; src/model/values.ts). */
  readonly fixedValue: Float64Array;
  /** Cost per waiting item per time unit (0 when the file gives none). */
  readonly waitingCost: number;
  /** Some pair has a value or the file gives waitingCost: net value can be computed. */
  readonly hasValues: boolean;
}

/** Rounds a cost to 1e-9 so that equal sums of decimal prices compare equal (and −0 becomes 0). */
export function roundCost(x: number): number {
  const r = Math.round(x * 1e9) / 1e9;
  return r === 0 ? 0 : r;
}

/** Builds the design space; `budget` overrides the scenario's (both absent: unlimited). */
export function designProblem(scenario: Scenario, fields: DesignFields, budget?: number): DesignProblem {
  const ids = scenario.classes.map((c) => c.id);
  const n = ids.length;
  const index = new Map(ids.map((id, k) => [id, k] as const));
  const keep = new Set(fields.mustKeep.map((p) => pairKey(p[0], p[1])));
  const forbid = new Set(fields.forbidden.map((p) => pairKey(p[0], p[1])));
  const fixed: Array<readonly [number, number]> = [];
  const toggles: Toggle[] = [];
  const forcedOut: ForcedRemoval[] = [];
  const fixedDegree = new Int32Array(n);
  const fixedValue: number[] = [];
  const values = pairValues(scenario);
  const valueOf = (pair: readonly [string, string]): number => values.byKey.get(pairKey(pair[0], pair[1])) ?? 0;
  const ends = (pair: readonly [string, string]): [number, number] => {
    const x = index.get(pair[0])!;
    const y = index.get(pair[1])!;
    return [Math.min(x, y), Math.max(x, y)];
  };
  scenario.compatibilities.forEach((c, i) => {
    const [a, b] = ends(c.pair);
    const key = pairKey(c.pair[0], c.pair[1]);
    if (!c.removable || keep.has(key)) {
      fixed.push([a, b]);
      fixedValue.push(valueOf(c.pair));
      fixedDegree[a]++;
      if (b !== a) fixedDegree[b]++;
    } else if (forbid.has(key)) forcedOut.push({ a, b, saving: c.saving, source: i });
    else toggles.push({ a, b, kind: 'removable', price: c.saving, source: i, value: valueOf(c.pair) });
  });
  scenario.candidates.forEach((c, i) => {
    if (forbid.has(pairKey(c.pair[0], c.pair[1]))) return;
    const [a, b] = ends(c.pair);
    toggles.push({ a, b, kind: 'candidate', price: c.cost, source: i, value: valueOf(c.pair) });
  });
  let offset = 0;
  for (const f of forcedOut) offset -= f.saving;
  const today = Uint8Array.from(toggles, (t) => (t.kind === 'removable' ? 1 : 0));
  return {
    n,
    ids,
    rates: Float64Array.from(scenario.classes, (c) => c.rate),
    timeUnit: scenario.timeUnit,
    fixed,
    toggles,
    forcedOut,
    costOffset: roundCost(offset),
    budget: budget ?? scenario.budget ?? Infinity,
    maxDegree: Float64Array.from(fields.maxCompatibilities),
    fixedDegree,
    waitTarget: Float64Array.from(fields.waitTarget),
    weight: Float64Array.from(fields.weight),
    maxAbandonment: Float64Array.from(fields.maxAbandonment),
    today,
    fixedValue: Float64Array.from(fixedValue),
    waitingCost: values.waitingCost,
    hasValues: values.any,
  };
}

/** Value per match of each pair of designPairs(p, d), in that order. */
export function designPairValues(p: DesignProblem, d: ArrayLike<number>): Float64Array {
  const out: number[] = Array.from(p.fixedValue);
  for (let j = 0; j < p.toggles.length; j++) if (d[j]) out.push(p.toggles[j]!.value);
  return Float64Array.from(out);
}

/** Cost of a design: Σ added candidates' costs − Σ dropped compatibilities' savings. */
export function designCost(p: DesignProblem, d: ArrayLike<number>): number {
  let s = p.costOffset;
  for (let j = 0; j < p.toggles.length; j++) {
    const t = p.toggles[j]!;
    if (t.kind === 'candidate') {
      if (d[j]) s += t.price;
    } else if (!d[j]) s -= t.price;
  }
  return roundCost(s);
}

/** Canonical key of a design: one character per toggle. */
export function designKey(d: ArrayLike<number>): string {
  let s = '';
  for (let j = 0; j < d.length; j++) s += d[j] ? '1' : '0';
  return s;
}

/** The design of a key. */
export function designOfKey(key: string): Uint8Array {
  return Uint8Array.from(key, (c) => (c === '1' ? 1 : 0));
}

/** Number of toggles that differ from today's design. */
export function changeCount(p: DesignProblem, d: ArrayLike<number>): number {
  let c = 0;
  for (let j = 0; j < p.toggles.length; j++) if ((d[j] ? 1 : 0) !== p.today[j]) c++;
  return c;
}

/** The design's pairs as class indices: fixed pairs first, then the toggles that are on, in order. */
export function designPairs(p: DesignProblem, d: ArrayLike<number>): Array<[number, number]> {
  const out: Array<[number, number]> = p.fixed.map(([a, b]) => [a, b]);
  for (let j = 0; j < p.toggles.length; j++) if (d[j]) out.push([p.toggles[j]!.a, p.toggles[j]!.b]);
  return out;
}

/** Compatibilities per class in a design (a self-loop counts once). */
export function degrees(p: DesignProblem, d: ArrayLike<number>): Int32Array {
  const deg = Int32Array.from(p.fixedDegree);
  for (let j = 0; j < p.toggles.length; j++) {
    if (!d[j]) continue;
    const t = p.toggles[j]!;
    deg[t.a]++;
    if (t.b !== t.a) deg[t.b]++;
  }
  return deg;
}

/** True when every class stays within its maxCompatibilities. */
export function degreesAllowed(p: DesignProblem, d: ArrayLike<number>): boolean {
  const deg = degrees(p, d);
  for (let k = 0; k < p.n; k++) if (deg[k]! > p.maxDegree[k]!) return false;
  return true;
}

/** True when the design costs at most the budget. */
export function withinBudget(p: DesignProblem, d: ArrayLike<number>): boolean {
  return designCost(p, d) <= p.budget + 1e-9;
}

/** Budget and maxCompatibilities: the constraints known before any evaluation. */
export function admissibleBeforeEvaluation(p: DesignProblem, d: ArrayLike<number>): boolean {
  return withinBudget(p, d) && degreesAllowed(p, d);
}

/** What a design changes relative to today: toggle indices added (candidates) and dropped (removables). */
export function designChanges(p: DesignProblem, d: ArrayLike<number>): { added: number[]; removed: number[] } {
  const added: number[] = [];
  const removed: number[] = [];
  for (let j = 0; j < p.toggles.length; j++) {
    const t = p.toggles[j]!;
    if (t.kind === 'candidate' && d[j]) added.push(j);
    if (t.kind === 'removable' && !d[j]) removed.push(j);
  }
  return { added, removed };
}
