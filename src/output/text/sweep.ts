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
  const blocks: Block[] = [
    title(`${r.scenario} — load sweep of ${referenceWords(r.reference)}: ${grown} grow together (exact FCFM backlog)`),
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
          return p.stable ? [num(p.backlog!), num(p.spareCapacity!)] : ['unstable', '—'];
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
    const today = !first.stable ? 'unstable today' : first.backlog! < base.backlog! ? 'helps today' : first.backlog! > base.backlog! ? 'hurts today' : 'same as today';
    const cross =
      own.length === 0
        ? 'no crossover within the sweep'
        : own.map((c) => `${c.direction === 'starts-to-hurt' ? 'starts to hurt' : 'starts to help'} at ×${num(c.factor)}${c.headroomUsed !== null ? ` (${pct(c.headroomUsed)} of the headroom)` : ''}`).join(', then ');
    const ownLimit = v.limit !== null ? `its own limit ×${num(v.limit, 6)}` : first.stable ? 'no limit' : 'no limit (unstable)';
    lines.push(`${label(v.name)}: ${today}; ${cross}; ${ownLimit}`);
  }
  if (lines.length > 0) blocks.push(list(lines, `Variants, measured against ${referenceWords(r.reference)}:`), para(`Crossovers: ${r.crossoverMethod}.`));
  return blocks;
}
