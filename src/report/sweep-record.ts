/**
 * The id-keyed record of a load sweep (`edgewise sweep --json`, also read by the HTML report) and its
 * CSV form (one row per step and design).
 */
import type { CompiledModel } from '../model/compile.js';
import { GROWTH_LIMIT_METHOD } from '../design/sweep/growth-limit.js';
import type { SweepResult } from '../design/sweep/sweep.js';

const r12 = (x: number): number | null => (Number.isFinite(x) ? Number(x.toPrecision(12)) : null);

export interface SweepPointRecord {
  readonly factor: number | null;
  /** Mean total backlog (null when unstable at this step). */
  readonly backlog: number | null;
  readonly stable: boolean;
  /** Least slack over independent sets (null when unstable). */
  readonly slack: number | null;
  readonly bottleneck: readonly string[];
}

export interface SweepRecord {
  readonly scenario: string;
  readonly timeUnit: string;
  readonly grow: readonly string[];
  readonly limit: { readonly factor: number | null; readonly method: string };
  readonly steps: ReadonlyArray<{ readonly factor: number | null; readonly headroomUsed: number | null }>;
  readonly curves: ReadonlyArray<{ readonly name: string; readonly limit: number | null; readonly points: readonly SweepPointRecord[] }>;
  readonly crossovers: ReadonlyArray<{
    readonly variant: string;
    readonly factor: number | null;
    readonly headroomUsed: number | null;
    readonly direction: 'starts-to-hurt' | 'starts-to-help';
    /** The two steps around the crossover. */
    readonly between: readonly [number | null, number | null];
    readonly how: string;
  }>;
  /** How crossovers are located. */
  readonly crossoverMethod: string;
}

export const CROSSOVER_METHOD =
  'sign change of the relative difference (variant − base) / base between two steps, interpolated linearly in the load factor; by bisection on exact evaluations when the variant is unstable at the later step';

export function sweepRecord(model: CompiledModel, r: SweepResult, meta: { scenario: string; timeUnit: string }): SweepRecord {
  const ids = (set: ArrayLike<number>): string[] => Array.from(set, (k) => model.ids[k]!);
  const used = (s: number): number | null => (Number.isFinite(r.limit) ? r12((s - 1) / (r.limit - 1)) : null);
  return {
    scenario: meta.scenario,
    timeUnit: meta.timeUnit,
    grow: ids(r.grow),
    limit: { factor: r12(r.limit), method: GROWTH_LIMIT_METHOD },
    steps: Array.from(r.factors, (s, t) => ({ factor: r12(s), headroomUsed: r12(r.headroomUsed[t]!) })),
    curves: [r.base, ...r.variants].map((c) => ({
      name: c.name,
      limit: r12(c.limit),
      points: Array.from(r.factors, (s, t) => ({
        factor: r12(s),
        backlog: r12(c.backlog[t]!),
        stable: Number.isFinite(c.backlog[t]!),
        slack: r12(c.slack[t]!),
        bottleneck: ids(c.bottleneck[t]!),
      })),
    })),
    crossovers: r.crossovers.map((c) => ({
      variant: c.variant,
      factor: r12(c.factor),
      headroomUsed: used(c.factor),
      direction: c.direction,
      between: [r12(r.factors[c.after]!), r12(r.factors[c.after + 1] ?? NaN)],
      how: c.how,
    })),
    crossoverMethod: CROSSOVER_METHOD,
  };
}

const csvField = (v: string): string => (/[",\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v);
const csvNum = (x: number): string => (Number.isFinite(x) ? String(Number(x.toPrecision(12))) : x > 0 ? 'inf' : '');

/** step,factor,headroom_used,design,stable,backlog,slack,bottleneck — one row per step and design. */
export function sweepCsv(model: CompiledModel, r: SweepResult): string {
  const lines = ['step,factor,headroom_used,design,stable,backlog,slack,bottleneck'];
  for (const c of [r.base, ...r.variants]) {
    r.factors.forEach((s, t) => {
      const bottleneck = Array.from(c.bottleneck[t]!, (k) => model.ids[k]!).join(' ');
      lines.push(
        [String(t), csvNum(s), csvNum(r.headroomUsed[t]!), csvField(c.name), String(Number.isFinite(c.backlog[t]!)), csvNum(c.backlog[t]!), csvNum(c.slack[t]!), csvField(bottleneck)].join(','),
      );
    });
  }
  return `${lines.join('\n')}\n`;
}
