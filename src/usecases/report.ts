/**
 * `report`: everything the HTML report shows, as one record — the decision `recommend` takes (the
 * recommended design and every verdict measured against it, today's beside them), today's design
 * and its match rates, a cheaper alternative, the load sweep of the bottleneck, every shown design
 * under each demand variant, simulated figures with abandonment when the file gives patience, and
 * the inputs. `report --json` prints the decision part.
 */
import { EdgewiseError, InfeasibleDesignError, InterruptedError, TooLargeError } from '../errors.js';
import { pairKey } from '../model/scenario.js';
import type { ObjectiveName } from '../design/space/objective.js';
import { impatientClasses, limitsNotComparedWarning } from './warnings.js';
import { pairRules, recordBase, scenarioContext, type ScenarioContext } from './context.js';
import { designFigures, type DesignFigures } from './designs.js';
import { designDetails } from '../design/search/recommend.js';
import { instabilityOf } from './instability.js';
import { evaluateOrExplain, outcomesUnderWith, type Outcome, type OutcomeScorer } from './outcomes.js';
import { byScoring, outcomeScorer, patienceOf, scoringPlan, simulationRecord, type ScoringInput, type ScoringRecord } from './scoring.js';
import { simulateDesign } from '../design/scoring/sim-score.js';
import { recommendUseCase, type RecommendInput, type RecommendRecord } from './recommend.js';
import { pairIds, setRecord, type InstabilityRecord, type PairIds, type RecordBase, type SetRecord } from './records.js';
import { simulateUseCase, type SimulateRecord } from './simulate.js';
import { sweepUseCase, type SweepRecord } from './sweep.js';
import { checkStability } from '../stability/check.js';
import { certificateWithIds } from '../stability/certificate.js';

/** A design the report shows, with its outcomes under the demand variants. */
export interface ShownDesign {
  readonly role: 'today' | 'recommended' | 'alternative';
  readonly name: string;
  readonly figures: DesignFigures;
  /** In the order of ReportRecord.variants. */
  readonly underVariants: Outcome[];
}

export interface SimulatedSummary {
  readonly role: 'today' | 'recommended';
  readonly seed: number;
  readonly replications: number;
  readonly arrivals: number;
  readonly backlog: { readonly mean: number | null; readonly ci95: [number, number] | null };
  readonly abandonShare: { readonly mean: number | null; readonly ci95: [number, number] | null };
  readonly byClass: Record<string, { readonly wait: number | null; readonly abandonShare: number | null; readonly patience: number | null }>;
}

export interface InputsRecord {
  readonly classes: Array<{
    readonly id: string;
    readonly label: string | null;
    /** The class's group (drawn together in the graph), when the file gives one. */
    readonly group: string | null;
    readonly rate: number;
    readonly patience: number | null;
    readonly weight: number | null;
    readonly waitTarget: number | null;
    readonly maxCompatibilities: number | null;
  }>;
  readonly compatibilities: Array<{ readonly pair: PairIds; readonly removable: boolean; readonly saving: number; readonly rule: string | null; readonly reason: string | null }>;
  readonly candidates: Array<{ readonly pair: PairIds; readonly cost: number; readonly rule: string | null; readonly reason: string | null }>;
  readonly demand: Array<{ readonly name: string; readonly rates: Record<string, number> }>;
}

export interface ReportRecord extends RecordBase, ScoringRecord {
  readonly command: 'report';
  readonly description: string | null;
  readonly costUnit: string | null;
  readonly itemWord: string;
  readonly budget: number | null;
  /** The recommender's record (the decision: recommended design, verdicts; the Pareto set; rules of thumb); null when no design is feasible. */
  readonly decision: RecommendRecord | null;
  /** Why there is no decision, when there is none. */
  readonly noDecision: string | null;
  readonly todayStable: boolean;
  readonly bottleneck: SetRecord | null;
  readonly todayInstability: InstabilityRecord | null;
  /** Today's match rate per compatibility (stable designs). */
  readonly matchRates: Array<{ readonly pair: PairIds; readonly rate: number }>;
  readonly designs: ShownDesign[];
  readonly variants: string[];
  readonly sweep: SweepRecord | null;
  /** The single addition the load sweep shows beside the designs, and why. */
  readonly sweepAddition: { readonly pair: PairIds; readonly why: 'harmful' | 'helpful' } | null;
  readonly simulated: SimulatedSummary[];
  readonly inputs: InputsRecord;
  readonly notes: string[];
  /** True when the report was interrupted: sections not yet computed are left out (the notes say which). */
  readonly partial: boolean;
}

