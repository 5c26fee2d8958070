/**
 * Heavy-traffic view of a design: the named classes' rates are scaled by a common factor s from today
 * (s = 1) to just short of the stability limit s* (growth-limit.ts), and at each step the exact mean
 * backlog (src/exact: evaluateBacklog) and the bottleneck slack (src/stability) are computed for the
 * base design and for each variant (compatibilities added and/or removed). Crossovers, where a variant
 * starts to help or to hurt, come from crossover.ts.
 *
 * Steps: s_t = 1 + (t / N) · approach · (s* − 1), t = 0..N (linear in the factor; `approach` = 0.98
 * stops at 98 % of the headroom). When nothing limits the growth, the sweep runs to s = maxFactor.
 */
import { EdgewiseError, UnstableDesignError, UsageError } from '../../errors.js';
import { compileGraph, edgePairs, findEdge, withRates, type CompiledModel } from '../../model/compile.js';
import { evaluateBacklog } from '../../exact/evaluate.js';
import { checkStability } from '../../stability/check.js';
import { certificateWithIds } from '../../stability/certificate.js';
import { findCrossovers, type Crossover } from './crossover.js';
import { growthLimit } from './growth-limit.js';

export interface SweepVariantSpec {
  readonly name: string;
  /** Compatibilities to add / remove (class indices; [a, a] is a self-loop). */
  readonly add: ReadonlyArray<readonly [number, number]>;
  readonly remove: ReadonlyArray<readonly [number, number]>;
}

export interface SweepOptions {
  /** Classes whose rates grow together (indices). */
  readonly grow: ArrayLike<number>;
  readonly variants?: readonly SweepVariantSpec[];
  /** Number of steps after today (default 10). */
  readonly steps?: number;
  /** Share of the headroom s* − 1 reached by the last step (default 0.98). */
  readonly approach?: number;
  /** Last factor when nothing limits the growth (default 4). */
  readonly maxFactor?: number;
  /** Memory guard of each exact evaluation. */
  readonly maxSets?: number;
  readonly timeUnit?: string;
}

export interface SweepCurve {
  readonly name: string;
  /** Exact mean total backlog at each step (Infinity when unstable there). */
  readonly backlog: Float64Array;
  /** Least slack λ(N(I)) − λ(I) over independent sets at each step (NaN when unstable there). */
  readonly slack: Float64Array;
  /** The bottleneck set at each step (class indices; empty when unstable). */
  readonly bottleneck: readonly Int32Array[];
  /** This design's own limit factor along the same growth. */
  readonly limit: number;
}

export interface SweepCrossover extends Crossover {
  readonly variant: string;
}

export interface SweepResult {
  readonly grow: Int32Array;
  /** The base design's limit factor s* (Infinity when unlimited). */
  readonly limit: number;
  /** Load factor of each step (1 = today). */
  readonly factors: Float64Array;
  /** Share of the headroom used at each step, (s − 1) / (s* − 1) (NaN when unlimited). */
  readonly headroomUsed: Float64Array;
  readonly base: SweepCurve;
  readonly variants: readonly SweepCurve[];
  readonly crossovers: readonly SweepCrossover[];
}

/** The design with the variant's changes (class indices; throws UsageError on impossible changes). */
export function applyChanges(model: CompiledModel, v: SweepVariantSpec): CompiledModel {
  const pairs = edgePairs(model);
  const drop = new Set<number>();
  for (const [x, y] of v.remove) {
    const e = findEdge(model, x, y);
    if (e < 0) throw new UsageError(`${v.name}: ${model.ids[x]} and ${model.ids[y]} are not compatible today, so they cannot be removed`);
    drop.add(e);
  }
  const kept = pairs.filter((_, e) => !drop.has(e));
  const seen = new Set(kept.map(([a, b]) => a * model.n + b));
  for (const [x, y] of v.add) {
    const a = Math.min(x, y);
    const b = Math.max(x, y);
    if (seen.has(a * model.n + b)) throw new UsageError(`${v.name}: ${model.ids[x]} and ${model.ids[y]} are already compatible`);
    seen.add(a * model.n + b);
    kept.push([a, b]);
  }
  return compileGraph(model.ids, model.rates, kept);
}

