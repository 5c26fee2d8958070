/**
 * `sweep`: the named classes grow together from today's rates to just short of the stability limit;
 * the exact backlog of the reference design and of each variant at each step, the bottleneck's spare
 * capacity, and the loads where a variant starts to help or to hurt.
 */
import { UsageError } from '../errors.js';
import { GROWTH_LIMIT_METHOD } from '../design/sweep/growth-limit.js';
import { sweep, type SweepVariantSpec } from '../design/sweep/sweep.js';
import { asciiPairs } from '../output/ascii-pairs.js';
import { recordBase, type ScenarioContext } from './context.js';
import { finite, idsOf, type PairIds, type RecordBase, type Reference } from './records.js';
import { exactWarnings } from './warnings.js';

export interface SweepVariantInput {
  readonly add: readonly PairIds[];
  readonly remove: readonly PairIds[];
}

export interface SweepInput {
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

export interface SweepRecord extends RecordBase {
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
    readonly how: 'interpolated' | 'bisection';
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
  const r = sweep(model, { grow, variants: specs, steps: input.steps, timeUnit: ctx.scenario.timeUnit });
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
    })),
  }));
  return {
    ...recordBase(ctx, 'sweep', exactWarnings(ctx)),
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
