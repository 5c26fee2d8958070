/**
 * Builds the report's data (report-data.ts) for one scenario: today's exact evaluation and
 * bottleneck, the recommender's Pareto front and baselines, the sensitivity table and a load sweep
 * from the design layer, and every shown design under each demand variant. Pure computation: the
 * command writes the file.
 */
import { EdgewiseError, InfeasibleDesignError } from '../errors.js';
import { compileModel, type CompiledModel } from '../model/compile.js';
import { readDesignFields } from '../model/design-fields.js';
import { demandVariants } from '../model/demand.js';
import { pairKey, type Scenario } from '../model/scenario.js';
import { designProblem } from '../design/problem.js';
import { recommend, type RecommendOptions } from '../design/recommend.js';
import { checkStability } from '../stability/check.js';
import { evaluateOrExplain, outcomesUnder } from './design-outcome.js';
import type { EdgeKind, GraphEdge } from './graph-svg.js';
import { frontPoints, recommendedDesign, type RecommendedDesign } from './recommended.js';
import type { BaselineView, DesignView, FrontPoint, Pair, ReportClass, ReportData, SensitivityRow, SweepView } from './report-data.js';
import { sensitivityRows, sweepView } from './design-sources.js';
import { namerOf, verdicts } from './verdicts.js';
import { fmt } from './units.js';

export interface GatherOptions {
  readonly source?: string;
  /** Budget (default: the scenario's). */
  readonly budget?: number;
  readonly recommend?: Omit<RecommendOptions, 'onProgress'>;
  /** Steps of the load sweep (default 12). */
  readonly sweepSteps?: number;
  readonly onPhase?: (phase: string) => void;
}

function classesOf(scenario: Scenario): ReportClass[] {
  return scenario.classes.map((c) => ({ id: c.id, label: typeof c.label === 'string' && c.label.trim() !== '' ? c.label : c.id, rate: c.rate }));
}

function stringField(scenario: Scenario, key: 'costUnit' | 'description' | 'itemWord'): string | null {
  const v = scenario[key];
  return typeof v === 'string' && v.trim() !== '' ? v : null;
}

export async function gatherReport(scenario: Scenario, options: GatherOptions = {}): Promise<ReportData> {
  const phase = options.onPhase ?? ((): void => {});
  const source = options.source;
  const variants = demandVariants(scenario, source);
  const fields = readDesignFields(scenario, source);
  const model = compileModel(scenario);
  const classes = classesOf(scenario);
  const notes: string[] = [];

  phase('today');
  const stability = checkStability(model);
  const todayEval = evaluateOrExplain(model, scenario.timeUnit);
  const todayView: DesignView = {
    name: "today's design",
    role: 'today',
    cost: 0,
    added: [],
    removed: [],
    stable: todayEval.stable,
    backlog: todayEval.stable ? todayEval.result.backlogTotal : NaN,
    waits: todayEval.stable ? Array.from(todayEval.result.wait) : null,
    ...(todayEval.stable ? {} : { instability: todayEval.why }),
    underVariants: outcomesUnder(model, [], [], variants, scenario.timeUnit),
  };
  const ids = (set: ArrayLike<number>): string[] => Array.from(set, (k) => model.ids[k]!);
  const b = stability.bottleneck;
  const bottleneck = b ? { set: ids(b.set), neighbours: ids(b.neighbours), demand: b.demand, capacity: b.capacity, slack: b.slack } : null;

  phase('sensitivity');
  let sensitivity: SensitivityRow[] = [];
  if (todayEval.stable) {
    const single = sensitivityRows(scenario, model);
    sensitivity = single.rows;
    notes.push(...single.notes);
  } else notes.push("Single changes and the load sweep compare against today's design, which is unstable: see the recommendation instead.");

  phase('recommend');
  const budget = options.budget ?? scenario.budget;
  const problem = designProblem(scenario, fields, budget);
  let front: RecommendedDesign[] = [];
  let baselines: BaselineView[] = [];
  try {
    const rec = await recommend(problem, { workerUrl: null, ...options.recommend });
    front = frontPoints(problem, rec);
    baselines = rec.baselines.map((x) => {
      const d = recommendedDesign(problem, x);
      return { name: x.name === 'today' ? "today's design" : x.name, cost: d.cost, backlog: d.backlog, frontAtCost: Number.isFinite(x.frontValue) ? x.frontValue : NaN, withinBudget: x.withinBudget };
    });
  } catch (e) {
    if (e instanceof InfeasibleDesignError || (e instanceof EdgewiseError && e.exitCode === 4)) notes.push(`No recommendation: ${e.message}.`);
    else throw e;
  }

  phase('designs');
  const shown = pickDesigns(front, todayView);
  const designs: DesignView[] = shown.map((s) => ({
    name: s.name,
    role: s.role,
    cost: s.d.cost,
    added: s.d.added,
    removed: s.d.removed,
    stable: s.d.stable,
    backlog: s.d.backlog,
    waits: s.d.waits,
    underVariants: outcomesUnder(model, s.d.added, s.d.removed, variants, scenario.timeUnit),
  }));

  phase('sweep');
  let sweep: SweepView | null = null;
  if (bottleneck && todayEval.stable) {
    try {
      sweep = sweepView(model, bottleneck.set, designs[0] ?? null, sensitivity, { steps: options.sweepSteps ?? 12, timeUnit: scenario.timeUnit, name: namerOf({ classes }) });
    } catch (e) {
      if (e instanceof EdgewiseError) notes.push(`No load sweep: ${e.message}.`);
      else throw e;
    }
  }

  const graphEdges = graphEdgesOf(scenario, model, todayEval.stable ? todayEval.result.matchRates : null, designs[0] ?? null, sensitivity);
  // ring: the bottleneck of a stable design, or the overloaded set of an unstable one
  const overloaded = !stability.stable && stability.certificate ? ids(stability.certificate.set) : null;
  const inRing = new Set(overloaded ?? bottleneck?.set ?? []);
  const costUnit = stringField(scenario, 'costUnit') ?? 'cost units';
  const partial: Omit<ReportData, 'verdicts'> = {
    scenario: scenario.name,
    description: stringField(scenario, 'description'),
    timeUnit: scenario.timeUnit,
    costUnit,
    itemWord: stringField(scenario, 'itemWord') ?? 'items',
    budget: budget ?? null,
    classes,
    compatibilityCount: scenario.compatibilities.length,
    candidateCount: scenario.candidates.length,
    graph: {
      nodes: classes.map((c) => ({ ...c, bottleneck: inRing.has(c.id) })),
      edges: graphEdges,
      timeUnit: scenario.timeUnit,
      title: `Compatibility graph of ${scenario.name}`,
      ...(overloaded ? { ringLabel: 'overloaded group (cannot keep up)' } : {}),
    },
    bottleneck,
    today: todayView,
    designs,
    front: front.map((d): FrontPoint => ({ cost: d.cost, backlog: d.backlog, maxWait: d.maxWait, added: d.added, removed: d.removed })),
    baselines,
    sensitivity,
    sweep,
    variants: variants.map((v) => v.name),
    notes,
  };
  return { ...partial, verdicts: verdicts(partial, namerOf(partial)) };
}

