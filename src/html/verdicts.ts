/**
 * The report's verdicts in plain words a manager can act on. One decision, one story: every
 * sentence about a pair comes from the verdicts measured against the recommended design, so the
 * page never says to fund a pair and not to pay for it, or to keep a pair and drop it.
 */
import type { ReportRecord } from '../usecases/report.js';
import type { VerdictRecord } from '../usecases/designs.js';
import { listWords, money, num, pairText, pct, plural, signedPct } from '../output/format.js';

/** Names a class for people. */
export type Namer = (id: string) => string;

/**
 * One way of naming classes across the whole page: the labels when every class has one of at most
 * 24 characters and no two share it, the ids otherwise.
 */
export function namerOf(r: Pick<ReportRecord, 'classes'>): Namer {
  const labels = r.classes.map((c) => c.label);
  const usable = labels.every((l) => l !== null && l.length <= 24) && new Set(labels).size === labels.length;
  const byId = new Map(r.classes.map((c) => [c.id, usable ? c.label! : c.id] as const));
  return (id) => byId.get(id) ?? id;
}

/** A pair in the one text notation of format.ts: "Old Town ↔ Market", "late shift ↔ late shift". */
export function pairWords(p: readonly [string, string], name: Namer): string {
  return pairText(p, name);
}

function changeWords(added: ReadonlyArray<readonly [string, string]>, removed: ReadonlyArray<readonly [string, string]>, name: Namer): string {
  const parts: string[] = [];
  if (added.length > 0) parts.push(`fund ${listWords(added.map((p) => pairWords(p, name)))}`);
  if (removed.length > 0) parts.push(`drop ${listWords(removed.map((p) => pairWords(p, name)))}`);
  return parts.join(' and ');
}

/** The headline sentences, most important first. */
export function verdicts(r: ReportRecord, name: Namer): string[] {
  const out: string[] = [];
  const unit = r.timeUnit;
  const items = r.itemWord;
  const d = r.decision;
  const t = d?.today;
  if (r.todayStable && t && t.backlog !== null) {
    let s = `Today's design keeps up with demand: on average ${num(t.backlog)} ${items} wait${t.maxWait !== null && t.maxWaitClass !== null ? `, and the longest mean wait is ${num(t.maxWait)} ${plural(unit)} (${name(t.maxWaitClass)})` : ''}.`;
    const b = r.bottleneck;
    if (b) {
      s += ` The tightest group is ${listWords(b.set.map(name))}: it brings ${num(b.demand)} per ${unit} and only ${listWords(b.neighbours.map(name))} can serve it, with ${num(b.capacity)} per ${unit} (${pct(b.spareCapacity / b.capacity, 2)} to spare).`;
    }
    out.push(s);
  } else if (!r.todayStable) {
    const ins = r.todayInstability;
    let s = `Today's design cannot keep up: ${ins?.message.replace(/^unstable: /, '') ?? 'some classes arrive faster than they can be matched'}. Waiting grows without bound until the design changes.`;
    const first = ins?.repairs[0];
    if (first) s += ` The cheapest way out is to add ${listWords(first.added.map((p) => pairWords(p, name)))} (${money(first.cost, r.costUnit)}).`;
    else if (ins?.noRepair) s += ` No allowed candidate can fix it: ${ins.noRepair.relief}`;
    out.push(s);
  }

  if (!d) {
    out.push(`No recommendation: ${r.noDecision ?? 'no design satisfies the constraints'}.`);
    return out;
  }
  const rec = d.recommended;
  const within = r.budget === null ? 'Without a budget limit' : `Within the budget of ${money(r.budget, r.costUnit)}`;
  // an interrupted search advises only on what it scored, and says so
  const budget = d.partial ? `${within}, the best design scored before the interruption` : within;
  if (rec.added.length + rec.removed.length > 0) {
    const cost = rec.cost >= 0 ? `costs ${money(rec.cost, r.costUnit)}` : `saves ${money(-rec.cost, r.costUnit)}`;
    if (t && t.backlog !== null && rec.backlog !== null) {
      const longest = t.maxWait !== null && rec.maxWait !== null ? `, and the longest mean wait from ${num(t.maxWait)} to ${num(rec.maxWait)} ${plural(unit)}` : '';
      out.push(
        `${budget}: ${changeWords(rec.added, rec.removed, name)}. It ${cost}; waiting goes from ${num(t.backlog)} to ${num(rec.backlog)} ${items} (${signedPct((rec.backlog - t.backlog) / t.backlog)})${longest}.`,
      );
    } else {
      out.push(`${budget}: ${changeWords(rec.added, rec.removed, name)}. It ${cost} and makes the design stable, with ${num(rec.backlog ?? NaN)} ${items} waiting on average.`);
    }
  } else if (d.partial) {
    out.push(`${within}, none of the designs scored before the interruption lowers waiting; the search did not finish, so a better design may exist.`);
  } else out.push(`${within}, no change lowers waiting: keep today's design.`);

  const against = d.verdicts.filter((v) => v.against === 'recommended');
  const base = rec.backlog ?? NaN;
  const harmful = against.filter((v) => v.advice === 'harmful' && v.backlogDelta !== null).sort((a, b) => b.backlogDelta! - a.backlogDelta!);
  for (const v of harmful.slice(0, 4)) out.push(harmfulSentence(v, base, name, r));
  if (harmful.length > 4) out.push(`${harmful.length - 4} more candidates would also raise waiting if added to the recommended design (see the single-change table).`);
  const needed = against.filter((v) => v.advice === 'needed for stability');
  if (needed.length > 0) {
    out.push(`Keep ${listWords(needed.map((v) => pairWords(v.pair, name)))}: without ${needed.length === 1 ? 'it' : 'any one of them'} the recommended design can no longer keep up.`);
  }
  const over = against.filter((v) => v.advice === 'over budget').sort((a, b) => (a.backlogDelta ?? 0) - (b.backlogDelta ?? 0))[0];
  if (over && over.backlogDelta !== null) {
    out.push(`Beyond the budget, adding ${pairWords(over.pair, name)} (${money(over.price, r.costUnit)}) to the recommended design would lower waiting by ${pct(-over.backlogDelta / base)}.`);
  }

  if (r.variants.length > 0) out.push(...variantSentences(r, name));
  if (r.sweep) {
    const s = sweepSentence(r, name);
    if (s) out.push(s);
  }
  const simRec = r.simulated.find((s) => s.role === 'recommended') ?? r.simulated.find((s) => s.role === 'today');
  if (simRec && simRec.backlog.mean !== null) {
    const who = simRec.role === 'recommended' ? 'the recommended design' : "today's design";
    out.push(
      `With the patience given in the file, items give up: simulation of ${who} gives ${num(simRec.backlog.mean)} ${items} waiting on average and ${pct(simRec.abandonShare.mean ?? NaN)} of arrivals giving up (${r.method === 'simulation' ? 'the figures above are simulated with giving up too' : 'the exact figures above ignore patience'}).`,
    );
  }
  return out;
}

