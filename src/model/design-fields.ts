/**
 * The scenario fields read by the design recommender (docs/scenario-format.md, "Recommender
 * fields"), validated separately from the core scenario so that other commands ignore them:
 *
 * - per class: `maxCompatibilities` (integer ≥ 0: at most this many compatibilities touch the class,
 *   a self-loop counting once), `waitTarget` (mean wait must stay ≤ this, time units, > 0) and
 *   `weight` (≥ 0, default 1, used by the weighted objective);
 * - top level: `mustKeep` (compatibilities no design may drop) and `forbidden` (pairs no design may
 *   contain: a candidate is never added, a removable compatibility is always dropped); each entry a
 *   pair `["a", "b"]` or `{"pair": ["a", "b"], "reason": "…"}` (the reason is shown beside the rule).
 *
 * Every problem is reported at once, with its JSON path, as InvalidScenarioError.
 */
import { InvalidScenarioError, type ScenarioProblem } from '../errors.js';
import { pairKey, type Scenario } from './scenario.js';

export interface DesignFields {
  /** Per class (scenario order): most compatibilities allowed, Infinity when unlimited. */
  readonly maxCompatibilities: Float64Array;
  /** Per class: mean wait target, Infinity when none. */
  readonly waitTarget: Float64Array;
  /** Per class: weight of the weighted objective (default 1). */
  readonly weight: Float64Array;
  /** Pairs (class ids) no design may drop, as listed. */
  readonly mustKeep: ReadonlyArray<readonly [string, string]>;
  /** Pairs (class ids) no design may contain, as listed. */
  readonly forbidden: ReadonlyArray<readonly [string, string]>;
}

const show = (v: unknown): string => (v === undefined ? 'missing' : JSON.stringify(v) ?? String(v));

