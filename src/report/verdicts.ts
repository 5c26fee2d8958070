/**
 * The report's verdicts in plain words a manager can act on: what today's design does, what to
 * fund or drop within the budget, which candidates not to pay for, and how the choice holds up
 * under other demand. Every number comes from the exact evaluation; sentences only say it.
 */
import { pairKey } from '../model/scenario.js';
import type { DesignView, Pair, ReportData, SensitivityRow, SweepView } from './report-data.js';
import { fmt, listWords, percent, plural } from './units.js';

/** Names a class for people. */
export type Namer = (id: string) => string;

/** Class labels when short enough (≤ 24 characters), ids otherwise. */
export function namerOf(data: Pick<ReportData, 'classes'>): Namer {
  const byId = new Map(data.classes.map((c) => [c.id, c.label.length <= 24 ? c.label : c.id] as const));
  return (id) => byId.get(id) ?? id;
}

export function pairWords(p: Pair, name: Namer): string {
  return p[0] === p[1] ? `${name(p[0])} with itself` : `${name(p[0])} – ${name(p[1])}`;
}

function money(x: number, unit: string): string {
  return `${fmt(x)} ${unit}`;
}

/** |delta| below this share of the base backlog counts as "no measurable change". */
const NEGLIGIBLE = 1e-6;

/** One cell of the sensitivity table: what to do about this single change. */
export function rowAdvice(row: SensitivityRow, base: number): string {
  const rel = base > 0 ? row.delta / base : NaN;
  if (row.kind === 'add') {
    if (!row.stable) return 'Still unstable with it: not enough on its own.';
    if (!Number.isFinite(base)) return 'Makes the design stable.';
    if (row.flagged) return `Don't fund: waiting goes up (${percent(rel)}).`;
    if (Math.abs(rel) <= NEGLIGIBLE) return 'No measurable effect on waiting.';
    return `Helps: waiting goes down (${percent(rel)}).`;
  }
  if (!row.stable) return 'Keep: without it the queue grows without bound.';
  if (!Number.isFinite(base)) return 'Dropping it keeps the design unstable.';
  if (row.flagged) {
    return Math.abs(rel) <= NEGLIGIBLE ? 'Drop it: saves money, waiting unchanged.' : `Drop it: saves money and waiting goes down (${percent(rel)}).`;
  }
  if (Math.abs(rel) <= NEGLIGIBLE) return 'Dropping it saves money at no change in waiting.';
  return `Keep, unless the saving matters more: waiting goes up (${percent(rel)}).`;
}

function changeWords(d: DesignView, name: Namer, costUnit: string, data: Pick<ReportData, 'sensitivity'>): string {
  const price = (p: Pair, kind: 'add' | 'remove'): string => {
    const row = data.sensitivity.find((r) => r.kind === kind && pairKey(r.pair[0], r.pair[1]) === pairKey(p[0], p[1]));
    return row ? ` (${fmt(row.money)})` : '';
  };
  const parts: string[] = [];
  if (d.added.length > 0) parts.push(`fund ${listWords(d.added.map((p) => pairWords(p, name) + price(p, 'add')))}`);
  if (d.removed.length > 0) parts.push(`drop ${listWords(d.removed.map((p) => pairWords(p, name) + price(p, 'remove')))}`);
  return parts.join(' and ');
}

function worstWait(d: DesignView, data: Pick<ReportData, 'classes'>): { value: number; cls: string } {
  let value = -Infinity;
  let cls = '';
  (d.waits ?? []).forEach((w, k) => {
    if (w > value) {
      value = w;
      cls = data.classes[k]!.label;
    }
  });
  return { value, cls };
}

