/**
 * The one record of "a design with its figures" (DesignFigures), made from the design layer's
 * details, and the verdict records of a decision. Every command that shows a design uses these.
 */
import type { DesignDetails } from '../design/search/recommend.js';
import type { Verdict } from '../design/decision/decide.js';
import { limitInside } from '../design/scoring/evaluator.js';
import { designChanges, type DesignProblem } from '../design/space/problem.js';
import { objectiveSign, type ObjectiveName } from '../design/space/objective.js';
import { byClass, finite, pairIds, type PairIds } from './records.js';
import { LP_DIGITS, roundFigure } from '../output/format.js';

export interface DesignFigures {
  readonly added: PairIds[];
  /** Dropped compatibilities (forbidden ones that every design drops included). */
  readonly removed: PairIds[];
  /** Σ costs of added candidates − Σ savings of dropped compatibilities. */
  readonly cost: number;
  readonly stable: boolean;
  /** How the figures were made. */
  readonly method: 'exact' | 'simulation';
  /** Mean total number of items waiting (null when unstable). */
  readonly backlog: number | null;
  readonly backlogCi95?: [number, number];
  /**
   * The objective's value as shown (null when unstable): a backlog or a wait (lower is better), or
   * the net value (higher is better; see the decision's `objectiveBetter`).
   */
  readonly objective: number | null;
  /**
   * With values in the file (src/model/values.ts), when stable: Σ value · match rate per time unit,
   * waitingCost · backlog, and their difference (null otherwise; pairs without a value count 0).
   */
  readonly valueRate: number | null;
  readonly waitingCostRate: number | null;
  readonly netValue: number | null;
  /** The largest class mean wait and its class (null when unstable). */
  readonly maxWait: number | null;
  readonly maxWaitClass: string | null;
  /** Mean wait per class (null when unstable). */
  readonly waits: Record<string, number | null> | null;
  /** Spare capacity of the bottleneck, λ(N(I)) − λ(I) (null when unstable or no bottleneck). */
  readonly spareCapacity: number | null;
  /** The least flow on a compatibility, maximised over edge flows: how far from the stability boundary (null when unstable). */
  readonly flowMargin: number | null;
  readonly independentSets: number | null;
  /** Simulated: 95 % interval of each class's mean wait. */
  readonly waitsCi95?: Record<string, [number, number]>;
  /** Simulated with patience: the share of arrivals that abandon, over all and per class. */
  readonly abandonShare?: number;
  readonly abandonShareByClass?: Record<string, number | null>;
  /**
   * With maxAbandonment in the file and figures simulated with patience: each limited class's share
   * against its limit. `within`: the share (point estimate) is at or below the limit; `withinNoise`:
   * the 95 % interval contains the limit, so this simulation cannot tell which side it is on.
   */
  readonly abandonmentLimits?: AbandonmentLimit[];
  /**
   * On a simulated front: this design's backlog minus the next cheaper design's, paired under
   * common random numbers, with its 95 % interval; `significant` when the interval excludes 0
   * (otherwise the two designs are not distinguishable by this simulation); `negligible` when the
   * whole interval lies within ±1 % of the cheaper design's backlog (whatever its sign, the
   * difference is too small to matter).
   */
  readonly vsCheaper?: { readonly backlogDifference: number; readonly ci95: [number, number] | null; readonly significant: boolean; readonly negligible: boolean };
  /** Simulated: the replications behind the figures (more where the ranking was uncertain). */
  readonly replications?: number;
}

export interface AbandonmentLimit {
  readonly class: string;
  readonly limit: number;
  readonly share: number;
  readonly shareCi95: [number, number] | null;
  readonly within: boolean;
  readonly withinNoise: boolean;
}

