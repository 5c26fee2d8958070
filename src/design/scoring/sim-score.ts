/**
 * Scoring one design by seeded simulation (the method used where the exact recursion is not
 * feasible — too many independent sets, a connected group past 64 classes — or where the file gives
 * patience, which the exact product form does not model).
 *
 * Common random numbers: every design scored with the same plan uses the same replication streams
 * (`streamStates(plan.seed, replications)`), derived from the seed alone, never from the design.
 * Under FCFM the patient engine draws exactly one arrival per step from the same stream whatever
 * the compatibilities, so two designs see the same arrival sequence and the difference of their
 * figures is estimated far more precisely than either alone (paired differences, `pairedDifference`).
 * With patience the arrival draws and abandonment draws interleave, so the streams are shared but
 * the sequences only partly.
 *
 * Intervals: independent replications, Student t with R − 1 degrees of freedom (src/sim/summary.ts).
 * Pure and synchronous: the same (model, plan, patience) gives the same figures in any thread.
 * Works for any number of classes (no bitmask over the classes; the patient engine's 32-class mask
 * loop is an optimisation with a general loop beside it).
 */
import type { CompiledModel } from '../../model/compile.js';
import { scaledModel } from '../../model/rate-scale.js';
import { streamStates } from '../../sim/random.js';
import { runReplication } from '../../sim/replication.js';
import { buildSimModel } from '../../sim/sim-model.js';
import { estimate } from '../../sim/summary.js';
import { t975 } from '../../sim/student-t.js';

/** How long a design is simulated, as plain data (sent to worker threads). */
export interface SimPlan {
  /** Measured arrivals per replication. */
  readonly arrivals: number;
  /** Arrivals discarded first, per replication. */
  readonly warmup: number;
  readonly replications: number;
  /** Stream seed: the same for every design compared (common random numbers). */
  readonly seed: number;
  /** Stop when more items than this wait at once (the design is then treated as unusable). */
  readonly maxWaiting: number;
}

/** The cheap plan of the search: enough to rank designs, not to report them. */
export function searchPlan(seed: number, n: number): SimPlan {
  const arrivals = Math.max(20_000, Math.min(60_000, n * 600));
  return { arrivals, warmup: Math.floor(arrivals / 4), replications: 3, seed, maxWaiting: 2_000_000 };
}

/** The longer plan of the designs returned (Pareto set, baselines, `evaluate`): intervals to report. */
export function reportPlan(seed: number, n: number): SimPlan {
  const arrivals = Math.max(60_000, Math.min(300_000, n * 3_000));
  // a stream of its own (seed offset), so the figures reported are not those the search selected on
  return { arrivals, warmup: Math.floor(arrivals / 5), replications: 10, seed: seed + 1_000_003, maxWaiting: 5_000_000 };
}

export type Interval = [number, number];

export interface SimFigures {
  readonly backlogTotal: number;
  readonly backlogCi95: Interval | null;
  /** Mean backlog per class and its interval. */
  readonly backlog: Float64Array;
  readonly backlogLo: Float64Array;
  readonly backlogHi: Float64Array;
  /** The total backlog of each replication, in replication order (for paired differences). */
  readonly perReplication: Float64Array;
  /** Share of arrivals that abandon, per class and over all (0 without patience). */
  readonly abandonShare: Float64Array;
  /** Ends of the 95 % interval of each class's abandonment share (the mean itself when no interval; 0 without patience). */
  readonly abandonShareLo: Float64Array;
  readonly abandonShareHi: Float64Array;
  readonly abandonShareTotal: number;
  readonly abandonShareCi95: Interval | null;
  /** Share matched on arrival, per class. */
  readonly immediate: Float64Array;
  readonly immediateTotal: number;
  /** Match rate per edge of the model (original time unit). */
  readonly matchRates: Float64Array;
  readonly replications: number;
  readonly arrivals: number;
  readonly impatient: boolean;
}

function ci(e: { ci95: readonly [number, number] | null }): Interval | null {
  return e.ci95 ? [e.ci95[0], e.ci95[1]] : null;
}

/**
 * Simulates the design under FCFM with the plan's streams. `patience` (model order; 0, Infinity or
 * NaN = patient) switches on abandonment (the timed engine). Throws TooLargeError when a queue
 * outgrows `plan.maxWaiting`.
 */
