/**
 * A design given as changes to today's (pairs added, pairs removed, by class id), evaluated exactly
 * under today's rates and under every demand variant: what `compare` and `report` show per design
 * and in the worst case.
 */
import { describeCertificate, UnstableDesignError } from '../errors.js';
import { compileGraph, edgePairs, type CompiledModel } from '../model/compile.js';
import type { DemandVariant } from '../model/demand.js';
import { pairKey } from '../model/scenario.js';
import { evaluateExact, type ExactOptions } from '../exact/evaluate.js';
import type { ExactResult } from '../exact/result.js';
import { certificateWithIds } from '../stability/certificate.js';
import { checkStability } from '../stability/check.js';
import type { PairIds } from './records.js';

/** One design's outcome under one set of rates. */
export interface Outcome {
  readonly stable: boolean;
  /** Mean total backlog (null when unstable). */
  readonly backlog: number | null;
  /** Largest class mean wait and its class (null when unstable). */
  readonly maxWait: number | null;
  readonly maxWaitClass: string | null;
  /** How the figures were made. */
  readonly method: 'exact' | 'simulation';
  /** Simulated: 95 % interval of the backlog. */
  readonly backlogCi95?: [number, number] | null;
}

/** Scores one compiled design (its own rates) into an outcome: exact, or simulated (src/usecases/scoring.ts). */
export type OutcomeScorer = (model: CompiledModel) => Promise<Outcome>;

/** Today's model with `added` pairs appended and `removed` pairs left out (edge order: kept, then added). */
export function changedModel(today: CompiledModel, added: readonly PairIds[], removed: readonly PairIds[], rates: ArrayLike<number> = today.rates): CompiledModel {
  const drop = new Set(removed.map((p) => pairKey(p[0], p[1])));
  const pairs: Array<[number, number]> = [];
  for (const [a, b] of edgePairs(today)) if (!drop.has(pairKey(today.ids[a]!, today.ids[b]!))) pairs.push([a, b]);
  for (const [x, y] of added) {
    const a = today.index.get(x);
    const b = today.index.get(y);
    if (a === undefined || b === undefined) throw new RangeError(`unknown class in pair ${x} ↔ ${y}`);
    pairs.push([a, b]);
  }
  return compileGraph(today.ids, rates, pairs);
}

/** Exact result, or the sentence saying why the design cannot keep up. */
export type Evaluated = { readonly stable: true; readonly result: ExactResult } | { readonly stable: false; readonly why: string };

/** Evaluates a compiled design; instability is decided by checkStability (its certificate explains it). */
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
  if (!e.stable) return { stable: false, backlog: null, maxWait: null, maxWaitClass: null, method: 'exact' };
  let k = 0;
  for (let i = 1; i < model.n; i++) if (e.result.wait[i]! > e.result.wait[k]!) k = i;
  return { stable: true, backlog: e.result.backlogTotal, maxWait: e.result.wait[k]!, maxWaitClass: model.ids[k]!, method: 'exact' };
}

/** The outcome of a design (given by changes) under each variant's rates. */
export function outcomesUnder(today: CompiledModel, added: readonly PairIds[], removed: readonly PairIds[], variants: readonly DemandVariant[], timeUnit: string, options: ExactOptions = {}): Outcome[] {
  return variants.map((v) => {
    const m = changedModel(today, added, removed, v.rates);
    return outcomeOf(m, evaluateOrExplain(m, timeUnit, options));
  });
}

/** As outcomesUnder, with the given scorer (exact or simulated), in variant order. */
export async function outcomesUnderWith(score: OutcomeScorer, today: CompiledModel, added: readonly PairIds[], removed: readonly PairIds[], variants: readonly DemandVariant[]): Promise<Outcome[]> {
  const out: Outcome[] = [];
  for (const v of variants) out.push(await score(changedModel(today, added, removed, v.rates)));
  return out;
}

/** The worst backlog over today's rates and every variant, and where (null backlog: unstable there). */
export function worstCase(today: Outcome, under: readonly Outcome[], variants: readonly string[]): { backlog: number | null; under: string } {
  let worst = today.stable ? today.backlog! : Infinity;
  let where = 'today';
  under.forEach((o, k) => {
    const b = o.stable ? o.backlog! : Infinity;
    if (b > worst) {
      worst = b;
      where = variants[k]!;
    }
  });
  return { backlog: Number.isFinite(worst) ? worst : null, under: where };
}
