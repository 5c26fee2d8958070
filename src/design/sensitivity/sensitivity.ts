/**
 * The exact effect of every single change of a design: the changes it is given (each a pair added
 * or removed, with its price and whether the scenario's rules allow it), one at a time. Every entry
 * is an exact FCFM evaluation of the changed design, computed incrementally from the base
 * (src/exact/single-change.ts: only the independent sets holding an endpoint of the change are
 * recomputed), flagged, explained by the base design's bottleneck, and ranked: changes the rules
 * allow first, then by benefit per unit of money (change-ranking.ts). Which changes to try and what
 * the rules say is the caller's (src/usecases/sensitivity.ts builds them from the scenario).
 */
import type { InstabilityCertificate } from '../../errors.js';
import { EdgewiseError, UnstableDesignError } from '../../errors.js';
import { compileGraph, edgePairs, type CompiledModel } from '../../model/compile.js';
import { singleChangeEvaluator, type ChangeResult } from '../../exact/single-change.js';
import { checkStability } from '../../stability/check.js';
import { certificateWithIds } from '../../stability/certificate.js';
import { bottlenecksOf, predicted, relationTo, type Bottleneck, type BottleneckRelation } from './bottleneck-relation.js';
import { compareChanges, perUnit } from './change-ranking.js';

export interface SensitivityOptions {
  /** Every absent pair (self-pairs included) as an addition, not only the scenario's candidates. */
  readonly allPairs?: boolean;
  /** Memory guard (independent sets); default DEFAULT_CHANGE_MAX_SETS of src/exact/single-change.ts. */
  readonly maxSets?: number;
  readonly timeUnit?: string;
  /** Called after each entry (for progress bars). */
  readonly onProgress?: (done: number, total: number) => void;
}

export interface SensitivityEntry extends ChangeSpec {
  /** Stable after the change (null when it could not be evaluated, see `skipped`). */
  readonly stable: boolean | null;
  /** Mean total backlog after the change (Infinity when unstable, NaN when skipped). */
  readonly backlog: number;
  /** backlog − base backlog. */
  readonly delta: number;
  /** Change in each class's mean wait (Infinity when unstable, NaN when skipped). */
  readonly waitDelta: Float64Array;
  /** delta per unit of price (see change-ranking.ts); undefined when unpriced or skipped. */
  readonly perUnit: number | undefined;
  /** Addition that raises the total backlog. */
  readonly harmful: boolean;
  /** Removal that lowers the total backlog, or keeps it equal and saves money. */
  readonly beneficial: boolean;
  /** Where the changed compatibility sits relative to the base bottleneck(s). */
  readonly relation: BottleneckRelation;
  /** The near-saturation condition holds (harm for an addition, benefit for a removal). */
  readonly predicted: boolean;
  /** Why the changed design is unstable. */
  readonly certificate?: InstabilityCertificate;
  /** How the exact figures were obtained (see ChangeResult.method). */
  readonly method?: ChangeResult['method'];
  /** Why the entry could not be evaluated (e.g. the joined component is too large). */
  readonly skipped?: string;
}

export interface SensitivityResult {
  readonly base: {
    readonly backlog: number;
    readonly backlogByClass: Float64Array;
    readonly wait: Float64Array;
    readonly emptyProbability: number;
    readonly independentSets: number;
    /** The bottleneck set(s) of the base design and their slack. */
    readonly bottlenecks: readonly Bottleneck[];
  };
  readonly additions: readonly SensitivityEntry[];
  readonly removals: readonly SensitivityEntry[];
}

/** |delta| at or below this fraction of the base backlog counts as "no change" (rounding level). */
export const EQUAL_RELATIVE = 1e-9;

/** The rule of the scenario that forbids a change. */
export type ChangeRule = 'forbidden' | 'fixed' | 'must-keep' | 'limit';

/** One change to try. */
export interface ChangeSpec {
  readonly kind: 'add' | 'remove';
  /** Class indices, a <= b (a = b: a self-loop). */
  readonly a: number;
  readonly b: number;
  /** Cost of the addition or saving of the removal; undefined when the scenario prices it not. */
  readonly price: number | undefined;
  /** Addition: a candidate of the scenario. Removal: a compatibility the scenario lets the designer drop. */
  readonly listed: boolean;
  /** The scenario's rules allow the change. */
  readonly allowed: boolean;
  readonly rule?: ChangeRule;
  /** Why the rule is there, when the scenario says. */
  readonly reason?: string;
}

type Job = ChangeSpec;

