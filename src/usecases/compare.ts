/**
 * `compare`: scenarios (or budgets of one scenario) side by side — today's stability, bottleneck,
 * backlog and worst class wait, and the recommended design of each column with its cost (the same
 * decision `recommend` takes); with demand variants, every design of the Pareto set is evaluated
 * under each variant and the design with the best worst case is named as the robust choice.
 * Columns are computed concurrently (p-limit).
 */
import pLimit from 'p-limit';
import { InfeasibleDesignError, TooLargeError } from '../errors.js';
import { checkStability } from '../stability/check.js';
import { certificateWithIds } from '../stability/certificate.js';
import type { ScenarioContext } from './context.js';
import { instabilityOf } from './instability.js';
import { evaluateOrExplain, outcomeOf, outcomesUnder, worstCase, type Outcome } from './outcomes.js';
import { recommendUseCase, type RecommendInput } from './recommend.js';
import { idsOf, type InstabilityRecord, type PairIds, type Reference } from './records.js';
import { patienceWarning } from './warnings.js';

export interface DesignSummary {
  readonly added: PairIds[];
  readonly removed: PairIds[];
  readonly cost: number;
  /** Under the column's rates. */
  readonly backlog: number | null;
  readonly maxWait: number | null;
  /** Worst total backlog over the column's rates and every variant (null: unstable under one). */
  readonly worstBacklog: number | null;
  /** Where the worst case happens: "today" or a variant's name. */
  readonly worstUnder: string;
}

export interface CompareColumn {
  readonly source: string;
  readonly scenario: string;
  readonly timeUnit: string;
  readonly costUnit: string | null;
  readonly budget: number | null;
  readonly reference: Reference;
  readonly stable: boolean;
  readonly instability: InstabilityRecord | null;
  readonly bottleneck: { readonly set: string[]; readonly spareCapacity: number } | null;
  /** Mean total backlog of the reference design (null when unstable). */
  readonly backlog: number | null;
  readonly worstWait: { readonly class: string; readonly wait: number } | null;
  /** The reference design under each variant. */
  readonly underVariants: Array<{ readonly variant: string } & Outcome>;
  /** The recommended design within the budget (the decision of `recommend`). */
  readonly recommended: DesignSummary | null;
  /** The Pareto design with the lowest worst case over the variants (null without variants). */
  readonly robust: DesignSummary | null;
  /** Why there is no recommendation. */
  readonly note: string | null;
  readonly variants: string[];
  readonly frontSize: number;
  readonly warnings: string[];
}

export interface CompareRecord {
  readonly command: 'compare';
  readonly warnings: string[];
  readonly columns: CompareColumn[];
}

export interface CompareInput {
  readonly columns: ReadonlyArray<{ readonly ctx: ScenarioContext; readonly budget?: number }>;
  readonly recommend: Omit<RecommendInput, 'objective'> & { readonly objective?: RecommendInput['objective'] };
  /** Columns computed at once. */
  readonly concurrency: number;
}

async function column(ctx: ScenarioContext, input: CompareInput): Promise<CompareColumn> {
  const model = ctx.model;
  const unit = ctx.scenario.timeUnit;
  const variants = ctx.variants;
  const names = variants.map((v) => v.name);
  const stability = checkStability(model);
  const today = outcomeOf(model, evaluateOrExplain(model, unit));
  const underVariants = outcomesUnder(model, [], [], variants, unit).map((o, k) => ({ variant: names[k]!, ...o }));
  let recommended: DesignSummary | null = null;
  let robust: DesignSummary | null = null;
  let note: string | null = null;
  let frontSize = 0;
  try {
    const rec = await recommendUseCase(ctx, { objective: 'total', jobs: 1, workerUrl: null, ...input.recommend } as RecommendInput);
    frontSize = rec.pareto.length;
    const summary = (d: { added: PairIds[]; removed: PairIds[]; cost: number; backlog: number | null; maxWait: number | null }): DesignSummary => {
      const base: Outcome = { stable: d.backlog !== null, backlog: d.backlog, maxWait: d.maxWait, maxWaitClass: null };
      const w = worstCase(base, outcomesUnder(ctx.today, d.added, d.removed, variants, unit), names);
      return { added: d.added, removed: d.removed, cost: d.cost, backlog: d.backlog, maxWait: d.maxWait, worstBacklog: w.backlog, worstUnder: w.under };
    };
    recommended = summary(rec.recommended);
    if (variants.length > 0) {
      const all = rec.pareto.map(summary);
      robust = all.reduce((r, s) => {
        const a = s.worstBacklog ?? Infinity;
        const b = r.worstBacklog ?? Infinity;
        return a < b || (a === b && s.cost < r.cost) ? s : r;
      });
    }
  } catch (e) {
    if (e instanceof InfeasibleDesignError) note = e.message;
    else if (e instanceof TooLargeError) note = `the recommender could not evaluate every design: ${e.message}`;
    else throw e;
  }
  const b = stability.bottleneck;
  return {
    source: ctx.source,
    scenario: ctx.scenario.name,
    timeUnit: unit,
    costUnit: ctx.costUnit,
    budget: Number.isFinite(ctx.problem.budget) ? ctx.problem.budget : null,
    reference: ctx.reference,
    stable: today.stable,
    instability: stability.stable ? null : await instabilityOf(ctx, certificateWithIds(model, stability.certificate!)),
    bottleneck: b ? { set: idsOf(model, b.set), spareCapacity: b.slack } : null,
    backlog: today.backlog,
    worstWait: today.stable ? { class: today.maxWaitClass!, wait: today.maxWait! } : null,
    underVariants,
    recommended,
    robust,
    note,
    variants: names,
    frontSize,
    warnings: [patienceWarning(ctx, `The figures of ${ctx.source}`)].filter((w): w is string => w !== null),
  };
}

/** One column per input, in input order. */
export async function compareUseCase(input: CompareInput): Promise<CompareRecord> {
  const limit = pLimit(Math.max(1, input.concurrency));
  const columns = await Promise.all(input.columns.map((c) => limit(() => column(c.ctx, input))));
  const warnings = [...new Set(columns.flatMap((c) => c.warnings))];
  return { command: 'compare', warnings, columns };
}