function scaled(model: CompiledModel, grown: Uint8Array, s: number): Float64Array {
  return model.rates.map((r, k) => (grown[k] ? r * s : r));
}

/** Throws UnstableDesignError when the base design is unstable today. */
export function sweep(model: CompiledModel, options: SweepOptions): SweepResult {
  const steps = options.steps ?? 10;
  const approach = options.approach ?? 0.98;
  const maxFactor = options.maxFactor ?? 4;
  if (!(Number.isInteger(steps) && steps >= 1)) throw new UsageError(`the number of steps must be a whole number >= 1, got ${steps}`);
  if (!(approach > 0 && approach < 1)) throw new UsageError(`approach must lie strictly between 0 and 1, got ${approach}`);
  const grow = Int32Array.from(options.grow);
  if (grow.length === 0) throw new UsageError('name at least one class to grow');
  const grown = new Uint8Array(model.n);
  grow.forEach((k) => (grown[k] = 1));
  const today = checkStability(model);
  if (!today.stable) throw new UnstableDesignError(certificateWithIds(model, today.certificate!), options.timeUnit);

  const limit = growthLimit(model, grow);
  const last = Number.isFinite(limit) ? 1 + approach * (limit - 1) : maxFactor;
  const factors = Float64Array.from({ length: steps + 1 }, (_, t) => 1 + ((last - 1) * t) / steps);
  const headroomUsed = factors.map((s) => (Number.isFinite(limit) ? (s - 1) / (limit - 1) : NaN));
  const designs = [{ name: 'base', model }, ...(options.variants ?? []).map((v) => ({ name: v.name, model: applyChanges(model, v) }))];
  const exactOptions = { ...(options.maxSets === undefined ? {} : { maxSets: options.maxSets }), ...(options.timeUnit ? { timeUnit: options.timeUnit } : {}) };
  const backlogAt = (m: CompiledModel, s: number): number => {
    try {
      return evaluateBacklog(withRates(m, scaled(m, grown, s)), exactOptions).backlogTotal;
    } catch (e) {
      if (e instanceof UnstableDesignError) return Infinity;
      throw e;
    }
  };
  const curves: SweepCurve[] = designs.map(({ name, model: m }) => {
    const backlog = new Float64Array(factors.length);
    const slack = new Float64Array(factors.length);
    const bottleneck: Int32Array[] = [];
    factors.forEach((s, t) => {
      backlog[t] = backlogAt(m, s);
      const st = stabilityAt(m, grown, s);
      slack[t] = st.slack;
      bottleneck.push(st.set);
    });
    const own = m === model ? limit : safeLimit(m, grow);
    return { name, backlog, slack, bottleneck, limit: own };
  });
  const [base, ...variants] = curves;
  const crossovers: SweepCrossover[] = [];
  variants.forEach((v, i) => {
    const vm = designs[i + 1]!.model;
    const rhoAt = (s: number): number => {
      const lb = backlogAt(model, s);
      const lv = backlogAt(vm, s);
      return Number.isFinite(lv) ? (lv - lb) / lb : Infinity;
    };
    for (const c of findCrossovers(factors, base!.backlog, v.backlog, rhoAt)) crossovers.push({ ...c, variant: v.name });
  });
  return { grow, limit, factors, headroomUsed, base: base!, variants, crossovers };
}

function stabilityAt(m: CompiledModel, grown: Uint8Array, s: number): { slack: number; set: Int32Array } {
  try {
    const r = checkStability(withRates(m, scaled(m, grown, s)));
    return r.stable && r.bottleneck ? { slack: r.bottleneck.slack, set: r.bottleneck.set } : { slack: NaN, set: new Int32Array(0) };
  } catch (e) {
    if (e instanceof EdgewiseError) return { slack: NaN, set: new Int32Array(0) };
    throw e;
  }
}

/** A variant's own limit; NaN when it is unstable today (no limit to speak of). */
function safeLimit(m: CompiledModel, grow: Int32Array): number {
  const s = checkStability(m);
  return s.stable ? growthLimit(m, grow) : NaN;
}