/** Reads and checks the recommender fields of a validated scenario; throws InvalidScenarioError. */
export function readDesignFields(scenario: Scenario, source?: string): DesignFields {
  const problems: ScenarioProblem[] = [];
  const bad = (path: string, message: string): void => {
    problems.push({ path, message });
  };
  const n = scenario.classes.length;
  const maxCompatibilities = new Float64Array(n).fill(Infinity);
  const waitTarget = new Float64Array(n).fill(Infinity);
  const weight = new Float64Array(n).fill(1);
  const ids = new Set(scenario.classes.map((c) => c.id));

  // compatibilities that can never go (not removable) per class, to check maxCompatibilities
  const compat = new Map<string, { index: number; removable: boolean }>();
  scenario.compatibilities.forEach((c, i) => compat.set(pairKey(c.pair[0], c.pair[1]), { index: i, removable: c.removable }));
  const candidates = new Map<string, number>();
  scenario.candidates.forEach((c, i) => candidates.set(pairKey(c.pair[0], c.pair[1]), i));

  scenario.classes.forEach((c, k) => {
    const p = `classes[${k}]`;
    const mc = c.maxCompatibilities;
    if (mc !== undefined) {
      if (typeof mc !== 'number' || !Number.isInteger(mc) || mc < 0) {
        bad(`${p}.maxCompatibilities`, `must be a whole number >= 0, found ${show(mc)}`);
      } else maxCompatibilities[k] = mc;
    }
    const wt = c.waitTarget;
    if (wt !== undefined) {
      if (typeof wt !== 'number' || !Number.isFinite(wt) || wt <= 0) {
        bad(`${p}.waitTarget`, `mean wait target must be a finite number > 0 (in ${scenario.timeUnit}s), found ${show(wt)}`);
      } else waitTarget[k] = wt;
    }
    const w = c.weight;
    if (w !== undefined) {
      if (typeof w !== 'number' || !Number.isFinite(w) || w < 0) bad(`${p}.weight`, `must be a finite number >= 0, found ${show(w)}`);
      else weight[k] = w;
    }
  });

  const readPairs = (field: 'mustKeep' | 'forbidden'): Array<readonly [string, string]> => {
    const v = scenario.extra[field];
    const out: Array<readonly [string, string]> = [];
    if (v === undefined) return out;
    if (!Array.isArray(v)) {
      bad(field, `must be an array of pairs like [["north", "centre"]], found ${show(v)}`);
      return out;
    }
    const seen = new Map<string, number>();
    v.forEach((entry: unknown, i: number) => {
      const p = `${field}[${i}]`;
      // an entry is a pair, or {pair, reason} with the rule's reason in words
      const isObject = typeof entry === 'object' && entry !== null && !Array.isArray(entry);
      const pair = isObject ? (entry as { pair?: unknown }).pair : entry;
      if (isObject) {
        const reason = (entry as { reason?: unknown }).reason;
        const extraKeys = Object.keys(entry as object).filter((k) => k !== 'pair' && k !== 'reason');
        if (reason !== undefined && typeof reason !== 'string') bad(`${p}.reason`, `must be text, found ${show(reason)}`);
        if (extraKeys.length > 0) bad(p, `unknown field${extraKeys.length === 1 ? '' : 's'} ${extraKeys.map((k) => `"${k}"`).join(', ')} (an entry is a pair, or {"pair": [a, b], "reason": "…"})`);
      }
      if (!Array.isArray(pair) || pair.length !== 2 || typeof pair[0] !== 'string' || typeof pair[1] !== 'string') {
        bad(p, `a pair must be two class ids like ["north", "centre"], found ${show(pair)}`);
        return;
      }
      const unknown = [...new Set(pair as string[])].filter((id) => !ids.has(id));
      if (unknown.length > 0) {
        bad(p, unknown.map((id) => `unknown class "${id}"`).join(', '));
        return;
      }
      const key = pairKey(pair[0], pair[1]);
      const prev = seen.get(key);
      if (prev !== undefined) {
        bad(p, `duplicate pair ${show(pair)}: already given at ${field}[${prev}]`);
        return;
      }
      seen.set(key, i);
      const c = compat.get(key);
      if (field === 'mustKeep' && c === undefined) {
        bad(
          p,
          candidates.has(key)
            ? `${show(pair)} is a candidate (candidates[${candidates.get(key)}]), not a compatibility: mustKeep can only protect existing compatibilities`
            : `${show(pair)} is not a compatibility of the scenario, so there is nothing to keep`,
        );
        return;
      }
      if (field === 'forbidden') {
        if (c !== undefined && !c.removable) {
          bad(p, `${show(pair)} is a compatibility that is not removable (compatibilities[${c.index}]): mark it "removable": true or drop it from forbidden`);
          return;
        }
        if (c === undefined && !candidates.has(key)) {
          bad(p, `${show(pair)} is neither a compatibility nor a candidate, so forbidding it has no effect`);
          return;
        }
      }
      out.push([pair[0], pair[1]]);
    });
    return out;
  };
  const mustKeep = readPairs('mustKeep');
  const forbidden = readPairs('forbidden');
  const kept = new Map(mustKeep.map((p, i) => [pairKey(p[0], p[1]), i] as const));
  forbidden.forEach((p, i) => {
    const j = kept.get(pairKey(p[0], p[1]));
    if (j !== undefined) bad(`forbidden[${i}]`, `${show(p)} is also in mustKeep[${j}]: a pair cannot be both kept and forbidden`);
  });

  // compatibilities that no design can drop must fit under maxCompatibilities
  if (problems.length === 0) {
    const index = new Map(scenario.classes.map((c, k) => [c.id, k] as const));
    const fixed = new Int32Array(n);
    for (const c of scenario.compatibilities) {
      const key = pairKey(c.pair[0], c.pair[1]);
      if (c.removable && !kept.has(key)) continue;
      const a = index.get(c.pair[0])!;
      const b = index.get(c.pair[1])!;
      fixed[a]++;
      if (b !== a) fixed[b]++;
    }
    scenario.classes.forEach((c, k) => {
      if (fixed[k]! > maxCompatibilities[k]!) {
        bad(
          `classes[${k}].maxCompatibilities`,
          `${maxCompatibilities[k]} is below the ${fixed[k]} compatibilities of "${c.id}" that cannot be dropped (not removable or in mustKeep)`,
        );
      }
    });
  }

  if (problems.length > 0) throw new InvalidScenarioError(problems, source);
  return { maxCompatibilities, waitTarget, weight, mustKeep, forbidden };
}
