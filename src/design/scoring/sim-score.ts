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
  /**
   * Index of the first replication (default 0): replications first … first + replications − 1 of
   * the seed's streams, so that a design given more replications later (sequential allocation)
   * continues the same streams as every other design, and its figures merge (`mergeFigures`).
   */
  readonly firstReplication?: number;
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
  /** Every replication's figures (for `mergeFigures`). */
  readonly raw: ReplicationData;
}

function ci(e: { ci95: readonly [number, number] | null }): Interval | null {
  return e.ci95 ? [e.ci95[0], e.ci95[1]] : null;
}

/**
 * The figures of each replication, kept so that more replications can be added later and the
 * summary recomputed (`mergeFigures`). Per class arrays are replication-major: [r · n + k].
 */
export interface ReplicationData {
  readonly n: number;
  readonly m: number;
  /** Index of the first replication these rows hold. */
  readonly first: number;
  readonly totals: Float64Array;
  readonly backlog: Float64Array;
  readonly abandonShare: Float64Array;
  readonly abandonTotal: Float64Array;
  readonly immediate: Float64Array;
  readonly immediateTotal: Float64Array;
  /** Match rate per edge of each replication ([r · m + e]), original time unit. */
  readonly matchRates: Float64Array;
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
  const first = plan.firstReplication ?? 0;
  const states = streamStates(plan.seed, first + plan.replications).slice(first);
  const n = working.n;
  const m = working.m;
  const R = plan.replications;
  const rep = { arrivals: plan.arrivals, warmup: plan.warmup, maxWaiting: plan.maxWaiting, timed: false, noQuantiles: true };
  const raw: ReplicationData = {
    n,
    m,
    first,
    totals: new Float64Array(R),
    backlog: new Float64Array(R * n),
    abandonShare: new Float64Array(R * n),
    abandonTotal: new Float64Array(R),
    immediate: new Float64Array(R * n),
    immediateTotal: new Float64Array(R),
    matchRates: new Float64Array(R * m),
  };
  for (let i = 0; i < R; i++) {
    const r = runReplication(sim, rep, first + i, states[i]!);
    raw.totals[i] = r.backlogTotal;
    raw.abandonTotal[i] = r.abandonShareTotal;
    raw.immediateTotal[i] = r.immediateTotal;
    for (let k = 0; k < n; k++) {
      raw.backlog[i * n + k] = r.backlog[k]!;
      raw.abandonShare[i * n + k] = r.abandonShare[k]!;
      raw.immediate[i * n + k] = r.immediate[k]!;
    }
    // match rates came out per scaled time unit: multiply back
    for (let e = 0; e < m; e++) raw.matchRates[i * m + e] = r.matchRates[e]! * scale;
  }
  return figuresOf(raw, plan.arrivals, sim.impatient);
}

/** The replications of `a` followed by those of `b` (b must start where a ends). */
function concatData(a: ReplicationData, b: ReplicationData): ReplicationData {
  if (a.n !== b.n || a.m !== b.m) throw new RangeError('replications of different models cannot be merged');
  const ra = a.totals.length;
  if (b.first !== a.first + ra) throw new RangeError(`replications ${b.first}… do not continue ${a.first}…${a.first + ra - 1}`);
  const cat = (x: Float64Array, y: Float64Array): Float64Array => {
    const out = new Float64Array(x.length + y.length);
    out.set(x);
    out.set(y, x.length);
    return out;
  };
  return {
    n: a.n,
    m: a.m,
    first: a.first,
    totals: cat(a.totals, b.totals),
    backlog: cat(a.backlog, b.backlog),
    abandonShare: cat(a.abandonShare, b.abandonShare),
    abandonTotal: cat(a.abandonTotal, b.abandonTotal),
    immediate: cat(a.immediate, b.immediate),
    immediateTotal: cat(a.immediateTotal, b.immediateTotal),
    matchRates: cat(a.matchRates, b.matchRates),
  };
}

/**
 * The figures of a design simulated further: `more` holds the replications that follow those of
 * `figures` on the same streams (plan.firstReplication = the replications so far). The result
 * equals one simulation of all the replications at once.
 */
export function mergeFigures(figures: SimFigures, more: SimFigures): SimFigures {
  if (figures.arrivals !== more.arrivals) throw new RangeError('replications of different lengths cannot be merged');
  return figuresOf(concatData(figures.raw, more.raw), figures.arrivals, figures.impatient);
}

/** Means and 95 % intervals of the replications' figures. */
function figuresOf(raw: ReplicationData, arrivals: number, impatient: boolean): SimFigures {
  const { n, m } = raw;
  const R = raw.totals.length;
  const column = (x: Float64Array, k: number, width: number): Float64Array => Float64Array.from({ length: R }, (_, i) => x[i * width + k]!);
  const total = estimate(raw.totals);
  const backlog = new Float64Array(n);
  const lo = new Float64Array(n);
  const hi = new Float64Array(n);
  const abandonShare = new Float64Array(n);
  const abandonLo = new Float64Array(n);
  const abandonHi = new Float64Array(n);
  const immediate = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const e = estimate(column(raw.backlog, k, n));
    backlog[k] = e.mean;
    lo[k] = e.ci95 ? e.ci95[0] : e.mean;
    hi[k] = e.ci95 ? e.ci95[1] : e.mean;
    if (impatient) {
      const a = estimate(column(raw.abandonShare, k, n));
      abandonShare[k] = a.mean;
      abandonLo[k] = a.ci95 ? a.ci95[0] : a.mean;
      abandonHi[k] = a.ci95 ? a.ci95[1] : a.mean;
    }
    immediate[k] = estimate(column(raw.immediate, k, n)).mean;
  }
  const ab = estimate(raw.abandonTotal);
  const matchRates = new Float64Array(m);
  for (let e = 0; e < m; e++) {
    let sum = 0;
    for (let i = 0; i < R; i++) sum += raw.matchRates[i * m + e]!;
    matchRates[e] = sum / R;
  }
  return {
    backlogTotal: total.mean,
    backlogCi95: ci(total),
    backlog,
    backlogLo: lo,
    backlogHi: hi,
    perReplication: raw.totals,
    abandonShare,
    abandonShareLo: abandonLo,
    abandonShareHi: abandonHi,
    abandonShareTotal: impatient ? ab.mean : 0,
    abandonShareCi95: impatient ? ci(ab) : null,
    immediate,
    immediateTotal: estimate(raw.immediateTotal).mean,
    matchRates,
    replications: R,
    arrivals,
    impatient,
    raw,
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
