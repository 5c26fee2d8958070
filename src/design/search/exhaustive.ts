/**
 * Exhaustive enumeration: every design (2^toggles of them) within the budget and maxCompatibilities
 * is scored, and the Pareto set is taken over all admissible ones, with the same archive rule and
 * flexibility penalty as the local search. Certain, and affordable up to about 20 toggles.
 */
import { UsageError } from '../../errors.js';
import { admissibleBeforeEvaluation } from '../space/problem.js';
import type { DesignEvaluator, DesignRecord } from '../scoring/evaluator.js';
import { paretoFront } from '../space/pareto.js';
import { SearchState } from './local-search.js';
import { SearchStopped } from '../scoring/scorer.js';

/** Largest number of toggles `--exhaustive` accepts. */
export const MAX_EXHAUSTIVE_TOGGLES = 20;

export interface ExhaustiveResult {
  readonly front: DesignRecord[];
  readonly harmful: ReadonlyMap<string, number[]>;
  /** 2^toggles. */
  readonly designs: number;
  /** Designs within the budget and maxCompatibilities (all scored). */
  readonly withinLimits: number;
  /** True when stopped (SIGINT) before every design was scored. */
  readonly stopped: boolean;
}

export async function exhaustiveSearch(evaluator: DesignEvaluator, batchSize = 4096): Promise<ExhaustiveResult> {
  const problem = evaluator.problem;
  const k = problem.toggles.length;
  if (k > MAX_EXHAUSTIVE_TOGGLES) {
    throw new UsageError(`--exhaustive enumerates 2^${k} designs; it is limited to ${MAX_EXHAUSTIVE_TOGGLES} removable compatibilities and candidates together`);
  }
  const total = 2 ** k;
  let within = 0;
  let batch: Uint8Array[] = [];
  try {
    for (let mask = 0; mask < total; mask++) {
      const d = new Uint8Array(k);
      for (let j = 0; j < k; j++) d[j] = (mask >>> j) & 1;
      if (!admissibleBeforeEvaluation(problem, d)) continue;
      within++;
      batch.push(d);
      if (batch.length >= batchSize) {
        await evaluator.evaluate(batch);
        batch = [];
      }
    }
    await evaluator.evaluate(batch);
  } catch (e) {
    if (!(e instanceof SearchStopped)) throw e;
    const state = new SearchState(evaluator);
    return { front: paretoFront(state.pool()), harmful: state.harmful, designs: total, withinLimits: within, stopped: true };
  }
  // Every design obtained by dropping a paid toggle costs less and has fewer compatibilities, so it
  // was scored too: every verdict is known. Refuse front designs until the front is clean.
  const state = new SearchState(evaluator);
  for (;;) {
    const front = paretoFront(state.pool());
    let refused = false;
    for (const r of front) {
      if (state.expanded.has(r.key)) continue;
      state.expanded.set(r.key, 2);
      state.judge(r);
      if (state.harmful.has(r.key)) refused = true;
    }
    if (!refused) return { front, harmful: state.harmful, designs: total, withinLimits: within, stopped: false };
  }
}
