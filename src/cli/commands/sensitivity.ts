import { describeCertificate } from '../../errors.js';
import { compileModel, type CompiledModel } from '../../model/compile.js';
import type { SensitivityEntry, SensitivityResult } from '../../design/sensitivity/sensitivity.js';
import { sensitivity } from '../../design/sensitivity/sensitivity.js';
import { sensitivityRecord } from '../../report/sensitivity-record.js';
import { num, table } from '../format.js';
import type { CommandIO } from '../io.js';
import { checkMaxSets } from '../options.js';
import { loadScenario } from '../load.js';

export interface SensitivityCommandOptions {
  readonly file: string;
  readonly allPairs?: boolean;
  readonly json?: boolean;
  readonly maxSets?: number;
}

/** `edgewise sensitivity FILE`: the exact effect of every single addition and removal. */
export async function sensitivityCommand(opts: SensitivityCommandOptions, io: CommandIO): Promise<number> {
  checkMaxSets(opts.maxSets);
  const scenario = loadScenario(opts.file, io.cwd);
  const model = compileModel(scenario);
  const result = sensitivity(scenario, model, {
    allPairs: opts.allPairs === true,
    ...(opts.maxSets === undefined ? {} : { maxSets: opts.maxSets }),
    timeUnit: scenario.timeUnit,
  });
  if (opts.json) {
    io.out(`${JSON.stringify(sensitivityRecord(model, result, { scenario: scenario.name, timeUnit: scenario.timeUnit }), null, 2)}\n`);
    return 0;
  }
  io.out(renderSensitivity(model, result, scenario.name, scenario.timeUnit));
  return 0;
}

const signed = (x: number): string => (Number.isFinite(x) ? (x > 0 ? `+${num(x)}` : num(x)) : x > 0 ? '+∞' : '—');
const braces = (model: CompiledModel, set: ArrayLike<number>): string => `{${Array.from(set, (k) => model.ids[k]!).join(', ')}}`;

function pairText(model: CompiledModel, e: SensitivityEntry): string {
  return e.a === e.b ? `${model.ids[e.a]} ↔ ${model.ids[e.a]} (same class)` : `${model.ids[e.a]} ↔ ${model.ids[e.b]}`;
}

/** The class whose mean wait changes most, e.g. "mage −3.21". */
function largestWaitChange(model: CompiledModel, e: SensitivityEntry): string {
  if (e.stable !== true) return '';
  let best = -1;
  for (let k = 0; k < model.n; k++) if (best < 0 || Math.abs(e.waitDelta[k]!) > Math.abs(e.waitDelta[best]!)) best = k;
  return best < 0 ? '' : `${model.ids[best]} ${signed(e.waitDelta[best]!)}`;
}

function verdict(e: SensitivityEntry): string {
  if (e.skipped) return 'not evaluated';
  if (!e.stable) return 'UNSTABLE';
  if (e.kind === 'add') return e.harmful ? 'HARMFUL' : e.delta < 0 ? 'helps' : 'no change';
  return e.beneficial ? 'beneficial' : 'raises backlog';
}

function condition(e: SensitivityEntry, bottleneck: boolean): string {
  if (!bottleneck) return 'n/a (no bottleneck)';
  const what = e.kind === 'add' ? 'harm' : 'benefit';
  const where = e.relation === 'joins-neighbours' ? 'joins two neighbours' : e.relation === 'touches' ? 'touches the bottleneck' : 'away from the bottleneck';
  return `${e.predicted ? `${what} predicted` : 'not predicted'} (${where})`;
}

/** Tables for people. */
export function renderSensitivity(model: CompiledModel, r: SensitivityResult, name: string, timeUnit: string): string {
  const u = timeUnit;
  const parts: string[] = [`${name} — exact effect of single changes (FCFM)`];
  const b = r.base.bottlenecks;
  const neck =
    b.length === 0
      ? ' · no bottleneck (every class matches its own kind, so no group of classes can saturate); the near-saturation condition does not apply'
      : ` · bottleneck ${b.map((x) => braces(model, x.set)).join(' and ')} with slack ${num(b[0]!.slack)}/${u} (can only be matched with ${braces(model, b[0]!.neighbours)})`;
  parts.push(`Today: mean backlog ${num(r.base.backlog)}${neck}`);
  const notes: string[] = [];
  const body = (entries: readonly SensitivityEntry[], kind: 'add' | 'remove'): string => {
    const money = kind === 'add' ? 'cost' : 'saving';
    const t = table(
      [kind === 'add' ? 'add' : 'remove', money, 'backlog', 'Δ backlog', `Δ per ${money}`, 'exact verdict', 'near-saturation condition', `largest wait change (${u})`],
      ['left', 'right', 'right', 'right', 'right', 'left', 'left', 'left'],
    );
    for (const e of entries) {
      t.push([
        pairText(model, e),
        e.price === undefined ? '—' : num(e.price),
        e.skipped ? '—' : e.stable ? num(e.backlog) : 'unstable',
        e.skipped ? '—' : signed(e.delta),
        e.perUnit === undefined ? '—' : signed(e.perUnit),
        verdict(e),
        condition(e, r.base.bottlenecks.length > 0),
        largestWaitChange(model, e),
      ]);
      if (e.certificate) notes.push(`without ${pairText(model, e)}: ${describeCertificate(e.certificate, u)}`);
      if (e.skipped) notes.push(`${pairText(model, e)}: ${e.skipped}`);
    }
    return t.toString();
  };
  if (r.additions.length > 0) parts.push(`Additions (most backlog saved per unit of cost first)\n${body(r.additions, 'add')}`);
  else parts.push('Additions: the scenario lists no candidates (use --all-pairs to try every absent pair).');
  if (r.removals.length > 0) parts.push(`Removals (least backlog added per unit saved first)\n${body(r.removals, 'remove')}`);
  if (notes.length > 0) parts.push(notes.map((x) => `  - ${x}`).join('\n'));
  parts.push(
    'HARMFUL: the addition raises the mean backlog; beneficial: the removal lowers it (or keeps it and saves money). ' +
      'The condition column is the published near-saturation criterion for the base bottleneck; the exact verdict is what holds today.',
  );
  return `${parts.join('\n\n')}\n`;
}
