import { compileModel } from '../../model/compile.js';
import { evaluateExact, DEFAULT_MAX_SETS } from '../../exact/evaluate.js';
import { checkStability } from '../../stability/check.js';
import { certificateWithIds } from '../../stability/certificate.js';
import { evaluationRecord, type EvaluationRecord } from '../../report/evaluation.js';
import { checkMaxSets } from '../options.js';
import { reportUnstable } from '../unstable.js';
import { loadScenario } from '../load.js';
import { num, pct, table } from '../format.js';
import type { CommandIO } from '../io.js';

export interface EvaluateOptions {
  readonly file: string;
  readonly json?: boolean;
  readonly maxSets?: number;
}

/** `edgewise evaluate FILE`: exact steady state under FCFM. */
export async function evaluateCommand(opts: EvaluateOptions, io: CommandIO): Promise<number> {
  checkMaxSets(opts.maxSets);
  const maxSets = opts.maxSets ?? DEFAULT_MAX_SETS;
  const scenario = loadScenario(opts.file, io.cwd);
  const model = compileModel(scenario);
  const stability = checkStability(model);
  if (!stability.stable) return reportUnstable(certificateWithIds(model, stability.certificate!), scenario.timeUnit, opts.json, io);
  const result = evaluateExact(model, { maxSets, timeUnit: scenario.timeUnit });
  const record = evaluationRecord(model, result, {
    scenario: scenario.name,
    timeUnit: scenario.timeUnit,
    bottleneck: stability.bottleneck,
  });
  if (opts.json) {
    io.out(`${JSON.stringify(record, null, 2)}\n`);
    return 0;
  }
  io.out(renderEvaluation(record, scenario.classes.map((c) => c.label), scenario.classes.map((c) => c.rate)));
  return 0;
}

/** The human-readable tables of an evaluation. */
export function renderEvaluation(r: EvaluationRecord, labels: ReadonlyArray<string | undefined>, rates: readonly number[]): string {
  const u = r.timeUnit;
  const ids = Object.keys(r.backlog.byClass);
  const hasLabels = labels.some((l) => l !== undefined && l !== '');
  const classes = table(
    ['class', ...(hasLabels ? ['label'] : []), 'rate', 'mean backlog', `mean wait (${u})`, 'matched on arrival'],
    ['left', ...(hasLabels ? (['left'] as const) : []), 'right', 'right', 'right', 'right'],
  );
  ids.forEach((id, k) => {
    classes.push([id, ...(hasLabels ? [labels[k] ?? ''] : []), num(rates[k]!), num(r.backlog.byClass[id]!), num(r.wait.byClass[id]!), pct(r.immediateMatch.byClass[id]!)]);
  });
  classes.push([{ content: 'total', colSpan: hasLabels ? 2 : 1 }, num(rates.reduce((a, b) => a + b, 0)), num(r.backlog.total), '', '']);
  const edges = table(['compatibility', `matches per ${u}`, 'share of matches'], ['left', 'right', 'right']);
  const sorted = [...r.matchRates].sort((a, b) => b.rate - a.rate);
  for (const e of sorted) edges.push([e.pair[0] === e.pair[1] ? `${e.pair[0]} ↔ ${e.pair[0]} (same class)` : `${e.pair[0]} ↔ ${e.pair[1]}`, num(e.rate), pct(e.share)]);
  const b = r.bottleneck;
  const verdict =
    `stable · total backlog ${num(r.backlog.total)} · system empty ${pct(r.emptyProbability)} of the time` +
    (b ? ` · bottleneck {${b.set.join(', ')}} with slack ${num(b.slack)}/${u}` : '') +
    ` · ${r.independentSets.toLocaleString('en-US')} independent sets`;
  return `${r.scenario} — exact FCFM steady state\n\n${classes.toString()}\n\n${edges.toString()}\n\n${verdict}\n`;
}
