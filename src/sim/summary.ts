import { waitQuantile } from './percentiles.js';
import { QUANTILE_LEVELS, type ReplicationRecord } from './record.js';
import { t975 } from './student-t.js';
import { addBins } from './wait-bins.js';

/** A mean across replications with its 95 % Student t interval (null with fewer than 2 values). */
export interface Estimate {
  readonly mean: number;
  readonly ci95: readonly [number, number] | null;
  /** Replications that produced a value (a class with no arrival in a replication gives none). */
  readonly count: number;
}

export interface WaitEstimate extends Estimate {
  /** Percentiles of the pooled waits of all replications (matched items only). */
  readonly p50: number;
  readonly p90: number;
  readonly p99: number;
  /** 95 % intervals of the per-replication percentiles p50, p90, p99. */
  readonly quantileCi95: ReadonlyArray<readonly [number, number] | null>;
}

export interface PerClass<T> {
  readonly total: T;
  readonly byClass: readonly T[];
}

/** The aggregated result of all replications (class and edge indices; ids are attached at the boundary). */
export interface ReplicationSummary {
  readonly replications: number;
  readonly backlog: PerClass<Estimate>;
  readonly wait: PerClass<WaitEstimate>;
  readonly immediateMatch: PerClass<Estimate>;
  /** Per compatibility, model edge order. */
  readonly matchRates: readonly Estimate[];
  readonly abandonRate: PerClass<Estimate>;
  readonly abandonShare: PerClass<Estimate>;
  /** Simulated time per replication (measured window). */
  readonly duration: Estimate;
}

/** Mean and 95 % interval of the finite values among `values`. */
export function estimate(values: ArrayLike<number>): Estimate {
  let count = 0;
  let sum = 0;
  for (let i = 0; i < values.length; i++) {
    if (Number.isFinite(values[i]!)) {
      count++;
      sum += values[i]!;
    }
  }
  if (count === 0) return { mean: NaN, ci95: null, count };
  const mean = sum / count;
  if (count < 2) return { mean, ci95: null, count };
  let ss = 0;
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i]!)) ss += (values[i]! - mean) ** 2;
  const half = (t975(count) * Math.sqrt(ss / (count - 1))) / Math.sqrt(count);
  return { mean, ci95: [mean - half, mean + half], count };
}

/**
 * Collects replication records (in any order) and aggregates them in index order, so that the
 * result does not depend on which thread finished first. Histograms are summed as they arrive
 * (sums of integer counts below 2^53 are exact in any order) and then dropped.
 */
export class ReplicationPool {
  private readonly records: Array<ReplicationRecord | undefined>;
  private pooled: Float64Array | undefined;
  private kind: 'arrivals' | 'time' = 'arrivals';
  private bins = 0;

  constructor(
    private readonly n: number,
    private readonly m: number,
    private readonly totalRate: number,
    replications: number,
  ) {
    this.records = new Array<ReplicationRecord | undefined>(replications).fill(undefined);
  }

  add(record: ReplicationRecord): void {
    if (!this.pooled) {
      this.pooled = new Float64Array(record.hist.length);
      this.kind = record.histKind;
      this.bins = record.histBins;
    }
    const h = record.hist;
    for (let i = 0; i < h.length; i++) this.pooled[i] += h[i]!;
    this.records[record.index] = { ...record, hist: new Float64Array(0) };
  }

  get received(): number {
    return this.records.filter((r) => r !== undefined).length;
  }

  /** Aggregates the records; with `partial`, only those received (an interrupted run), in index order. */
  summary(partial = false): ReplicationSummary {
    const recs = partial
      ? this.records.filter((r): r is ReplicationRecord => r !== undefined)
      : this.records.map((r, i) => {
          if (!r) throw new Error(`replication ${i} is missing`);
          return r;
        });
    const { n, m } = this;
    const R = recs.length;
    const L = QUANTILE_LEVELS.length;
    const col = (f: (r: ReplicationRecord) => number): Estimate => estimate(recs.map(f));
    const perClass = (arr: (r: ReplicationRecord) => Float64Array, tot: (r: ReplicationRecord) => number): PerClass<Estimate> => ({
      total: col(tot),
      byClass: Array.from({ length: n }, (_, k) => col((r) => arr(r)[k]!)),
    });
    const pooled = this.pooled ?? new Float64Array(0);
    const totalHist = new Float64Array(this.bins);
    for (let k = 0; k < n; k++) addBins(totalHist, pooled, k * this.bins, this.bins);
    const waitOf = (slot: number, mean: Estimate, hist: Float64Array, start: number): WaitEstimate => {
      const q = QUANTILE_LEVELS.map((p) => waitQuantile(this.kind, hist, start, this.bins, this.totalRate, p));
      const qci = QUANTILE_LEVELS.map((_, i) => estimate(recs.map((r) => r.waitQuantiles[slot * L + i]!)).ci95);
      return { ...mean, p50: q[0]!, p90: q[1]!, p99: q[2]!, quantileCi95: qci };
    };
    return {
      replications: R,
      backlog: perClass((r) => r.backlog, (r) => r.backlogTotal),
      wait: {
        total: waitOf(n, col((r) => r.waitMeanTotal), totalHist, 0),
        byClass: Array.from({ length: n }, (_, k) => waitOf(k, col((r) => r.waitMean[k]!), pooled, k * this.bins)),
      },
      immediateMatch: perClass((r) => r.immediate, (r) => r.immediateTotal),
      matchRates: Array.from({ length: m }, (_, e) => col((r) => r.matchRates[e]!)),
      abandonRate: perClass((r) => r.abandonRate, (r) => r.abandonRateTotal),
      abandonShare: perClass((r) => r.abandonShare, (r) => r.abandonShareTotal),
      duration: col((r) => r.duration),
    };
  }
}

/**
 * A summary simulated on rates divided by `scale` (time running `scale` times slower), brought back
 * to the original time unit: waits and durations divided, rates multiplied; backlogs and shares
 * unchanged.
 */
export function scaledSummary(s: ReplicationSummary, scale: number): ReplicationSummary {
  if (scale === 1) return s;
  const ci = (c: readonly [number, number] | null, f: number): readonly [number, number] | null => (c ? [c[0] * f, c[1] * f] : null);
  const est = (e: Estimate, f: number): Estimate => ({ ...e, mean: e.mean * f, ci95: ci(e.ci95, f) });
  const wait = (w: WaitEstimate): WaitEstimate => ({
    ...w,
    ...est(w, 1 / scale),
    p50: w.p50 / scale,
    p90: w.p90 / scale,
    p99: w.p99 / scale,
    quantileCi95: w.quantileCi95.map((c) => ci(c, 1 / scale)),
  });
  const rate = (p: PerClass<Estimate>): PerClass<Estimate> => ({ total: est(p.total, scale), byClass: p.byClass.map((e) => est(e, scale)) });
  return {
    ...s,
    wait: { total: wait(s.wait.total), byClass: s.wait.byClass.map(wait) },
    matchRates: s.matchRates.map((e) => est(e, scale)),
    abandonRate: rate(s.abandonRate),
    duration: est(s.duration, 1 / scale),
  };
}
