/** What the exact FCFM evaluator returns (indices; ids are attached at the boundary). */
export interface ExactResult {
  /** Number of independent sets the recursion used (summed over connected components). */
  readonly independentSets: number;
  /** P(no item waits). */
  readonly emptyProbability: number;
  /** Mean total number of waiting items. */
  readonly backlogTotal: number;
  /** Mean number of waiting items per class. */
  readonly backlog: Float64Array;
  /** Mean wait per class (Little's law: backlog / rate), in the scenario's time unit. */
  readonly wait: Float64Array;
  /** Probability that an arrival of the class is matched at once (PASTA). */
  readonly immediateMatch: Float64Array;
  /** Matches per time unit along each compatibility (edge order of the model; self-loops included). */
  readonly matchRates: Float64Array;
}