export interface ReportInput extends Omit<ScoringInput, 'jobs' | 'seed'> {
  readonly objective?: ObjectiveName;
  readonly jobs: number;
  readonly seed: number;
  /** Designs the recommender may score (default REPORT_SIMULATED_DESIGNS when designs are simulated). */
  readonly maxDesigns?: number;
  readonly sweepSteps?: number;
  readonly onPhase?: (phase: string) => void;
  /**
   * Stops the work (SIGINT): the recommender gives what it found so far, and the sections not yet
   * computed are left out with a note; the record is then `partial`.
   */
  readonly signal?: AbortSignal;
  /** Arrivals per replication of the simulated figures (patience). */
  readonly simulationArrivals?: number;
}

function inputsOf(ctx: ScenarioContext): InputsRecord {
  const rules = pairRules(ctx.scenario);
  const ruleOf = (a: string, b: string): { rule: string | null; reason: string | null } => {
    const r = rules.get(pairKey(a, b));
    return { rule: r?.kind ?? null, reason: r?.reason ?? null };
  };
  const f = ctx.fields;
  return {
    classes: ctx.scenario.classes.map((c, k) => ({
      id: c.id,
      label: typeof c.label === 'string' && c.label !== '' ? c.label : null,
      group: c.group ?? null,
      rate: c.rate,
      patience: c.patience ?? null,
      weight: f.weight[k] === 1 ? null : f.weight[k]!,
      waitTarget: Number.isFinite(f.waitTarget[k]!) ? f.waitTarget[k]! : null,
      maxCompatibilities: Number.isFinite(f.maxCompatibilities[k]!) ? f.maxCompatibilities[k]! : null,
    })),
    compatibilities: ctx.scenario.compatibilities.map((c) => ({ pair: [c.pair[0], c.pair[1]] as const, removable: c.removable, saving: c.saving, ...ruleOf(c.pair[0], c.pair[1]) })),
    candidates: ctx.scenario.candidates.map((c) => ({ pair: [c.pair[0], c.pair[1]] as const, cost: c.cost, ...ruleOf(c.pair[0], c.pair[1]) })),
    demand: ctx.variants.map((v) => ({ name: v.name, rates: Object.fromEntries(v.changed.map((id) => [id, v.rates[ctx.today.index.get(id)!]!])) })),
  };
}

/** A cheaper Pareto design that already gets at least half of the recommended design's improvement. */
function alternativeOf(rec: RecommendRecord): DesignFigures | null {
  const best = rec.recommended;
  if (best.objective === null || rec.today.objective === null) return null;
  const s = rec.objectiveBetter === 'higher' ? -1 : 1; // compare as "lower is better"
  const half = s * rec.today.objective - 0.5 * (s * rec.today.objective - s * best.objective);
  const cheaper = rec.pareto.filter((d) => d.cost < best.cost && d.objective !== null && s * d.objective <= half && d.added.length + d.removed.length > 0);
  return cheaper.sort((a, b) => a.cost - b.cost)[0] ?? null;
}

function simulatedSummary(role: 'today' | 'recommended', r: SimulateRecord): SimulatedSummary {
  return {
    role,
    seed: r.seed,
    replications: r.replications,
    arrivals: r.arrivals,
    backlog: { mean: r.backlog.total.mean, ci95: r.backlog.total.ci95 },
    abandonShare: { mean: r.abandonment.total.share.mean, ci95: r.abandonment.total.share.ci95 },
    byClass: Object.fromEntries(
      Object.entries(r.abandonment.byClass).map(([id, a]) => [id, { wait: r.wait.byClass[id]!.mean, abandonShare: a.share.mean, patience: a.patience }]),
    ),
  };
}

