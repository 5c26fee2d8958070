/**
 * Value per match (docs/scenario-format.md, "Value per match"): a compatibility or a candidate may
 * carry `value`, what one match along it is worth (revenue, fit; negative for a detour), and the
 * file may give `waitingCost`, the cost of one waiting item per time unit. A pair without a value
 * counts 0.
 *
 * The value rate of a design is Σ_pairs value · (matches per time unit along the pair), the waiting
 * cost rate is waitingCost · (mean total backlog), and the net value is their difference.
 */
import type { CompiledModel } from './compile.js';
import { pairKey, type Scenario } from './scenario.js';

export interface PairValues {
  /** Value per match by pairKey of the class ids (pairs the file gives a value only). */
  readonly byKey: ReadonlyMap<string, number>;
  /** Cost per waiting item per time unit (0 when the file gives none). */
  readonly waitingCost: number;
  /** The file gives `waitingCost`. */
  readonly hasWaitingCost: boolean;
  /** Some compatibility or candidate has a value, or the file gives waitingCost. */
  readonly any: boolean;
}

/** The values of a validated scenario's compatibilities and candidates, and its waiting cost. */
export function pairValues(scenario: Scenario): PairValues {
  const byKey = new Map<string, number>();
  for (const c of [...scenario.compatibilities, ...scenario.candidates]) {
    if (c.value !== undefined) byKey.set(pairKey(c.pair[0], c.pair[1]), c.value);
  }
  const hasWaitingCost = scenario.waitingCost !== undefined;
  return { byKey, waitingCost: scenario.waitingCost ?? 0, hasWaitingCost, any: byKey.size > 0 || hasWaitingCost };
}

/** Value per match of each edge of a model (0 for a pair without a value), and which edges have one. */
export function edgeValues(model: CompiledModel, values: PairValues): { value: Float64Array; given: Uint8Array } {
  const value = new Float64Array(model.m);
  const given = new Uint8Array(model.m);
  for (let e = 0; e < model.m; e++) {
    const v = values.byKey.get(pairKey(model.ids[model.edgeA[e]!]!, model.ids[model.edgeB[e]!]!));
    if (v !== undefined) {
      value[e] = v;
      given[e] = 1;
    }
  }
  return { value, given };
}

/** Σ_e value[e] · matchRates[e]: the value of the matches per time unit. */
export function valueRate(value: ArrayLike<number>, matchRates: ArrayLike<number>): number {
  let s = 0;
  for (let e = 0; e < value.length; e++) s += value[e]! * matchRates[e]!;
  return s;
}