/** The headline sentences, most important first. */
export function verdicts(data: Omit<ReportData, 'verdicts'>, name: Namer): string[] {
  const out: string[] = [];
  const unit = data.timeUnit;
  const items = data.itemWord;
  const t = data.today;
  if (t.stable) {
    const w = worstWait(t, data);
    let s = `Today's design keeps up with demand: on average ${fmt(t.backlog)} ${items} wait, and the longest mean wait is ${fmt(w.value)} ${plural(unit)} (${w.cls}).`;
    if (data.bottleneck) {
      const b = data.bottleneck;
      const share = b.capacity > 0 ? b.slack / b.capacity : NaN;
      s += ` The tightest group is ${listWords(b.set.map(name))}: it brings ${fmt(b.demand)} per ${unit} and only ${listWords(b.neighbours.map(name))} can serve it, with ${fmt(b.capacity)} per ${unit} (${fmt(share * 100, 2)}\u00a0% to spare).`;
    }
    out.push(s);
  } else {
    out.push(`Today's design cannot keep up: ${t.instability ?? 'some classes are matched more slowly than they arrive'}. Waiting grows without bound until the design changes.`);
  }

  const best = data.designs[0];
  const budget = data.budget === null ? 'Without a budget limit' : `Within the budget of ${money(data.budget, data.costUnit)}`;
  if (best && (best.added.length > 0 || best.removed.length > 0)) {
    const what = changeWords(best, name, data.costUnit, data);
    const cost = best.cost >= 0 ? `costs ${money(best.cost, data.costUnit)}` : `saves ${money(-best.cost, data.costUnit)}`;
    if (t.stable) {
      const rel = (best.backlog - t.backlog) / t.backlog;
      const w0 = worstWait(t, data);
      const w1 = worstWait(best, data);
      out.push(
        `${budget}: ${what}. It ${cost}; waiting goes from ${fmt(t.backlog)} to ${fmt(best.backlog)} ${items} (${percent(rel)}), and the longest mean wait from ${fmt(w0.value)} to ${fmt(w1.value)} ${plural(unit)}.`,
      );
    } else {
      out.push(`${budget}: ${what}. It ${cost} and makes the design stable, with ${fmt(best.backlog)} ${items} waiting on average.`);
    }
  } else if (!best && data.front.length > 0) {
    out.push(`${budget}, no change lowers waiting: keep today's design.`);
  }

  if (data.variants.length > 0 && data.designs.length > 0) out.push(...variantVerdicts(data, name));
  const harmful = data.sensitivity.filter((r) => r.kind === 'add' && r.flagged && r.stable).sort((a, b) => b.delta - a.delta);
  for (const r of harmful) {
    const rel = t.backlog > 0 ? r.delta / t.backlog : NaN;
    const who = r.pair[0] === r.pair[1] ? `${name(r.pair[0])} ${data.itemWord} match each other` : `${name(r.pair[0])} and ${name(r.pair[1])} match each other`;
    const why =
      r.relation === 'joins-neighbours'
        ? ` More flexibility is not always better: it lets ${who}, although both serve the tightest group and its spare capacity is what keeps waiting down.`
        : ' More flexibility is not always better here.';
    out.push(`Do not pay for ${pairWords(r.pair, name)} (${money(r.money, data.costUnit)}): on its own it raises waiting by ${percent(rel).replace('+', '')}.${why}`);
  }
  const savings = data.sensitivity.filter((r) => r.kind === 'remove' && r.flagged && r.stable);
  if (savings.length > 0) {
    const parts = savings.map((r) => {
      const rel = t.backlog > 0 ? r.delta / t.backlog : NaN;
      return `${pairWords(r.pair, name)} (saves ${fmt(r.money)}, waiting ${Math.abs(rel) <= NEGLIGIBLE ? 'unchanged' : percent(rel)})`;
    });
    out.push(`On ${savings.length === 1 ? 'its' : 'their'} own, dropping ${parts.join(' or ')} would save money without adding waiting (savings in ${data.costUnit}).`);
  }
  const breaking = data.sensitivity.filter((r) => r.kind === 'remove' && !r.stable);
  if (breaking.length > 0 && t.stable) {
    out.push(`Keep ${listWords(breaking.map((r) => pairWords(r.pair, name)))}: without ${breaking.length === 1 ? 'it' : 'any one of them'} the design can no longer keep up.`);
  }

  if (data.sweep) {
    const s = sweepVerdict(data.sweep, name);
    if (s) out.push(s);
  }
  return out;
}

/** Worst case of a design over today and every variant: NaN/Infinity-aware. */
export function worstCase(d: DesignView, variants: readonly string[]): { backlog: number; where: string } {
  let backlog = d.stable ? d.backlog : Infinity;
  let where = 'today';
  d.underVariants.forEach((o, k) => {
    const b = o.stable ? o.backlog : Infinity;
    if (b > backlog) {
      backlog = b;
      where = variants[k]!;
    }
  });
  return { backlog, where };
}

function variantVerdicts(data: Omit<ReportData, 'verdicts'>, name: Namer): string[] {
  const out: string[] = [];
  const items = data.itemWord;
  const shown = [data.today, ...data.designs];
  const worst = shown.map((d) => worstCase(d, data.variants));
  const best = data.designs[0]!;
  const wb = worst[1]!;
  const robustIndex = worst.reduce((bi, w, i) => (w.backlog < worst[bi]!.backlog ? i : bi), 0);
  const unstableToday = data.variants.filter((_, k) => !data.today.underVariants[k]!.stable);
  if (unstableToday.length > 0) {
    out.push(`Under ${listWords(unstableToday.map((v) => `“${v}”`))} demand today's design cannot keep up.`);
  }
  if (Number.isFinite(wb.backlog)) {
    out.push(`The recommended design's worst case is ${fmt(wb.backlog)} ${items} waiting (${wb.where === 'today' ? "today's demand" : `“${wb.where}” demand`}).`);
  } else {
    out.push(`The recommended design cannot keep up under “${wb.where}” demand: consider a more robust design.`);
  }
  const robust = shown[robustIndex]!;
  if (robust !== best && Number.isFinite(worst[robustIndex]!.backlog)) {
    const what = robust.role === 'today' ? "today's design" : `the design that ${changeWords(robust, name, data.costUnit, data)}`;
    out.push(`Most robust across all demand futures: ${what}, with at most ${fmt(worst[robustIndex]!.backlog)} ${items} waiting (worst case “${worst[robustIndex]!.where}”).`);
  }
  return out;
}

function sweepVerdict(s: SweepView, name: Namer): string | null {
  const grow = listWords(s.grow.map(name));
  const parts: string[] = [];
  if (s.limit !== null && Number.isFinite(s.limit)) parts.push(`Today's design stays stable until the demand of ${grow} reaches ×${fmt(s.limit)} of today's`);
  for (const c of s.crossovers) parts.push(`${c.label} at ×${fmt(c.load)}`);
  if (parts.length === 0) return null;
  return `${parts.join('; ')}.`;
}
