import { UsageError } from '../../errors.js';
import { fitLog, type FitResult } from '../../intake/fit-log.js';
import { fitRecord } from '../../intake/fit-record.js';
import { fitScenario } from '../../intake/fit-scenario.js';
import { num } from '../../output/format.js';
import { list, para, renderDoc, tableBlock, title, type Block } from '../../output/text/doc.js';
import { wrap } from '../../output/text/wrap.js';
import type { CommandIO } from '../io.js';
import { readInputFile } from '../load.js';
import { prepareOutput, writeFileAtomic } from '../write.js';

export interface FitCommandOptions {
  readonly file: string;
  readonly time: string;
  readonly class: string;
  readonly outcome?: string;
  readonly wait?: string;
  readonly timeUnit?: string;
  readonly bands?: number;
  readonly bandHours?: string;
  readonly from?: string;
  readonly to?: string;
  readonly compatibilities?: string;
  readonly json?: boolean;
  readonly output?: string;
}

const interval = (p: readonly [number | null, number | null]): string => `${p[0] === null ? '∞' : num(p[0])} to ${p[1] === null ? '∞' : num(p[1])}`;

/** The human-readable output, as text blocks (src/output/text/doc.ts) that fit the width. */
export function fitText(r: FitResult): Block[] {
  const rec = fitRecord(r);
  const u = r.timeUnit;
  const blocks: Block[] = [title(`${r.source} — arrival rates per class (per ${u})`)];
  const how = r.timeFormat === 'iso' ? `ISO timestamps (UTC where no offset is written), converted to ${u}s` : `numbers, read as ${u}s (--time-unit)`;
  const est = r.window.estimated ? ', estimated: first to last arrival plus one mean gap at each end' : '';
  const at = (v: number | string): string => (typeof v === 'string' ? v.replace(/\.\d+Z$/, 'Z') : num(v));
  blocks.push(para(`times: ${how} · window ${at(rec.window.from)} to ${at(rec.window.to)} (${num(r.window.length)} ${u}s${est}) · ${r.arrivals} arrivals`));
  const withPatience = rec.classes.some((c) => c.patience);
  const right = { align: 'right' as const };
  blocks.push(
    tableBlock({
      columns: [
        { header: 'class' },
        { header: 'arrivals', ...right },
        { header: `rate /${u}`, ...right },
        { header: '95 % interval (exact)', ...right },
        { header: 'dispersion p', ...right, secondary: true },
        ...(withPatience ? [{ header: `mean patience (${u})`, ...right }, { header: '95 % interval', ...right, secondary: true }, { header: 'abandoned', ...right }] : []),
      ],
      rows: rec.classes.map((c) => {
        const p = c.patience;
        return [
          c.id,
          String(c.count),
          num(c.rate),
          interval(c.ci95),
          c.dispersion ? num(c.dispersion.pValue, 2) : '—',
          ...(withPatience ? (p ? [p.mean === null ? '∞ (none left)' : num(p.mean), interval(p.ci95), `${p.abandoned} of ${p.abandoned + p.censored}`] : ['—', '—', '—']) : []),
        ];
      }),
    }),
  );
  if (rec.classes.some((c) => c.bands)) {
    blocks.push(
      tableBlock(
        {
          columns: [{ header: 'class' }, { header: 'band' }, { header: 'arrivals', ...right }, { header: `exposure (${u})`, ...right }, { header: `rate /${u}`, ...right }, { header: '95 % interval (exact)', ...right }],
          rows: rec.classes.flatMap((c) => (c.bands ?? []).map((x) => [c.id, x.band, String(x.count), num(x.exposure), num(x.rate), interval(x.ci95)])),
        },
        'Per time band',
      ),
    );
  }
  if (r.warnings.length > 0) blocks.push(list(r.warnings.map((w) => `warning: ${w}`)));
  return blocks;
}

/** The human-readable output at a width (120 columns by default). */
export function renderFit(r: FitResult, width = 120): string {
  return renderDoc(fitText(r), { width });
}

/** `edgewise fit LOG.csv --time COL --class COL …`: rates with exact intervals, patience, dispersion. */
export async function fitCommand(opts: FitCommandOptions, io: CommandIO): Promise<number> {
  if (opts.compatibilities !== undefined && opts.output === undefined) throw new UsageError('--compatibilities builds a scenario file: give it a name with -o, e.g. -o scenario.json');
  const inputs = [opts.file, ...(opts.compatibilities ? [opts.compatibilities] : [])];
  const target = opts.output === undefined ? undefined : prepareOutput(opts.output, io.cwd, inputs);
  const result = fitLog(readInputFile(opts.file, io.cwd), opts.file, {
    time: opts.time,
    class: opts.class,
    ...(opts.outcome === undefined ? {} : { outcome: opts.outcome }),
    ...(opts.wait === undefined ? {} : { wait: opts.wait }),
    ...(opts.timeUnit === undefined ? {} : { timeUnit: opts.timeUnit }),
    ...(opts.bands === undefined ? {} : { bands: opts.bands }),
    ...(opts.bandHours === undefined ? {} : { bandHours: opts.bandHours }),
    ...(opts.from === undefined ? {} : { from: opts.from }),
    ...(opts.to === undefined ? {} : { to: opts.to }),
  });
  let wrote = '';
  if (target !== undefined) {
    const warnings: string[] = [];
    const compatibilities = opts.compatibilities === undefined ? undefined : { text: readInputFile(opts.compatibilities, io.cwd), file: opts.compatibilities };
    const { document } = fitScenario(result, compatibilities ? { compatibilities } : {}, warnings);
    writeFileAtomic(target, `${JSON.stringify(document, null, 2)}\n`);
    const kind = compatibilities ? `a scenario with the compatibilities of ${opts.compatibilities}` : 'a scenario fragment (classes only: add compatibilities with --compatibilities FILE)';
    wrote = [`wrote ${opts.output}: ${kind}`, ...warnings.map((w) => `warning: ${w}`)].map((line) => `${wrap(line, io.columns, '  ').join('\n')}\n`).join('');
  }
  if (opts.json) {
    io.out(`${JSON.stringify(fitRecord(result), null, 2)}\n`);
    if (wrote !== '') io.err(wrote);
  } else io.out(renderFit(result, io.columns) + (wrote === '' ? '' : `\n${wrote}`));
  return 0;
}
