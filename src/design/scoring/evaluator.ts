/**
 * Scored designs, cached by design key: every design is scored at most once, and the search reads
 * all it knows from here. Scoring goes through a Scorer (pool.ts) in batches; records are created in
 * input order, so the cache's content never depends on which worker finished first.
 *
 * A design to score may come with its origin: a scored design it differs from by one toggle. The
 * designs of a batch with the same origin are then scored together by reuse (score-flips.ts) when
 * reuse.ts says it pays — a choice made from the batch and the origin's record alone, so it never
 * depends on timing or on the number of workers, and it changes no verdict or count and no figure
 * beyond 1e-10 relative.
 */
import type { DesignProblem } from '../space/problem.js';
import { admissibleBeforeEvaluation, changeCount, designCost, designKey } from '../space/problem.js';
import { needsMatchRates, needsPerClass, objectiveValue, type ObjectiveName } from '../space/objective.js';
import type { Scorer } from './scorer.js';
import { reuses, type ReuseMode } from './reuse.js';
import type { Score, ScoreMethod, ScoreSpec } from './score.js';
import type { Interval, SimPlan } from './sim-score.js';
import type { ScoreTask } from './score-task.js';

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
  /** Σ value · match rate when the objective is net value (NaN otherwise or when unstable). */
  readonly valueRate: number;
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
  /**
   * Simulated with patience: the share of some limited class's arrivals that abandon is clearly
   * above its maxAbandonment — the whole 95 % interval of the search's short run (the point
   * estimate where there is no interval). A design whose interval holds the limit stays admissible:
   * the longer re-score decides. False when the figures have no abandonment.
   */
  readonly overAbandonmentLimit: boolean;
  /** Within budget and limits, stable, meets every wait target and abandonment limit: may enter the Pareto archive. */
  readonly feasible: boolean;
  /** Independent sets of the design (0 when refused before the exact recursion). */
  readonly independentSets: number;
  /** How the figures were made (absent: exact). */
  readonly method?: 'exact' | 'simulation';
  /** Simulated: 95 % interval of the total backlog. */
  readonly backlogCi95?: Interval | null;
  /** Simulated: total backlog per replication (common random numbers across designs). */
  readonly perReplication?: Float64Array;
  /** Simulated with patience: share of arrivals that abandon. */
  readonly abandonShareTotal?: number;
}

/** How a search scores its designs (absent: exact only). */
export interface ScoringChoice {
  readonly method: ScoreMethod;
  /** The search's simulation plan. */
  readonly sim: SimPlan;
  /** Mean patience per class (0 = patient). */
  readonly patience?: readonly number[];
}

/** A scored design that a design to score differs from by exactly one toggle. */
export interface Origin {
  readonly from: DesignRecord;
  readonly toggle: number;
}

export interface EvaluatorProgress {
  /** Designs scored so far (exact evaluations plus designs refused before evaluation). */
  readonly scored: number;
  /** Exact evaluations so far. */
  readonly evaluations: number;
}

/** The scoring spec of a problem. */
export function scoreSpecOf(problem: DesignProblem, objective: ObjectiveName, maxSets?: number, scoring?: ScoringChoice): ScoreSpec {
  const hasTargets = problem.waitTarget.some((w) => Number.isFinite(w));
  return {
    ids: problem.ids,
    rates: Array.from(problem.rates),
    fixed: problem.fixed,
    toggles: problem.toggles.map((t) => [t.a, t.b] as const),
    perClass: needsPerClass(objective, hasTargets),
    matchValue: needsMatchRates(objective),
    fixedValue: Array.from(problem.fixedValue),
    toggleValue: problem.toggles.map((t) => t.value),
    ...(maxSets === undefined ? {} : { maxSets }),
    ...(scoring ? { method: scoring.method, sim: scoring.sim, ...(scoring.patience ? { patience: scoring.patience } : {}) } : {}),
  };
}

export class DesignEvaluator {
  private readonly cache = new Map<string, DesignRecord>();
  /** Exact evaluations run (cache misses that reached the exact evaluator). */
  evaluations = 0;
  /** Designs scored (cache misses). */
  scored = 0;

  private readonly perClass: boolean;
  /** Value rates need the exact match rates: no reuse of a single-change preparation. */
  private readonly matchValue: boolean;