/**
 * The designs shown beside today's: the best of the front within the budget (lowest backlog), and
 * a cheaper one that already gets at least half of its improvement, when there is one.
 */
function pickDesigns(front: readonly RecommendedDesign[], today: DesignView): Array<{ name: string; role: 'recommended' | 'alternative'; d: RecommendedDesign }> {
  const changed = front.filter((d) => d.added.length > 0 || d.removed.length > 0);
  if (changed.length === 0) return [];
  const best = changed.reduce((a, d) => (d.backlog < a.backlog || (d.backlog === a.backlog && d.cost < a.cost) ? d : a));
  const out: Array<{ name: string; role: 'recommended' | 'alternative'; d: RecommendedDesign }> = [
    { name: `recommended (cost ${fmt(best.cost)})`, role: 'recommended', d: best },
  ];
  const reference = today.stable ? today.backlog : Infinity;
  if (Number.isFinite(reference)) {
    const half = reference - 0.5 * (reference - best.backlog);
    const cheaper = changed.filter((d) => d.cost < best.cost && d.backlog <= half).sort((a, c) => a.cost - c.cost)[0];
    if (cheaper) out.push({ name: `cheaper option (cost ${fmt(cheaper.cost)})`, role: 'alternative', d: cheaper });
  }
  return out;
}

function graphEdgesOf(
  scenario: Scenario,
  model: CompiledModel,
  matchRates: Float64Array | null,
  chosen: DesignView | null,
  sensitivity: readonly SensitivityRow[],
): GraphEdge[] {
  const keyOf = (p: Pair): string => pairKey(p[0], p[1]);
  const funded = new Set((chosen?.added ?? []).map(keyOf));
  const dropped = new Set((chosen?.removed ?? []).map(keyOf));
  const harmful = new Set(sensitivity.filter((r) => r.kind === 'add' && r.flagged).map((r) => keyOf(r.pair)));
  const edges: GraphEdge[] = [];
  for (let e = 0; e < model.m; e++) {
    const p: Pair = [model.ids[model.edgeA[e]!]!, model.ids[model.edgeB[e]!]!];
    const kind: EdgeKind = dropped.has(keyOf(p)) ? 'drop' : 'today';
    edges.push({ a: model.edgeA[e]!, b: model.edgeB[e]!, kind, ...(matchRates ? { matchRate: matchRates[e]! } : {}) });
  }
  for (const c of scenario.candidates) {
    const k = keyOf(c.pair);
    edges.push({ a: model.index.get(c.pair[0])!, b: model.index.get(c.pair[1])!, kind: funded.has(k) ? 'fund' : 'candidate', harmful: harmful.has(k) });
  }
  return edges;
}
