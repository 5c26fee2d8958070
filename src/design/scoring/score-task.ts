/**
 * A unit of scoring work, as plain data (sent to worker threads): one design scored afresh, or the
 * designs one toggle away from a base design scored by reuse (score-flips.ts). Either gives its
 * scores in order: one for a design, one per flip.
 *
 * Reuse is exact only: when the spec simulates every design, or (auto) when a flip passes the exact
 * guard, the flips are scored one by one afresh (scoreDesign chooses the method per design).
 */
import { TooLargeError } from '../../errors.js';
import { scoreFlips } from './score-flips.js';
import { scoreDesign, simulatesAlways, type Score, type ScoreSpec } from './score.js';

export type ScoreTask = { readonly design: Uint8Array } | { readonly base: Uint8Array; readonly flips: readonly number[] };

/** Number of scores a task gives. */
export function taskSize(task: ScoreTask): number {
  return 'design' in task ? 1 : task.flips.length;
}

function flipped(base: Uint8Array, j: number): Uint8Array {
  const d = Uint8Array.from(base);
  d[j] = d[j] ? 0 : 1;
  return d;
}

export function runTask(spec: ScoreSpec, task: ScoreTask): Score[] {
  if ('design' in task) return [scoreDesign(spec, task.design)];
  const fresh = (): Score[] => task.flips.map((j) => scoreDesign(spec, flipped(task.base, j)));
  if (simulatesAlways(spec)) return fresh();
  try {
    return scoreFlips(spec, task.base, task.flips);
  } catch (e) {
    if (e instanceof TooLargeError && spec.method === 'auto') return fresh();
    throw e;
  }
}
