/**
 * The id-keyed record of a sensitivity table (the shape `edgewise sensitivity --json` prints), with a
 * plain-language explanation of every entry: the exact verdict first, then where the change sits
 * relative to the base bottleneck and what the near-saturation condition predicts.
 */
import { describeCertificate, type InstabilityCertificate } from '../errors.js';
import type { CompiledModel } from '../model/compile.js';
import { relationToSet, type Bottleneck } from '../design/sensitivity/bottleneck-relation.js';
import type { SensitivityEntry, SensitivityResult } from '../design/sensitivity/sensitivity.js';

const r12 = (x: number): number | null => (Number.isFinite(x) ? Number(x.toPrecision(12)) : null);
const short = (x: number): string => (Number.isFinite(x) ? String(Number(x.toPrecision(4))) : x > 0 ? '∞' : '—');

export interface BottleneckRecord {
  readonly set: readonly string[];
  readonly neighbours: readonly string[];
  readonly demand: number | null;
  readonly capacity: number | null;
  readonly slack: number | null;
}

interface EntryCommon {
  readonly pair: readonly [string, string];
  readonly stable: boolean | null;
  readonly backlog: number | null;
  readonly delta: number | null;
  readonly predicted: boolean;
  readonly relation: SensitivityEntry['relation'];
  readonly explanation: string;
  readonly waitDelta: Record<string, number | null>;
  readonly method?: string;
  readonly certificate?: InstabilityCertificate & { readonly message: string };
  readonly skipped?: string;
}

export interface AdditionRecord extends EntryCommon {
  /** null for a pair that is not a candidate (listed by --all-pairs). */
  readonly cost: number | null;
  readonly candidate: boolean;
  readonly deltaPerCost: number | null;
  readonly harmful: boolean;
}

export interface RemovalRecord extends EntryCommon {
  readonly saving: number;
  readonly removable: boolean;
  readonly deltaPerSaving: number | null;
  readonly beneficial: boolean;
}

export interface SensitivityRecord {
  readonly scenario: string;
  readonly timeUnit: string;
  readonly base: {
    readonly backlog: number | null;
    readonly wait: Record<string, number | null>;
    readonly independentSets: number;
    readonly bottlenecks: readonly BottleneckRecord[];
  };
  readonly additions: readonly AdditionRecord[];
  readonly removals: readonly RemovalRecord[];
}

const braces = (names: readonly string[]): string => `{${names.join(', ')}}`;

/** Sentence for one entry (see the file comment). */
export function explainEntry(model: CompiledModel, e: SensitivityEntry, bottlenecks: readonly Bottleneck[], timeUnit: string): string {
  const id = (k: number): string => model.ids[k]!;
  const what = e.a === e.b ? `${id(e.a)} with ${id(e.a)}` : `${id(e.a)} and ${id(e.b)}`;
  let exact: string;
  if (e.skipped) exact = `not evaluated: ${e.skipped}`;
  else if (!e.stable) exact = 'exact: breaks stability';
  else if (e.kind === 'add') exact = e.harmful ? `exact: harmful, backlog +${short(e.delta)}` : e.delta < 0 ? `exact: helps, backlog ${short(e.delta)}` : 'exact: no change in backlog';
  else exact = e.beneficial ? (e.delta < 0 ? `exact: beneficial, backlog ${short(e.delta)}` : 'exact: beneficial, same backlog and a saving') : `exact: backlog +${short(e.delta)}`;
  if (bottlenecks.length === 0) return `${exact}; no bottleneck to compare with`;
  const u = `/${timeUnit}`;
  const named = (b: Bottleneck): string => `the bottleneck ${braces(Array.from(b.set, id))} (slack ${short(b.slack)}${u})`;
  const touched = bottlenecks.find((b) => relationToSet(b, e.a, e.b) === 'touches');
  const joined = bottlenecks.find((b) => relationToSet(b, e.a, e.b) === 'joins-neighbours');
  let cond: string;
  if (e.relation === 'touches' && touched) {
    cond = `${e.kind === 'add' ? 'it touches' : 'it touched'} ${named(touched)}: ${e.kind === 'add' ? 'no harm' : 'no benefit'} predicted near saturation`;
  } else if (e.relation === 'joins-neighbours' && joined) {
    const both = e.a === e.b ? `${id(e.a)} is a neighbour of ${named(joined)}` : `${what} are both neighbours of ${named(joined)}`;
    if (e.kind === 'add') cond = `${both}: harm predicted near saturation`;
    else cond = e.predicted ? `${both}: removing it is predicted to help near saturation` : `${both}, but without it that set is no longer the bottleneck: no prediction`;
  } else {
    cond = `away from ${named(bottlenecks[0]!)}: the near-saturation condition says nothing`;
  }
  return `${exact}; ${cond}`;
}

/** Builds the record (ids at the boundary, numbers rounded to 12 significant digits). */
export function sensitivityRecord(model: CompiledModel, result: SensitivityResult, meta: { scenario: string; timeUnit: string }): SensitivityRecord {
  const id = (k: number): string => model.ids[k]!;
  const byClass = (v: Float64Array): Record<string, number | null> => Object.fromEntries(model.ids.map((x, k) => [x, r12(v[k]!)]));
  const { bottlenecks } = result.base;
  const verdict = (e: SensitivityEntry) => ({
    stable: e.stable,
    backlog: e.stable === false ? null : r12(e.backlog),
    delta: r12(e.delta),
  });
  const tail = (e: SensitivityEntry) => ({
    predicted: e.predicted,
    relation: e.relation,
    explanation: explainEntry(model, e, bottlenecks, meta.timeUnit),
    waitDelta: byClass(e.waitDelta),
    ...(e.method ? { method: e.method } : {}),
    ...(e.certificate ? { certificate: { ...e.certificate, message: describeCertificate(e.certificate, meta.timeUnit) } } : {}),
    ...(e.skipped ? { skipped: e.skipped } : {}),
  });
  return {
    scenario: meta.scenario,
    timeUnit: meta.timeUnit,
    base: {
      backlog: r12(result.base.backlog),
      wait: byClass(result.base.wait),
      independentSets: result.base.independentSets,
      bottlenecks: bottlenecks.map((b) => ({
        set: Array.from(b.set, id),
        neighbours: Array.from(b.neighbours, id),
        demand: r12(b.demand),
        capacity: r12(b.capacity),
        slack: r12(b.slack),
      })),
    },
    additions: result.additions.map(
      (e): AdditionRecord => ({
        pair: [id(e.a), id(e.b)],
        cost: e.price ?? null,
        candidate: e.listed,
        ...verdict(e),
        deltaPerCost: e.perUnit === undefined ? null : r12(e.perUnit),
        harmful: e.harmful,
        ...tail(e),
      }),
    ),
    removals: result.removals.map(
      (e): RemovalRecord => ({
        pair: [id(e.a), id(e.b)],
        saving: e.price ?? 0,
        removable: e.listed,
        ...verdict(e),
        deltaPerSaving: e.perUnit === undefined ? null : r12(e.perUnit),
        beneficial: e.beneficial,
        ...tail(e),
      }),
    ),
  };
}