/** Throws UnstableDesignError when the base design is unstable. */
export function sensitivity(model: CompiledModel, jobs: readonly ChangeSpec[], options: SensitivityOptions = {}): SensitivityResult {
  const timeUnit = options.timeUnit ?? 'time unit';
  const stability = checkStability(model);
  if (!stability.stable) throw new UnstableDesignError(certificateWithIds(model, stability.certificate!), timeUnit);
  const bottlenecks = bottlenecksOf(model, stability);
  const evaluator = singleChangeEvaluator(model, { ...(options.maxSets === undefined ? {} : { maxSets: options.maxSets }), timeUnit });
  const base = evaluator.base;

  const tol = EQUAL_RELATIVE * Math.max(base.backlogTotal, Number.MIN_VALUE);
  const entries: SensitivityEntry[] = [];
  const least = bottlenecks[0]?.slack ?? Infinity;
  jobs.forEach((job, done) => {
    const relation = relationTo(bottlenecks, job.a, job.b);
    const common = { ...job, relation, predicted: predicted(relation) && (job.kind === 'add' || staysBottleneck(model, job, least)) };
    let r: ChangeResult;
    try {
      r = evaluator.toggle(job.a, job.b);
    } catch (e) {
      if (!(e instanceof EdgewiseError)) throw e;
      entries.push({
        ...common,
        stable: null,
        backlog: NaN,
        delta: NaN,
        waitDelta: new Float64Array(model.n).fill(NaN),
        perUnit: undefined,
        harmful: false,
        beneficial: false,
        skipped: e.message,
      });
      options.onProgress?.(done + 1, jobs.length);
      return;
    }
    const delta = r.stable ? r.backlogTotal - base.backlogTotal : Infinity;
    const waitDelta = new Float64Array(model.n);
    for (let k = 0; k < model.n; k++) waitDelta[k] = r.stable ? r.wait[k]! - base.wait[k]! : Infinity;
    const same = Math.abs(delta) <= tol;
    entries.push({
      ...common,
      stable: r.stable,
      backlog: r.backlogTotal,
      delta,
      waitDelta,
      perUnit: perUnit(same ? 0 : delta, job.price),
      harmful: job.kind === 'add' && r.stable && !same && delta > 0,
      beneficial: job.kind === 'remove' && r.stable && (same ? (job.price ?? 0) > 0 : delta < 0),
      method: r.method,
      ...(r.stable ? {} : { certificate: certificateOf(model, job, r) }),
    });
    options.onProgress?.(done + 1, jobs.length);
  });
  const sortable = (e: SensitivityEntry) => ({ a: e.a, b: e.b, price: e.price, delta: Math.abs(e.delta) <= tol ? 0 : e.delta });
  const order = (x: SensitivityEntry, y: SensitivityEntry): number => (x.allowed === y.allowed ? 0 : x.allowed ? -1 : 1) || compareChanges(sortable(x), sortable(y));
  return {
    base: {
      backlog: base.backlogTotal,
      backlogByClass: base.backlog,
      wait: base.wait,
      emptyProbability: base.emptyProbability,
      independentSets: evaluator.independentSets,
      bottlenecks,
    },
    additions: entries.filter((e) => e.kind === 'add').sort(order),
    removals: entries.filter((e) => e.kind === 'remove').sort(order),
  };
}

/**
 * For a removal between two neighbours of the bottleneck I: the published condition speaks of adding
 * the compatibility back to the design without it, so it applies when I is still a bottleneck there.
 * Removing it leaves N(I) and the slack of I unchanged and can only tighten other sets (those holding
 * an endpoint, which the compatibility would touch); so the question is whether the least slack of
 * the changed design is still that of I. A removal that breaks stability is not predicted to help.
 */
export function staysBottleneck(model: CompiledModel, job: Job, least: number): boolean {
  let s;
  try {
    s = checkStability(changedModel(model, job));
  } catch (e) {
    if (e instanceof EdgewiseError) return false; // on the stability boundary within precision
    throw e;
  }
  if (!s.stable || !s.bottleneck) return false;
  return s.bottleneck.slack >= least - 1e-9 * Math.max(Math.abs(least), model.totalRate * 1e-3);
}

function changedModel(model: CompiledModel, job: Job): CompiledModel {
  const pairs = edgePairs(model).filter(([x, y]) => !(job.kind === 'remove' && x === job.a && y === job.b));
  if (job.kind === 'add') pairs.push([job.a, job.b]);
  return compileGraph(model.ids, model.rates, pairs);
}

/**
 * The certificate of an unstable change, preferably from the stability layer on the changed design
 * (it names bipartite components as such); the recursion's own set otherwise.
 */
function certificateOf(model: CompiledModel, job: Job, r: ChangeResult): InstabilityCertificate {
  const changed = changedModel(model, job);
  try {
    const s = checkStability(changed);
    if (!s.stable && s.certificate) return certificateWithIds(changed, s.certificate);
  } catch (e) {
    if (!(e instanceof EdgewiseError)) throw e;
  }
  return r.certificate!;
}
