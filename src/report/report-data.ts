/**
 * Everything the HTML report shows, as plain id-keyed data (built by gather-report.ts from the
 * design layer's results; rendered by report-html.ts). Keeping this shape separate means the page
 * can be tested on hand-made data, and the numbers can be tested without parsing HTML.
 */
import type { GraphPicture } from '../html/graph-svg.js';

export type Pair = readonly [string, string];

export interface ReportClass {
  readonly id: string;
  readonly label: string;
  readonly rate: number;
}

/** One design's outcome under one set of rates. */
export interface Outcome {
  readonly stable: boolean;
  /** Mean total number waiting (NaN when unstable). */
  readonly backlog: number;
  /** Largest class mean wait (NaN when unstable). */
  readonly maxWait: number;
  /** Id of the class with the largest mean wait ('' when unstable). */
  readonly maxWaitClass: string;
}

/** A design shown in the report: today's, or one the recommender returned. */
export interface DesignView {
  readonly name: string;
  readonly role: 'today' | 'recommended' | 'alternative';
  readonly cost: number;
  readonly added: readonly Pair[];
  readonly removed: readonly Pair[];
  readonly stable: boolean;
  /** Mean total number waiting under today's rates (NaN when unstable). */
  readonly backlog: number;
  /** Mean wait per class in class order (null when unstable). */
  readonly waits: readonly number[] | null;
  /** Sentence explaining the instability (certificate), when unstable. */
  readonly instability?: string;
  /** Outcome under each demand variant, in the order of ReportData.variants. */
  readonly underVariants: readonly Outcome[];
}

export interface SensitivityRow {
  readonly kind: 'add' | 'remove';
  readonly pair: Pair;
  /** Cost of adding, or saving of removing. */
  readonly money: number;
  readonly stable: boolean;
  readonly backlog: number;
  /** Change in total backlog against today's design (NaN when unstable). */
  readonly delta: number;
  /** harmful (addition) or beneficial (removal). */
  readonly flagged: boolean;
  /** The near-saturation condition's prediction, when the design layer gives one. */
  readonly predicted: boolean | null;
  /** Where the pair sits relative to the bottleneck of today's design. */
  readonly relation?: 'joins-neighbours' | 'touches' | 'elsewhere';
  /** The design layer's one-line explanation (exact verdict and condition). */
  readonly why?: string;
  /** Instability sentence when the change breaks stability. */
  readonly instability?: string;
}

export interface FrontPoint {
  readonly cost: number;
  readonly backlog: number;
  readonly maxWait: number;
  readonly added: readonly Pair[];
  readonly removed: readonly Pair[];
}

export interface BaselineView {
  readonly name: string;
  readonly cost: number;
  /** NaN when unstable. */
  readonly backlog: number;
  /** Backlog of the best front design costing at most as much (NaN when none). */
  readonly frontAtCost: number;
  /** Costs at most the budget. */
  readonly withinBudget: boolean;
}

export interface SweepView {
  readonly grow: readonly string[];
  readonly curves: ReadonlyArray<{ readonly name: string; readonly role: 'today' | 'recommended' | 'alternative' | 'warning'; readonly points: ReadonlyArray<{ readonly load: number; readonly backlog: number }> }>;
  readonly crossovers: ReadonlyArray<{ readonly load: number; readonly label: string }>;
  /** Largest load factor the base design can take (stability limit), when known. */
  readonly limit: number | null;
}

export interface ReportData {
  readonly scenario: string;
  readonly description: string | null;
  readonly timeUnit: string;
  readonly costUnit: string;
  /** Noun for waiting items, e.g. "items". */
  readonly itemWord: string;
  readonly budget: number | null;
  readonly classes: readonly ReportClass[];
  readonly compatibilityCount: number;
  readonly candidateCount: number;
  readonly graph: GraphPicture;
  readonly bottleneck: { readonly set: readonly string[]; readonly neighbours: readonly string[]; readonly demand: number; readonly capacity: number; readonly slack: number } | null;
  readonly today: DesignView;
  /** Recommended designs shown beside today's (the main recommendation first). */
  readonly designs: readonly DesignView[];
  readonly front: readonly FrontPoint[];
  readonly baselines: readonly BaselineView[];
  readonly sensitivity: readonly SensitivityRow[];
  readonly sweep: SweepView | null;
  /** Names of the demand variants (empty when the scenario lists none). */
  readonly variants: readonly string[];
  /** Plain sentences at the top of the report, most important first. */
  readonly verdicts: readonly string[];
  /** What the report could not compute, and why. */
  readonly notes: readonly string[];
}
