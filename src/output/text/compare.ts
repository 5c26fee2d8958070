import { basename } from 'node:path';
import type { CompareColumn, CompareRecord, DesignSummary } from '../../usecases/compare.js';
import { num, pairText, rate, setText, wait, waitScale } from '../format.js';
import { referenceWords } from './common.js';
import { tableBlock, type Block } from './doc.js';

function changes(d: DesignSummary): string {
  const parts: string[] = [];
  if (d.added.length > 0) parts.push(`add ${d.added.map((p) => pairText(p)).join(', ')}`);
  if (d.removed.length > 0) parts.push(`drop ${d.removed.map((p) => pairText(p)).join(', ')}`);
  return parts.length > 0 ? parts.join('; ') : "keep today's design";
}

/** A backlog as shown: "12.3" (exact) or "12.3 ± 0.4 (simulated)" with half its 95 % interval. */
function backlogCell(b: number | null, ci: readonly [number, number] | null | undefined, method: 'exact' | 'simulation'): string {
  if (b === null) return 'unbounded';
  return method === 'simulation' ? `${num(b)}${ci ? ` ± ${num((ci[1] - ci[0]) / 2, 2)}` : ''} (simulated)` : num(b);
}

const worst = (d: DesignSummary): string => (d.worstBacklog !== null ? `${num(d.worstBacklog)} (${d.worstUnder})` : `unstable (${d.worstUnder})`);

/** `compare` for people: one column per scenario (or per budget); columns that do not fit fold into further tables. */
export function compareText(r: CompareRecord): Block[] {
  const cols = r.columns;
  const hasVariants = cols.some((c) => c.variants.length > 0);
  const scale = (c: CompareColumn) => waitScale(c.timeUnit, [c.worstWait?.wait ?? NaN, c.recommended?.maxWait ?? NaN]);
  const rows: Array<[string, (c: CompareColumn) => string]> = [
    ['scenario', (c) => c.scenario],
    ['design', (c) => referenceWords(c.reference)],
    ['stability', (c) => (c.stable ? 'stable' : `UNSTABLE: ${c.instability?.message.replace(/^unstable: /, '') ?? ''}`)],
    ['bottleneck (spare capacity)', (c) => (c.bottleneck ? `${setText(c.bottleneck.set)} (${rate(c.bottleneck.spareCapacity, c.timeUnit)})` : '—')],
    ['total backlog', (c) => backlogCell(c.backlog, c.backlogCi95, c.method)],
    ['worst class wait', (c) => (c.worstWait ? `${wait(c.worstWait.wait, scale(c))} (${c.worstWait.class})` : 'unbounded')],
  ];
  if (hasVariants) {
    rows.push(['worst demand, this design', (c) => {
      if (c.underVariants.length === 0) return '—';
      const bad = c.underVariants.find((o) => !o.stable);
      if (bad) return `unstable (${bad.variant})`;
      const w = c.underVariants.reduce((a, o) => ((o.backlog ?? 0) > (a.backlog ?? 0) ? o : a));
      return c.backlog !== null && (w.backlog ?? 0) <= c.backlog ? `${num(c.backlog)} (today)` : `${num(w.backlog ?? NaN)} (${w.variant})`;
    }]);
  }
  rows.push(
    ['recommended design', (c) => (c.recommended ? changes(c.recommended) : c.note ?? '—')],
    ['its cost', (c) => (c.recommended ? num(c.recommended.cost) : '—')],
    ['its total backlog', (c) => (c.recommended?.backlog != null ? backlogCell(c.recommended.backlog, c.recommended.backlogCi95, c.recommended.method) : '—')],
    ['its worst class wait', (c) => (c.recommended?.maxWait != null ? wait(c.recommended.maxWait, scale(c)) : '—')],
  );
  if (hasVariants) {
    rows.push(
      ['its worst case (demand)', (c) => (c.recommended && c.variants.length > 0 ? worst(c.recommended) : '—')],
      ['robust choice (best worst case)', (c) => {
        if (!c.robust || !c.recommended) return '—';
        if (c.robust.cost === c.recommended.cost && changes(c.robust) === changes(c.recommended)) return 'the recommended design';
        return `${changes(c.robust)}, cost ${num(c.robust.cost)}, worst case ${worst(c.robust)}`;
      }],
    );
  }
  const head = (c: CompareColumn): string => `${basename(c.source)} · budget ${c.budget === null ? 'none' : num(c.budget)}`;
  return [
    tableBlock({
      columns: [{ header: '' }, ...cols.map((c) => ({ header: head(c), wrap: true }))],
      rows: rows.map(([label, cell]) => [label, ...cols.map(cell)]),
      key: 0,
    }),
  ];
}
