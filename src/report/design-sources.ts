/**
 * Adapters from the design layer's single-change table (src/design/sensitivity.ts) and load sweep
 * (src/design/sweep.ts) to the report's shapes: ids attached, removals limited to the ones a
 * designer may make, and the sweep's variants chosen for the report.
 */
import { describeCertificate, EdgewiseError, UnstableDesignError } from '../errors.js';
import type { CompiledModel } from '../model/compile.js';
import { pairKey, type Scenario } from '../model/scenario.js';
import { sensitivity, type SensitivityEntry } from '../design/sensitivity/sensitivity.js';
import { sweep, type SweepVariantSpec } from '../design/sweep/sweep.js';
import { explainEntry } from './sensitivity-record.js';
import type { DesignView, Pair, SensitivityRow, SweepView } from './report-data.js';

export interface SensitivityRows {
  readonly rows: SensitivityRow[];
  /** Why some or all entries are missing. */
  readonly notes: string[];
}

/**
 * Every candidate added and every removable compatibility dropped, one at a time (exact). An
 * unstable base has no such table (the design layer refuses it), which is said in the notes.
 */
export function sensitivityRows(scenario: Scenario, model: CompiledModel): SensitivityRows {
  let result;
  try {
    result = sensitivity(scenario, model, { timeUnit: scenario.timeUnit });
  } catch (e) {
    if (e instanceof UnstableDesignError) return { rows: [], notes: ["No single-change table: today's design is unstable, so there is no base to compare with."] };
    if (e instanceof EdgewiseError) return { rows: [], notes: [`No single-change table: ${e.message}`] };
    throw e;
  }
  const removable = new Set(scenario.compatibilities.filter((c) => c.removable).map((c) => pairKey(c.pair[0], c.pair[1])));
  const notes: string[] = [];
  const rows: SensitivityRow[] = [];
  const toRow = (e: SensitivityEntry): SensitivityRow | null => {
    const pair: Pair = [model.ids[e.a]!, model.ids[e.b]!];
    if (e.kind === 'remove' && !removable.has(pairKey(pair[0], pair[1]))) return null;
    if (e.stable === null) {
      notes.push(`${e.kind === 'add' ? 'Adding' : 'Dropping'} ${pair[0]}–${pair[1]} was not evaluated: ${e.skipped ?? 'too large'}.`);
      return null;
    }
    return {
      kind: e.kind,
      pair,
      money: e.price ?? 0,
      stable: e.stable,
      backlog: e.stable ? e.backlog : NaN,
      delta: e.stable ? e.delta : NaN,
      flagged: e.kind === 'add' ? e.harmful : e.beneficial,
      predicted: e.predicted,
      relation: e.relation,
      why: explainEntry(model, e, result.base.bottlenecks, scenario.timeUnit),
      ...(e.certificate ? { instability: describeCertificate(e.certificate, scenario.timeUnit).replace(/^unstable: /, '') } : {}),
    };
  };
  for (const e of [...result.additions, ...result.removals]) {
    const row = toRow(e);
    if (row) rows.push(row);
  }
  return { rows, notes };
}

/**
 * The load sweep of the report: the bottleneck classes grow together; the curves are today's
 * design, the recommended design (when it changes anything) and the most harmful single addition
 * (or, when none is harmful, the most helpful one not already recommended).
 */
export function sweepView(
  model: CompiledModel,
  grow: readonly string[],
  chosen: DesignView | null,
  rows: readonly SensitivityRow[],
  options: { readonly steps: number; readonly timeUnit: string; readonly name: (id: string) => string },
): SweepView {
  const name = options.name;
  const at = (id: string): number => model.index.get(id)!;
  const ix = (p: Pair): [number, number] => [at(p[0]), at(p[1])];
  const variants: SweepVariantSpec[] = [];
  const roles: Array<'recommended' | 'warning' | 'alternative'> = [];
  const labels: string[] = [];
  if (chosen && (chosen.added.length > 0 || chosen.removed.length > 0)) {
    variants.push({ name: 'recommended design', add: chosen.added.map(ix), remove: chosen.removed.map(ix) });
    roles.push('recommended');
    labels.push('the recommended design');
  }
  const chosenKeys = new Set((chosen?.added ?? []).map((p) => pairKey(p[0], p[1])));
  const adds = rows.filter((r) => r.kind === 'add' && r.stable && Number.isFinite(r.delta));
  const harmful = adds.filter((r) => r.flagged).sort((a, b) => b.delta - a.delta)[0];
  const helpful = adds.filter((r) => !r.flagged && r.delta < 0 && !chosenKeys.has(pairKey(r.pair[0], r.pair[1]))).sort((a, b) => a.delta - b.delta)[0];
  const single = harmful ?? helpful;
  if (single) {
    const words = single.pair[0] === single.pair[1] ? `${name(single.pair[0])} with itself` : `${name(single.pair[0])} – ${name(single.pair[1])}`;
    variants.push({ name: `with ${words}`, add: [ix(single.pair)], remove: [] });
    roles.push(harmful ? 'warning' : 'alternative');
    labels.push(`adding ${words}`);
  }
  const r = sweep(model, { grow: grow.map(at), variants, steps: options.steps, timeUnit: options.timeUnit });
  const points = (backlog: Float64Array) =>
    Array.from(r.factors, (load, t) => ({ load, backlog: backlog[t]! })).filter((p) => Number.isFinite(p.backlog));
  return {
    grow,
    curves: [
      { name: "today's design", role: 'today', points: points(r.base.backlog) },
      ...r.variants.map((v, i) => ({ name: v.name, role: roles[i]!, points: points(v.backlog) })),
    ],
    crossovers: r.crossovers.map((c) => {
      const i = r.variants.findIndex((v) => v.name === c.variant);
      return { load: c.factor, label: `${capital(labels[i] ?? c.variant)} starts to ${c.direction === 'starts-to-hurt' ? 'hurt' : 'help'}` };
    }),
    limit: Number.isFinite(r.limit) ? r.limit : null,
  };
}

const capital = (s: string): string => s.charAt(0).toUpperCase() + s.slice(1);
