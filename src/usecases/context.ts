/**
 * What every use case starts from: a validated scenario compiled once, with the design and the
 * demand the command is asked about (today's by default; `--design` and `--demand` choose others).
 * Validation happened before (src/model/validate.ts); nothing here refuses a scenario.
 */
import { UsageError } from '../errors.js';
import { compileGraph, compileModel, type CompiledModel } from '../model/compile.js';
import { readDesignFields, type DesignFields } from '../model/design-fields.js';
import { demandVariants, type DemandVariant } from '../model/demand.js';
import { pairKey, type Scenario } from '../model/scenario.js';
import { pairValues, type PairValues } from '../model/values.js';
import { designProblem, designPairs, type DesignProblem } from '../design/space/problem.js';
import type { PairIds, Reference } from './records.js';

/** A design given as changes to today's: pairs added and pairs removed (class ids). */
export interface DesignChanges {
  readonly added: readonly PairIds[];
  readonly removed: readonly PairIds[];
}

export interface ScenarioContext {
  readonly scenario: Scenario;
  /** Where the scenario came from (file name), for messages. */
  readonly source: string;
  /** Today's design under the scenario's rates. */
  readonly today: CompiledModel;
  readonly fields: DesignFields;
  readonly variants: readonly DemandVariant[];
  /** The design space (budget from the options or the scenario). */
  readonly problem: DesignProblem;
  readonly costUnit: string | null;
  readonly itemWord: string;
  readonly description: string | null;
  /** Some class has a patience. */
  readonly patience: boolean;
  /** Value per match of the pairs that have one, and the waiting cost (src/model/values.ts). */
  readonly values: PairValues;
  /** The design and demand asked about, and their compiled model. */
  readonly reference: Reference;
  readonly model: CompiledModel;
  /** The reference design as a toggle vector of `problem`. */
  readonly design: Uint8Array;
}

const text = (v: string | undefined): string | null => (typeof v === 'string' && v.trim() !== '' ? v : null);

export interface ContextOptions {
  readonly source: string;
  readonly budget?: number;
  /** The design to use instead of today's, and where it came from (for its name). */
  readonly design?: DesignChanges & { readonly from: string };
  /** Name of a demand variant of the scenario. */
  readonly demand?: string;
  /**
   * Add two demand variants from the classes' fitted intervals (`rateCi95`, e.g. written by `fit`):
   * "fitted low" (every class at the low end) and "fitted high" (every class at the high end), so
   * that a robust choice covers what the data cannot rule out.
   */
  readonly rateIntervals?: boolean;
}

/** Names of the variants `rateIntervals` adds. */
export const FITTED_LOW = 'fitted low';
export const FITTED_HIGH = 'fitted high';

/** The two variants of the classes' fitted intervals (throws UsageError when no class has one). */
export function intervalVariants(scenario: Scenario): DemandVariant[] {
  const withCi = scenario.classes.filter((c) => c.rateCi95 !== undefined);
  if (withCi.length === 0) throw new UsageError('--rate-intervals: no class of the scenario has a fitted interval (rateCi95); `edgewise fit` writes them');
  const end = (i: 0 | 1): DemandVariant => ({
    name: i === 0 ? FITTED_LOW : FITTED_HIGH,
    rates: Float64Array.from(scenario.classes, (c) => (c.rateCi95 ? c.rateCi95[i] : c.rate)),
    changed: withCi.map((c) => c.id),
  });
  return [end(0), end(1)];
}

/** The toggle vector of a design given as changes (throws UsageError for changes the problem cannot make). */
export function designVector(problem: DesignProblem, changes: DesignChanges, from: string): Uint8Array {
  const d = Uint8Array.from(problem.today);
  const index = new Map(problem.ids.map((id, k) => [id, k] as const));
  const toggleOf = new Map(problem.toggles.map((t, j) => [pairKey(problem.ids[t.a]!, problem.ids[t.b]!), j] as const));
  const forced = new Set(problem.forcedOut.map((f) => pairKey(problem.ids[f.a]!, problem.ids[f.b]!)));
  const fixed = new Set(problem.fixed.map(([a, b]) => pairKey(problem.ids[a]!, problem.ids[b]!)));
  const name = (p: PairIds): string => `${p[0]} ↔ ${p[1]}`;
  for (const p of [...changes.added, ...changes.removed]) {
    for (const id of p) if (!index.has(id)) throw new UsageError(`${from}: unknown class "${id}" in ${name(p)}`);
  }
  for (const p of changes.added) {
    const j = toggleOf.get(pairKey(p[0], p[1]));
    if (j === undefined || problem.toggles[j]!.kind !== 'candidate') {
      throw new UsageError(`${from}: ${name(p)} cannot be added: it is ${fixed.has(pairKey(p[0], p[1])) || toggleOf.has(pairKey(p[0], p[1])) ? 'already compatible today' : forced.has(pairKey(p[0], p[1])) ? 'forbidden' : 'not a candidate of the scenario (or it is forbidden)'}`);
    }
    d[j] = 1;
  }
  for (const p of changes.removed) {
    const key = pairKey(p[0], p[1]);
    if (forced.has(key)) continue; // every design drops it anyway
    const j = toggleOf.get(key);
    if (j === undefined || problem.toggles[j]!.kind !== 'removable') {
      throw new UsageError(`${from}: ${name(p)} cannot be removed: ${fixed.has(key) ? 'the scenario does not allow dropping it (not removable, or in mustKeep)' : 'it is not a compatibility today'}`);
    }
    d[j] = 0;
  }
  return d;
}

