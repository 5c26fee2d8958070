import type { CompiledModel } from '../model/compile.js';
import type { ExactResult } from '../exact/result.js';

/** A rounded, id-keyed record of an exact evaluation: the shape `evaluate --json` prints. */
export interface EvaluationRecord {
  readonly stable: true;
  readonly scenario: string;
  readonly timeUnit: string;
  readonly independentSets: number;
  readonly backlog: { readonly total: number; readonly byClass: Record<string, number> };
  readonly wait: { readonly byClass: Record<string, number> };
  readonly immediateMatch: { readonly byClass: Record<string, number> };
  readonly emptyProbability: number;
  readonly matchRates: ReadonlyArray<{ readonly pair: readonly [string, string]; readonly rate: number; readonly share: number }>;
  readonly bottleneck: { readonly set: readonly string[]; readonly slack: number } | null;
}

const r12 = (x: number): number => Number(x.toPrecision(12));

/** Builds the record; `bottleneck` holds class indices and the slack. */
export function evaluationRecord(
  model: CompiledModel,
  result: ExactResult,
  meta: { scenario: string; timeUnit: string; bottleneck?: { set: ArrayLike<number>; slack: number } | undefined },
): EvaluationRecord {
  const byClass = (v: Float64Array): Record<string, number> => Object.fromEntries(model.ids.map((id, k) => [id, r12(v[k]!)]));
  const half = model.totalRate / 2;
  return {
    stable: true,
    scenario: meta.scenario,
    timeUnit: meta.timeUnit,
    independentSets: result.independentSets,
    backlog: { total: r12(result.backlogTotal), byClass: byClass(result.backlog) },
    wait: { byClass: byClass(result.wait) },
    immediateMatch: { byClass: byClass(result.immediateMatch) },
    emptyProbability: r12(result.emptyProbability),
    matchRates: Array.from({ length: model.m }, (_, e) => ({
      pair: [model.ids[model.edgeA[e]!]!, model.ids[model.edgeB[e]!]!] as const,
      rate: r12(result.matchRates[e]!),
      share: r12(result.matchRates[e]! / half),
    })),
    bottleneck: meta.bottleneck
      ? { set: Array.from(meta.bottleneck.set, (k) => model.ids[k]!), slack: r12(meta.bottleneck.slack) }
      : null,
  };
}
