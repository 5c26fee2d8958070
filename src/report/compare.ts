/**
 * Side-by-side comparison of scenarios (or of budgets of one scenario): for each column, today's
 * stability, bottleneck, total backlog and worst class wait, and the best design within the budget
 * from the recommender, with its cost; with demand variants, every design of the front is also
 * evaluated under each variant, its worst case shown, and the design with the best worst case named
 * as the robust choice. Columns are computed concurrently (p-limit).
 */
import pLimit from 'p-limit';
import { EdgewiseError, InfeasibleDesignError } from '../errors.js';
import { compileModel } from '../model/compile.js';
import { readDesignFields } from '../model/design-fields.js';
import { demandVariants } from '../model/demand.js';
import type { Scenario } from '../model/scenario.js';
import { designProblem } from '../design/space/problem.js';
import { recommend, type RecommendOptions } from '../design/search/recommend.js';
import { checkStability } from '../stability/check.js';
import { evaluateOrExplain, outcomeOf, outcomesUnder } from './design-outcome.js';
import { frontPoints, type RecommendedDesign } from './recommended.js';
import type { Outcome, Pair } from './report-data.js';

export interface CompareInput {
  readonly scenario: Scenario;
  /** File name, for messages and headers. */
  readonly source: string;
  /** Budget of this column (default: the scenario's). */
  readonly budget?: number;
}

export interface DesignSummary {
  readonly cost: number;
  readonly added: readonly Pair[];
  readonly removed: readonly Pair[];
  /** Under today's rates. */
  readonly backlog: number;
  readonly maxWait: number;
  /** Worst total backlog over today's rates and every variant (Infinity when unstable under one). */
  readonly worstBacklog: number;
  /** Where the worst case happens: "today" or a variant name. */
  readonly worstUnder: string;
}

export interface CompareColumn {
  readonly source: string;
  readonly scenario: string;
  readonly timeUnit: string;
  readonly budget: number | null;
  readonly stable: boolean;
  /** Why today's design cannot keep up (certificate sentence), when unstable. */
  readonly instability: string | null;
  readonly bottleneck: { readonly set: readonly string[]; readonly slack: number } | null;
  /** Today's mean total backlog (NaN when unstable). */
  readonly backlog: number;
  readonly worstWait: { readonly class: string; readonly wait: number } | null;
  /** Today's design under each variant. */
  readonly todayUnder: ReadonlyArray<{ readonly variant: string } & Outcome>;
  /** Best (lowest backlog) design of the front within the budget. */
  readonly best: DesignSummary | null;
  /** Front design with the lowest worst case over demand variants (null without variants). */
  readonly robust: DesignSummary | null;
  /** Why there is no best design (e.g. no stable design within the budget). */
  readonly note: string | null;
  readonly variants: readonly string[];
  /** Designs on the front within the budget. */
  readonly frontSize: number;
}

export interface CompareOptions {
  /** Columns computed at once (p-limit); default 2. */
  readonly concurrency?: number;
  /** Passed to the recommender of each column. */
  readonly recommend?: Omit<RecommendOptions, 'onProgress'>;
}

/** One column per input, in input order. */
export async function compareScenarios(inputs: readonly CompareInput[], options: CompareOptions = {}): Promise<CompareColumn[]> {
  const limit = pLimit(Math.max(1, options.concurrency ?? 2));
  return Promise.all(inputs.map((input) => limit(() => compareOne(input, options))));
}

function summary(d: RecommendedDesign, backlog: number, maxWait: number, under: readonly Outcome[], variants: readonly string[]): DesignSummary {
  let worst = backlog;
  let where = 'today';
  under.forEach((o, k) => {
    const b = o.stable ? o.backlog : Infinity;
    if (b > worst) {
      worst = b;
      where = variants[k]!;
    }
  });
  return { cost: d.cost, added: d.added, removed: d.removed, backlog, maxWait, worstBacklog: worst, worstUnder: where };
}

async function compareOne(input: CompareInput, options: CompareOptions): Promise<CompareColumn> {
  const { scenario } = input;
  const variants = demandVariants(scenario, input.source);
  const fields = readDesignFields(scenario, input.source);
  const model = compileModel(scenario);
  const stability = checkStability(model);
  const today = evaluateOrExplain(model, scenario.timeUnit);
  const todayOutcome = outcomeOf(model, today);
  const variantNames = variants.map((v) => v.name);
  const todayUnder = outcomesUnder(model, [], [], variants, scenario.timeUnit).map((o, k) => ({ variant: variantNames[k]!, ...o }));
  const budget = input.budget ?? scenario.budget ?? null;
  const problem = designProblem(scenario, fields, budget ?? undefined);

  let best: DesignSummary | null = null;
  let robust: DesignSummary | null = null;
  let note: string | null = null;
  let frontSize = 0;
  try {
    const rec = await recommend(problem, { workerUrl: null, ...options.recommend });
    const front = frontPoints(problem, rec);
    frontSize = front.length;
    const summaries = front.map((d) => summary(d, d.backlog, d.maxWait, outcomesUnder(model, d.added, d.removed, variants, scenario.timeUnit), variantNames));
    // the front is sorted by cost with backlog decreasing: the last point is the best within budget
    best = summaries[summaries.length - 1] ?? null;
    if (variants.length > 0 && summaries.length > 0) {
      robust = summaries.reduce((r, s) => (s.worstBacklog < r.worstBacklog || (s.worstBacklog === r.worstBacklog && s.cost < r.cost) ? s : r));
    }
  } catch (e) {
    if (e instanceof InfeasibleDesignError) note = e.message;
    else if (e instanceof EdgewiseError && e.exitCode === 4) note = `the recommender could not evaluate every design: ${e.message}`;
    else throw e;
  }

  return {
    source: input.source,
    scenario: scenario.name,
    timeUnit: scenario.timeUnit,
    budget,
    stable: today.stable,
    instability: today.stable ? null : today.why,
    bottleneck: stability.bottleneck ? { set: Array.from(stability.bottleneck.set, (k) => model.ids[k]!), slack: stability.bottleneck.slack } : null,
    backlog: todayOutcome.backlog,
    worstWait: todayOutcome.stable ? { class: todayOutcome.maxWaitClass, wait: todayOutcome.maxWait } : null,
    todayUnder,
    best,
    robust,
    note,
    variants: variantNames,
    frontSize,
  };
}
