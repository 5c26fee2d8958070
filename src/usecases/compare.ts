/**
 * `compare`: scenarios (or budgets of one scenario) side by side — today's stability, bottleneck,
 * backlog and worst class wait, and the recommended design of each column with its cost (the same
 * decision `recommend` takes); with demand variants, every design of the Pareto set is evaluated
 * under each variant and the design with the best worst case is named as the robust choice.
 * Columns are computed concurrently (p-limit).
 */
import pLimit from 'p-limit';
import { InfeasibleDesignError, TooLargeError, UsageError } from '../errors.js';
import { checkStability } from '../stability/check.js';
import { certificateWithIds } from '../stability/certificate.js';
import type { ScenarioContext } from './context.js';
import { instabilityOf } from './instability.js';
import { outcomesUnderWith, worstCase, type Outcome, type OutcomeScorer } from './outcomes.js';
import { byScoring, outcomeScorer, patienceOf, simulationRecord, simulationWarning, type ScoringInput, type ScoringRecord } from './scoring.js';
import { recommendUseCase, type RecommendInput } from './recommend.js';
import { idsOf, type InstabilityRecord, type PairIds, type Reference } from './records.js';
import { limitsNotComparedWarning, patienceWarning } from './warnings.js';

export interface DesignSummary {
  readonly added: PairIds[];
  readonly removed: PairIds[];
  readonly cost: number;
  /** How its figures under the column's rates were made (those of `recommend`). */
  readonly method: 'exact' | 'simulation';
  /** Under the column's rates. */
  readonly backlog: number | null;
  readonly backlogCi95?: [number, number];
  readonly maxWait: number | null;
  /** Worst total backlog over the column's rates and every variant (null: unstable under one). */
  readonly worstBacklog: number | null;
  /** Where the worst case happens: "today" or a variant's name. */
  readonly worstUnder: string;
}

export interface CompareColumn extends ScoringRecord {
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
  /** Simulated: its 95 % interval. */
  readonly backlogCi95?: [number, number] | null;
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
  /** How the columns' own figures are scored (today's design, every design under the variants); recommend gets the same. */
  readonly scoring?: ScoringInput;
  /** Columns computed at once. */
  readonly concurrency: number;
}

async function column(ctx: ScenarioContext, input: CompareInput): Promise<CompareColumn> {
  const model = ctx.model;
  const unit = ctx.scenario.timeUnit;
  const variants = ctx.variants;
  const names = variants.map((v) => v.name);
  const stability = checkStability(model);
  const scoring: ScoringInput = { ...input.scoring, workerUrl: null };
  // one method for the column's own figures: today's design and every design under the variants
  let scorer: OutcomeScorer = outcomeScorer(ctx, scoring, 'exact');
  let scored: ScoringRecord = { method: 'exact' };
  const first = await byScoring(
    ctx,
    scoring,
    async () => {
      const today = await scorer(model);
      return { today, under: await outcomesUnderWith(scorer, model, [], [], variants) };
    },
    async (reason) => {
      scorer = outcomeScorer(ctx, scoring, 'simulation');
      scored = simulationRecord(ctx, scoring, reason);
      const today = await scorer(model);
      return { today, under: await outcomesUnderWith(scorer, model, [], [], variants) };
    },
  );
  const today = first.today;
  const underVariants = first.under.map((o, k) => ({ variant: names[k]!, ...o }));
  let recommended: DesignSummary | null = null;
  let robust: DesignSummary | null = null;
  let note: string | null = null;
  let frontSize = 0;
  try {
    const patience = input.scoring?.score !== undefined && input.scoring.score !== 'exact' ? patienceOf(ctx) : undefined;
    const rec = await recommendUseCase(ctx, {
      objective: 'total',
      jobs: 1,
      workerUrl: null,
      ...(input.scoring?.score ? { score: input.scoring.score } : {}),
      ...(input.scoring?.seed !== undefined ? { seed: input.scoring.seed } : {}),
      ...(input.scoring?.maxSets !== undefined ? { maxSets: input.scoring.maxSets } : {}),
      ...(patience ? { patience } : {}),
      ...input.recommend,
    } as RecommendInput);
    frontSize = rec.pareto.length;
    const summary = async (d: { added: PairIds[]; removed: PairIds[]; cost: number; backlog: number | null; backlogCi95?: [number, number]; maxWait: number | null; method: 'exact' | 'simulation' }): Promise<DesignSummary> => {
      const base: Outcome = { stable: d.backlog !== null, backlog: d.backlog, maxWait: d.maxWait, maxWaitClass: null, method: d.method };
      const w = worstCase(base, await outcomesUnderWith(scorer, ctx.today, d.added, d.removed, variants), names);
      return { added: d.added, removed: d.removed, cost: d.cost, method: d.method, backlog: d.backlog, ...(d.backlogCi95 ? { backlogCi95: d.backlogCi95 } : {}), maxWait: d.maxWait, worstBacklog: w.backlog, worstUnder: w.under };
    };
    recommended = await summary(rec.recommended);
    if (variants.length > 0) {
      const all: DesignSummary[] = [];
      for (const d of rec.pareto) all.push(await summary(d));
      robust = all.reduce((r, s) => {
        const a = s.worstBacklog ?? Infinity;
        const b = r.worstBacklog ?? Infinity;
        return a < b || (a === b && s.cost < r.cost) ? s : r;
      });
    }
  } catch (e) {
    if (e instanceof InfeasibleDesignError) note = e.message;
    else if (e instanceof UsageError) throw e;
    else if (e instanceof TooLargeError) note = `the recommender could not evaluate every design: ${e.message}`;
    else throw e;
  }
  const b = stability.bottleneck;
  const simNote = simulationWarning(scored);
  return {
    ...scored,
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
    ...(today.backlogCi95 !== undefined ? { backlogCi95: today.backlogCi95 } : {}),
    worstWait: today.stable ? { class: today.maxWaitClass!, wait: today.maxWait! } : null,
    underVariants,
    recommended,
    robust,
    note,
    variants: names,
    frontSize,
    warnings: [
      simNote ? `${ctx.source}: ${simNote}` : patienceWarning(ctx, `The figures of ${ctx.source}`),
      recommended && recommended.method !== scored.method ? `${ctx.source}: the recommended design's figures are ${recommended.method === 'simulation' ? 'simulated' : 'exact'} (the recommender's), today's are ${scored.method === 'simulation' ? 'simulated' : 'exact'}.` : null,
      limitsNotComparedWarning(ctx, scored.method, `${ctx.source}: today's figures and those under the variants`),
    ].filter((w): w is string => w !== null),
  };
}

/** One column per input, in input order. */
export async function compareUseCase(input: CompareInput): Promise<CompareRecord> {
  const limit = pLimit(Math.max(1, input.concurrency));
  const columns = await Promise.all(input.columns.map((c) => limit(() => column(c.ctx, input))));
  const warnings = [...new Set(columns.flatMap((c) => c.warnings))];
  return { command: 'compare', warnings, columns };
}

