/**
 * Scoring the designs one toggle away from a base design — the add/remove neighbours of a design the
 * local search expands, among them the "drop one paid compatibility" designs of the flexibility
 * penalty — with the single-change evaluator of src/exact/single-change.ts: the base is prepared once
 * (about one forward pass), then each flip recomputes only the independent sets holding an endpoint
 * of the toggled pair.
 *
 * Every field equals scoreDesign's for the same design: backlogs to 1e-10 relative (the accuracy of
 * the single-change evaluator against a fresh evaluation), and exactly the same verdicts otherwise —
 * the same designs are refused at sight (unstable without evaluating), refused by the recursion
 * (unstable, one evaluation), or refused as too large (the flipped design's sets are counted with
 * the same guard as a fresh evaluation, which also gives its exact count). When the base itself cannot
 * be prepared (unstable, or beyond the single-change memory guard) every flip is scored afresh.
 */
import { TooLargeError, UnstableDesignError } from '../../errors.js';
import { DEFAULT_MAX_SETS } from '../../exact/evaluate.js';
import { prepareComponents } from '../../exact/prepare.js';
import { DEFAULT_CHANGE_MAX_SETS, singleChangeEvaluator, type SingleChangeEvaluator } from '../../exact/single-change.js';
import { scoreDesign, specModel, unstableAtSight, UNSTABLE_EVALUATED, UNSTABLE_UNEVALUATED, type Score, type ScoreSpec } from './score.js';

/** The design with toggle j switched. */
export function flipped(design: ArrayLike<number>, j: number): Uint8Array {
  const d = Uint8Array.from(design);
  d[j] = d[j] ? 0 : 1;
  return d;
}

/** Scores of the designs `base` with toggle flips[i] switched, in the order of `flips`. */
export function scoreFlips(spec: ScoreSpec, base: ArrayLike<number>, flips: readonly number[]): Score[] {
  // the single-change evaluator gives backlogs, not match rates: value rates need a fresh scoring
  if (spec.matchValue) return flips.map((j) => scoreDesign(spec, flipped(base, j)));
  const maxSets = spec.maxSets ?? DEFAULT_MAX_SETS;
  const model = specModel(spec, base);
  let ev: SingleChangeEvaluator | undefined;
  if (!unstableAtSight(model)) {
    try {
      ev = singleChangeEvaluator(model, { maxSets: Math.min(maxSets, DEFAULT_CHANGE_MAX_SETS) });
    } catch (e) {
      if (!(e instanceof UnstableDesignError || e instanceof TooLargeError)) throw e;
    }
  }
  if (!ev) return flips.map((j) => scoreDesign(spec, flipped(base, j)));
  const change = ev;
  return flips.map((j): Score => {
    const changed = specModel(spec, flipped(base, j));
    if (unstableAtSight(changed)) return UNSTABLE_UNEVALUATED;
    // the same count and refusal (TooLargeError) as the fresh evaluation's first step
    const { total } = prepareComponents(changed, maxSets);
    const [a, b] = spec.toggles[j]!;
    let r;
    try {
      r = change.toggle(a, b);
    } catch (e) {
      // joining two components beyond the single-change guard: evaluate that design afresh
      if (e instanceof TooLargeError) return scoreDesign(spec, flipped(base, j));
      throw e;
    }
    if (!r.stable) return UNSTABLE_EVALUATED;
    return { stable: true, backlogTotal: r.backlogTotal, backlog: spec.perClass ? r.backlog : null, valueRate: NaN, independentSets: total, evaluated: true };
  });
}
