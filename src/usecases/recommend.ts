/**
 * `recommend` (and the decision `report` and `compare` carry): the cost/objective Pareto set of the
 * designs within the budget, the recommended design — the one with the best objective, made
 * single-change optimal — every single-change verdict measured against it and against today's
 * design, the rules of thumb beside the set, and the ways out when today's design is unstable.
 */
import { InfeasibleDesignError, UsageError } from '../errors.js';
import { checkStability } from '../stability/check.js';
import { certificateWithIds } from '../stability/certificate.js';
import { decide, type Decision } from '../design/decision/decide.js';
import { needsMatchRates, objectiveBetter, objectiveLabel, objectiveSign, type ObjectiveName } from '../design/space/objective.js';
import { paretoFront } from '../design/space/pareto.js';
import { changeCount } from '../design/space/problem.js';
import { designDetails, NO_VALUES_MESSAGE, recommend, type DesignDetails, type Recommendation, type RecommendOptions } from '../design/search/recommend.js';
import type { AllocationRecord } from '../design/search/allocation.js';
import { limitInside, overAbandonmentLimit } from '../design/scoring/evaluator.js';
import type { ScenarioContext } from './context.js';
import { recordBase } from './context.js';
import { changePairs, designFigures, verdictRecord, type DesignFigures, type VerdictRecord } from './designs.js';
import { instabilityOf } from './instability.js';
import { finite, pairIds, type InstabilityRecord, type RepairRecord, type PairIds, type RecordBase } from './records.js';
import { exactWarnings, scoringWarnings, valueWarnings } from './warnings.js';
import { checkDesignSize } from './limits.js';
import { LP_DIGITS, num, roundFigure } from '../output/format.js';

export interface ParetoEntry extends DesignFigures {
  /** True for the recommended design. */
  readonly recommended: boolean;
}

export interface BaselineEntry extends DesignFigures {
  readonly name: string;
  /** How the design was built. */
  readonly note: string;
  readonly withinBudget: boolean;
  readonly withinLimits: boolean;
  readonly meetsTargets: boolean;
  /** Paid compatibilities whose removal alone would lower the objective. */
  readonly harmful: PairIds[];
  /** Comparable with the Pareto set: stable, within budget and limits, targets met. */
  readonly feasible: boolean;
  /**
   * Why it has no gap to the Pareto set (null when it has one): "unstable", "over budget",
   * "exceeds maxCompatibilities", "misses a wait target", "over an abandonment limit",
   * "nothing that cheap in the set". The text, the report and the JSON give the same reason.
   */
  readonly noGap: string | null;
  /** Best objective of the Pareto set at this cost or below, as shown (null when not comparable). */
  readonly frontAtCost: number | null;
  /**
   * How far the rule of thumb is behind the Pareto set at its cost, in the objective's unit (> 0:
   * worse; for net value frontAtCost − objective, else objective − frontAtCost), and that over |objective|.
   */
  readonly gap: number | null;
  readonly relativeGap: number | null;
}

/** The decision every command tells the same way. */
export interface DecisionPart {
  readonly objective: ObjectiveName;
  readonly objectiveLabel: string;
  /** Which way the objective as shown is better: 'lower' (backlog, wait) or 'higher' (net value). */
  readonly objectiveBetter: 'lower' | 'higher';
  /** The file's cost per waiting item per time unit (null when it gives none). */
  readonly waitingCost: number | null;
  /** null: no budget limit. */
  readonly budget: number | null;
  readonly costUnit: string | null;
  /** The recommended design: the best objective within the budget, single-change optimal. */
  readonly recommended: DesignFigures & { readonly improvements: number; readonly why: string };
  readonly today: DesignFigures;
  /** Every single change measured against the recommended design, then against today's. */
  readonly verdicts: VerdictRecord[];
}