/** Each limited class's simulated abandonment share against its maxAbandonment (null: no limit or no abandonment figures). */
export function abandonmentLimits(
  ids: readonly string[],
  limits: ArrayLike<number> | undefined,
  share: ArrayLike<number> | undefined,
  lo?: ArrayLike<number>,
  hi?: ArrayLike<number>,
): AbandonmentLimit[] | null {
  if (!limits || !share) return null;
  const out: AbandonmentLimit[] = [];
  for (let k = 0; k < ids.length; k++) {
    const limit = limits[k]!;
    if (Number.isNaN(limit)) continue;
    const ci: [number, number] | null = lo && hi && Number.isFinite(lo[k]!) && Number.isFinite(hi[k]!) ? [lo[k]!, hi[k]!] : null;
    out.push({ class: ids[k]!, limit, share: share[k]!, shareCi95: ci, within: share[k]! <= limit, withinNoise: ci !== null && limitInside(limit, ci[0], ci[1]) });
  }
  return out.length > 0 ? out : null;
}

/** The limits of the file against per-class simulated estimates (mean and 95 % interval per class). */
export function limitsOfEstimates(
  ids: readonly string[],
  limits: ArrayLike<number> | undefined,
  byClass: ReadonlyArray<{ readonly mean: number; readonly ci95: readonly [number, number] | null }>,
): AbandonmentLimit[] | null {
  const nan = (x: number): number => (Number.isFinite(x) ? x : NaN);
  return abandonmentLimits(
    ids,
    limits,
    byClass.map((e) => e.mean),
    byClass.map((e) => nan(e.ci95 ? e.ci95[0] : NaN)),
    byClass.map((e) => nan(e.ci95 ? e.ci95[1] : NaN)),
  );
}

/** Added and dropped pairs of a design (forced removals of forbidden pairs first among the dropped). */
export function changePairs(problem: DesignProblem, design: ArrayLike<number>): { added: PairIds[]; removed: PairIds[] } {
  const { added, removed } = designChanges(problem, design);
  const t = (j: number): PairIds => pairIds(problem, problem.toggles[j]!.a, problem.toggles[j]!.b);
  return { added: added.map(t), removed: [...problem.forcedOut.map((f) => pairIds(problem, f.a, f.b)), ...removed.map(t)] };
}

export function designFigures(problem: DesignProblem, d: DesignDetails, objective: ObjectiveName): DesignFigures {
  let maxClass: string | null = null;
  if (d.wait) {
    let k = 0;
    for (let i = 1; i < problem.n; i++) if (d.wait[i]! > d.wait[k]!) k = i;
    maxClass = problem.ids[k]!;
  }
  return {
    ...changePairs(problem, d.design),
    cost: d.cost,
    stable: d.stable,
    method: d.method ?? 'exact',
    backlog: d.stable ? finite(d.backlogTotal) : null,
    ...(d.stable && d.backlogCi95 ? { backlogCi95: [d.backlogCi95[0], d.backlogCi95[1]] as [number, number] } : {}),
    objective: d.stable ? finite(objectiveSign(objective) * d.objective) : null,
    ...valueFigures(problem, d),
    maxWait: d.stable ? finite(d.maxWait) : null,
    maxWaitClass: maxClass,
    waits: d.wait ? byClass(problem.ids, d.wait) : null,
    spareCapacity: d.stable ? finite(d.bottleneckSlack) : null,
    flowMargin: d.stable && Number.isFinite(d.minEdgeFlow) ? roundFigure(d.minEdgeFlow, LP_DIGITS) : null,
    independentSets: d.stable && d.method !== 'simulation' ? d.independentSets : null,
    ...(d.stable && d.waitLo && d.waitHi ? { waitsCi95: intervalsByClass(problem.ids, d.waitLo, d.waitHi) } : {}),
    ...(d.stable && d.abandonShare && d.abandonShareTotal !== undefined && d.abandonShareTotal > 0
      ? { abandonShare: d.abandonShareTotal, abandonShareByClass: byClass(problem.ids, d.abandonShare) }
      : {}),
    ...limitsOf(problem, d),
    ...(d.vsCheaper && Number.isFinite(d.vsCheaper.mean)
      ? { vsCheaper: { backlogDifference: d.vsCheaper.mean, ci95: d.vsCheaper.ci95 ? [d.vsCheaper.ci95[0], d.vsCheaper.ci95[1]] : null, significant: d.vsCheaper.significant, negligible: d.vsCheaper.negligible } }
      : {}),
    ...(d.stable && d.method === 'simulation' && d.perReplication ? { replications: d.perReplication.length } : {}),
  };
}

