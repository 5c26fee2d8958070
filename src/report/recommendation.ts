/**
 * The recommender's result as id-keyed, rounded records: the shape `recommend --json` prints, and
 * its CSV form. Nothing here depends on how the search ran (no timings, no thread counts), so the
 * same inputs always give the same bytes.
 */
import type { DesignProblem } from '../design/space/problem.js';
import type { DesignDetails, Recommendation } from '../design/search/recommend.js';
import type { MilpDesign } from '../design/search/milp.js';
import { designChanges } from '../design/space/problem.js';
import type { ObjectiveName } from '../design/space/objective.js';

export type IdPair = readonly [string, string];

export interface ParetoRecord {
  readonly cost: number;
  readonly backlog: number | null;
  readonly objective: number | null;
  readonly added: IdPair[];
  /** Dropped compatibilities, forced removals of `forbidden` pairs included. */
  readonly removed: IdPair[];
  readonly stable: boolean;
  readonly maxWait: number | null;
  /** Smallest flow on a compatibility, maximised over flows (t* of the edge-flow LP). */
  readonly slack: number | null;
  /** Smallest λ(N(I)) − λ(I) over independent sets. */
  readonly bottleneckSlack: number | null;
  readonly waits: Record<string, number | null> | null;
}

export interface BaselineRecord {
  readonly name: string;
  readonly note: string;
  readonly cost: number;
  readonly backlog: number | null;
  readonly objective: number | null;
  readonly maxWait: number | null;
  readonly stable: boolean;
  readonly withinBudget: boolean;
  readonly withinLimits: boolean;
  readonly meetsTargets: boolean;
  /** Paid compatibilities whose removal alone would lower the objective. */
  readonly harmful: IdPair[];
  /** Comparable with the front: stable, within budget and limits, wait targets met. */
  readonly feasible: boolean;
  /** Best front objective at this cost or below (null when not comparable or nothing that cheap). */
  readonly frontAtCost: number | null;
  /** objective − frontAtCost. */
  readonly gap: number | null;
  /** gap / objective. */
  readonly relativeGap: number | null;
  readonly added: IdPair[];
  readonly removed: IdPair[];
}

export interface MilpRecord {
  readonly cost: number;
  readonly minEdgeFlow: number | null;
  readonly proven: boolean;
  readonly added: IdPair[];
  readonly removed: IdPair[];
}

export interface RecommendationRecord {
  readonly scenario: string;
  readonly timeUnit: string;
  readonly costUnit: string | null;
  readonly objective: ObjectiveName;
  readonly budget: number | null;
  readonly pareto: ParetoRecord[];
  readonly baselines: BaselineRecord[];
  /** Exact evaluations of the search. */
  readonly evaluations: number;
  /** Designs scored (evaluations plus designs refused as unstable before any evaluation). */
  readonly scored: number;
  /** 2^(removable compatibilities + candidates). */
  readonly designSpace: number;
  /** evaluations / designSpace. */
  readonly evaluationShare: number;
  readonly exhaustive: boolean;
  readonly harmfulRefused: number;
  readonly milp: { readonly cheapest: MilpRecord; readonly ladder: ReadonlyArray<{ readonly budget: number; readonly design: MilpRecord | null }> };
}

const r12 = (x: number): number | null => (Number.isFinite(x) ? Number(x.toPrecision(12)) : null);

function pairOf(problem: DesignProblem, a: number, b: number): IdPair {
  return [problem.ids[a]!, problem.ids[b]!];
}

/** Added and dropped pairs of a design (forced removals first among the dropped). */
export function changePairs(problem: DesignProblem, design: Uint8Array): { added: IdPair[]; removed: IdPair[] } {
  const { added, removed } = designChanges(problem, design);
  const t = (j: number): IdPair => pairOf(problem, problem.toggles[j]!.a, problem.toggles[j]!.b);
  return { added: added.map(t), removed: [...problem.forcedOut.map((f) => pairOf(problem, f.a, f.b)), ...removed.map(t)] };
}