export interface RecommendRecord extends RecordBase, DecisionPart {
  readonly command: 'recommend';
  /** Cheapest first; the objective falls along it. */
  readonly pareto: ParetoEntry[];
  readonly baselines: BaselineEntry[];
  readonly search: {
    readonly evaluations: number;
    /** Of the designs scored, those scored by simulation (0 or absent: all exact). */
    readonly simulated?: number;
    readonly scored: number;
    readonly toggles: number;
    /** 2^toggles (null when beyond 2^53). */
    readonly designSpace: number | null;
    readonly exhaustive: boolean;
    readonly harmfulRefused: number;
    /** The search stopped at this limit of designs scored (null: it ran to its end). */
    readonly designLimit: number | null;
    /** With maxAbandonment in the file: Pareto designs of the search dropped as over a limit by the final re-score. */
    readonly overLimitAfterRescore?: number;
    /** A simulated re-score: the replications added where the ranking was uncertain (docs/simulation-scoring.md). */
    readonly allocation?: AllocationRecord;
    readonly cheapestStableCost: number;
    readonly milp: { readonly cheapest: MilpEntry; readonly ladder: Array<{ readonly budget: number; readonly design: MilpEntry | null }> };
  };
  /** When today's design is unstable: why, and the ways out. */
  readonly instability: InstabilityRecord | null;
  /** When unstable: the cheapest sets of allowed candidates that make it stable, cheapest first (as in `instability`). */
  readonly repairs: RepairRecord[] | null;
  /** True when the search was interrupted: the set is what was found so far. */
  readonly partial: boolean;
}

export interface MilpEntry {
  readonly cost: number;
  readonly added: PairIds[];
  readonly removed: PairIds[];
  readonly flowMargin: number | null;
  readonly proven: boolean;
}

export interface RecommendInput extends Omit<RecommendOptions, 'objective'> {
  readonly objective: ObjectiveName;
}

/** The Pareto set with the improved recommended design in it. */
function mergedFront(ctx: ScenarioContext, pareto: readonly DesignDetails[], extra: DesignDetails | undefined): DesignDetails[] {
  const all = extra ? [...pareto, extra] : [...pareto];
  const points = all.map((d) => ({ d, cost: d.cost, objective: d.objective, changes: changeCount(ctx.problem, d.design), key: d.key }));
  return paretoFront(points).map((p) => p.d);
}

/** Recommendation → the decision: recommended design, verdicts, the front it sits on. */
export function decisionOf(ctx: ScenarioContext, rec: Recommendation, input: RecommendInput): { decision: Decision | null; pareto: DesignDetails[]; recommended: DesignDetails } {
  const pick = rec.pareto.reduce((best, d) => (d.objective < best.objective ? d : best));
  // single-change verdicts are exact; a simulated pick gets none (the record says so)
  if (rec.partial || pick.method === 'simulation') return { decision: null, pareto: rec.pareto, recommended: pick };
  const decision = decide(ctx.problem, input.objective, pick.design, input.maxSets === undefined ? {} : { maxSets: input.maxSets });
  const same = decision.improvements === 0;
  const recommended = same ? pick : designDetails(ctx.problem, input.objective, decision.design, input.maxSets);
  return { decision, pareto: mergedFront(ctx, rec.pareto, same ? undefined : recommended), recommended };
}

export function decisionPart(ctx: ScenarioContext, input: RecommendInput, parts: ReturnType<typeof decisionOf>, todayDetails: DesignDetails, partial = false): DecisionPart {
  const p = ctx.problem;
  const d = parts.decision;
  return {
    objective: input.objective,
    objectiveLabel: objectiveLabel(input.objective),
    objectiveBetter: objectiveBetter(input.objective),
    waitingCost: ctx.scenario.waitingCost ?? null,
    budget: finite(p.budget),
    costUnit: ctx.costUnit,
    recommended: {
      ...designFigures(p, parts.recommended, input.objective),
      improvements: d?.improvements ?? 0,
      why: `the ${objectiveBetter(input.objective) === 'higher' ? 'highest' : 'lowest'} ${objectiveLabel(input.objective)} within the ${Number.isFinite(p.budget) ? 'budget' : 'candidates'}${partial ? ' among the designs scored before the interruption' : ''}${d && d.improvements > 0 ? `, after ${d.improvements} single-change improvement${d.improvements === 1 ? '' : 's'} of the search's pick` : ''}`,
    },
    today: designFigures(p, todayDetails, input.objective),
    verdicts: d ? d.verdicts.map((v) => verdictRecord(p, v, input.objective)) : [],
  };
}

