import cliProgress from 'cli-progress';
import { UsageError } from '../../errors.js';
import { readDesignFields } from '../../model/design-fields.js';
import { designProblem } from '../../design/problem.js';
import { OBJECTIVES, objectiveLabel, type ObjectiveName } from '../../design/objective.js';
import { recommend, type RecommendProgress } from '../../design/recommend.js';
import { recommendationCsv, recommendationRecord, type IdPair, type RecommendationRecord } from '../../report/recommendation.js';
import { loadScenario } from '../load.js';
import { num, pct, table } from '../format.js';
import type { CommandIO } from '../io.js';
import { checkMaxSets } from '../options.js';

export interface RecommendCommandOptions {
  readonly file: string;
  readonly budget?: number;
  readonly objective?: string;
  readonly jobs?: number;
  readonly exhaustive?: boolean;
  readonly seed?: number;
  readonly maxSets?: number;
  readonly json?: boolean;
  readonly csv?: boolean;
}

function checkOptions(opts: RecommendCommandOptions): ObjectiveName {
  const objective = (opts.objective ?? 'total') as ObjectiveName;
  if (!OBJECTIVES.includes(objective)) throw new UsageError(`--objective must be one of ${OBJECTIVES.join(', ')}, got ${JSON.stringify(opts.objective)}`);
  if (opts.budget !== undefined && !Number.isFinite(opts.budget)) throw new UsageError(`--budget must be a number, got ${opts.budget}`);
  if (opts.jobs !== undefined && !(Number.isInteger(opts.jobs) && opts.jobs >= 1)) throw new UsageError(`--jobs must be a whole number >= 1, got ${opts.jobs}`);
  if (opts.seed !== undefined && !Number.isInteger(opts.seed)) throw new UsageError(`--seed must be a whole number, got ${opts.seed}`);
  checkMaxSets(opts.maxSets);
  if (opts.json && opts.csv) throw new UsageError('choose one of --json and --csv');
  return objective;
}

/** A progress bar on standard error (terminals only); returns the callback and a stop function. */
function progressBar(io: CommandIO): { onProgress?: (p: RecommendProgress) => void; stop: () => void } {
  if (!io.isTTY) return { stop: () => undefined };
  const bar = new cliProgress.SingleBar(
    { format: 'recommend [{bar}] {phase} · {evaluations} exact evaluations', stream: process.stderr, clearOnComplete: true, hideCursor: true },
    cliProgress.Presets.shades_classic,
  );
  let started = false;
  let total = 1;
  return {
    onProgress: (p) => {
      total = Math.max(total, p.scored + 1, Math.ceil(p.scored * 1.25));
      if (!started) {
        bar.start(total, p.scored, { phase: p.phase, evaluations: p.evaluations });
        started = true;
      }
      bar.setTotal(total);
      bar.update(p.scored, { phase: p.phase, evaluations: p.evaluations });
    },
    stop: () => {
      if (started) bar.stop();
    },
  };
}

/** `edgewise recommend FILE`: the cost/objective Pareto set of the designs within the budget. */
export async function recommendCommand(opts: RecommendCommandOptions, io: CommandIO): Promise<number> {
  const objective = checkOptions(opts);
  const scenario = loadScenario(opts.file, io.cwd);
  const fields = readDesignFields(scenario, opts.file);
  const problem = designProblem(scenario, fields, opts.budget);
  const progress = progressBar(io);
  let rec;
  try {
    rec = await recommend(problem, {
      objective,
      jobs: opts.jobs ?? 1,
      exhaustive: Boolean(opts.exhaustive),
      seed: opts.seed ?? 1,
      ...(opts.maxSets === undefined ? {} : { maxSets: opts.maxSets }),
      ...(progress.onProgress ? { onProgress: progress.onProgress } : {}),
    });
  } finally {
    progress.stop();
  }
  const costUnit = scenario.costUnit;
  const record = recommendationRecord(problem, rec, { scenario: scenario.name, costUnit });
  if (opts.json) io.out(`${JSON.stringify(record, null, 2)}\n`);
  else if (opts.csv) io.out(recommendationCsv(record));
  else io.out(renderRecommendation(record));
  return 0;
}

const pairText = ([a, b]: IdPair): string => (a === b ? `${a}↔${a}` : `${a}↔${b}`);

function changesText(added: readonly IdPair[], removed: readonly IdPair[]): string {
  const parts = [...added.map((p) => `+ ${pairText(p)}`), ...removed.map((p) => `− ${pairText(p)}`)];
  return parts.length === 0 ? "today's design" : parts.join(', ');
}

/** The human-readable tables of a recommendation. */
export function renderRecommendation(r: RecommendationRecord): string {
  const u = r.timeUnit;
  const showObjective = r.objective === 'weighted'; // max-wait is the max wait column itself
  const label = objectiveLabel(r.objective);
  const front = table(
    ['cost', 'backlog', ...(showObjective ? [label] : []), `max wait (${u})`, 'slack', 'changes from today'],
    ['right', 'right', ...(showObjective ? (['right'] as const) : []), 'right', 'right', 'left'],
  );
  for (const p of r.pareto) {
    front.push([num(p.cost), num(p.backlog ?? NaN), ...(showObjective ? [num(p.objective ?? NaN)] : []), num(p.maxWait ?? NaN), num(p.slack ?? NaN), changesText(p.added, p.removed)]);
  }
  const base = table(['baseline', 'cost', label, `front at this cost`, 'gap', 'how it is built'], ['left', 'right', 'right', 'right', 'right', 'left']);
  for (const b of r.baselines) {
    const why = !b.stable ? 'unstable' : !b.withinBudget ? 'over budget' : !b.withinLimits ? 'exceeds maxCompatibilities' : !b.meetsTargets ? 'misses a wait target' : '';
    const gap = b.gap === null ? (why || 'nothing that cheap on the front') : `${num(b.gap)}${b.relativeGap === null ? '' : ` (${pct(b.relativeGap)})`}`;
    base.push([b.name, num(b.cost), num(b.objective ?? NaN), num(b.frontAtCost ?? NaN), gap, b.note + (b.harmful.length > 0 ? `; pays for harmful ${b.harmful.map(pairText).join(', ')}` : '')]);
  }
  const budget = r.budget === null ? 'no budget limit' : `budget ${num(r.budget)}${r.costUnit ? ` ${r.costUnit}` : ''}`;
  const how = r.exhaustive ? 'every design enumerated' : 'MILP seeds + Pareto local search';
  const footer =
    `${r.evaluations.toLocaleString('en-US')} exact evaluation${r.evaluations === 1 ? '' : 's'} ` +
    `(${pct(r.evaluationShare, 2)} of the ${r.designSpace.toLocaleString('en-US')} possible design${r.designSpace === 1 ? '' : 's'}; ${how})` +
    (r.harmfulRefused > 0 ? ` · ${r.harmfulRefused} design${r.harmfulRefused === 1 ? '' : 's'} refused for paying for a harmful compatibility` : '') +
    ` · cheapest stable design costs ${num(r.milp.cheapest.cost)}`;
  return (
    `${r.scenario} — designs worth considering (objective: ${label}, ${budget})\n\n` +
    `Pareto set, cheapest first (no design is both cheaper and better):\n${front.toString()}\n\n` +
    `Baselines:\n${base.toString()}\n\n${footer}\n`
  );
}
