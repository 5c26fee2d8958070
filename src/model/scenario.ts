/** The validated, in-memory form of a scenario file (see docs/scenario-format.md). */

export interface ClassSpec {
  /** Unique class id, used everywhere at the boundary. */
  readonly id: string;
  /** Poisson arrival rate per time unit, finite and > 0. */
  readonly rate: number;
  readonly label?: string;
  /** Mean patience (time units) for the simulator; absent = infinitely patient. */
  readonly patience?: number;
  /** Extra fields are kept untouched for later commands. */
  readonly [extra: string]: unknown;
}

export interface CompatibilitySpec {
  /** The two class ids; `[a, a]` means items of class a match each other. */
  readonly pair: readonly [string, string];
  /** May the designer drop it? */
  readonly removable: boolean;
  /** What dropping it saves (>= 0). */
  readonly saving: number;
  readonly [extra: string]: unknown;
}

export interface CandidateSpec {
  readonly pair: readonly [string, string];
  /** What enabling it costs (>= 0). */
  readonly cost: number;
  readonly [extra: string]: unknown;
}

export interface Scenario {
  readonly name: string;
  readonly timeUnit: string;
  readonly classes: readonly ClassSpec[];
  readonly compatibilities: readonly CompatibilitySpec[];
  readonly candidates: readonly CandidateSpec[];
  readonly budget?: number;
  /** Every other top-level field of the file, kept as written. */
  readonly extra: Readonly<Record<string, unknown>>;
}

/** Canonical key of an unordered pair, independent of order: "a\u0000b" with a <= b. */
export function pairKey(a: string, b: string): string {
  return a <= b ? `${a}\u0000${b}` : `${b}\u0000${a}`;
}
