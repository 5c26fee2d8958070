import type { CheckRecord } from '../../usecases/check.js';
import { num, pct, perUnit, rate, setText } from '../format.js';
import { instabilityBlocks, referenceWords, setsTable } from './common.js';
import { para, tableBlock, title, type Block } from './doc.js';

/** How many tight sets the text lists (all are in --json). */
const SHOWN_SETS = 10;

/** `check` for people. `labels` are the classes' labels (or undefined), in class order. */
export function checkText(r: CheckRecord, costUnit: string | null): Block[] {
  const blocks: Block[] = [title(`${r.scenario} — stability of ${referenceWords(r.reference)}`)];
  if (!r.stable) return [...blocks, ...instabilityBlocks(r.instability!, r.timeUnit, costUnit)];
  const u = perUnit(r.timeUnit);
  if (r.tightSets.length > 0) {
    const more = r.tightSets.length - SHOWN_SETS;
    const t = setsTable(r.tightSets.slice(0, SHOWN_SETS), r.timeUnit, 'bottleneck');
    blocks.push({ ...t, heading: 'Tightest independent sets (spare capacity = capacity − demand):' } as Block);
    if (more > 0) blocks.push(para(`… and ${more} more (see --json).`));
  }
  const hasLabels = r.classes.some((c) => c.label !== null);
  blocks.push(
    tableBlock(
      {
        columns: [
          { header: 'class' },
          ...(hasLabels ? [{ header: 'label', wrap: true, secondary: true }] : []),
          { header: `rate ${u}`, align: 'right' as const },
          { header: `headroom ${u}`, align: 'right' as const },
          { header: 'headroom % of rate', align: 'right' as const },
        ],
        rows: r.classes.map((c) => {
          const h = r.headroom![c.id] ?? null;
          return [c.id, ...(hasLabels ? [c.label ?? ''] : []), num(c.rate), h === null ? 'unbounded' : num(h), h === null ? '—' : pct(h / c.rate)];
        }),
      },
      'How far each rate may grow, the others fixed, before the design turns unstable (unbounded: the class is matched with its own kind):',
    ),
  );
  const b = r.bottleneck;
  const comps = r.components === 1 ? '' : ` · ${r.components} independent components`;
  blocks.push(
    para(
      b
        ? `Stable · bottleneck ${setText(b.set)}: ${rate(b.spareCapacity, r.timeUnit)} of spare capacity (${pct(b.spareCapacity / b.capacity)} of its capacity ${rate(b.capacity, r.timeUnit)})${comps}`
        : `Stable · every class can be matched with its own kind, so no group of classes limits the design${comps}`,
    ),
  );
  return blocks;
}
