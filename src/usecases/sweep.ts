/**
 * `sweep`: the named classes grow together from today's rates to just short of the stability limit;
 * the exact backlog of the reference design and of each variant at each step, the bottleneck's spare
 * capacity, and the loads where a variant starts to help or to hurt.
 */
import { UsageError } from '../errors.js';
import { GROWTH_LIMIT_METHOD } from '../design/sweep/growth-limit.js';
import { applyChanges, sweep, type SweepVariantSpec } from '../design/sweep/sweep.js';
import { growthLimit } from '../design/sweep/growth-limit.js';
import { withRates } from '../model/compile.js';
import { checkStability } from '../stability/check.js';
import { EdgewiseError, UnstableDesignError } from '../errors.js';
import { certificateWithIds } from '../stability/certificate.js';
import type { Score } from '../design/scoring/score.js';
import { combineAllocations, type AllocationRecord } from '../design/search/allocation.js';
import { backlogInterval, byScoring, pairedVs, pairsOf, patienceOf, scoringPlan, simulateAgainstFirst, simulationRecord, simulationWarning, type ScoringInput, type ScoringRecord } from './scoring.js';
import { asciiPairs } from '../output/ascii-pairs.js';
import { recordBase, type ScenarioContext } from './context.js';
import { finite, idsOf, type PairIds, type RecordBase, type Reference } from './records.js';
import { exactWarnings, limitsNotComparedWarning, withNote } from './warnings.js';

export interface SweepVariantInput {
  readonly add: readonly PairIds[];
  readonly remove: readonly PairIds[];
}

export interface SweepInput extends ScoringInput {
  readonly grow: readonly string[];
  readonly variants: readonly SweepVariantInput[];
  readonly steps: number;
}

export interface SweepPoint {
  readonly factor: number;
  readonly stable: boolean;
  /** Mean total backlog (null when unstable at this step). */
  readonly backlog: number | null;
  /** λ(N(I)) − λ(I) of the bottleneck (null when unstable). */
  readonly spareCapacity: number | null;
  readonly bottleneck: string[];
  /** How the backlog was made. */
  readonly method: 'exact' | 'simulation';
  /** Simulated: 95 % interval of the backlog. */
  readonly backlogCi95?: [number, number] | null;
  /**
   * Simulated, for a variant: its backlog minus the reference design's at this step, paired under
   * common random numbers (the same arrival stream), with its 95 % interval; `significant` when
   * the interval excludes 0 (otherwise the two are not distinguishable at this step).
   */
  readonly vsReference?: { readonly difference: number | null; readonly ci95: [number, number] | null; readonly significant: boolean };
}

export interface SweepCurveRecord {
  /** "reference" for the design swept, else "with a~b" / "without c~d". */
  readonly name: string;
  readonly add: PairIds[];
  readonly remove: PairIds[];
  /** This design's own limit factor along the same growth (null: unlimited, or unstable today). */
  readonly limit: number | null;
  readonly points: SweepPoint[];
}

export interface SweepRecord extends RecordBase, ScoringRecord {
  readonly command: 'sweep';
  readonly reference: Reference;
  readonly grow: string[];
  /** The reference design's limit factor (null when nothing limits the growth). */
  readonly limit: { readonly factor: number | null; readonly method: string };
  readonly steps: Array<{ readonly factor: number; readonly headroomUsed: number | null }>;
  readonly curves: SweepCurveRecord[];
  readonly crossovers: Array<{
    readonly variant: string;
    readonly factor: number;
    readonly headroomUsed: number | null;
    readonly direction: 'starts-to-hurt' | 'starts-to-help';
    readonly between: [number, number | null];
    /**
     * Exact: 'interpolated' or 'bisection'. Simulated: 'bracketed' (significant on both sides, between
     * two neighbouring steps: `factor` is the midpoint) or 'unresolved' (steps whose intervals hold 0
     * lie between the last step on one side and the first on the other; `factor` is the midpoint).
     */
    readonly how: 'interpolated' | 'bisection' | 'bracketed' | 'unresolved';
  }>;
  readonly crossoverMethod: string;
}

export const CROSSOVER_METHOD =
  'sign change of the relative difference (variant − base) / base between two steps, interpolated linearly in the load factor; by bisection on exact evaluations when the variant is unstable at the later step';

/** The variant's name: "with a~b,c~d", "without e~f", or both. */
export function variantName(v: SweepVariantInput): string {
  const parts: string[] = [];
  if (v.add.length > 0) parts.push(`with ${asciiPairs(v.add)}`);
  if (v.remove.length > 0) parts.push(`without ${asciiPairs(v.remove)}`);
  return parts.join(' ');
}

