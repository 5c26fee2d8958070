/**
 * `evaluate`: the steady state of one design under FCFM — backlog and wait per class, the chance an
 * arrival is matched at once, the chance the system is empty, and the match rate along every
 * compatibility — exact, from the product form.
 */
import { evaluateExact, DEFAULT_MAX_SETS } from '../exact/evaluate.js';
import { checkStability } from '../stability/check.js';
import { certificateWithIds } from '../stability/certificate.js';
import { supportedDigits } from '../output/format.js';
import { recordBase, type ScenarioContext } from './context.js';
import { instabilityOf } from './instability.js';
import { byClass, idsOf, pairIds, type InstabilityRecord, type RepairRecord, type PairIds, type RecordBase, type Reference } from './records.js';
import { exactWarnings, valueWarnings } from './warnings.js';
import { edgeValues } from '../model/values.js';

export interface MatchRateRecord {
  readonly pair: PairIds;
  /** Matches per time unit along the compatibility. */
  readonly rate: number;
  /** Share of all matches. */
  readonly share: number;
  /** Value per match the file gives the pair (null when it gives none: the pair counts 0). */
  readonly value: number | null;
  /** value · rate: what the pair's matches are worth per time unit (null without a value). */
  readonly valueRate: number | null;
}

/**
 * Value per match (docs/scenario-format.md): present when some pair of the file has a value or the
 * file gives waitingCost. Exact FCFM figures (patience ignored: see the warnings).
 */
export interface ValueRecord {
  /** Σ_pairs value · match rate, per time unit (pairs without a value count 0). */
  readonly rate: number;
  /** The file's cost per waiting item per time unit (null when it gives none: counted 0). */
  readonly waitingCost: number | null;
  /** waitingCost · mean total backlog, per time unit. */
  readonly waitingCostRate: number;
  /** rate − waitingCostRate. */
  readonly net: number;
  /** Pairs of the evaluated design with a value, and without one (counted 0). */
  readonly pairsWithValue: number;
  readonly pairsWithoutValue: number;
  /** Some class has a patience the exact figures ignore (the warnings say so too). */
  readonly patienceIgnored: boolean;
}

export interface EvaluateRecord extends RecordBase {
  readonly command: 'evaluate';
  readonly reference: Reference;
  readonly stable: boolean;
  /** How the figures were made. */
  readonly method: 'exact';
  readonly independentSets: number | null;
  /** Mean number of items waiting: in all, and per class. */
  readonly backlog: { readonly total: number; readonly byClass: Record<string, number | null> } | null;
  /** Mean wait per class (Little's law), in the time unit; `mean` over all arrivals. */
  readonly wait: { readonly mean: number; readonly byClass: Record<string, number | null> } | null;
  /** Probability that an arrival is matched at once (on arrival), per class and over all arrivals. */
  readonly matchedAtOnce: { readonly total: number; readonly byClass: Record<string, number | null> } | null;
  /** Probability that no item waits. */
  readonly emptyProbability: number | null;
  readonly matchRates: MatchRateRecord[];
  /** Value rate, waiting cost rate and net value (null without values in the file, or when unstable). */
  readonly value: ValueRecord | null;
  readonly bottleneck: { readonly set: string[]; readonly spareCapacity: number; readonly capacity: number } | null;
  readonly instability: InstabilityRecord | null;
  /** When unstable: the cheapest sets of allowed candidates that make it stable, cheapest first (as in `instability`). */
  readonly repairs: RepairRecord[] | null;
}

export interface EvaluateOptions {
  readonly maxSets?: number;
}

export async function evaluateUseCase(ctx: ScenarioContext, options: EvaluateOptions = {}): Promise<EvaluateRecord> {
  const model = ctx.model;
  const stability = checkStability(model);
  const warnings = [...exactWarnings(ctx), ...(ctx.values.any && stability.stable ? valueWarnings(ctx) : [])];
  const base = { ...recordBase(ctx, 'evaluate', warnings), reference: ctx.reference, method: 'exact' as const };
  if (!stability.stable) {
    const instability = await instabilityOf(ctx, certificateWithIds(model, stability.certificate!));
    return {
      ...base,
      stable: false,
      independentSets: null,
      backlog: null,
      wait: null,
      matchedAtOnce: null,
      emptyProbability: null,
      matchRates: [],
      value: null,
      bottleneck: null,
      instability,
      repairs: instability.repairs,
    };
  }
  const r = evaluateExact(model, { maxSets: options.maxSets ?? DEFAULT_MAX_SETS, timeUnit: ctx.scenario.timeUnit });
  const total = model.totalRate;
  let atOnce = 0;
  for (let k = 0; k < model.n; k++) atOnce += model.rates[k]! * r.immediateMatch[k]!;
  const half = total / 2;
  const b = stability.bottleneck;
  const values = edgeValues(model, ctx.values);
  let valueSum = 0;
  let withValue = 0;
  for (let e = 0; e < model.m; e++) {
    valueSum += values.value[e]! * r.matchRates[e]!;
    withValue += values.given[e]!;
  }
  const waiting = ctx.values.waitingCost * r.backlogTotal;
  return {
    ...base,
    precision: supportedDigits(b ? b.slack / b.capacity : null),
    stable: true,
    independentSets: r.independentSets,
    backlog: { total: r.backlogTotal, byClass: byClass(model.ids, r.backlog) },
    wait: { mean: r.backlogTotal / total, byClass: byClass(model.ids, r.wait) },
    matchedAtOnce: { total: atOnce / total, byClass: byClass(model.ids, r.immediateMatch) },
    emptyProbability: r.emptyProbability,
    matchRates: Array.from({ length: model.m }, (_, e) => ({
      pair: pairIds(model, model.edgeA[e]!, model.edgeB[e]!),
      rate: r.matchRates[e]!,
      share: r.matchRates[e]! / half,
      value: values.given[e] ? values.value[e]! : null,
      valueRate: values.given[e] ? values.value[e]! * r.matchRates[e]! : null,
    })),
    value: ctx.values.any
      ? {
          rate: valueSum,
          waitingCost: ctx.values.hasWaitingCost ? ctx.values.waitingCost : null,
          waitingCostRate: waiting,
          net: valueSum - waiting,
          pairsWithValue: withValue,
          pairsWithoutValue: model.m - withValue,
          patienceIgnored: ctx.patience,
        }
      : null,
    bottleneck: b ? { set: idsOf(model, b.set), spareCapacity: b.slack, capacity: b.capacity } : null,
    instability: null,
    repairs: null,
  };
}