/** The context of a command (throws UsageError for an unknown demand variant or an impossible design). */
export function scenarioContext(scenario: Scenario, options: ContextOptions): ScenarioContext {
  const fields = readDesignFields(scenario, options.source);
  const declared = demandVariants(scenario, options.source);
  const fitted = options.rateIntervals ? intervalVariants(scenario) : [];
  for (const v of fitted) {
    if (declared.some((d) => d.name === v.name)) throw new UsageError(`--rate-intervals: the scenario already has a demand variant named "${v.name}"`);
  }
  const variants = [...declared, ...fitted];
  let rates: ArrayLike<number> = scenario.classes.map((c) => c.rate);
  if (options.demand !== undefined && options.demand !== 'today') {
    const v = variants.find((x) => x.name === options.demand);
    if (!v) {
      const known = variants.map((x) => x.name);
      throw new UsageError(`--demand ${options.demand}: the scenario has no such demand variant (${known.length > 0 ? `known: ${known.join(', ')}` : 'it lists none'})`);
    }
    rates = v.rates;
  }
  const base = compileModel(scenario);
  const today = options.demand === undefined || options.demand === 'today' ? base : compileGraph(base.ids, rates, edgePairsOf(base));
  const problem = designProblem(scenario, fields, options.budget);
  const withRates: DesignProblem = rates === problem.rates ? problem : { ...problem, rates: Float64Array.from(rates) };
  const design = options.design ? designVector(withRates, options.design, options.design.from) : Uint8Array.from(withRates.today);
  const model = options.design || withRates.forcedOut.length > 0 ? compileGraph(base.ids, withRates.rates, designPairs(withRates, design)) : today;
  const reference: Reference = {
    kind: options.design ? 'design' : 'today',
    name: options.design ? `the design in ${options.design.from}` : "today's design",
    added: options.design ? options.design.added.map((p) => [p[0], p[1]] as const) : [],
    removed: options.design ? options.design.removed.map((p) => [p[0], p[1]] as const) : [],
    demand: options.demand ?? 'today',
  };
  return {
    scenario,
    source: options.source,
    today,
    fields,
    variants,
    problem: withRates,
    costUnit: text(scenario.costUnit),
    itemWord: text(scenario.itemWord) ?? 'items',
    description: text(scenario.description),
    patience: scenario.classes.some((c) => c.patience !== undefined),
    values: pairValues(scenario),
    reference,
    model: options.design ? model : today,
    design,
  };
}

function edgePairsOf(model: CompiledModel): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  for (let e = 0; e < model.m; e++) out.push([model.edgeA[e]!, model.edgeB[e]!]);
  return out;
}

/** The common fields of a record made from this context. */
export function recordBase<C extends string>(ctx: ScenarioContext, command: C, warnings: readonly (string | null)[]) {
  return {
    command,
    scenario: ctx.scenario.name,
    timeUnit: ctx.scenario.timeUnit,
    warnings: warnings.filter((w): w is string => w !== null),
    classes: ctx.scenario.classes.map((c, k) => ({ id: c.id, label: typeof c.label === 'string' && c.label !== '' ? c.label : null, rate: ctx.model.rates[k]! })),
  };
}

/** A rule of the scenario on a pair: it may not be dropped (mustKeep) or may not be in any design (forbidden). */
export interface PairRule {
  readonly kind: 'must-keep' | 'forbidden';
  readonly reason: string | null;
}

/** The scenario's rules by pair key (pairKey), with their reasons when the file gives them. */
export function pairRules(scenario: Scenario): Map<string, PairRule> {
  const out = new Map<string, PairRule>();
  for (const r of scenario.mustKeep) out.set(pairKey(r.pair[0], r.pair[1]), { kind: 'must-keep', reason: r.reason ?? null });
  for (const r of scenario.forbidden) out.set(pairKey(r.pair[0], r.pair[1]), { kind: 'forbidden', reason: r.reason ?? null });
  return out;
}