export const SIMULATED_CROSSOVER_METHOD =
  'change of sign of the paired difference (variant − reference) between steps where its 95 % interval excludes 0 (a variant unstable at a step counts as hurting there): bracketed between two neighbouring steps, or unresolved where steps not distinguishable lie between';

export async function sweepUseCase(ctx: ScenarioContext, input: SweepInput): Promise<SweepRecord> {
  const model = ctx.model;
  const at = (id: string, flag: string): number => {
    const k = model.index.get(id);
    if (k === undefined) throw new UsageError(`${flag}: unknown class "${id}"`);
    return k;
  };
  const seen = new Set<string>();
  for (const id of input.grow) {
    if (seen.has(id)) throw new UsageError(`--grow names ${id} twice`);
    seen.add(id);
  }
  const grow = input.grow.map((id) => at(id, '--grow'));
  const names = input.variants.map(variantName);
  const dup = names.find((n, i) => names.indexOf(n) !== i);
  if (dup) throw new UsageError(`the variant "${dup}" is given twice`);
  const specs: SweepVariantSpec[] = input.variants.map((v, i) => ({
    name: names[i]!,
    add: v.add.map((p) => [at(p[0], '--with'), at(p[1], '--with')] as const),
    remove: v.remove.map((p) => [at(p[0], '--without'), at(p[1], '--without')] as const),
  }));
  return byScoring(
    ctx,
    input,
    () => exactSweep(ctx, input, grow, specs),
    (reason) => simulatedSweep(ctx, input, grow, specs, reason),
  );
}

function exactSweep(ctx: ScenarioContext, input: SweepInput, grow: number[], specs: SweepVariantSpec[]): SweepRecord {
  const model = ctx.model;
  const r = sweep(model, { grow, variants: specs, steps: input.steps, timeUnit: ctx.scenario.timeUnit, ...(input.maxSets === undefined ? {} : { maxSets: input.maxSets }) });
  const used = (s: number): number | null => (Number.isFinite(r.limit) ? (s - 1) / (r.limit - 1) : null);
  const curves = [r.base, ...r.variants].map((c, i) => ({
    name: i === 0 ? 'reference' : c.name,
    add: i === 0 ? [] : input.variants[i - 1]!.add.map((p) => [p[0], p[1]] as const),
    remove: i === 0 ? [] : input.variants[i - 1]!.remove.map((p) => [p[0], p[1]] as const),
    limit: finite(c.limit),
    points: Array.from(r.factors, (s, t) => ({
      factor: s,
      stable: Number.isFinite(c.backlog[t]!),
      backlog: finite(c.backlog[t]!),
      spareCapacity: finite(c.slack[t]!),
      bottleneck: idsOf(model, c.bottleneck[t]!),
      method: 'exact' as const,
    })),
  }));
  return {
    ...recordBase(ctx, 'sweep', withNote(exactWarnings(ctx), limitsNotComparedWarning(ctx, 'exact', 'These exact figures'))),
    method: 'exact',
    reference: ctx.reference,
    grow: idsOf(model, r.grow),
    limit: { factor: finite(r.limit), method: GROWTH_LIMIT_METHOD },
    steps: Array.from(r.factors, (s, t) => ({ factor: s, headroomUsed: finite(r.headroomUsed[t]!) })),
    curves,
    crossovers: r.crossovers.map((c) => ({
      variant: c.variant,
      factor: c.factor,
      headroomUsed: used(c.factor),
      direction: c.direction,
      between: [r.factors[c.after]!, finite(r.factors[c.after + 1] ?? NaN)],
      how: c.how,
    })),
    crossoverMethod: CROSSOVER_METHOD,
  };
}

const APPROACH = 0.98;
const MAX_FACTOR = 4;

/**
 * The sweep with every backlog simulated: at each step the reference design and the variants are
 * simulated under that step's rates with the same plan (common random numbers), so each variant's
 * difference from the reference is a paired difference with its own interval. The stability limit,
 * the spare capacity and the bottleneck come from the stability LP as in the exact sweep.
 */
