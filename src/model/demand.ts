/**
 * Demand variants: named rate sets listed beside the classes of a scenario, such as
 *
 *   "demand": { "peak": { "airport": 26, "tech-park": 28 }, "quiet": { "airport": 9 } }
 *
 * Each variant overrides the rates of the classes it names; the others keep the rate given in
 * `classes`. The scenario validator keeps the field in `scenario.extra`; this file validates it and
 * reports every problem with its JSON path (InvalidScenarioError), as the validator does.
 */
import { InvalidScenarioError, type ScenarioProblem } from '../errors.js';
import type { Scenario } from './scenario.js';

/** One named rate set, as a full rate vector in the order of `scenario.classes`. */
export interface DemandVariant {
  readonly name: string;
  readonly rates: Float64Array;
  /** Ids of the classes whose rate the variant sets, in the order written. */
  readonly changed: readonly string[];
}

/** The name of the rates written in `classes`; reserved, so a variant cannot take it. */
export const TODAY = 'today';

const isObj = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
const show = (v: unknown): string => (v === undefined ? 'missing' : JSON.stringify(v) ?? String(v));

/** `demand.peak` for a plain name, `demand["late night"]` otherwise. */
function member(base: string, key: string): string {
  return /^[A-Za-z_$][\w$]*$/.test(key) ? `${base}.${key}` : `${base}[${JSON.stringify(key)}]`;
}

/**
 * The demand variants of a scenario (not including today's rates), in the order written.
 * Returns [] when the scenario has no `demand` field; throws InvalidScenarioError listing every
 * problem otherwise.
 */
export function demandVariants(scenario: Scenario, source?: string): DemandVariant[] {
  const doc = scenario.extra['demand'];
  if (doc === undefined) return [];
  const problems: ScenarioProblem[] = [];
  const bad = (path: string, message: string): void => void problems.push({ path, message });
  if (!isObj(doc)) {
    bad('demand', `must be an object of named rate sets like {"peak": {"${scenario.classes[0]?.id ?? 'a'}": 12}}, found ${show(doc)}`);
    throw new InvalidScenarioError(problems, source);
  }
  const index = new Map(scenario.classes.map((c, k) => [c.id, k] as const));
  const known = scenario.classes.map((c) => c.id);
  const hint = ` (known: ${known.slice(0, 8).join(', ')}${known.length > 8 ? ', …' : ''})`;
  const out: DemandVariant[] = [];
  const names = Object.keys(doc);
  if (names.length === 0) bad('demand', 'empty: list at least one named rate set, or leave the field out');
  for (const name of names) {
    const path = member('demand', name);
    const set = doc[name];
    if (name.trim() === '') {
      bad(path, 'a demand variant needs a non-empty name');
      continue;
    }
    if (name === TODAY) {
      bad(path, `the name "${TODAY}" is reserved for the rates written in classes; pick another name`);
      continue;
    }
    if (!isObj(set)) {
      bad(path, `must be an object mapping class ids to rates, found ${show(set)}`);
      continue;
    }
    const rates = Float64Array.from(scenario.classes, (c) => c.rate);
    const changed: string[] = [];
    let ok = true;
    const ids = Object.keys(set);
    if (ids.length === 0) {
      bad(path, 'empty: name at least one class and its rate');
      ok = false;
    }
    for (const id of ids) {
      const p = member(path, id);
      const k = index.get(id);
      const rate = set[id];
      if (k === undefined) {
        bad(p, `unknown class "${id}"${known.length > 0 ? hint : ''}`);
        ok = false;
        continue;
      }
      if (typeof rate !== 'number' || !Number.isFinite(rate)) {
        bad(p, `rate must be a finite number, found ${show(rate)}`);
        ok = false;
      } else if (rate <= 0) {
        bad(p, `rate must be > 0, found ${rate}`);
        ok = false;
      } else {
        rates[k] = rate;
        changed.push(id);
      }
    }
    if (ok) out.push({ name, rates, changed });
  }
  if (problems.length > 0) throw new InvalidScenarioError(problems, source);
  return out;
}
