/** What checkStability returns. Everything is in class / edge indices; ids only at the boundary. */

/** An independent self-loop-free set I with λ(I) ≥ λ(N(I)) (up to the tolerance of tolerance.ts). */
export interface IndexCertificate {
  readonly set: Int32Array;
  readonly neighbours: Int32Array;
  /** λ(I). */
  readonly demand: number;
  /** λ(N(I)). */
  readonly capacity: number;
  readonly reason: 'bipartite' | 'overloaded';
}

/** An independent self-loop-free set and its spare capacity slack = λ(N(I)) − λ(I). */
export interface TightSet {
  readonly set: Int32Array;
  readonly neighbours: Int32Array;
  readonly slack: number;
  readonly demand: number;
  readonly capacity: number;
}

export interface ComponentStability {
  /** Class indices, ascending. */
  readonly members: Int32Array;
  /** No self-loop and two-colourable (an isolated class without self-loop counts). */
  readonly bipartite: boolean;
  readonly stable: boolean;
  /** t* of the edge-flow LP (absent for bipartite components, where no LP is solved). */
  readonly minEdgeFlow?: number;
  readonly certificate?: IndexCertificate;
}

export interface StabilityReport {
  readonly stable: boolean;
  /** Connected components (of the classes with a positive rate) in order of their smallest class index. */
  readonly components: readonly ComponentStability[];
  /** Certificate of the first unstable component. */
  readonly certificate?: IndexCertificate;
  /**
   * When stable: an edge flow μ with Σ_{e∋k} a_{k,e} μ_e = λ_k (per edge index), strictly positive
   * on the edges between classes of positive rate (0 on the edges of a class of rate 0).
   */
  readonly flow?: Float64Array;
  /**
   * Per class: how far λ_k may grow, the other rates fixed, before the design turns unstable;
   * Infinity for a self-looped class; NaN for the classes of an unstable component (and, in an
   * unstable design, for classes of rate 0).
   */
  readonly headroom: Float64Array;
  /**
   * The tightest independent set containing each class of the stable components (distinct),
   * sorted by slack ascending, ties to the larger set.
   */
  readonly tightSets: readonly TightSet[];
  /** When stable: the first tight set, i.e. the smallest slack over all independent sets. */
  readonly bottleneck?: TightSet;
  /**
   * When stable with a bottleneck: its slack relative to its capacity, (λ(N(I)) − λ(I)) / λ(N(I)). Exact figures lose about 1e-16 / relativeSlack of their relative
   * precision near the boundary (see backlogDigits in precision.ts and docs).
   */
  readonly relativeSlack?: number;
}

/** The smallest flow on a compatibility over the components (each maximised by its edge-flow LP); Infinity when none has one. */
export function minEdgeFlowOf(report: StabilityReport): number {
  let m = Infinity;
  for (const c of report.components) m = Math.min(m, c.minEdgeFlow ?? Infinity);
  return m;
}
