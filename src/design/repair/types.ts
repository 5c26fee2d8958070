/**
 * What `repairs` returns. Everything is in indices (toggle indices of the DesignProblem, class
 * indices); ids are attached at the boundary.
 */

/** One repair: a set of allowed candidates whose addition to today's design makes it stable. */
export interface Repair {
  /** Toggle indices (into problem.toggles) of the candidates added, ascending. */
  readonly added: readonly number[];
  /** Σ of their costs (rounded to 1e-9). */
  readonly cost: number;
  /** True when the repaired design costs at most the problem's budget (problem.costOffset + cost ≤ budget). */
  readonly withinBudget: boolean;
}

/** How a pair would relieve an overloaded set I: inside I (a self-pair or two classes of I), or from I to a class outside I ∪ N(I). */
export type ReliefKind = 'within' | 'outside';

/** A pair that would relieve the overloaded set but the scenario's rules keep out. */
export interface BlockedPair {
  /** Class indices, a ≤ b (equal for a self-pair). */
  readonly a: number;
  readonly b: number;
  /** `forbidden`: listed in the scenario's forbidden pairs; `limit`: an endpoint is at its maxCompatibilities today. */
  readonly rule: 'forbidden' | 'limit';
  /** Where the pair is listed: scenario.candidates[source], or scenario.compatibilities[source] (a removable compatibility the rules drop). */
  readonly origin: 'candidate' | 'compatibility';
  readonly source: number;
  /** For rule `limit`: the endpoints already at their maxCompatibilities; empty otherwise. */
  readonly full: readonly number[];
  readonly relief: ReliefKind;
}

/** A class outside I ∪ N(I): pairing it with a class of I adds its rate to the capacity λ(N(I)). */
export interface Partner {
  readonly class: number;
  readonly rate: number;
}

/** The set that stays overloaded with every allowed candidate added, and what would relieve it. */
export interface Overload {
  /** I, ascending: independent, no self-pair, λ(I) ≥ λ(N(I)) in the all-allowed design. */
  readonly set: Int32Array;
  /** N(I) in the all-allowed design, ascending. */
  readonly neighbours: Int32Array;
  /** λ(I). */
  readonly demand: number;
  /** λ(N(I)). */
  readonly capacity: number;
  /** λ(I) − λ(N(I)) ≥ 0: the capacity I lacks (a relief must bring more than this). */
  readonly deficit: number;
  /** Classes outside I ∪ N(I), by rate descending (ties by index): partners for an `outside` relief. */
  readonly partners: readonly Partner[];
  /** Listed pairs of a relieving kind that the rules keep out, in scenario order (candidates first). */
  readonly blocked: readonly BlockedPair[];
}

/** A class whose maxCompatibilities a repair would exceed. */
export interface LimitExcess {
  readonly class: number;
  /** Compatibilities with the repair. */
  readonly degree: number;
  readonly max: number;
}

/** Today's design is stable: no repair needed. */
export interface StableToday {
  readonly status: 'stable-today';
}

/** The cheapest repairs, cheapest first (ties: fewer pairs, then pair order). */
export interface RepairsFound {
  readonly status: 'repairs';
  readonly repairs: readonly Repair[];
  /**
   * True when `repairs` are the cheapest minimal sets found by the MILP; false when the one repair
   * given was found instead by dropping candidates from the all-allowed design (a design whose
   * smallest edge flow is below the MILP's floor, so its cost is not known to be the least).
   */
  readonly complete: boolean;
}

/** Even with every allowed candidate added, the set `overload.set` stays overloaded. */
export interface Overloaded {
  readonly status: 'overloaded';
  readonly overload: Overload;
}

/**
 * Every allowed candidate together would restore stability, but no set within the maxCompatibilities
 * of every class does. `withoutLimits` is the cheapest repair when the limits are lifted (and any
 * candidate the limits keep out is allowed), with the classes it takes over their limit.
 */
export interface LimitBound {
  readonly status: 'limits';
  readonly withoutLimits?: Repair;
  readonly overLimit: readonly LimitExcess[];
}

export type RepairResult = StableToday | RepairsFound | Overloaded | LimitBound;

/** A candidate the scenario's forbidden pairs keep out (the design problem leaves it out of its toggles). */
export interface ForbiddenCandidate {
  /** Class indices, a ≤ b. */
  readonly a: number;
  readonly b: number;
  /** Index in scenario.candidates. */
  readonly source: number;
}

export interface RepairOptions {
  /** Most repairs to return (default 5). */
  readonly count?: number;
  /** Candidates the rules forbid (see forbiddenCandidates), to name them when they would have helped. */
  readonly forbiddenCandidates?: readonly ForbiddenCandidate[];
}