/** What the Pareto set did with the file's maxAbandonment limits: said whenever the file has one. */
export function limitWarnings(ctx: ScenarioContext, rec: Recommendation): string[] {
  const limits = ctx.problem.maxAbandonment;
  const limited = limits ? ctx.problem.ids.filter((_, k) => !Number.isNaN(limits[k]!)) : [];
  if (limited.length === 0) return [];
  const who = `${limited.length === 1 ? 'class' : 'classes'} ${limited.slice(0, 4).join(', ')}${limited.length > 4 ? ` and ${limited.length - 4} more` : ''}`;
  if (!rec.limitsChecked) {
    return [
      `The abandonment limits (maxAbandonment of ${who}) were not checked: these figures have no abandonment (exact scoring assumes patient items), so a design may be over a limit; use --score auto or simulation to honour them.`,
    ];
  }
  const noisy = rec.pareto.filter((d) => d.stable && d.abandonShareLo && d.abandonShareHi && straddles(limits!, d.abandonShare!, d.abandonShareLo, d.abandonShareHi)).length;
  const dropped = rec.overLimitAfterRescore ?? 0;
  return [
    `Abandonment limits (maxAbandonment of ${who}) checked on the simulated shares: designs over a limit were kept out of the Pareto set` +
      (dropped > 0 ? `; ${dropped} design${dropped === 1 ? '' : 's'} the search admitted ${dropped === 1 ? 'was' : 'were'} over a limit in the longer re-score and dropped` : '') +
      (noisy > 0 ? `; ${noisy} design${noisy === 1 ? "'s" : "s'"} interval contains a limit (within noise: the simulation cannot tell which side)` : '') +
      '.',
  ];
}

function straddles(limits: ArrayLike<number>, share: ArrayLike<number>, lo: ArrayLike<number>, hi: ArrayLike<number>): boolean {
  for (let k = 0; k < limits.length; k++) if (!Number.isNaN(limits[k]!) && share[k]! <= limits[k]! && limitInside(limits[k]!, lo[k]!, hi[k]!)) return true;
  return false;
}

