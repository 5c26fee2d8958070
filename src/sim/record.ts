/** What one replication reports: flat per-class / per-edge arrays of its own estimates. */

/** Wait quantile levels reported (p50, p90, p99). */
export const QUANTILE_LEVELS = [0.5, 0.9, 0.99] as const;

export interface ReplicationPlan {
  /** Measured arrivals per replication (after the warm-up). */
  readonly arrivals: number;
  /** Arrivals simulated and discarded first. */
  readonly warmup: number;
  /** Stop (TooLargeError) when more items than this wait at once, all classes together. */
  readonly maxWaiting: number;
  /** Use the timed engine even when every class is patient (it is used anyway with impatience). */
  readonly timed: boolean;
  /**
   * Leave out the wait percentiles (NaN): they cost a fixed ~0.1 s per replication (a bisection
   * over the histogram per class), which dominates the short runs of design scoring. The record
   * then carries no histogram (`hist` empty) and the counters are reused (counters.ts).
   */
  readonly noQuantiles?: boolean;
}

export interface ReplicationRecord {
  readonly index: number;
  /** Measured arrivals. */
  readonly arrivals: number;
  /** Length of the measured window (time units; arrivals/Λ for the patient engine). */
  readonly duration: number;
  /** Time-average number of waiting items, per class. */
  readonly backlog: Float64Array;
  readonly backlogTotal: number;
  /** Mean wait of the items matched in the window (zero for those matched on arrival), per class. */
  readonly waitMean: Float64Array;
  readonly waitMeanTotal: number;
  /** Wait quantiles: [class 0 p50, p90, p99, class 1 …, total p50, p90, p99]. */
  readonly waitQuantiles: Float64Array;
  /** Share of the class's arrivals matched at once. */
  readonly immediate: Float64Array;
  readonly immediateTotal: number;
  /** Matches per time unit along each compatibility (model edge order). */
  readonly matchRates: Float64Array;
  /** Abandonments per time unit, per class. */
  readonly abandonRate: Float64Array;
  readonly abandonRateTotal: number;
  /** Abandonments / arrivals, per class. */
  readonly abandonShare: Float64Array;
  readonly abandonShareTotal: number;
  /** Wait histogram per class (bins of `histKind`, bin 0 = matched on arrival), for pooled percentiles. */
  readonly hist: Float64Array;
  readonly histKind: 'arrivals' | 'time';
  readonly histBins: number;
}