function limitsOf(problem: DesignProblem, d: DesignDetails): { abandonmentLimits?: AbandonmentLimit[] } {
  if (!d.stable || d.method !== 'simulation') return {};
  const l = abandonmentLimits(problem.ids, problem.maxAbandonment, d.abandonShare, d.abandonShareLo, d.abandonShareHi);
  return l ? { abandonmentLimits: l } : {};
}

/** Value rate, waiting cost rate and net value of a design (null when not applicable). */
function valueFigures(problem: DesignProblem, d: DesignDetails): Pick<DesignFigures, 'valueRate' | 'waitingCostRate' | 'netValue'> {
  if (!d.stable || !problem.hasValues || !Number.isFinite(d.valueRate)) return { valueRate: null, waitingCostRate: null, netValue: null };
  const waiting = problem.waitingCost * d.backlogTotal;
  return { valueRate: finite(d.valueRate), waitingCostRate: finite(waiting), netValue: finite(d.valueRate - waiting) };
}

/** Per-class intervals keyed by id (classes without a finite interval left out). */
export function intervalsByClass(ids: readonly string[], lo: ArrayLike<number>, hi: ArrayLike<number>): Record<string, [number, number]> {
  const out: Record<string, [number, number]> = {};
  ids.forEach((id, k) => {
    if (Number.isFinite(lo[k]!) && Number.isFinite(hi[k]!)) out[id] = [lo[k]!, hi[k]!];
  });
  return out;
}

export interface VerdictRecord {
  readonly pair: PairIds;
  /** A candidate (costs money to add) or a removable compatibility of today's design (saves money when dropped). */
  readonly kind: 'candidate' | 'removable';
  /** 'add': the pair is outside the design measured against; 'remove': inside it. */
  readonly change: 'add' | 'remove';
  /** The design the change is measured against. */
  readonly against: 'recommended' | 'today';
  /** Exact change of the objective as shown (net value: + is better; null when the change breaks stability). */
  readonly delta: number | null;
  /** Change of the mean total backlog (null when unstable). */
  readonly backlogDelta: number | null;
  /** Cost of adding (candidate), or saving of dropping (removable compatibility). */
  readonly price: number;
  /** The changed design's cost. */
  readonly cost: number;
  readonly stable: boolean;
  readonly withinBudget: boolean;
  /** The changed design is within budget, maxCompatibilities and wait targets. */
  readonly feasible: boolean;
  /** What the change does to the objective as shown ('raises' the net value is better). */
  readonly effect: Verdict['effect'];
  /** What to do, only against the recommended design. */
  readonly advice?: NonNullable<Verdict['advice']>;
}

export function verdictRecord(problem: DesignProblem, v: Verdict, objective: ObjectiveName): VerdictRecord {
  const t = problem.toggles[v.toggle]!;
  const sign = objectiveSign(objective);
  const effect = sign === 1 ? v.effect : v.effect === 'lowers' ? 'raises' : v.effect === 'raises' ? 'lowers' : v.effect;
  return {
    pair: pairIds(problem, t.a, t.b),
    kind: t.kind,
    change: v.change,
    against: v.against,
    delta: finite(sign * v.delta),
    backlogDelta: finite(v.backlogDelta),
    price: t.price,
    cost: v.cost,
    stable: v.stable,
    withinBudget: v.withinBudget,
    feasible: v.feasible,
    effect,
    ...(v.advice ? { advice: v.advice } : {}),
  };
}
