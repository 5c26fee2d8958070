/** Text of the intake commands: `fit`'s rates and patience, and the lines `import` and `starter` print. */
import type { fitRecord } from '../../intake/fit-record.js';
import { count, counted, num } from '../format.js';
import { para, tableBlock, title, type Block } from './doc.js';

type FitRecord = ReturnType<typeof fitRecord>;

const interval = (p: readonly [number | null, number | null]): string => `${p[0] === null ? '∞' : num(p[0])} to ${p[1] === null ? '∞' : num(p[1])}`;

/** `fit` for people. */
export function fitText(rec: FitRecord, wrote: string | null): Block[] {
  const u = rec.timeUnit;
  const how = rec.time.format === 'iso' ? `ISO timestamps (UTC where no offset is written), converted to ${u}s` : `numbers, read as ${u}s (--time-unit)`;
  const est = rec.window.estimated ? ', estimated: first to last arrival plus one mean gap at each end' : '';
  const at = (v: number | string): string => (typeof v === 'string' ? v.replace(/\.\d+Z$/, 'Z') : num(v));
  const withPatience = rec.classes.some((c) => c.patience);
  const blocks: Block[] = [
    title(`${rec.source} — arrival rates per class (per ${u})`),
    para(`Times: ${how} · window ${at(rec.window.from)} to ${at(rec.window.to)} (${num(rec.window.length)} ${u}s${est}) · ${count(rec.arrivals)} arrivals`),
    tableBlock({
      columns: [
        { header: 'class' },
        { header: 'arrivals', align: 'right' },
        { header: `rate /${u}`, align: 'right' },
        { header: '95 % interval (exact)', align: 'right' },
        { header: 'dispersion p', align: 'right', secondary: true },
        ...(withPatience
          ? [
              { header: `mean patience (${u})`, align: 'right' as const },
              { header: '95 % interval', align: 'right' as const, secondary: true },
              { header: 'abandoned', align: 'right' as const, secondary: true },
            ]
          : []),
      ],
      rows: rec.classes.map((c) => {
        const p = c.patience;
        return [
          c.id,
          count(c.count),
          num(c.rate),
          interval(c.ci95),
          c.dispersion ? num(c.dispersion.pValue, 2) : '—',
          ...(withPatience ? (p ? [p.mean === null ? '∞ (none left)' : num(p.mean), interval(p.ci95), `${p.abandoned} of ${p.abandoned + p.censored}`] : ['—', '—', '—']) : []),
        ];
      }),
    }),
  ];
  if (rec.classes.some((c) => c.bands)) {
    blocks.push(
      tableBlock(
        {
          columns: [{ header: 'class' }, { header: 'band' }, { header: 'arrivals', align: 'right' }, { header: `exposure (${u})`, align: 'right' }, { header: `rate /${u}`, align: 'right' }, { header: '95 % interval (exact)', align: 'right' }],
          rows: rec.classes.flatMap((c) => (c.bands ?? []).map((x) => [c.id, x.band, count(x.count), num(x.exposure), num(x.rate), interval(x.ci95)])),
        },
        'Per time band:',
      ),
    );
  }
  if (wrote) blocks.push(para(wrote));
  return blocks;
}

/** The line `import` prints after writing. */
export function importText(output: string, s: { classes: readonly unknown[]; compatibilities: ReadonlyArray<{ removable: boolean }>; candidates: readonly unknown[]; budget?: number | undefined }): Block[] {
  const removable = s.compatibilities.filter((c) => c.removable).length;
  const budget = s.budget === undefined ? '' : `, budget ${num(s.budget)}`;
  return [
    para(
      `wrote ${output}: ${counted(s.classes.length, 'class', 'classes')}, ${counted(s.compatibilities.length, 'compatibility', 'compatibilities')} ` +
        `(${removable} removable), ${counted(s.candidates.length, 'candidate')}${budget} · next: edgewise check ${output}`,
    ),
  ];
}

/** What `starter` prints after writing. */
export function starterText(paths: readonly string[], readme: string, scenario: string): Block[] {
  return [para(`wrote ${paths.join(', ')}`), para(`next: read ${readme}, then edgewise check ${scenario}`)];
}
