import type { SweepRecord } from '../../usecases/sweep.js';
import { num, pairText, pct, perUnit } from '../format.js';
import { referenceWords } from './common.js';
import { list, para, tableBlock, title, type Block } from './doc.js';

/** `sweep` for people: one row per step, backlog and spare capacity of every design. */
export function sweepText(r: SweepRecord): Block[] {
  const u = perUnit(r.timeUnit);
  const grown = r.grow.join(', ');
  // curves are named in the ASCII notation in the record ("with a~b"); text writes pairs as a ↔ b
  const label = (name: string): string => {
    if (name === 'reference') return referenceWords(r.reference);
    const c = r.curves.find((x) => x.name === name);
    if (!c) return name;
    const parts = [c.add.length > 0 ? `with ${c.add.map((p) => pairText(p)).join(', ')}` : '', c.remove.length > 0 ? `without ${c.remove.map((p) => pairText(p)).join(', ')}` : ''];
    return parts.filter((x) => x !== '').join(' ');
  };
  const sim = r.method === 'simulation';
  // simulated: each backlog with its 95 % interval as "12.3 ± 0.4"
  const shown = (p: SweepRecord['curves'][number]['points'][number]): string =>
    p.backlogCi95 ? `${num(p.backlog!)} ± ${num((p.backlogCi95[1] - p.backlogCi95[0]) / 2, 2)}` : num(p.backlog!);
  const blocks: Block[] = [
    title(`${r.scenario} — load sweep of ${referenceWords(r.reference)}: ${grown} grow together (${sim ? 'simulated' : 'exact'} FCFM backlog)`),
    tableBlock({
      columns: [
        { header: 'load factor', align: 'right' },
        { header: 'headroom used', align: 'right', secondary: true },
        ...r.curves.flatMap((c) => [
          { header: `${label(c.name)}: backlog`, align: 'right' as const },
          { header: `spare capacity ${u}`, align: 'right' as const, secondary: true },
        ]),
      ],
      rows: r.steps.map((s, t) => [
        `×${num(s.factor)}`,
        s.headroomUsed === null ? '—' : pct(s.headroomUsed),
        ...r.curves.flatMap((c) => {
          const p = c.points[t]!;
          return p.stable ? [shown(p), p.spareCapacity === null ? '—' : num(p.spareCapacity)] : ['unstable', '—'];
        }),
      ]),
    }),
  ];
  const last = r.steps[r.steps.length - 1]!;
  blocks.push(
    para(
      r.limit.factor !== null
        ? `Stability limit: the rates of ${grown} can grow up to ×${num(r.limit.factor, 6)} (${r.limit.method}); the sweep stops at ${pct(last.headroomUsed ?? NaN, 0)} of that headroom.`
        : `Nothing limits the growth of ${grown} (the LP is unbounded); the sweep stops at ×${num(last.factor)}.`,
    ),
  );
  const lines: string[] = [];
  for (const v of r.curves.slice(1)) {
    const own = r.crossovers.filter((c) => c.variant === v.name);
    const first = v.points[0]!;
    const base = r.curves[0]!.points[0]!;
    const today = !first.stable
      ? 'unstable today'
      : first.vsReference && !first.vsReference.significant
        ? 'not distinguishable today'
        : first.backlog! < base.backlog!
          ? 'helps today'
          : first.backlog! > base.backlog!
            ? 'hurts today'
            : 'same as today';
    const where = (c: SweepRecord['crossovers'][number]): string =>
      c.how === 'bracketed' || c.how === 'unresolved'
        ? `between ×${num(c.between[0])} and ×${num(c.between[1] ?? NaN)}${c.how === 'unresolved' ? ' (unresolved: not distinguishable in between)' : ''}`
        : `at ×${num(c.factor)}${c.headroomUsed !== null ? ` (${pct(c.headroomUsed)} of the headroom)` : ''}`;
    const cross =
      own.length === 0
        ? 'no crossover within the sweep'
        : own.map((c) => `${c.direction === 'starts-to-hurt' ? 'starts to hurt' : 'starts to help'} ${where(c)}`).join(', then ');
    const ownLimit = v.limit !== null ? `its own limit ×${num(v.limit, 6)}` : first.stable ? 'no limit' : 'no limit (unstable)';
    lines.push(`${label(v.name)}: ${today}; ${cross}; ${ownLimit}`);
  }
  if (lines.length > 0) blocks.push(list(lines, `Variants, measured against ${referenceWords(r.reference)}:`), para(`Crossovers: ${r.crossoverMethod}.`));
  if (sim) blocks.push(para('Simulated: each backlog is shown as mean ± half its 95 % interval; a variant is said to help or hurt only where its paired difference from the reference is significant.'));
  return blocks;
}
