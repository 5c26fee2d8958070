/**
 * The CSV forms of the records that have one: one row per single change, per design, per sweep step
 * or per comparison column. Pairs and lists are in the ASCII notation (ascii-pairs.ts); numbers are
 * rounded like JSON (machine.ts).
 */
import type { SensitivityRecord } from '../usecases/sensitivity.js';
import type { SweepRecord } from '../usecases/sweep.js';
import type { RecommendRecord } from '../usecases/recommend.js';
import type { CompareRecord } from '../usecases/compare.js';
import { asciiIds, asciiPair, asciiPairs } from './ascii-pairs.js';
import { renderCsv, type CsvCell } from './machine.js';

export function sensitivityCsv(r: SensitivityRecord): string {
  const head = ['change', 'pair', 'allowed', 'rule', 'price', 'stable', 'backlog', 'delta', 'deltaPerPrice', 'verdict', 'predicted', 'relation', 'method', 'deltaLow', 'deltaHigh', 'significant'];
  const rows: CsvCell[][] = [...r.additions, ...r.removals].map((c) => [
    c.change,
    asciiPair(c.pair),
    c.allowed,
    c.rule ?? null,
    c.price,
    c.stable,
    c.backlog,
    c.delta,
    c.deltaPerPrice,
    c.verdict,
    c.predicted,
    c.relation,
    c.method,
    c.deltaCi95?.[0] ?? null,
    c.deltaCi95?.[1] ?? null,
    c.significant ?? null,
  ]);
  return renderCsv(head, rows, r.precision);
}

/** "a~b,c~d" for a list of pairs in one cell. */
export const pairsCell = asciiPairs;

/** step,factor,headroomUsed,design,stable,backlog,spareCapacity,bottleneck — one row per step and design. */
export function sweepCsv(r: SweepRecord): string {
  const head = ['step', 'factor', 'headroomUsed', 'design', 'stable', 'backlog', 'spareCapacity', 'bottleneck', 'method', 'backlogLow', 'backlogHigh'];
  const rows: CsvCell[][] = [];
  for (const c of r.curves) {
    c.points.forEach((p, t) =>
      rows.push([t, p.factor, r.steps[t]!.headroomUsed, c.name, p.stable, p.backlog, p.spareCapacity, asciiIds(p.bottleneck), p.method, p.backlogCi95?.[0] ?? null, p.backlogCi95?.[1] ?? null]),
    );
  }
  return renderCsv(head, rows, r.precision);
}

/**
 * One row per Pareto design (kind "pareto", the recommended one marked) and per rule of thumb (kind
 * "baseline"); with values in the file, the columns valueRate, waitingCostRate and netValue follow
 * objective (for the objective net-value, objective is the net value: higher is better).
 */
export function recommendCsv(r: RecommendRecord): string {
  type Row = RecommendRecord['pareto'][number] | RecommendRecord['baselines'][number];
  const values = [...r.pareto, ...r.baselines, r.today].some((d) => d.netValue !== null);
  const v = (d: Row): CsvCell[] => (values ? [d.valueRate, d.waitingCostRate, d.netValue] : []);
  // with abandonment limits judged: the share over all, the limited classes over their limit, and those within noise
  const limits = [...r.pareto, ...r.baselines].some((d) => d.abandonmentLimits !== undefined);
  const ids = (d: Row, pick: (l: NonNullable<Row['abandonmentLimits']>[number]) => boolean): string => asciiIds((d.abandonmentLimits ?? []).filter(pick).map((l) => l.class));
  const l = (d: Row): CsvCell[] => (limits ? [d.abandonShare ?? null, d.abandonmentLimits ? ids(d, (x) => !x.within) : null, d.abandonmentLimits ? ids(d, (x) => x.withinNoise) : null] : []);
  const head = [
    'kind', 'name', 'recommended', 'cost', 'method', 'backlog', 'objective', ...(values ? ['valueRate', 'waitingCostRate', 'netValue'] : []), 'maxWait', 'spareCapacity',
    ...(limits ? ['abandonShare', 'overAbandonmentLimit', 'abandonmentWithinNoise'] : []), 'frontAtCost', 'gap', 'feasible', 'added', 'removed',
  ];
  const rows: CsvCell[][] = [];
  r.pareto.forEach((p, i) =>
    rows.push(['pareto', `design ${i + 1}`, p.recommended, p.cost, p.method, p.backlog, p.objective, ...v(p), p.maxWait, p.spareCapacity, ...l(p), null, null, true, asciiPairs(p.added), asciiPairs(p.removed)]),
  );
  for (const b of r.baselines) {
    rows.push(['baseline', b.name, false, b.cost, b.method, b.backlog, b.objective, ...v(b), b.maxWait, b.spareCapacity, ...l(b), b.frontAtCost, b.gap, b.feasible, asciiPairs(b.added), asciiPairs(b.removed)]);
  }
  return renderCsv(head, rows, r.precision);
}

export const COMPARE_CSV_HEADER = [
  'source', 'scenario', 'budget', 'stable', 'bottleneck', 'bottleneckSpareCapacity', 'backlog', 'worstWaitClass', 'worstWait',
  'recommendedCost', 'recommendedAdded', 'recommendedRemoved', 'recommendedBacklog', 'recommendedMaxWait', 'recommendedWorstBacklog', 'recommendedWorstUnder',
  'robustCost', 'robustAdded', 'robustRemoved', 'robustWorstBacklog', 'robustWorstUnder', 'note', 'method', 'recommendedMethod',
] as const;

/** A header line, then one line per column of the comparison. */
export function compareCsv(r: CompareRecord): string {
  const rows: CsvCell[][] = r.columns.map((c) => {
    const b = c.recommended;
    const s = c.robust;
    return [
      c.source, c.scenario, c.budget, c.stable,
      c.bottleneck ? asciiIds(c.bottleneck.set) : null, c.bottleneck?.spareCapacity ?? null,
      c.backlog, c.worstWait?.class ?? null, c.worstWait?.wait ?? null,
      b?.cost ?? null, b ? asciiPairs(b.added) : null, b ? asciiPairs(b.removed) : null, b?.backlog ?? null, b?.maxWait ?? null,
      b ? (b.worstBacklog ?? 'unstable') : null, b?.worstUnder ?? null,
      s?.cost ?? null, s ? asciiPairs(s.added) : null, s ? asciiPairs(s.removed) : null, s ? (s.worstBacklog ?? 'unstable') : null, s?.worstUnder ?? null,
      c.note ?? c.instability?.message ?? null,
      c.method, b?.method ?? null,
    ];
  });
  return renderCsv(COMPARE_CSV_HEADER, rows);
}
