import type { EvaluateRecord } from '../../usecases/evaluate.js';
import { count, estimate, num, pairText, pct, perUnit, rate, setText, wait, waitScale, type WaitScale } from '../format.js';
import { abandonmentLimitsBlock, instabilityBlocks, referenceWords } from './common.js';
import { para, tableBlock, title, type Block } from './doc.js';

export interface EvaluateTextOptions {
  readonly costUnit: string | null;
  /** --wait-unit. */
  readonly waitUnit?: string;
}

/** Where each class's matches go: "mage 56 %, archer 44 %" (partners by share of the class's matches). */
function partners(r: EvaluateRecord, id: string): string {
  const rows: Array<{ other: string; rate: number }> = [];
  let sum = 0;
  for (const m of r.matchRates) {
    if (m.pair[0] !== id && m.pair[1] !== id) continue;
    const self = m.pair[0] === m.pair[1];
    const per = self ? 2 * m.rate : m.rate; // a match within the class involves two of its items
    rows.push({ other: self ? 'itself' : m.pair[0] === id ? m.pair[1] : m.pair[0], rate: per });
    sum += per;
  }
  rows.sort((a, b) => b.rate - a.rate || (a.other < b.other ? -1 : 1));
  return rows.map((x) => `${x.other} ${pct(sum > 0 ? x.rate / sum : 0, 0)}`).join(', ');
}

/** `evaluate` for people. */
export function evaluateText(r: EvaluateRecord, o: EvaluateTextOptions): Block[] {
  const sim = r.method === 'simulation';
  const blocks: Block[] = [title(`${r.scenario} — ${sim ? 'simulated' : 'exact'} FCFM steady state of ${referenceWords(r.reference)}`)];
  if (!r.stable) return [...blocks, ...instabilityBlocks(r.instability!, r.timeUnit, o.costUnit)];
  const ids = r.classes.map((c) => c.id);
  const waits = ids.map((id) => r.wait!.byClass[id] ?? NaN);
  const scale: WaitScale = waitScale(r.timeUnit, waits, o.waitUnit);
  const hasLabels = r.classes.some((c) => c.label !== null);
  const u = perUnit(r.timeUnit);
  const total = r.classes.reduce((a, c) => a + c.rate, 0);
  // simulated figures: "mean ± half-width of the 95 % interval"
  const backlogText = (id: string | null): string => {
    const v = id === null ? r.backlog!.total : (r.backlog!.byClass[id] ?? NaN);
    const c = id === null ? r.backlogCi95 : r.backlogByClassCi95?.[id];
    return sim && c ? estimate(v, c[0], c[1]) : num(v);
  };
  const waitText = (id: string | null): string => {
    const v = id === null ? r.wait!.mean : (r.wait!.byClass[id] ?? NaN);
    const c = id === null ? r.waitCi95 : r.waitByClassCi95?.[id];
    if (!sim || !c) return wait(v, scale);
    return `${wait(v, scale)} ± ${num(((c[1] - c[0]) / 2) * scale.factor, 2)}`;
  };
  const ab = r.abandonShare;
  blocks.push(
    tableBlock({
      columns: [
        { header: 'class' },
        ...(hasLabels ? [{ header: 'label', wrap: true, secondary: true }] : []),
        { header: `rate ${u}`, align: 'right' as const },
        { header: 'mean backlog', align: 'right' as const },
        { header: 'mean wait', align: 'right' as const },
        { header: 'matched at once', align: 'right' as const },
        ...(ab ? [{ header: 'abandon', align: 'right' as const }] : []),
        { header: 'matched with (share of its matches)', wrap: true, secondary: true },
      ],
      rows: [
        ...r.classes.map((c) => [
          c.id,
          ...(hasLabels ? [c.label ?? ''] : []),
          num(c.rate),
          backlogText(c.id),
          waitText(c.id),
          pct(r.matchedAtOnce!.byClass[c.id] ?? NaN),
          ...(ab ? [pct(ab.byClass[c.id] ?? NaN)] : []),
          partners(r, c.id),
        ]),
        ['all classes', ...(hasLabels ? [''] : []), num(total), backlogText(null), waitText(null), pct(r.matchedAtOnce!.total), ...(ab ? [pct(ab.total)] : []), ''],
      ],
      ruleBefore: [r.classes.length],
    }),
  );
  const b = r.bottleneck;
  if (sim) {
    const c = r.backlogCi95;
    const m = r.simulation!;
    blocks.push(
      para(
        `Stable · ${num(r.backlog!.total)} items wait on average, simulated (95 % interval ${c ? `${num(c[0])}–${num(c[1])}` : 'not available'})` +
          (b ? ` · bottleneck ${setText(b.set)} with ${rate(b.spareCapacity, r.timeUnit)} of spare capacity` : '') +
          ` · ${m.replications} replications of ${count(m.arrivals)} arrivals, seed ${m.seed}${m.abandonment ? ', with abandonment' : ''} · ± : half-width of the 95 % interval`,
      ),
    );
    const limits = abandonmentLimitsBlock(r.abandonmentLimits);
    if (limits) blocks.push(limits);
    blocks.push(...valueBlocks(r));
    return blocks;
  }
  blocks.push(
    para(
      `Stable · ${num(r.backlog!.total)} items wait on average · the system is empty ${pct(r.emptyProbability!)} of the time` +
        (b ? ` · bottleneck ${setText(b.set)} with ${rate(b.spareCapacity, r.timeUnit)} of spare capacity` : '') +
        ` · ${count(r.independentSets!)} independent sets`,
    ),
  );
  blocks.push(...valueBlocks(r));
  return blocks;
}

