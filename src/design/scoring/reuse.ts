/**
 * When the recommender scores the designs one toggle away from a scored design (its add/remove
 * neighbours, the flexibility penalty's "drop one paid compatibility" designs among them) by reusing
 * that design's single-change preparation (score-flips.ts) instead of scoring each afresh.
 *
 * Measured with bench/_incremental-crossover.ts (2-core machine, CPU time, best of several; designs
 * of 300 to 1.7M independent sets, rings with chords and meshed graphs; k = 3, 8 and 16 neighbours):
 * - total backlog only (objective `total`, no wait targets): a fresh scoring is one forward pass with
 *   the first moment (evaluateBacklog). One flip of the single-change evaluator (it touches about half
 *   of the sets and carries per-class values and their adjoint) cost 0.94–1.63 times that, the base
 *   preparation 1.4–3.2 times. Reuse never paid: at k = 8 it took 1.26–2.00 times as long as k fresh
 *   scorings, at every size. So it is off.
 * - per-class figures (objective `weighted` or `max-wait`, or wait targets): a fresh scoring is
 *   evaluateExact (forward and tail passes). One flip cost 0.37–0.71 of it, the base 1.0–1.5 of it.
 *   The break-even number of neighbours from one base was 1.2–2.1 from 1 000 to 50 000 sets and
 *   1.7–5.1 from 50 000 to 1.7M; at k = 8 reuse took 0.49–0.67 of the fresh time up to 65 000 sets
 *   and 0.64–0.87 above. Unstable neighbours (the recursion stops early, afresh too) move the
 *   break-even up; below 1 000 sets one evaluation takes under 0.2 ms. Hence the thresholds below.
 * Measured again in one session at load 6–7 (`npx tsx bench/recommend.ts penalty-reuse`, the 8 drops
 * of a design with per-class figures, CPU time afresh against by reuse): before fresh scoring ran over
 * the shared trie of the fixed pairs (score.ts, exact/shared-trie.ts), 41 against 113 ms at 24 classes
 * (54 391 sets) and 684 against 1 054 ms at 30 classes (475 350 sets), so reuse no longer paid there
 * even then (fresh scoring has become faster since the figures above were taken); with the shared trie
 * 43 against 121 ms and 902 against 1 285 ms. A whole search, 20 classes × 40 candidates with the
 * `weighted` objective: 39.2 s with the rule above and 34.0 s with 'never' before; 26.8 s (this rule)
 * and 27.8 s ('never') with the shared trie. So 'auto' scores afresh wherever the fixed pairs' shared
 * trie is made and the base design reaches at least 1/SHARED_TRIE_SPARSE of its sets (the rule by
 * which a thread keeps it); elsewhere the thresholds above stand (not measured again).
 * Results do not depend on the choice beyond 1e-10 relative (the single-change evaluator's accuracy):
 * verdicts, counts and refusals are the same (score-flips.ts).
 */
import { DEFAULT_CHANGE_MAX_SETS } from '../../exact/single-change.js';
import { SHARED_TRIE_SPARSE } from './score.js';

export type ReuseMode = 'auto' | 'always' | 'never';

/** Fewest independent sets of the base design for reuse (per-class scoring). */
export const REUSE_MIN_SETS = 1_000;

/** From this many sets of the base, more flips are needed to repay its preparation. */
export const REUSE_LARGE_SETS = 50_000;

/**
 * Fewest neighbours scored from one base: the break-even was measured at ≤ 2.1 from 1 000 to 50 000
 * sets and ≤ 5.1 from 50 000 to 1.7M (all neighbours stable); these leave a margin for load, for
 * unstable neighbours and for designs unlike the measured ones.
 */
export const REUSE_MIN_FLIPS = 3;
export const REUSE_MIN_FLIPS_LARGE = 8;

/**
 * True when `flips` designs one toggle away from a stable base of `sets` independent sets should be
 * scored by reuse. `perClass`: the scoring computes per-class figures (evaluateExact when fresh).
 * `sharedSets`: the set count of the fixed pairs' shared trie when fresh scoring makes one
 * (sharedTrieSets in score.ts), undefined otherwise.
 * 'auto' also leaves bases beyond the single-change memory guard to fresh scoring; 'always' (tests,
 * benchmarks) reuses whenever it can (score-flips.ts falls back to fresh scoring when it cannot).
 */
export function reuses(mode: ReuseMode, perClass: boolean, sets: number, flips: number, sharedSets?: number): boolean {
  if (mode === 'never' || flips < 1) return false;
  if (mode === 'always') return true;
  if (!perClass || sets < REUSE_MIN_SETS || sets > DEFAULT_CHANGE_MAX_SETS) return false;
  if (sharedSets !== undefined && sets * SHARED_TRIE_SPARSE >= sharedSets) return false;
  return flips >= (sets < REUSE_LARGE_SETS ? REUSE_MIN_FLIPS : REUSE_MIN_FLIPS_LARGE);
}