function harmfulSentence(v: VerdictRecord, base: number, name: Namer, r: ReportRecord): string {
  const rel = base > 0 ? v.backlogDelta! / base : NaN;
  if (v.kind === 'removable') {
    return `Drop ${pairWords(v.pair, name)} as recommended: keeping it would forgo its saving (${money(v.price, r.costUnit)}) and raise waiting by ${pct(rel)}. More flexibility is not always better.`;
  }
  return `Do not pay for ${pairWords(v.pair, name)} (${money(v.price, r.costUnit)}): added to the recommended design it raises waiting by ${pct(rel)}. More flexibility is not always better.`;
}

function variantSentences(r: ReportRecord, name: Namer): string[] {
  const out: string[] = [];
  const items = r.itemWord;
  const worstOf = (i: number): { backlog: number; where: string } => {
    const d = r.designs[i]!;
    let b = d.figures.backlog ?? Infinity;
    let where = 'today';
    d.underVariants.forEach((o, k) => {
      const x = o.stable ? o.backlog! : Infinity;
      if (x > b) {
        b = x;
        where = r.variants[k]!;
      }
    });
    return { backlog: b, where };
  };
  const today = r.designs.findIndex((d) => d.role === 'today');
  const rec = r.designs.findIndex((d) => d.role === 'recommended');
  if (today >= 0) {
    const bad = r.variants.filter((_, k) => !r.designs[today]!.underVariants[k]!.stable);
    if (bad.length > 0) out.push(`Under ${listWords(bad.map((v) => `“${v}”`))} demand today's design cannot keep up.`);
  }
  if (rec >= 0) {
    const w = worstOf(rec);
    out.push(
      Number.isFinite(w.backlog)
        ? `The recommended design's worst case is ${num(w.backlog)} ${items} waiting (${w.where === 'today' ? "today's demand" : `“${w.where}” demand`}).`
        : `The recommended design cannot keep up under “${w.where}” demand: consider a more robust design.`,
    );
  }
  const all = r.designs.map((_, i) => worstOf(i));
  const robust = all.reduce((bi, w, i) => (w.backlog < all[bi]!.backlog ? i : bi), 0);
  if (robust !== rec && rec >= 0 && Number.isFinite(all[robust]!.backlog)) {
    const d = r.designs[robust]!;
    out.push(`Most robust across all demand futures: ${d.role === 'today' ? "today's design" : `the design that would ${changeWords(d.figures.added, d.figures.removed, name)}`}, with at most ${num(all[robust]!.backlog)} ${items} waiting.`);
  }
  return out;
}

function sweepSentence(r: ReportRecord, name: Namer): string | null {
  const s = r.sweep!;
  const grow = listWords(s.grow.map(name));
  const parts: string[] = [];
  if (s.limit.factor !== null) parts.push(`Today's design stays stable until the demand of ${grow} reaches ×${num(s.limit.factor, 3)} of today's`);
  for (const c of s.crossovers) parts.push(`${curveWords(r, c.variant, name)} starts to ${c.direction === 'starts-to-hurt' ? 'hurt' : 'help'} at ×${num(c.factor, 3)}`);
  return parts.length === 0 ? null : `${parts.join('; ')}.`;
}

/** How the report names a sweep curve. */
export function curveWords(r: ReportRecord, curve: string, name: Namer): string {
  const s = r.sweep!;
  const i = s.curves.findIndex((c) => c.name === curve);
  if (i <= 0) return "today's design";
  const hasRec = r.designs.some((d) => d.role === 'recommended');
  if (i === 1 && hasRec) return 'the recommended design';
  const a = r.sweepAddition;
  return a ? `the recommended design with ${pairWords(a.pair, name)} added` : curve;
}