/** Value rate, waiting cost and net value, and the pairs that carry a value (when the file gives values). */
function valueBlocks(r: EvaluateRecord): Block[] {
  const v = r.value;
  if (!v) return [];
  const u = perUnit(r.timeUnit);
  const waiting = v.waitingCost === null ? 'no waitingCost in the file (counted 0)' : `waiting cost ${num(v.waitingCostRate)}${u} (${num(v.waitingCost)} per waiting item × ${num(r.backlog!.total)} waiting)`;
  const zero =
    v.pairsWithValue > 0 && v.pairsWithoutValue > 0
      ? ` ${count(v.pairsWithoutValue)} of the design's ${count(v.pairsWithValue + v.pairsWithoutValue)} pairs ${v.pairsWithoutValue === 1 ? 'has' : 'have'} no value in the file and count${v.pairsWithoutValue === 1 ? 's' : ''} 0.`
      : v.pairsWithValue === 0
        ? ' No pair of this design has a value in the file: every match counts 0.'
        : '';
  const patience =
    r.method === 'simulation'
      ? ' From the simulated match rates (items that give up earn nothing): means of the replications, without an interval.'
      : v.patienceIgnored
        ? ' Exact FCFM figures: patience is ignored (see the warning).'
        : '';
  const blocks: Block[] = [
    para(`Value of matches ${num(v.rate)}${u} (Σ value per match × match rate) − ${waiting} = net value ${num(v.net)}${u}.${zero}${patience}`),
  ];
  const rows = r.matchRates.filter((m) => m.value !== null).sort((a, b) => b.valueRate! - a.valueRate! || (pairText(a.pair) < pairText(b.pair) ? -1 : 1));
  if (rows.length > 0) {
    blocks.push(
      tableBlock(
        {
          columns: [
            { header: 'pair', wrap: true },
            { header: 'value per match', align: 'right' },
            { header: `matches ${u}`, align: 'right' },
            { header: `value ${u}`, align: 'right' },
            { header: 'share of value', align: 'right', secondary: true },
          ],
          rows: rows.map((m) => [pairText(m.pair), num(m.value!), num(m.rate), num(m.valueRate!), v.rate !== 0 ? pct(m.valueRate! / v.rate) : '—']),
        },
        'Pairs with a value, by value per time unit:',
      ),
    );
  }
  return blocks;
}
