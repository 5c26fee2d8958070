/**
 * A design given as changes to today's (pairs added, pairs removed, by class id), evaluated exactly
 * under today's rates and under every demand variant. Used by `report` and `compare` to show the
 * recommender's designs per class and in the worst case; the search itself lives in src/design/.
 */
import { describeCertificate, UnstableDesignError } from '../errors.js';
import { compileGraph, edgePairs, type CompiledModel } from '../model/compile.js';
import type { DemandVariant } from '../model/demand.js';
import { pairKey } from '../model/scenario.js';
import { evaluateExact, type ExactOptions } from '../exact/evaluate.js';
import type { ExactResult } from '../exact/result.js';
import { certificateWithIds } from '../stability/certificate.js';
import { checkStability } from '../stability/check.js';
import type { Outcome, Pair } from './report-data.js';

/** Today's model with `added` pairs appended and `removed` pairs left out (edge order: kept, then added). */
export function changedModel(today: CompiledModel, added: readonly Pair[], removed: readonly Pair[], rates: ArrayLike<number> = today.rates): CompiledModel {
  const drop = new Set(removed.map((p) => pairKey(p[0], p[1])));
  const pairs: Array<[number, number]> = [];
  for (const [a, b] of edgePairs(today)) if (!drop.has(pairKey(today.ids[a]!, today.ids[b]!))) pairs.push([a, b]);
  for (const [x, y] of added) {
    const a = today.index.get(x);
    const b = today.index.get(y);
    if (a === undefined || b === undefined) throw new RangeError(`unknown class in pair ${x}–${y}`);
    pairs.push([a, b]);
  }
  return compileGraph(today.ids, rates, pairs);
}

/** Exact result, or the sentence saying why the design cannot keep up. */
export type Evaluated = { readonly stable: true; readonly result: ExactResult } | { readonly stable: false; readonly why: string };

/**
 * Evaluates a compiled design. Instability is decided by checkStability (its certificate explains
 * it); the exact recursion also refuses saturated sets, which is caught the same way.
 */
export function evaluateOrExplain(model: CompiledModel, timeUnit: string, options: ExactOptions = {}): Evaluated {
  const st = checkStability(model);
  if (!st.stable) return { stable: false, why: describeCertificate(certificateWithIds(model, st.certificate!), timeUnit).replace(/^unstable: /, '') };
  try {
    return { stable: true, result: evaluateExact(model, { ...options, timeUnit }) };
  } catch (e) {
    if (e instanceof UnstableDesignError) return { stable: false, why: e.message.replace(/^unstable: /, '') };
    throw e;
  }
}

export function outcomeOf(model: CompiledModel, e: Evaluated): Outcome {
  if (!e.stable) return { stable: false, backlog: NaN, maxWait: NaN, maxWaitClass: '' };
  let k = 0;
  for (let i = 1; i < model.n; i++) if (e.result.wait[i]! > e.result.wait[k]!) k = i;
  return { stable: true, backlog: e.result.backlogTotal, maxWait: e.result.wait[k]!, maxWaitClass: model.ids[k]! };
}

/** The outcome of a design (given by changes) under each variant's rates. */
export function outcomesUnder(today: CompiledModel, added: readonly Pair[], removed: readonly Pair[], variants: readonly DemandVariant[], timeUnit: string, options: ExactOptions = {}): Outcome[] {
  return variants.map((v) => {
    const m = changedModel(today, added, removed, v.rates);
    return outcomeOf(m, evaluateOrExplain(m, timeUnit, options));
  });
}