function paretoRecord(problem: DesignProblem, d: DesignDetails): ParetoRecord {
  return {
    cost: d.cost,
    backlog: r12(d.backlogTotal),
    objective: r12(d.objective),
    ...changePairs(problem, d.design),
    stable: d.stable,
    maxWait: r12(d.maxWait),
    slack: r12(d.minEdgeFlow),
    bottleneckSlack: r12(d.bottleneckSlack),
    waits: d.wait ? Object.fromEntries(problem.ids.map((id, k) => [id, r12(d.wait![k]!)])) : null,
  };
}

function milpRecord(problem: DesignProblem, m: MilpDesign): MilpRecord {
  return { cost: m.cost, minEdgeFlow: r12(m.verifiedMinFlow), proven: m.proven, ...changePairs(problem, m.design) };
}

export function recommendationRecord(problem: DesignProblem, rec: Recommendation, meta: { scenario: string; costUnit?: string | undefined }): RecommendationRecord {
  return {
    scenario: meta.scenario,
    timeUnit: problem.timeUnit,
    costUnit: meta.costUnit ?? null,
    objective: rec.objective,
    budget: r12(rec.budget),
    pareto: rec.pareto.map((d) => paretoRecord(problem, d)),
    baselines: rec.baselines.map((b) => ({
      name: b.name,
      note: b.note,
      cost: b.cost,
      backlog: r12(b.backlogTotal),
      objective: r12(b.objective),
      maxWait: r12(b.maxWait),
      stable: b.stable,
      withinBudget: b.withinBudget,
      withinLimits: b.withinLimits,
      meetsTargets: b.meetsTargets,
      harmful: b.harmful.map((j) => pairOf(problem, problem.toggles[j]!.a, problem.toggles[j]!.b)),
      feasible: b.feasible,
      frontAtCost: b.feasible ? r12(b.frontValue) : null,
      gap: r12(b.gap),
      relativeGap: Number.isFinite(b.gap) && b.objective > 0 ? r12(b.gap / b.objective) : null,
      ...changePairs(problem, b.design),
    })),
    evaluations: rec.evaluations,
    scored: rec.scored,
    designSpace: rec.designSpace,
    evaluationShare: r12(rec.evaluations / rec.designSpace) ?? 0,
    exhaustive: rec.exhaustive,
    harmfulRefused: rec.harmfulRefused,
    milp: {
      cheapest: milpRecord(problem, rec.milp.cheapest),
      ladder: rec.milp.ladder.map((l) => ({ budget: l.budget, design: l.design ? milpRecord(problem, l.design) : null })),
    },
  };
}

function csvField(v: string | number | boolean | null): string {
  const s = v === null ? '' : String(v);
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

const pairsText = (pairs: readonly IdPair[]): string => pairs.map(([a, b]) => `${a}~${b}`).join(' ');

/** CSV: one row per Pareto design (kind "pareto") and per baseline (kind "baseline"). */
export function recommendationCsv(r: RecommendationRecord): string {
  const head = ['kind', 'name', 'cost', 'backlog', 'objective', 'maxWait', 'slack', 'frontAtCost', 'gap', 'feasible', 'added', 'removed'];
  const rows: Array<Array<string | number | boolean | null>> = [];
  r.pareto.forEach((p, i) => rows.push(['pareto', `design ${i + 1}`, p.cost, p.backlog, p.objective, p.maxWait, p.slack, null, null, true, pairsText(p.added), pairsText(p.removed)]));
  for (const b of r.baselines) rows.push(['baseline', b.name, b.cost, b.backlog, b.objective, b.maxWait, null, b.frontAtCost, b.gap, b.feasible, pairsText(b.added), pairsText(b.removed)]);
  return [head, ...rows].map((row) => row.map(csvField).join(',')).join('\n') + '\n';
}