export function simulateDesign(original: CompiledModel, plan: SimPlan, patience?: ArrayLike<number>): SimFigures {
  const { working, scale } = scaledModel(original);
  const scaledPatience = patience ? Float64Array.from(patience, (p) => (p > 0 && Number.isFinite(p) ? p * scale : Infinity)) : undefined;
  const sim = buildSimModel(working, scaledPatience ? { patience: scaledPatience } : {});
  const states = streamStates(plan.seed, plan.replications);
  const n = working.n;
  const R = plan.replications;
  const rep = { arrivals: plan.arrivals, warmup: plan.warmup, maxWaiting: plan.maxWaiting, timed: false, noQuantiles: true };
  const totals = new Float64Array(R);
  const perClass = Array.from({ length: n }, () => new Float64Array(R));
  const abandonPer = Array.from({ length: n }, () => new Float64Array(R));
  const immPer = Array.from({ length: n }, () => new Float64Array(R));
  const abandonTot = new Float64Array(R);
  const immTot = new Float64Array(R);
  const matchSum = new Float64Array(working.m);
  for (let i = 0; i < R; i++) {
    const r = runReplication(sim, rep, i, states[i]!);
    totals[i] = r.backlogTotal;
    abandonTot[i] = r.abandonShareTotal;
    immTot[i] = r.immediateTotal;
    for (let k = 0; k < n; k++) {
      perClass[k]![i] = r.backlog[k]!;
      abandonPer[k]![i] = r.abandonShare[k]!;
      immPer[k]![i] = r.immediate[k]!;
    }
    for (let e = 0; e < working.m; e++) matchSum[e] += r.matchRates[e]!;
  }
  const total = estimate(totals);
  const backlog = new Float64Array(n);
  const lo = new Float64Array(n);
  const hi = new Float64Array(n);
  const abandonShare = new Float64Array(n);
  const abandonLo = new Float64Array(n);
  const abandonHi = new Float64Array(n);
  const immediate = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const e = estimate(perClass[k]!);
    backlog[k] = e.mean;
    lo[k] = e.ci95 ? e.ci95[0] : e.mean;
    hi[k] = e.ci95 ? e.ci95[1] : e.mean;
    if (sim.impatient) {
      const a = estimate(abandonPer[k]!);
      abandonShare[k] = a.mean;
      abandonLo[k] = a.ci95 ? a.ci95[0] : a.mean;
      abandonHi[k] = a.ci95 ? a.ci95[1] : a.mean;
    }
    immediate[k] = estimate(immPer[k]!).mean;
  }
  const ab = estimate(abandonTot);
  // match rates came out per scaled time unit: multiply back
  const matchRates = Float64Array.from(matchSum, (x) => (x / R) * scale);
  return {
    backlogTotal: total.mean,
    backlogCi95: ci(total),
    backlog,
    backlogLo: lo,
    backlogHi: hi,
    perReplication: totals,
    abandonShare,
    abandonShareLo: abandonLo,
    abandonShareHi: abandonHi,
    abandonShareTotal: sim.impatient ? ab.mean : 0,
    abandonShareCi95: sim.impatient ? ci(ab) : null,
    immediate,
    immediateTotal: estimate(immTot).mean,
    matchRates,
    replications: R,
    arrivals: plan.arrivals,
    impatient: sim.impatient,
  };
}

/** The paired difference a − b of two designs simulated with the same streams, and its 95 % interval. */
export interface PairedDifference {
  readonly mean: number;
  readonly ci95: Interval | null;
  /** The interval excludes 0: one design is better than the other at the 5 % level. */
  readonly significant: boolean;
}

export function pairedDifference(a: ArrayLike<number>, b: ArrayLike<number>): PairedDifference {
  const R = Math.min(a.length, b.length);
  if (R < 2) return { mean: R === 1 ? a[0]! - b[0]! : NaN, ci95: null, significant: false };
  let sum = 0;
  for (let i = 0; i < R; i++) sum += a[i]! - b[i]!;
  const mean = sum / R;
  let ss = 0;
  for (let i = 0; i < R; i++) ss += (a[i]! - b[i]! - mean) ** 2;
  const half = (t975(R) * Math.sqrt(ss / (R - 1))) / Math.sqrt(R);
  const ci95: Interval = [mean - half, mean + half];
  return { mean, ci95, significant: ci95[0] > 0 || ci95[1] < 0 };
}
