/**
 * Output shapes of `compare`: the rounded JSON record and CSV (one line per column, RFC 4180
 * quoting). The table for people is drawn by the command (src/cli/commands/compare.ts).
 */
import type { CompareColumn, DesignSummary } from './compare.js';
import type { Pair } from './report-data.js';

const r12 = (x: number): number | null => (Number.isFinite(x) ? Number(x.toPrecision(12)) : null);

function designRecord(d: DesignSummary | null) {
  if (!d) return null;
  return {
    cost: r12(d.cost),
    added: d.added,
    removed: d.removed,
    backlog: r12(d.backlog),
    maxWait: r12(d.maxWait),
    worstCase: { backlog: r12(d.worstBacklog), under: d.worstUnder, stable: Number.isFinite(d.worstBacklog) },
  };
}

/** The `compare --json` document. */
export function compareRecord(columns: readonly CompareColumn[]) {
  return {
    columns: columns.map((c) => ({
      source: c.source,
      scenario: c.scenario,
      timeUnit: c.timeUnit,
      budget: c.budget,
      stable: c.stable,
      instability: c.instability,
      bottleneck: c.bottleneck ? { set: c.bottleneck.set, slack: r12(c.bottleneck.slack) } : null,
      backlog: r12(c.backlog),
      worstWait: c.worstWait ? { class: c.worstWait.class, wait: r12(c.worstWait.wait) } : null,
      variants: c.todayUnder.map((o) => ({ name: o.variant, stable: o.stable, backlog: r12(o.backlog), maxWait: r12(o.maxWait) })),
      best: designRecord(c.best),
      robust: designRecord(c.robust),
      frontSize: c.frontSize,
      note: c.note,
    })),
  };
}

/** "a–b, a–c" for a cell. */
export function pairsText(pairs: readonly Pair[], separator = ', '): string {
  return pairs.map((p) => `${p[0]}–${p[1]}`).join(separator);
}

function csvCell(v: string | number | boolean | null): string {
  if (v === null) return '';
  const s = typeof v === 'number' ? (Number.isFinite(v) ? String(Number(v.toPrecision(12))) : '') : String(v);
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export const COMPARE_CSV_HEADER = [
  'source', 'scenario', 'budget', 'stable', 'bottleneck', 'bottleneckSlack', 'backlog', 'worstWaitClass', 'worstWait',
  'bestCost', 'bestAdded', 'bestRemoved', 'bestBacklog', 'bestMaxWait', 'bestWorstBacklog', 'bestWorstUnder',
  'robustCost', 'robustAdded', 'robustRemoved', 'robustWorstBacklog', 'robustWorstUnder', 'note',
] as const;

/** CSV text: a header line, then one line per column of the comparison. */
export function compareCsv(columns: readonly CompareColumn[]): string {
  const lines = [COMPARE_CSV_HEADER.join(',')];
  for (const c of columns) {
    const b = c.best;
    const r = c.robust;
    const row: Array<string | number | boolean | null> = [
      c.source, c.scenario, c.budget, c.stable,
      c.bottleneck ? c.bottleneck.set.join(' ') : null, c.bottleneck ? c.bottleneck.slack : null,
      c.stable ? c.backlog : null, c.worstWait?.class ?? null, c.worstWait?.wait ?? null,
      b ? b.cost : null, b ? pairsText(b.added, ' ') : null, b ? pairsText(b.removed, ' ') : null, b ? b.backlog : null, b ? b.maxWait : null,
      b ? (Number.isFinite(b.worstBacklog) ? b.worstBacklog : 'unstable') : null, b ? b.worstUnder : null,
      r ? r.cost : null, r ? pairsText(r.added, ' ') : null, r ? pairsText(r.removed, ' ') : null,
      r ? (Number.isFinite(r.worstBacklog) ? r.worstBacklog : 'unstable') : null, r ? r.worstUnder : null,
      c.note ?? c.instability,
    ];
    lines.push(row.map(csvCell).join(','));
  }
  return `${lines.join('\n')}\n`;
}
