import { basename } from 'node:path';
import Table from 'cli-table3';
import { UsageError } from '../../errors.js';
import { compareScenarios, type CompareColumn, type CompareInput, type DesignSummary } from '../../report/compare.js';
import { compareCsv, compareRecord, pairsText } from '../../report/compare-output.js';
import { plural } from '../../report/units.js';
import { num } from '../format.js';
import type { CommandIO } from '../io.js';
import { loadScenario } from '../load.js';

export interface CompareOptions {
  readonly files: readonly string[];
  /** "50,100,200" */
  readonly budgets?: string;
  readonly json?: boolean;
  readonly csv?: boolean;
  /** Columns evaluated at once (p-limit). */
  readonly jobs?: number;
}

/** Parses "50,100,200" into budgets (each a finite number >= 0). */
export function parseBudgets(text: string): number[] {
  const parts = text.split(',').map((s) => s.trim());
  const out: number[] = [];
  for (const p of parts) {
    const v = p === '' ? NaN : Number(p);
    if (!Number.isFinite(v) || v < 0) throw new UsageError(`--budgets takes numbers >= 0 separated by commas, e.g. 50,100,200; "${p}" is not one`);
    out.push(v);
  }
  return out;
}

/** `edgewise compare FILE… [--budgets 50,100,200] [--json|--csv]`. */
export async function compareCommand(opts: CompareOptions, io: CommandIO): Promise<number> {
  if (opts.json && opts.csv) throw new UsageError('choose one of --json and --csv');
  if (opts.files.length === 0) throw new UsageError('compare needs at least one scenario file');
  const jobs = opts.jobs ?? 2;
  if (!Number.isInteger(jobs) || jobs < 1) throw new UsageError(`--jobs must be a whole number >= 1, got ${opts.jobs}`);
  const budgets = opts.budgets === undefined ? undefined : parseBudgets(opts.budgets);
  const inputs: CompareInput[] = [];
  for (const file of opts.files) {
    const scenario = loadScenario(file, io.cwd);
    if (budgets) for (const budget of budgets) inputs.push({ scenario, source: file, budget });
    else inputs.push({ scenario, source: file });
  }
  if (io.isTTY && !opts.json && !opts.csv) io.err(`edgewise compare: ${inputs.length} column${inputs.length === 1 ? '' : 's'}, ${jobs} at a time…\n`);
  const columns = await compareScenarios(inputs, { concurrency: jobs });
  if (opts.json) io.out(`${JSON.stringify(compareRecord(columns), null, 2)}\n`);
  else if (opts.csv) io.out(compareCsv(columns));
  else io.out(renderCompare(columns));
  return 0;
}

function changes(d: DesignSummary): string {
  const parts: string[] = [];
  if (d.added.length > 0) parts.push(`add ${pairsText(d.added)}`);
  if (d.removed.length > 0) parts.push(`drop ${pairsText(d.removed)}`);
  return parts.length > 0 ? parts.join('; ') : "keep today's design";
}

/** The side-by-side table: one column per scenario (or per budget). */
export function renderCompare(columns: readonly CompareColumn[]): string {
  const colWidth = columns.length > 3 ? 28 : 36;
  const head = ['', ...columns.map((c) => `${basename(c.source)}\nbudget ${c.budget === null ? 'none' : num(c.budget)}`)];
  const t = new Table({
    head,
    colWidths: [22, ...columns.map(() => colWidth)],
    wordWrap: true,
    style: { head: [], border: [], compact: false },
  });
  const row = (label: string, cell: (c: CompareColumn) => string): void => void t.push([label, ...columns.map(cell)]);
  const unit = (c: CompareColumn): string => c.timeUnit;
  const units = (c: CompareColumn): string => plural(c.timeUnit);
  const hasVariants = columns.some((c) => c.variants.length > 0);
  row('scenario', (c) => c.scenario);
  row("today's design", (c) => (c.stable ? 'stable' : `UNSTABLE: ${c.instability}`));
  row('bottleneck (slack)', (c) => (c.bottleneck ? `{${c.bottleneck.set.join(', ')}} (${num(c.bottleneck.slack)}/${unit(c)})` : '—'));
  row('total backlog', (c) => (c.stable ? num(c.backlog) : '∞'));
  row('worst class wait', (c) => (c.worstWait ? `${num(c.worstWait.wait)} ${units(c)} (${c.worstWait.class})` : '∞'));
  if (hasVariants) {
    row("today's design, worst demand", (c) => {
      if (c.todayUnder.length === 0) return '—';
      const bad = c.todayUnder.find((o) => !o.stable);
      if (bad) return `unstable (${bad.variant})`;
      const w = c.todayUnder.reduce((a, o) => (o.backlog > a.backlog ? o : a));
      return `${num(Math.max(w.backlog, c.backlog))} (${w.backlog > c.backlog ? w.variant : 'today'})`;
    });
  }
  row('best design within budget', (c) => (c.best ? changes(c.best) : c.note ?? '—'));
  row('its cost', (c) => (c.best ? num(c.best.cost) : '—'));
  row('its total backlog', (c) => (c.best ? num(c.best.backlog) : '—'));
  row('its worst class wait', (c) => (c.best ? `${num(c.best.maxWait)} ${units(c)}` : '—'));
  if (hasVariants) {
    row('its worst case (demand)', (c) => (c.best && c.variants.length > 0 ? worst(c.best) : '—'));
    row('robust choice (best worst case)', (c) => {
      if (!c.robust || !c.best) return '—';
      if (c.robust.cost === c.best.cost && pairsText(c.robust.added) === pairsText(c.best.added) && pairsText(c.robust.removed) === pairsText(c.best.removed)) return 'the best design';
      return `${changes(c.robust)}, cost ${num(c.robust.cost)}, worst case ${worst(c.robust)}`;
    });
  }
  return `${t.toString()}\n`;
}

function worst(d: DesignSummary): string {
  return Number.isFinite(d.worstBacklog) ? `${num(d.worstBacklog)} (${d.worstUnder})` : `unstable (${d.worstUnder})`;
}
