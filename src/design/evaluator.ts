/**
 * Scored designs, cached by design key: every design is scored at most once, and the search reads
 * all it knows from here. Scoring goes through a Scorer (pool.ts) in batches; records are created in
 * input order, so the cache's content never depends on which worker finished first.
 */
import type { DesignProblem } from './problem.js';
import { admissibleBeforeEvaluation, changeCount, designCost, designKey } from './problem.js';
import { objectiveValue, type ObjectiveName } from './objective.js';
import type { Scorer } from './pool.js';
import type { Score, ScoreSpec } from './score.js';

export interface DesignRecord {
  readonly key: string;
  readonly design: Uint8Array;
  readonly cost: number;
  /** Toggles that differ from today's design. */
  readonly changes: number;
  readonly stable: boolean;
  /** Objective value (NaN when unstable). */
  readonly objective: number;
  readonly backlogTotal: number;
  /** Per-class backlog when scored in full, else null. */
  readonly backlog: Float64Array | null;
  /** Largest class mean wait when scored in full, else NaN. */
  readonly maxWait: number;
  /** Every class meets its wait target (true when there is none). */
  readonly meetsTargets: boolean;
  /** max_k W_k / waitTarget_k when scored in full and stable (0 without targets), else NaN. */
  readonly targetRatio: number;
  /** Within the budget and maxCompatibilities. */
  readonly withinLimits: boolean;
  /** Within budget and limits, stable, meets every wait target: may enter the Pareto archive. */
  readonly feasible: boolean;
}

export interface EvaluatorProgress {
  /** Designs scored so far (exact evaluations plus designs refused before evaluation). */
  readonly scored: number;
  /** Exact evaluations so far. */
  readonly evaluations: number;
}

/** The scoring spec of a problem. */
export function scoreSpecOf(problem: DesignProblem, objective: ObjectiveName, maxSets?: number): ScoreSpec {
  const hasTargets = problem.waitTarget.some((w) => Number.isFinite(w));
  return {
    ids: problem.ids,
    rates: Array.from(problem.rates),
    fixed: problem.fixed,
    toggles: problem.toggles.map((t) => [t.a, t.b] as const),
    perClass: objective !== 'total' || hasTargets,
    ...(maxSets === undefined ? {} : { maxSets }),
  };
}

export class DesignEvaluator {
  private readonly cache = new Map<string, DesignRecord>();
  /** Exact evaluations run (cache misses that reached the exact evaluator). */
  evaluations = 0;
  /** Designs scored (cache misses). */
  scored = 0;

  constructor(
    readonly problem: DesignProblem,
    readonly objective: ObjectiveName,
    private readonly scorer: Scorer,
    private readonly onProgress?: (p: EvaluatorProgress) => void,
  ) {}

  get(key: string): DesignRecord | undefined {
    return this.cache.get(key);
  }

  has(key: string): boolean {
    return this.cache.has(key);
  }

  /** Every record, in the order designs were first scored. */
  records(): IterableIterator<DesignRecord> {
    return this.cache.values();
  }

  get size(): number {
    return this.cache.size;
  }

  private record(key: string, design: Uint8Array, s: Score): DesignRecord {
    const p = this.problem;
    let maxWait = NaN;
    let meets = true;
    let ratio = NaN;
    if (s.stable && s.backlog) {
      maxWait = 0;
      ratio = 0;
      for (let k = 0; k < p.n; k++) {
        const w = s.backlog[k]! / p.rates[k]!;
        maxWait = Math.max(maxWait, w);
        if (Number.isFinite(p.waitTarget[k]!)) ratio = Math.max(ratio, w / p.waitTarget[k]!);
        if (w > p.waitTarget[k]! * (1 + 1e-12)) meets = false;
      }
    }
    const within = admissibleBeforeEvaluation(p, design);
    const objective = s.stable ? objectiveValue(this.objective, s.backlogTotal, s.backlog ?? undefined, p.rates, p.weight) : NaN;
    return {
      key,
      design,
      cost: designCost(p, design),
      changes: changeCount(p, design),
      stable: s.stable,
      objective,
      backlogTotal: s.backlogTotal,
      backlog: s.backlog,
      maxWait,
      meetsTargets: meets,
      targetRatio: ratio,
      withinLimits: within,
      feasible: within && s.stable && meets,
    };
  }

  /** Records of the designs, in input order; unknown designs are scored (duplicates once). */
  async evaluate(designs: readonly Uint8Array[]): Promise<DesignRecord[]> {
    const fresh: Uint8Array[] = [];
    const freshKeys: string[] = [];
    const queued = new Set<string>();
    const keys = designs.map((d) => designKey(d));
    designs.forEach((d, i) => {
      const key = keys[i]!;
      if (this.cache.has(key) || queued.has(key)) return;
      queued.add(key);
      fresh.push(Uint8Array.from(d));
      freshKeys.push(key);
    });
    if (fresh.length > 0) {
      const scores = await this.scorer.score(fresh);
      scores.forEach((s, i) => {
        this.cache.set(freshKeys[i]!, this.record(freshKeys[i]!, fresh[i]!, s));
        this.scored++;
        if (s.evaluated) this.evaluations++;
      });
      this.onProgress?.({ scored: this.scored, evaluations: this.evaluations });
    }
    return keys.map((k) => this.cache.get(k)!);
  }
}
