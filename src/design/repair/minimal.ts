/**
 * Minimality of a repair. Adding a compatibility never makes a design less stable (independent sets
 * can only disappear and neighbourhoods only grow, in the condition λ(I) < λ(N(I)) of "Stability of
 * the stochastic matching model", J. Appl. Probab. 2016). So one pass suffices: a member that could
 * not be dropped from a larger set cannot be dropped from a smaller one either, and every member of
 * the result has been dropped once and found needed.
 */
import type { DesignProblem } from '../space/problem.js';
import { isStableWith } from './stable.js';

/**
 * A minimal stabilising subset of `set` (toggle indices of `sub`; the set itself must be stable),
 * ascending. Tries the dearest members first, so the result is no dearer than the input.
 */
export function minimise(sub: DesignProblem, set: readonly number[]): number[] {
  const order = [...set].sort((x, y) => sub.toggles[y]!.price - sub.toggles[x]!.price || y - x);
  const keep = new Set(set);
  for (const j of order) {
    keep.delete(j);
    if (!isStableWith(sub, [...keep])) keep.add(j);
  }
  return [...keep].sort((x, y) => x - y);
}
