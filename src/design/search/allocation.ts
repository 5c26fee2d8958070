/**
 * Sequential allocation of the final re-score: more replications only where the ranking of the
 * returned designs is still uncertain.
 *
 * The designs returned by a simulated search are first re-scored with the report plan (10
 * replications). Then, round by round, the questions the output answers are checked:
 *
 * - along the Pareto set, is each design's backlog different from the next cheaper one's? The paired
 *   difference (same streams) is **resolved** when its 95 % interval excludes 0 (significant), or
 *   when the whole interval lies within ±`indifference` (1 %) of the cheaper design's backlog
 *   (negligible: more replications could only show a difference too small to matter);
 * - is a design's abandonment share on one side of each limit? Resolved when no limit lies inside
 *   the share's interval.
 *
 * The designs of every open question get `step` more replications (both designs of a pair reach
 * the same count, so the paired difference uses them all), up to `max` replications a design. The
 * extra replications continue the same streams (`firstReplication`), so a design simulated 10 + 10
 * times has exactly the figures of one 20-replication run, and the result depends on the seed only.
 * The rounds end when every question is resolved, every open design has `max` replications, or the
 * run is stopped (SIGINT: the figures so far are kept).
 */
import { limitInside } from '../scoring/evaluator.js';
import type { Score } from '../scoring/score.js';
import type { PairedDifference } from '../scoring/sim-score.js';

export interface AllocationPlan {
  /** Replications of the first re-score. */
  readonly initial: number;
  /** Replications added to an open design per round. */
  readonly step: number;
  /** Most replications a design gets. */
  readonly max: number;
  /** Share of the cheaper design's backlog within which a difference is negligible. */
  readonly indifference: number;
}

export const ALLOCATION_STEP = 10;
export const ALLOCATION_MAX = 40;
export const INDIFFERENCE = 0.01;

export function allocationPlan(initial: number): AllocationPlan {
  return { initial, step: ALLOCATION_STEP, max: Math.max(initial, ALLOCATION_MAX), indifference: INDIFFERENCE };
}

/** What the allocation did (JSON `search.allocation`). */
export interface AllocationRecord {
  readonly initialReplications: number;
  readonly maxReplications: number;
  /** Share of the cheaper design's backlog within which a difference counts as negligible. */
  readonly indifference: number;
  /** Questions open after the first re-score (those the extra replications were for). */
  readonly openAtStart: number;
  readonly rounds: number;
  /** Designs given more replications than the first re-score's. */
  readonly extended: number;
  /** Replications added in all (each of the plan's length). */
  readonly extraReplications: number;
  /** Questions still open at the end (neither significant nor negligible; or a limit inside an interval). */
  readonly unresolved: number;
  /** The run was stopped during the allocation. */
  readonly stopped: boolean;
}

/** The allocations of several independent comparisons (a sweep's steps) as one record. */
export function combineAllocations(list: readonly AllocationRecord[]): AllocationRecord | undefined {
  if (list.length === 0) return undefined;
  return {
    initialReplications: list[0]!.initialReplications,
    maxReplications: list[0]!.maxReplications,
    indifference: list[0]!.indifference,
    openAtStart: list.reduce((s, a) => s + a.openAtStart, 0),
    rounds: Math.max(...list.map((a) => a.rounds)),
    extended: list.reduce((s, a) => s + a.extended, 0),
    extraReplications: list.reduce((s, a) => s + a.extraReplications, 0),
    unresolved: list.reduce((s, a) => s + a.unresolved, 0),
    stopped: list.some((a) => a.stopped),
  };
}

/** True when the whole interval of the difference lies within ±share × reference. */
export function negligibleDifference(d: PairedDifference, reference: number, share: number): boolean {
  if (!d.ci95 || !(reference > 0)) return false;
  const zone = share * reference;
  return d.ci95[0] >= -zone && d.ci95[1] <= zone;
}

/** True when some limit lies inside its class's interval (the simulation cannot tell the side). */
export function limitInsideInterval(limits: ArrayLike<number> | undefined, lo: ArrayLike<number> | undefined, hi: ArrayLike<number> | undefined): boolean {
  if (!limits || !lo || !hi) return false;
  for (let k = 0; k < limits.length; k++) {
    const l = limits[k]!;
    if (!Number.isNaN(l) && limitInside(l, lo[k]!, hi[k]!)) return true;
  }
  return false;
}

/** Replications of a simulated score (0 when it has none). */
export function replicationsOf(s: Score | undefined): number {
  return s?.perReplication?.length ?? 0;
}

export interface AllocationInput {
  readonly plan: AllocationPlan;
  /** The first re-score's scores by design key. */
  readonly scores: ReadonlyMap<string, Score>;
  /**
   * The open questions of the current figures: each group lists design keys that must reach the
   * same (larger) number of replications — a pair, or one design near a limit.
   */
  readonly open: (scores: ReadonlyMap<string, Score>) => string[][];
  /** Scores `count` more replications of each design (by key), starting at replication `first`, in order. */
  readonly extend: (keys: string[], first: number, count: number) => Promise<Score[]>;
  /** Merges a score with its extra replications. */
  readonly merge: (score: Score, more: Score) => Score;
  readonly stopped: () => boolean;
}

export async function allocateReplications(input: AllocationInput): Promise<{ scores: Map<string, Score>; record: AllocationRecord }> {
  const { plan } = input;
  const scores = new Map(input.scores);
  const extended = new Set<string>();
  let rounds = 0;
  let extra = 0;
  let stopped = false;
  let open = input.open(scores);
  const openAtStart = open.length;
  for (;;) {
    // the replications each open design should reach this round
    const target = new Map<string, number>();
    for (const group of open) {
      const live = group.filter((k) => scores.get(k)?.stable === true && replicationsOf(scores.get(k)) > 0);
      if (live.length === 0) continue;
      const reach = Math.min(plan.max, Math.max(...live.map((k) => replicationsOf(scores.get(k)))) + plan.step);
      for (const k of live) target.set(k, Math.max(target.get(k) ?? 0, reach));
    }
    // one batch per (first replication, count), in a fixed order: the same bytes on every run
    const batches = new Map<string, { first: number; count: number; keys: string[] }>();
    for (const [k, reach] of [...target].sort((a, b) => (a[0] < b[0] ? -1 : a[0] > b[0] ? 1 : 0))) {
      const have = replicationsOf(scores.get(k));
      if (reach <= have) continue;
      const id = `${have}:${reach - have}`;
      const b = batches.get(id) ?? { first: have, count: reach - have, keys: [] };
      b.keys.push(k);
      batches.set(id, b);
    }
    if (batches.size === 0) break;
    if (input.stopped()) {
      stopped = true;
      break;
    }
    rounds++;
    for (const b of [...batches.values()].sort((x, y) => x.first - y.first || x.count - y.count)) {
      const more = await input.extend(b.keys, b.first, b.count);
      b.keys.forEach((k, i) => {
        scores.set(k, input.merge(scores.get(k)!, more[i]!));
        extended.add(k);
        extra += b.count;
      });
    }
    open = input.open(scores);
  }
  return {
    scores,
    record: {
      initialReplications: plan.initial,
      maxReplications: plan.max,
      indifference: plan.indifference,
      openAtStart,
      rounds,
      extended: extended.size,
      extraReplications: extra,
      unresolved: open.length,
      stopped,
    },
  };
}
