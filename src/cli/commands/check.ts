import { reportUnstable } from '../unstable.js';
import { compileModel, type CompiledModel } from '../../model/compile.js';
import type { Scenario } from '../../model/scenario.js';
import { certificateWithIds } from '../../stability/certificate.js';
import { checkStability } from '../../stability/check.js';
import type { StabilityReport, TightSet } from '../../stability/report.js';
import { num, pct, round, table } from '../format.js';
import type { CommandIO } from '../io.js';
import { loadScenario } from '../load.js';

export interface CheckOptions {
  readonly file: string;
  readonly json?: boolean;
}

/** How many tight sets the human-readable output lists. */
const SHOWN_SETS = 10;

const ids = (model: CompiledModel, set: ArrayLike<number>): string[] => Array.from(set, (k) => model.ids[k]!);

function setRecord(model: CompiledModel, t: TightSet) {
  return { set: ids(model, t.set), neighbours: ids(model, t.neighbours), demand: round(t.demand), capacity: round(t.capacity), slack: round(t.slack) };
}

/** The --json document of a stable design. */
export function stableRecord(model: CompiledModel, scenario: Scenario, r: StabilityReport) {
  const byClass: Record<string, number | null> = {};
  model.ids.forEach((id, k) => (byClass[id] = round(r.headroom[k]!)));
  return {
    stable: true,
    timeUnit: scenario.timeUnit,
    bottleneck: r.bottleneck ? setRecord(model, r.bottleneck) : null,
    tightSets: r.tightSets.map((t) => setRecord(model, t)),
    headroom: { byClass },
    components: r.components.length,
  };
}

const braces = (names: string[]): string => `{${names.join(', ')}}`;

/** Tables and verdict of a stable design. */
export function renderStable(model: CompiledModel, scenario: Scenario, r: StabilityReport): string {
  const u = scenario.timeUnit;
  const parts: string[] = [`${scenario.name} — stability check`];
  if (r.tightSets.length > 0) {
    const sets = table(['', 'independent set', `demand /${u}`, 'can only be matched with', `capacity /${u}`, `slack /${u}`], ['left', 'left', 'right', 'left', 'right', 'right']);
    r.tightSets.slice(0, SHOWN_SETS).forEach((t, i) => {
      sets.push([i === 0 ? 'bottleneck' : '', braces(ids(model, t.set)), num(t.demand), braces(ids(model, t.neighbours)), num(t.capacity), num(t.slack)]);
    });
    const more = r.tightSets.length - SHOWN_SETS;
    parts.push(`Tightest independent sets (spare capacity = slack)\n${sets.toString()}${more > 0 ? `\n… and ${more} more (see --json)` : ''}`);
  }
  const labels = scenario.classes.map((c) => c.label);
  const hasLabels = labels.some((l) => l !== undefined && l !== '');
  const classes = table(
    ['class', ...(hasLabels ? ['label'] : []), `rate /${u}`, `headroom /${u}`, 'headroom % of rate'],
    ['left', ...(hasLabels ? (['left'] as const) : []), 'right', 'right', 'right'],
  );
  model.ids.forEach((id, k) => {
    const h = r.headroom[k]!;
    const rate = model.rates[k]!;
    classes.push([id, ...(hasLabels ? [labels[k] ?? ''] : []), num(rate), h === Infinity ? '∞ (self-match)' : num(h), h === Infinity ? '∞' : pct(h / rate)]);
  });
  parts.push(`How far each rate may grow, the others fixed, before the design turns unstable\n${classes.toString()}`);
  const b = r.bottleneck;
  const comps = r.components.length === 1 ? '' : ` · ${r.components.length} independent components`;
  parts.push(
    b
      ? `stable · bottleneck ${braces(ids(model, b.set))}: ${num(b.slack)}/${u} to spare (${pct(b.slack / b.capacity)} of its capacity ${num(b.capacity)}/${u})${comps}`
      : `stable · every class can be matched with its own kind, so no group of classes limits the design${comps}`,
  );
  return `${parts.join('\n\n')}\n`;
}

/** `edgewise check FILE`: is the design stable, and how much room is left? */
export async function checkCommand(opts: CheckOptions, io: CommandIO): Promise<number> {
  const scenario = loadScenario(opts.file, io.cwd);
  const model = compileModel(scenario);
  const report = checkStability(model);
  if (!report.stable) {
    return reportUnstable(certificateWithIds(model, report.certificate!), scenario.timeUnit, opts.json, io);
  }
  if (opts.json) io.out(`${JSON.stringify(stableRecord(model, scenario, report), null, 2)}\n`);
  else io.out(renderStable(model, scenario, report));
  return 0;
}
