/**
 * The plain-language explanation of one single change: the exact verdict first, then where the
 * change sits relative to the base design's bottleneck and what the published near-saturation
 * condition predicts ("Flexibility can hurt dynamic matching system performance", SIGMETRICS
 * Perform. Eval. Rev. 2022) — never instead of the exact verdict.
 */
import type { CompiledModel } from '../model/compile.js';
import { relationToSet, type Bottleneck } from '../design/sensitivity/bottleneck-relation.js';
import type { SensitivityEntry } from '../design/sensitivity/sensitivity.js';
import { num, perUnit, setText } from '../output/format.js';

const short = (x: number): string => (Number.isFinite(x) ? num(x) : x > 0 ? '∞' : '—');
const braces = (names: readonly string[]): string => setText(names);

/** Sentence for one entry (see the file comment). */
/** `lead` replaces the exact verdict's words (a simulated verdict gives its own). */
export function explainEntry(model: CompiledModel, e: SensitivityEntry, bottlenecks: readonly Bottleneck[], timeUnit: string, lead?: string): string {
  const id = (k: number): string => model.ids[k]!;
  const what = e.a === e.b ? `${id(e.a)} with ${id(e.a)}` : `${id(e.a)} and ${id(e.b)}`;
  let exact: string;
  if (e.skipped) exact = `not evaluated: ${e.skipped}`;
  else if (!e.stable) exact = 'exact: breaks stability';
  else if (e.kind === 'add') exact = e.harmful ? `exact: harmful, backlog +${short(e.delta)}` : e.delta < 0 ? `exact: helps, backlog ${short(e.delta)}` : 'exact: no change in backlog';
  else exact = e.beneficial ? (e.delta < 0 ? `exact: beneficial, backlog ${short(e.delta)}` : 'exact: beneficial, same backlog and a saving') : `exact: backlog +${short(e.delta)}`;
  if (lead !== undefined) exact = lead;
  if (bottlenecks.length === 0) return `${exact}; no bottleneck to compare with`;
  const u = perUnit(timeUnit);
  const named = (b: Bottleneck): string => `the bottleneck ${braces(Array.from(b.set, id))} (spare capacity ${short(b.slack)}${u})`;
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

