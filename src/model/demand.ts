/**
 * Demand variants: named rate sets listed beside the classes of a scenario, such as
 *
 *   "demand": { "peak": { "airport": 26, "tech-park": 28 }, "summer": { "icu-night": 0 } }
 *
 * Each variant overrides the rates of the classes it names; the others keep the rate given in
 * `classes`. A rate may be 0: no items of that class arrive in the variant (it never waits, and
 * its figures are 0). The file is validated up front (validate.ts, cross-checks.ts), so this only
 * turns the validated variants into rate vectors.
 */
import type { Scenario } from './scenario.js';
import { TODAY } from './cross-checks.js';

export { TODAY };

/** One named rate set, as a full rate vector in the order of `scenario.classes`. */
export interface DemandVariant {
  readonly name: string;
  readonly rates: Float64Array;
  /** Ids of the classes whose rate the variant sets, in the order written. */
  readonly changed: readonly string[];
}

/**
 * The demand variants of a validated scenario (not including today's rates), in the order written;
 * [] when the scenario has none. `source` is kept for callers written before validation moved up
 * front; a validated scenario never throws here.
 */
export function demandVariants(scenario: Scenario, _source?: string): DemandVariant[] {
  if (scenario.demand.length === 0) return [];
  const index = new Map(scenario.classes.map((c, k) => [c.id, k] as const));
  return scenario.demand.map((v) => {
    const rates = Float64Array.from(scenario.classes, (c) => c.rate);
    const changed: string[] = [];
    for (const id of Object.keys(v.rates)) {
      const k = index.get(id);
      if (k === undefined) throw new RangeError(`demand variant ${v.name} names an unknown class: the scenario was not validated`);
      rates[k] = v.rates[id]!;
      changed.push(id);
    }
    return { name: v.name, rates, changed };
  });
}
