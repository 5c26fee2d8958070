/** Blocks several text renderers share: which design a record is about, instability and repairs. */
import type { InstabilityRecord, PairIds, Reference, SetRecord } from '../../usecases/records.js';
import { listWords, num, pairText, perUnit, pct, rate, setText } from '../format.js';
import type { AbandonmentLimit } from '../../usecases/designs.js';
import { para, tableBlock, type Block } from './doc.js';

/** "today's design" / "the design in D.json (+ a ↔ b, − c ↔ d)", with the demand when not today's. */
export function referenceWords(r: Reference): string {
  const changes = [...r.added.map((p) => `+ ${pairText(p)}`), ...r.removed.map((p) => `− ${pairText(p)}`)];
  const design = changes.length > 0 && r.kind !== 'today' ? `${r.name} (${changes.join(', ')})` : r.name;
  return r.demand === 'today' ? design : `${design} under the "${r.demand}" demand`;
}

/** "+ a ↔ b, − c ↔ d", or "no change" for today's design. */
export function changesText(added: readonly PairIds[], removed: readonly PairIds[]): string {
  const parts = [...added.map((p) => `+ ${pairText(p)}`), ...removed.map((p) => `− ${pairText(p)}`)];
  return parts.length === 0 ? 'no change' : parts.join(', ');
}

/** A table of independent sets with demand, capacity and spare capacity. */
export function setsTable(sets: readonly SetRecord[], timeUnit: string, firstLabel?: string): Block {
  const u = perUnit(timeUnit);
  return tableBlock({
    columns: [
      ...(firstLabel ? [{ header: '' }] : []),
      { header: 'independent set', wrap: true },
      { header: `demand ${u}`, align: 'right' },
      { header: 'can only be matched with', wrap: true, secondary: true },
      { header: `capacity ${u}`, align: 'right' },
      { header: `spare capacity ${u}`, align: 'right' },
    ],
    rows: sets.map((t, i) => [
      ...(firstLabel ? [i === 0 ? firstLabel : ''] : []),
      setText(t.set),
      num(t.demand),
      setText(t.neighbours),
      num(t.capacity),
      num(t.spareCapacity),
    ]),
    key: firstLabel ? 1 : 0,
  });
}

/** The certificate in words, then the repairs (or why there is none). */
export function instabilityBlocks(ins: InstabilityRecord, timeUnit: string, costUnit: string | null): Block[] {
  const blocks: Block[] = [para(`Unstable: ${ins.message.replace(/^unstable: /, '')}. Waiting grows without bound.`)];
  if (ins.repairs.length > 0) {
    blocks.push(
      tableBlock(
        {
          columns: [{ header: 'repair' }, { header: 'add', wrap: true }, { header: `cost${costUnit ? ` (${costUnit})` : ''}`, align: 'right' }],
          rows: ins.repairs.map((r, i) => [String(i + 1), r.added.map((p) => pairText(p)).join(', '), num(r.cost)]),
          key: 0,
        },
        'Ways out, cheapest first (each a set of allowed candidates that makes the design stable when added together):',
      ),
    );
  } else if (ins.noRepair) {
    const o = ins.noRepair.overloaded;
    const blocked = ins.noRepair.blocked.map((b) => `${pairText(b.pair)} (${b.rule})`);
    blocks.push(
      para(
        `No allowed set of candidates makes the design stable: even with every allowed candidate, ${setText(o.set)} brings ${rate(o.demand, timeUnit)} ` +
          `and only ${setText(o.neighbours)} can serve it (${rate(o.capacity, timeUnit)}). ${ins.noRepair.relief}` +
          (blocked.length > 0 ? ` Rules block ${listWords(blocked)}.` : ''),
      ),
    );
  } else {
    blocks.push(para('No allowed candidate makes the design stable.'));
  }
  return blocks;
}

/** "Abandonment limits: a 3.1 % (2.5–3.8 %) within 5 %; b 12.0 % over 10 %." (null without limits). */
export function abandonmentLimitsBlock(limits: readonly AbandonmentLimit[] | undefined): Block | null {
  if (!limits || limits.length === 0) return null;
  const one = (l: AbandonmentLimit): string =>
    `${l.class} ${pct(l.share)}${l.shareCi95 ? ` (${pct(l.shareCi95[0])}–${pct(l.shareCi95[1])})` : ''} ${l.within ? (l.withinNoise ? 'within (noise: the interval contains the limit)' : 'within') : l.withinNoise ? 'over (noise: the interval contains the limit)' : 'OVER'} ${pct(l.limit)}`;
  const over = limits.filter((l) => !l.within).length;
  return para(`Abandonment limits (maxAbandonment; simulated share of each class's arrivals that give up, 95 % interval): ${limits.map(one).join('; ')}.${over > 0 ? ` ${over} of ${limits.length} over the limit.` : ''}`);
}