/** The recommender's design limit in a report when designs are simulated (a report also sweeps and shows designs). */
export const REPORT_SIMULATED_DESIGNS = 600;

export async function reportUseCase(ctx: ScenarioContext, input: ReportInput): Promise<ReportRecord> {
  const phase = input.onPhase ?? ((): void => {});
  const unit = ctx.scenario.timeUnit;
  const notes: string[] = [];
  const variantNames = ctx.variants.map((v) => v.name);

  phase('today');
  const stability = checkStability(ctx.today);
  const scoring: ScoringInput = { ...input, ...(input.jobs > 1 ? {} : { workerUrl: null }) };
  // one method for the report's own figures (today's match rates, every shown design under the variants)
  let scorer: OutcomeScorer = outcomeScorer(ctx, scoring, 'exact');
  let scored: ScoringRecord = { method: 'exact' };
  const todayRates = await byScoring(
    ctx,
    scoring,
    () => {
      const e = evaluateOrExplain(ctx.today, unit, input.maxSets === undefined ? {} : { maxSets: input.maxSets });
      return e.stable ? Array.from(e.result.matchRates) : null;
    },
    async (reason) => {
      scorer = outcomeScorer(ctx, scoring, 'simulation');
      scored = simulationRecord(ctx, scoring, reason);
      if (!stability.stable) return null;
      try {
        return Array.from(simulateDesign(ctx.today, scoringPlan(ctx, scoring), patienceOf(ctx)).matchRates);
      } catch (e) {
        if (e instanceof TooLargeError) return null;
        throw e;
      }
    },
  );
  const todayInstability = stability.stable ? null : await instabilityOf(ctx, certificateWithIds(ctx.today, stability.certificate!));

  phase('recommend');
  let decision: RecommendRecord | null = null;
  let noDecision: string | null = null;
  try {
    const score = input.score ?? 'exact';
    const simulatedSearch = score === 'simulation' || scored.method === 'simulation';
    const maxDesigns = input.maxDesigns ?? (simulatedSearch ? REPORT_SIMULATED_DESIGNS : undefined);
    decision = await recommendUseCase(ctx, {
      objective: input.objective ?? 'total',
      jobs: input.jobs,
      seed: input.seed,
      score,
      ...(score !== 'exact' && ctx.patience ? { patience: patienceOf(ctx) } : {}),
      ...(input.maxSets === undefined ? {} : { maxSets: input.maxSets }),
      ...(maxDesigns === undefined ? {} : { maxDesigns }),
      ...(input.jobs > 1 ? {} : { workerUrl: null }),
      ...(input.signal ? { signal: input.signal } : {}),
    } as RecommendInput);
  } catch (e) {
    if (e instanceof InfeasibleDesignError) noDecision = e.message;
    else if (e instanceof TooLargeError) noDecision = `the recommender could not evaluate every design: ${e.message}`;
    else if (e instanceof InterruptedError) noDecision = 'interrupted before the recommender had scored a design within the budget';
    else throw e;
  }

  const stopped = (): boolean => input.signal?.aborted === true;
  const skipped: string[] = [];
  phase('designs');
  const designs: ShownDesign[] = [];
  const show = async (role: ShownDesign['role'], name: string, figures: DesignFigures): Promise<void> => {
    if (stopped() && ctx.variants.length > 0 && !skipped.includes('the designs under the demand variants')) skipped.push('the designs under the demand variants');
    designs.push({ role, name, figures, underVariants: stopped() ? [] : await outcomesUnderWith(scorer, ctx.today, figures.added, figures.removed, ctx.variants) });
  };
  if (decision) {
    await show('today', "today's design", decision.today);
    if (decision.recommended.added.length + decision.recommended.removed.length > 0) await show('recommended', 'the recommended design', decision.recommended);
    const alt = alternativeOf(decision);
    if (alt) await show('alternative', 'a cheaper option', alt);
  } else if (stability.stable && ctx.problem.forcedOut.length === 0) {
    // no recommendation (no stable design within the rules, or a design past the exact guard): today's figures still show
    try {
      await show('today', "today's design", designFigures(ctx.problem, designDetails(ctx.problem, input.objective ?? 'total', Uint8Array.from(ctx.problem.today), input.maxSets), input.objective ?? 'total'));
    } catch (e) {
      if (!(e instanceof EdgewiseError)) throw e;
    }
  }

  phase('sweep');
  let sweep: SweepRecord | null = null;
  let sweepAddition: ReportRecord['sweepAddition'] = null;
  if (stopped()) skipped.push('the load sweep');
  else if (stability.stable && stability.bottleneck) {
    const grow = Array.from(stability.bottleneck.set, (k) => ctx.today.ids[k]!);
    const rec = decision?.recommended;
    const variants: Array<{ add: PairIds[]; remove: PairIds[] }> = [];
    if (rec && rec.added.length + rec.removed.length > 0) variants.push({ add: rec.added, remove: rec.removed });
    const adds = (decision?.verdicts ?? []).filter((v) => v.against === 'recommended' && v.change === 'add' && v.stable && v.delta !== null);
    const s = decision?.objectiveBetter === 'higher' ? -1 : 1; // deltas as "lower is better"
    const harmful = adds.filter((v) => v.advice === 'harmful').sort((a, b) => s * b.delta! - s * a.delta!)[0];
    const helpful = adds.filter((v) => v.effect === (s === 1 ? 'lowers' : 'raises')).sort((a, b) => s * a.delta! - s * b.delta!)[0];
    const single = harmful ?? helpful;
    if (single && rec) {
      variants.push({ add: [...rec.added, single.pair], remove: rec.removed });
      sweepAddition = { pair: single.pair, why: harmful ? 'harmful' : 'helpful' };
    }
    try {
      sweep = await sweepUseCase(ctx, {
        grow,
        variants,
        steps: input.sweepSteps ?? 12,
        score: input.score ?? 'exact',
        seed: input.seed,
        jobs: input.jobs,
        ...(input.maxSets === undefined ? {} : { maxSets: input.maxSets }),
        ...(input.jobs > 1 ? {} : { workerUrl: null }),
      });
    } catch (e) {
      if (e instanceof EdgewiseError) notes.push(`No load sweep: ${e.message}.`);
      else throw e;
    }
  } else if (!stability.stable) notes.push("No load sweep: today's design is unstable.");

  phase('simulate');
  const simulated: SimulatedSummary[] = [];
  if (ctx.patience && stopped()) skipped.push('the simulated figures with patience');
  else if (ctx.patience) {
    const run = async (role: 'today' | 'recommended', c: ScenarioContext): Promise<void> => {
      const r = await simulateUseCase(c, { policy: 'fcfm', jobs: input.jobs, seed: input.seed, replications: 4, arrivals: input.simulationArrivals ?? 400_000, exactMaxSets: 1 });
      simulated.push(simulatedSummary(role, r));
    };
    await run('today', ctx);
    const rec = decision?.recommended;
    if (rec && rec.added.length + rec.removed.length > 0) {
      const removed = rec.removed.filter((p) => !ctx.problem.forcedOut.some((f) => pairKey(ctx.problem.ids[f.a]!, ctx.problem.ids[f.b]!) === pairKey(p[0], p[1])));
      await run('recommended', scenarioContext(ctx.scenario, { source: ctx.source, design: { added: rec.added, removed, from: 'the recommendation' } }));
    }
  }

  // the report says it in its own words: the exact figures ignore patience, the simulated ones beside them do not
  const allSimulated =
    scored.method === 'simulation' &&
    (!decision || [decision.today, decision.recommended].every((d) => d.method === 'simulation')) &&
    (!sweep || sweep.method === 'simulation');
  const patienceNote = !ctx.patience
    ? null
    : allSimulated
      ? `Every figure of this report is simulated with the patience in the file (${impatientClasses(ctx)} one): items giving up (abandonment) are included.`
      : `The exact figures ignore patience (${impatientClasses(ctx)} one in the file): they assume every item waits until it is matched; the simulated figures under "Waits per class" include items giving up (abandonment).`;
  // the decision (recommend's) checks the limits; the report's own sections do not
  const limitsNote = limitsNotComparedWarning(ctx, scored.method, "The report's figures outside the Pareto set and the decision");
  const warnings = [...(decision?.warnings ?? []).filter((w) => !/patience/i.test(w)), ...(patienceNote ? [patienceNote] : []), ...(limitsNote ? [limitsNote] : [])];
  // each simulated section says so where it is printed
  const simulatedParts = [
    scored.method === 'simulation' ? "today's match rates and the designs under the demand variants" : null,
    decision && [decision.today, decision.recommended].some((d) => d.method === 'simulation') ? 'the designs of the decision and the Pareto set' : null,
    sweep?.method === 'simulation' ? 'the load sweep' : null,
  ].filter((w): w is string => w !== null);
  if (simulatedParts.length > 0) {
    const plan = scoringPlan(ctx, scoring);
    const extended = [decision?.search.allocation, sweep?.simulation?.allocation].filter((a) => a !== undefined && a.extended > 0);
    const more = extended.length > 0 ? `, more, up to ${extended[0]!.maxReplications}, where a comparison was not settled by them` : '';
    notes.push(
      `Simulated figures (seed ${input.seed}, the same arrival stream for every design): ${simulatedParts.join('; ')}. Each simulated figure has a 95 % interval (in the JSON record; ${plan.replications} replications of ${plan.arrivals.toLocaleString('en-US')} arrivals${more}), and two designs are called different only when their paired difference is significant.${ctx.patience ? " They include the file's patience: items giving up (abandonment)." : ''}`,
    );
  }
  const partial = stopped() || decision?.partial === true;
  if (partial) {
    notes.unshift(
      `Interrupted: this report shows what was computed before the stop${decision?.partial ? ' (the Pareto set is what the search had found so far)' : ''}${skipped.length > 0 ? `; not computed: ${skipped.join(', ')}` : ''}.`,
    );
  }
  return {
    ...recordBase(ctx, 'report', [...new Set(warnings)]),
    ...scored,
    partial,
    description: ctx.description,
    costUnit: ctx.costUnit,
    itemWord: ctx.itemWord,
    budget: Number.isFinite(ctx.problem.budget) ? ctx.problem.budget : null,
    decision,
    noDecision,
    todayStable: stability.stable,
    bottleneck: stability.bottleneck ? setRecord(ctx.today, stability.bottleneck) : null,
    todayInstability,
    matchRates: todayRates ? Array.from({ length: ctx.today.m }, (_, e) => ({ pair: pairIds(ctx.today, ctx.today.edgeA[e]!, ctx.today.edgeB[e]!), rate: todayRates[e]! })) : [],
    designs,
    variants: variantNames,
    sweep,
    sweepAddition,
    simulated,
    inputs: inputsOf(ctx),
    notes,
  };
}

/** What `report --json` prints: the decision, measured against the recommended design and today's. */
export function decisionRecord(r: ReportRecord) {
  const d = r.decision;
  return {
    command: 'report' as const,
    scenario: r.scenario,
    timeUnit: r.timeUnit,
    warnings: r.warnings,
    /** How today's figures were made; each design below has its own `method`. */
    method: r.method,
    /** What the page prints under its summary: which sections are simulated, sections left out and why. */
    notes: r.notes,
    costUnit: r.costUnit,
    budget: r.budget,
    objective: d?.objective ?? null,
    recommended: d ? d.recommended : null,
    today: d ? d.today : null,
    verdicts: d ? d.verdicts : [],
    noDecision: r.noDecision,
    partial: r.partial,
    instability: r.todayInstability,
    repairs: r.todayInstability ? r.todayInstability.repairs : null,
  };
}
