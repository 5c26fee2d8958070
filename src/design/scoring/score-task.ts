/**
 * A unit of scoring work, as plain data (sent to worker threads): one design scored afresh, or the
 * designs one toggle away from a base design scored by reuse (score-flips.ts). Either gives its
 * scores in order: one for a design, one per flip.
 */
import { scoreFlips } from './score-flips.js';
import { scoreDesign, type Score, type ScoreSpec } from './score.js';

export type ScoreTask = { readonly design: Uint8Array } | { readonly base: Uint8Array; readonly flips: readonly number[] };

/** Number of scores a task gives. */
export function taskSize(task: ScoreTask): number {
  return 'design' in task ? 1 : task.flips.length;
}

export function runTask(spec: ScoreSpec, task: ScoreTask): Score[] {
  return 'design' in task ? [scoreDesign(spec, task.design)] : scoreFlips(spec, task.base, task.flips);
}
