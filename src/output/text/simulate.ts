import type { EstimateRecord, SimulateRecord, WaitRecord } from '../../usecases/simulate.js';
import { count, estimate, num, pairText, pct, perUnit, wait, waitScale, type WaitScale } from '../format.js';
import { abandonmentLimitsBlock, referenceWords } from './common.js';
import { para, tableBlock, title, type Block } from './doc.js';

const POLICY_WORDS: Record<string, string> = {
  fcfm: 'FCFM',
  'most-waiting': 'the most-waiting policy',
  ranked: 'the ranked policy',
  'random-class': 'the random-class policy',
};

function pm(e: EstimateRecord, scale = 1): string {
  if (e.mean === null) return '—';
  if (!e.ci95) return num(e.mean * scale);
  return estimate(e.mean * scale, e.ci95[0] * scale, e.ci95[1] * scale);
}

function pmPct(e: EstimateRecord): string {
  if (e.mean === null) return '—';
  if (!e.ci95) return pct(e.mean);
  return `${pct(e.mean)} ± ${pct((e.ci95[1] - e.ci95[0]) / 2)}`;
}

const exactOr = (e: EstimateRecord, f: (x: number) => string): string => (e.exact === undefined ? '—' : f(e.exact));

/** `simulate` for people. */
export function simulateText(r: SimulateRecord, o: { readonly waitUnit?: string }): Block[] {
  const ids = r.classes.map((c) => c.id);
  const scale: WaitScale = waitScale(r.timeUnit, ids.map((id) => r.wait.byClass[id]!.mean ?? NaN), o.waitUnit);
  const w = (x: number | null): string => (x === null ? '—' : wait(x, scale));
  const hasExact = r.exact.available;
  const impatient = Object.values(r.abandonment.byClass).some((a) => a.patience !== null);
  const u = perUnit(r.timeUnit);
  const blocks: Block[] = [
    title(`${r.scenario}: ${referenceWords(r.reference)} simulated under ${POLICY_WORDS[r.policy] ?? r.policy}${r.ranking ? ` (ranking ${r.ranking.join(', ')})` : ''}`),
    para(
      `${count(r.replications)} replication${r.replications === 1 ? '' : 's'}${r.partial ? ` of ${count(r.plannedReplications)} (interrupted)` : ''} × ${count(r.arrivals)} arrivals (after ${count(r.warmup)} warm-up), seed ${r.seed}`,
    ),
  ];
  const row = (label: string, b: EstimateRecord, wt: WaitRecord, m: EstimateRecord, ab?: { rate: EstimateRecord; share: EstimateRecord; patience?: number | null }): string[] => [
    label,
    pm(b),
    ...(hasExact ? [exactOr(b, num)] : []),
    wt.mean === null ? '—' : wt.ci95 ? `${wait(wt.mean, scale)} ± ${num(((wt.ci95[1] - wt.ci95[0]) / 2) * scale.factor, 2)}` : w(wt.mean),
    ...(hasExact ? [exactOr(wt, (x) => wait(x, scale))] : []),
    w(wt.p50),
    w(wt.p90),
    w(wt.p99),
    pmPct(m),
    ...(hasExact ? [exactOr(m, (x) => pct(x))] : []),
    // a class without patience never gives up: say so rather than print 0 ± 0
    ...(impatient && ab ? (ab.patience === null ? ['patient', 'patient'] : [pm(ab.rate), pmPct(ab.share)]) : []),
  ];
  blocks.push(
    tableBlock({
      columns: [
        { header: 'class' },
        { header: 'backlog', align: 'right' },
        ...(hasExact ? [{ header: 'exact', align: 'right' as const }] : []),
        { header: 'mean wait', align: 'right' },
        ...(hasExact ? [{ header: 'exact', align: 'right' as const }] : []),
        { header: 'p50', align: 'right', secondary: true },
        { header: 'p90', align: 'right', secondary: true },
        { header: 'p99', align: 'right', secondary: true },
        { header: 'matched at once', align: 'right' },
        ...(hasExact ? [{ header: 'exact', align: 'right' as const, secondary: true }] : []),
        ...(impatient ? [{ header: `abandon ${u}`, align: 'right' as const, secondary: true }, { header: 'abandon share', align: 'right' as const }] : []),
      ],
      rows: [
        ...ids.map((id) => row(id, r.backlog.byClass[id]!, r.wait.byClass[id]!, r.matchedAtOnce.byClass[id]!, r.abandonment.byClass[id]!)),
        row('all classes', r.backlog.total, r.wait.total, r.matchedAtOnce.total, r.abandonment.total),
      ],
      ruleBefore: [ids.length],
    }),
  );
  blocks.push(
    tableBlock({
      columns: [{ header: 'compatibility', wrap: true }, { header: `matches ${u}`, align: 'right' }, ...(hasExact ? [{ header: 'exact', align: 'right' as const }] : [])],
      rows: r.matchRates.map((m) => [pairText(m.pair), pm(m.rate), ...(hasExact ? [exactOr(m.rate, num)] : [])]),
    }),
  );
  const df = r.replications - 1;
  const notes = [
    r.replications > 1 ? `± : half-width of the 95 % interval across replications (Student t, ${df} degree${df === 1 ? '' : 's'} of freedom).` : 'One replication: no interval (use --replications 2 or more).',
    'Wait percentiles pool all replications; items matched at once wait 0, abandoned items are left out.',
  ];
  if (!hasExact && r.exact.reason) notes.push(`No exact column: ${r.exact.reason}.`);
  const limits = abandonmentLimitsBlock(r.abandonmentLimits);
  if (limits) blocks.push(limits);
  blocks.push(para(notes.join(' ')));
  return blocks;
}