export async function recommendUseCase(ctx: ScenarioContext, input: RecommendInput): Promise<RecommendRecord> {
  const p = ctx.problem;
  if (needsMatchRates(input.objective) && !p.hasValues) throw new UsageError(NO_VALUES_MESSAGE);
  if (needsMatchRates(input.objective) && input.score === 'simulation') {
    throw new UsageError('--objective net-value needs exact match rates, which --score simulation does not give; use --score exact (or auto)');
  }
  // the net value is an exact objective: auto scores it exactly (and says, beside the figures, that they ignore patience)
  if (needsMatchRates(input.objective) && input.score === 'auto') input = { ...input, score: 'exact' };
  const sign = objectiveSign(input.objective);
  checkDesignSize(p.n, p.toggles.length, 'recommend');
  const todayStability = checkStability(ctx.today);
  // today's repairs (HiGHS, in this thread) are worked out while the search waits for its scores:
  // with --jobs 2 and more they overlap the workers' scoring instead of coming before it
  const instabilityRun = todayStability.stable ? Promise.resolve(null) : instabilityOf(ctx, certificateWithIds(ctx.today, todayStability.certificate!));
  void instabilityRun.catch(() => undefined); // awaited below, after the search
  let rec: Recommendation;
  try {
    rec = await recommend(p, input);
  } catch (e) {
    const instability = await instabilityRun.catch(() => null);
    const o = instability?.noRepair?.overloaded;
    if (e instanceof InfeasibleDesignError && instability?.noRepair && o && o.set.length > 0) {
      throw new InfeasibleDesignError(
        `no stable design exists: even with every allowed candidate, {${o.set.join(', ')}} brings ${num(o.demand)}/${ctx.scenario.timeUnit} and only {${o.neighbours.join(', ')}} can serve it (${num(o.capacity)}/${ctx.scenario.timeUnit}). ${instability.noRepair.relief}` +
          (instability.noRepair.blocked.length > 0 ? ` Rules block ${instability.noRepair.blocked.map((b) => `${b.pair[0]} ↔ ${b.pair[1]} (${b.rule})`).join(', ')}.` : ''),
      );
    }
    throw e;
  }
  const instability = await instabilityRun;
  const parts = decisionOf(ctx, rec, input);
  const todayDetails = rec.today ?? designDetails(p, input.objective, Uint8Array.from(p.today), input.maxSets);
  const decision = decisionPart(ctx, input, parts, todayDetails, rec.partial);
  const recommendedKey = parts.recommended.key;
  const front = parts.pareto;
  const pair = (j: number): PairIds => pairIds(p, p.toggles[j]!.a, p.toggles[j]!.b);
  const milpEntry = (m: Recommendation['milp']['cheapest']): MilpEntry => ({ cost: m.cost, ...changePairs(p, m.design), flowMargin: Number.isFinite(m.verifiedMinFlow) ? roundFigure(m.verifiedMinFlow, LP_DIGITS) : null, proven: m.proven });
  const simulatedFront = front.some((d) => d.method === 'simulation');
  const warnings = [
    ...(input.score === undefined || input.score === 'exact' ? exactWarnings(ctx, 'The figures of every design') : scoringWarnings(ctx, input.score, rec, simulatedFront)),
    ...(p.hasValues ? valueWarnings(ctx) : []),
    rec.partial
      ? 'interrupted: the Pareto set is what the search had found so far; designs not yet checked for harmful paid compatibilities may be in it, and no verdicts were computed' +
        (front.some((d) => d.stable && d.wait === null) ? "; designs scored exactly show the search's total backlog only (their waits per class would need a full evaluation of each)" : '')
      : null,
    ...limitWarnings(ctx, rec),
    rec.designLimit !== undefined
      ? `the search stopped at its limit of ${rec.designLimit} designs scored (--max-designs): designs it did not reach may be better, and designs not yet checked for harmful paid compatibilities may be in the Pareto set`
      : null,
  ];
  return {
    ...recordBase(ctx, 'recommend', warnings),
    ...decision,
    pareto: front.map((d) => ({ ...designFigures(p, d, input.objective), recommended: d.key === recommendedKey })),
    baselines: rec.baselines.map((b) => ({
      ...designFigures(p, b, input.objective),
      name: b.name,
      note: b.note,
      withinBudget: b.withinBudget,
      withinLimits: b.withinLimits,
      meetsTargets: b.meetsTargets,
      harmful: b.harmful.map(pair),
      feasible: b.feasible,
      noGap: Number.isFinite(b.gap)
        ? null
        : !b.stable
          ? 'unstable'
          : !b.withinBudget
            ? 'over budget'
            : !b.withinLimits
              ? 'exceeds maxCompatibilities'
              : !b.meetsTargets
                ? 'misses a wait target'
                : overAbandonmentLimit(p, b.abandonShare)
                  ? 'over an abandonment limit'
                  : 'nothing that cheap in the set',
      frontAtCost: b.feasible ? finite(sign * b.frontValue) : null,
      gap: finite(b.gap),
      relativeGap: Number.isFinite(b.gap) && b.objective !== 0 ? b.gap / Math.abs(b.objective) : null,
    })),
    search: {
      evaluations: rec.evaluations,
      ...(rec.simulated ? { simulated: rec.simulated } : {}),
      scored: rec.scored,
      toggles: rec.toggles,
      designSpace: rec.toggles <= 53 ? rec.designSpace : null,
      exhaustive: rec.exhaustive,
      harmfulRefused: rec.harmfulRefused,
      designLimit: rec.designLimit ?? null,
      ...(rec.overLimitAfterRescore === undefined ? {} : { overLimitAfterRescore: rec.overLimitAfterRescore }),
      ...(rec.allocation ? { allocation: rec.allocation } : {}),
      cheapestStableCost: rec.milp.cheapest.cost,
      milp: { cheapest: milpEntry(rec.milp.cheapest), ladder: rec.milp.ladder.map((l) => ({ budget: l.budget, design: l.design ? milpEntry(l.design) : null })) },
    },
    instability,
    repairs: instability ? instability.repairs : null,
    partial: rec.partial,
  };
}