async function simulatedSweep(ctx: ScenarioContext, input: SweepInput, grow: number[], specs: SweepVariantSpec[], reason: string): Promise<SweepRecord> {
  const model = ctx.model;
  if (!(Number.isInteger(input.steps) && input.steps >= 1)) throw new UsageError(`the number of steps must be a whole number >= 1, got ${input.steps}`);
  const today = checkStability(model);
  if (!today.stable) throw new UnstableDesignError(certificateWithIds(model, today.certificate!), ctx.scenario.timeUnit);
  const grown = new Uint8Array(model.n);
  grow.forEach((k) => (grown[k] = 1));
  const limit = growthLimit(model, Int32Array.from(grow));
  const last = Number.isFinite(limit) ? 1 + APPROACH * (limit - 1) : MAX_FACTOR;
  const factors = Array.from({ length: input.steps + 1 }, (_, t) => 1 + ((last - 1) * t) / input.steps);
  const designs = [model, ...specs.map((v) => applyChanges(model, v))];
  const pairs = designs.map(pairsOf);
  const plan = scoringPlan(ctx, input);
  const patience = patienceOf(ctx);
  const scaled = (s: number): Float64Array => model.rates.map((r, k) => (grown[k] ? r * s : r));
  const at: Score[][] = [];
  const allocations: AllocationRecord[] = [];
  for (const s of factors) {
    const step = await simulateAgainstFirst(model.ids, scaled(s), pairs, plan, input, patience);
    at.push(step.scores);
    allocations.push(step.allocation);
  }
  const stabilityAt = (d: number, s: number): { slack: number | null; set: string[] } => {
    try {
      const st = checkStability(withRates(designs[d]!, scaled(s)));
      return st.stable && st.bottleneck ? { slack: st.bottleneck.slack, set: idsOf(model, st.bottleneck.set) } : { slack: null, set: [] };
    } catch (e) {
      if (e instanceof EdgewiseError) return { slack: null, set: [] };
      throw e;
    }
  };
  const ownLimit = (d: number): number | null => {
    if (d === 0) return finite(limit);
    return checkStability(designs[d]!).stable ? finite(growthLimit(designs[d]!, Int32Array.from(grow))) : null;
  };
  const curves: SweepCurveRecord[] = designs.map((_, d) => ({
    name: d === 0 ? 'reference' : specs[d - 1]!.name,
    add: d === 0 ? [] : input.variants[d - 1]!.add.map((p) => [p[0], p[1]] as const),
    remove: d === 0 ? [] : input.variants[d - 1]!.remove.map((p) => [p[0], p[1]] as const),
    limit: ownLimit(d),
    points: factors.map((s, t) => {
      const sc = at[t]![d]!;
      const st = stabilityAt(d, s);
      const vs = d === 0 ? null : pairedVs(sc, at[t]![0]!);
      return {
        factor: s,
        stable: sc.stable,
        backlog: sc.stable ? finite(sc.backlogTotal) : null,
        spareCapacity: st.slack,
        bottleneck: st.set,
        method: 'simulation' as const,
        backlogCi95: backlogInterval(sc),
        ...(vs ? { vsReference: { difference: finite(vs.mean), ci95: vs.ci95 ? [vs.ci95[0], vs.ci95[1]] as [number, number] : null, significant: vs.significant } } : {}),
      };
    }),
  }));
  const used = (s: number): number | null => (Number.isFinite(limit) ? (s - 1) / (limit - 1) : null);
  const crossovers: SweepRecord['crossovers'] = [];
  curves.slice(1).forEach((c) => {
    // +1: hurts (significant, or unstable while the reference is not); −1: helps; 0: not distinguishable
    const sign = c.points.map((p, t) => {
      if (!curves[0]!.points[t]!.stable) return 0;
      if (!p.stable) return 1;
      const v = p.vsReference!;
      return v.significant && v.difference !== null ? Math.sign(v.difference) : 0;
    });
    let prev = -1;
    sign.forEach((g, t) => {
      if (g === 0) return;
      if (prev >= 0 && sign[prev]! !== g) {
        const lo = factors[prev]!;
        const hi = factors[t]!;
        const mid = (lo + hi) / 2;
        crossovers.push({
          variant: c.name,
          factor: mid,
          headroomUsed: used(mid),
          direction: g > 0 ? 'starts-to-hurt' : 'starts-to-help',
          between: [lo, hi],
          how: t === prev + 1 ? 'bracketed' : 'unresolved',
        });
      }
      prev = t;
    });
  });
  const scoring = simulationRecord(ctx, input, reason, combineAllocations(allocations));
  return {
    ...recordBase(ctx, 'sweep', withNote([simulationWarning(scoring)!, ...exactWarnings(ctx).filter((w) => !/ignore patience/.test(w))], limitsNotComparedWarning(ctx, 'simulation', 'These simulated figures'))),
    ...scoring,
    reference: ctx.reference,
    grow: idsOf(model, Int32Array.from(grow)),
    limit: { factor: finite(limit), method: GROWTH_LIMIT_METHOD },
    steps: factors.map((s) => ({ factor: s, headroomUsed: used(s) })),
    curves,
    crossovers,
    crossoverMethod: SIMULATED_CROSSOVER_METHOD,
  };
}