  constructor(
    readonly problem: DesignProblem,
    readonly objective: ObjectiveName,
    private readonly scorer: Scorer,
    private readonly onProgress?: (p: EvaluatorProgress) => void,
    /** When designs with an origin are scored by reuse (reuse.ts). */
    readonly reuse: ReuseMode = 'auto',
    /** The set count of the fixed pairs' shared trie fresh scoring makes (score.ts sharedTrieSets), if any. */
    private readonly sharedSets?: number,
  ) {
    this.perClass = needsPerClass(objective, problem.waitTarget.some((w) => Number.isFinite(w)));
    this.matchValue = needsMatchRates(objective);
  }

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
    const value = { valueRate: s.valueRate, waitingCost: p.waitingCost };
    const objective = s.stable ? objectiveValue(this.objective, s.backlogTotal, s.backlog ?? undefined, p.rates, p.weight, value, s.abandonShareTotal) : NaN;
    // the short run's noise alone must not keep a design out: over only when its interval is
    const over = s.stable && overAbandonmentLimit(p, s.abandonShareLo ?? s.abandonShare);
    return {
      key,
      design,
      cost: designCost(p, design),
      changes: changeCount(p, design),
      stable: s.stable,
      objective,
      backlogTotal: s.backlogTotal,
      valueRate: s.valueRate,
      backlog: s.backlog,
      maxWait,
      meetsTargets: meets,
      targetRatio: ratio,
      withinLimits: within,
      overAbandonmentLimit: over,
      feasible: within && s.stable && meets && !over,
      independentSets: s.independentSets,
      ...(s.method ? { method: s.method } : {}),
      ...(s.backlogCi95 !== undefined ? { backlogCi95: s.backlogCi95 } : {}),
      ...(s.perReplication ? { perReplication: s.perReplication } : {}),
      ...(s.abandonShareTotal !== undefined ? { abandonShareTotal: s.abandonShareTotal } : {}),
    };
  }

  /**
   * Records of the designs, in input order; unknown designs are scored (duplicates once, with the
   * origin given at their first occurrence). `origins[i]`, when given, is a scored design that
   * designs[i] differs from by exactly the toggle named.
   */
  async evaluate(designs: readonly Uint8Array[], origins?: ReadonlyArray<Origin | undefined>): Promise<DesignRecord[]> {
    const fresh: Uint8Array[] = [];
    const freshKeys: string[] = [];
    const freshOrigins: Array<Origin | undefined> = [];
    const queued = new Set<string>();
    const keys = designs.map((d) => designKey(d));
    designs.forEach((d, i) => {
      const key = keys[i]!;
      if (this.cache.has(key) || queued.has(key)) return;
      queued.add(key);
      fresh.push(Uint8Array.from(d));
      freshKeys.push(key);
      freshOrigins.push(origins?.[i]);
    });
    if (fresh.length > 0) {
      const scores = await this.score(fresh, freshOrigins);
      scores.forEach((s, i) => {
        this.cache.set(freshKeys[i]!, this.record(freshKeys[i]!, fresh[i]!, s));
        this.scored++;
        if (s.evaluated) this.evaluations++;
      });
      this.onProgress?.({ scored: this.scored, evaluations: this.evaluations });
    }
    return keys.map((k) => this.cache.get(k)!);
  }

  /** Scores in input order: designs with a stable origin grouped by origin, each group by reuse when it pays. */
  private async score(designs: readonly Uint8Array[], origins: ReadonlyArray<Origin | undefined>): Promise<Score[]> {
    const tasks: ScoreTask[] = [];
    const at: number[][] = [];
    const groups = new Map<string, { from: DesignRecord; flips: number[]; at: number[] }>();
    designs.forEach((design, i) => {
      const o = origins[i];
      if (!o || !o.from.stable || this.reuse === 'never' || this.matchValue) {
        tasks.push({ design });
        at.push([i]);
        return;
      }
      checkOrigin(design, o);
      let g = groups.get(o.from.key);
      if (!g) groups.set(o.from.key, (g = { from: o.from, flips: [], at: [] }));
      g.flips.push(o.toggle);
      g.at.push(i);
    });
    for (const g of groups.values()) {
      if (reuses(this.reuse, this.perClass, g.from.independentSets, g.flips.length, this.sharedSets)) {
        tasks.push({ base: g.from.design, flips: g.flips });
        at.push(g.at);
      } else {
        for (const i of g.at) {
          tasks.push({ design: designs[i]! });
          at.push([i]);
        }
      }
    }
    const out = await this.scorer.scoreTasks(tasks);
    const scores = new Array<Score>(designs.length);
    out.forEach((s, t) => at[t]!.forEach((i, q) => (scores[i] = s[q]!)));
    return scores;
  }
}

/** True when some class with a maxAbandonment has a (simulated) abandonment share above it. */
/** True when a limit lies inside a non-empty interval [lo, hi]: the simulation cannot tell on which side the share is. */
export function limitInside(limit: number, lo: number, hi: number): boolean {
  return lo <= limit && limit <= hi && lo < hi;
}

export function overAbandonmentLimit(p: DesignProblem, share: ArrayLike<number> | undefined): boolean {
  const limit = p.maxAbandonment;
  if (!limit || !share) return false;
  for (let k = 0; k < p.n; k++) if (share[k]! > limit[k]!) return true; // NaN (no limit) never compares true
  return false;
}

/** Throws when the design does not differ from its origin by exactly the named toggle. */
function checkOrigin(design: Uint8Array, o: Origin): void {
  const base = o.from.design;
  for (let j = 0; j < design.length; j++) {
    const differs = (design[j] ? 1 : 0) !== (base[j] ? 1 : 0);
    if (differs !== (j === o.toggle)) {
      throw new RangeError(`design ${designKey(design)} is not ${o.from.key} with toggle ${o.toggle} switched`);
    }
  }
}
