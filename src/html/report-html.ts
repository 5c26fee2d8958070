/**
 * The self-contained HTML report, drawn from the report record (src/usecases/report.ts): one file,
 * inline CSS and inline SVG, no script, no external font, image or link, so it opens offline and
 * prints. All user text goes through escape.ts. One namer for classes throughout (verdicts.ts), and
 * every verdict is measured against the recommended design, today's beside it.
 */
import type { ReportRecord, ShownDesign } from '../usecases/report.js';
import type { VerdictRecord } from '../usecases/designs.js';
import { listWords, money, num, pairText, pct, plural, signed, signedPct } from '../output/format.js';
import { escapeHtml, html, raw, type Markup } from './escape.js';
import { graphSvg, type EdgeKind, type GraphEdge } from './graph-svg.js';
import { paretoChart } from './pareto-chart.js';
import { REPORT_CSS } from './report-css.js';
import { sweepChart } from './sweep-chart.js';
import { curveWords, namerOf, verdicts, type Namer } from './verdicts.js';
import { changeWord } from '../output/text/recommend.js';
import { WORK_LIMITS } from '../usecases/limits.js';
import { waitChart } from './wait-chart.js';

export interface ReportMeta {
  /** Shown in the footer, e.g. "edgewise 0.2.0". */
  readonly generator: string;
}

const key = (p: readonly [string, string]): string => `${p[0]}\u0001${p[1]}`;

/** The whole page as a string. */
export function renderReport(r: ReportRecord, meta: ReportMeta): string {
  const name = namerOf(r);
  const lines = verdicts(r, name);
  const sections: Markup[] = [];
  let n = 0;
  const section = (id: string, title: string, body: Markup): void => {
    n++;
    sections.push(html`<section id="${id}"><h2><span class="num">${n}</span>${title}</h2>${body}</section>`);
  };
  section('graph', 'Who can be matched with whom', graphSection(r, name));
  if (r.decision) section('cost-vs-waiting', 'Cost against waiting', paretoSection(r, name));
  section('waits', 'Waits per class', waitSection(r, name));
  if (r.sweep) section('growth', 'If demand grows', sweepSection(r, name));
  if (r.decision && r.decision.verdicts.length > 0) section('single-changes', 'Every single change, exactly', changesSection(r, name));
  if (r.variants.length > 0 && r.designs.length > 0) section('demand-futures', 'Demand futures', variantSection(r, name));
  section('inputs', 'Appendix: the inputs', inputsSection(r, name));

  const costUnit = r.costUnit ?? 'cost units';
  const facts = html`<ul class="facts">
<li><b>${r.classes.length}</b> classes</li>
<li><b>${r.inputs.compatibilities.length}</b> compatibilities today</li>
<li><b>${r.inputs.candidates.length}</b> candidates</li>
<li>budget <b>${r.budget === null ? 'none' : `${num(r.budget)} ${costUnit}`}</b></li>
<li>rates per <b>${r.timeUnit}</b></li>
${r.variants.length > 0 ? html`<li>demand futures: <b>${listWords(r.variants.map((v) => `“${v}”`))}</b></li>` : ''}
</ul>`;
  const notes = [...r.warnings, ...r.notes];
  const notesHtml = notes.length > 0 ? html`<p class="note">${notes.map((x, i) => html`${i > 0 ? raw('<br>') : ''}${x}`)}</p>` : '';
  const page = html`<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="${meta.generator}">
<title>Design report: ${r.scenario}</title>
<style>${raw(REPORT_CSS)}</style>
</head>
<body>
<main>
<header class="top">
<p class="kicker">Design report · steady state under first come, first matched</p>
<h1>${r.scenario}</h1>
${r.description ? html`<p class="lede">${r.description}</p>` : ''}
${facts}
</header>
<section id="verdicts" aria-label="What to do">
<ol class="verdicts">${lines.map((v) => html`<li>${v}</li>`)}</ol>
${notesHtml}
</section>
${sections}
<footer>
<p>Figures are long-run averages for first come, first matched: each arrival is matched with the oldest compatible waiting item. They are exact for Poisson arrivals at the rates given and patient items; where the inputs give patience, simulated figures with items giving up are shown beside them. Waits follow from the number waiting by Little's law. A design is stable when every group of classes can be served faster than it arrives.</p>
<p>Made by ${meta.generator}. This file is self-contained: it needs no network and prints on A4.</p>
</footer>
</main>
</body>
</html>
`;
  return page.html;
}

function figure(id: string, chart: Markup, caption: Markup | string): Markup {
  return html`<figure class="chart-box" id="${id}" data-chart="${id}">${chart}<figcaption>${caption}</figcaption></figure>`;
}

/**
 * A pair in the one pair notation (pairText), each class name kept on one line: ids may contain
 * hyphens, where browsers would otherwise break a line ("g1-" / "3"); the line may still break
 * around the arrow.
 */
function pairMarkup(p: readonly [string, string], name: Namer): Markup {
  const text = pairText(p, (id) => (id === p[0] ? '\u0000' : '\u0001'));
  const one = (id: string): string => html`<span class="name">${name(id)}</span>`.html;
  // "a ↔" kept on one line (the text stays "a ↔ b"): a line may break after the arrow, never before it
  return raw(escapeHtml(text).replace('\u0000 ↔ ', '<span class="keep">\u0000 ↔</span> ').replace(/\u0000/g, one(p[0])).replace(/\u0001/g, one(p[1])));
}

/** "a, b and c" over markup (the same words as listWords). */
function listMarkup(items: readonly Markup[]): Markup {
  if (items.length <= 1) return html`${items}`;
  return html`${items.slice(0, -1).map((m, i) => html`${i > 0 ? ', ' : ''}${m}`)} and ${items[items.length - 1]}`;
}

function changeList(d: { added: ReadonlyArray<readonly [string, string]>; removed: ReadonlyArray<readonly [string, string]> }, name: Namer): Markup {
  if (d.added.length === 0 && d.removed.length === 0) return html`<span class="muted">no change</span>`;
  const parts: Markup[] = [];
  if (d.added.length > 0) parts.push(html`fund ${listMarkup(d.added.map((p) => pairMarkup(p, name)))}`);
  if (d.removed.length > 0) parts.push(html`drop ${listMarkup(d.removed.map((p) => pairMarkup(p, name)))}`);
  return html`${parts.map((m, i) => html`${i > 0 ? '; ' : ''}${m}`)}`;
}

/** Most rows of the front the report's table shows; the JSON record (report --json, recommend) has them all. */
const FRONT_ROWS = 14;

/**
 * The rows of the front the table shows: all of them when few, otherwise the recommended design,
 * the cheapest and the dearest, and designs spread evenly over the cost range between them.
 */
export function frontRows<T extends { cost: number; recommended: boolean }>(front: readonly T[], most = FRONT_ROWS): T[] {
  if (front.length <= most) return [...front];
  const keep = new Set<number>([0, front.length - 1]);
  front.forEach((p, i) => p.recommended && keep.add(i));
  const lo = front[0]!.cost;
  const hi = front[front.length - 1]!.cost;
  const slots = most - keep.size;
  for (let s = 1; s <= slots && keep.size < most; s++) {
    const target = lo + ((hi - lo) * s) / (slots + 1);
    let best = -1;
    for (let i = 0; i < front.length; i++) {
      if (keep.has(i)) continue;
      if (best < 0 || Math.abs(front[i]!.cost - target) < Math.abs(front[best]!.cost - target)) best = i;
    }
    if (best >= 0) keep.add(best);
  }
  return [...keep].sort((a, b) => a - b).map((i) => front[i]!);
}

function graphSection(r: ReportRecord, name: Namer): Markup {
  if (r.classes.length > WORK_LIMITS.drawnClasses) {
    return html`<p class="explain">The design has ${r.classes.length} classes, more than the ${WORK_LIMITS.drawnClasses} a readable drawing can hold; the tables of the appendix list every class and compatibility.</p>`;
  }
  const index = new Map(r.classes.map((c, k) => [c.id, k] as const));
  const rec = r.decision?.recommended;
  const funded = new Set((rec?.added ?? []).map(key));
  const dropped = new Set((rec?.removed ?? []).map(key));
  const harmful = new Set((r.decision?.verdicts ?? []).filter((v) => v.against === 'recommended' && v.advice === 'harmful').map((v) => key(v.pair)));
  const rate = new Map(r.matchRates.map((m) => [key(m.pair), m.rate] as const));
  const ordered = (p: readonly [string, string]): [number, number] => {
    const a = index.get(p[0])!;
    const b = index.get(p[1])!;
    return a <= b ? [a, b] : [b, a];
  };
  const edges: GraphEdge[] = [];
  for (const c of r.inputs.compatibilities) {
    const [a, b] = ordered(c.pair);
    const pk = key([r.classes[a]!.id, r.classes[b]!.id]);
    const kind: EdgeKind = dropped.has(pk) ? 'drop' : 'today';
    const m = rate.get(pk);
    edges.push({ a, b, kind, ...(m === undefined ? {} : { matchRate: m }) });
  }
  for (const c of r.inputs.candidates) {
    const [a, b] = ordered(c.pair);
    const pk = key([r.classes[a]!.id, r.classes[b]!.id]);
    edges.push({ a, b, kind: funded.has(pk) ? 'fund' : 'candidate', harmful: harmful.has(pk) });
  }
  const overloaded = r.todayInstability ? new Set(r.todayInstability.certificate.set) : new Set(r.bottleneck?.set ?? []);
  const pic = {
    nodes: r.classes.map((c, k) => ({ id: c.id, label: name(c.id), rate: c.rate, bottleneck: overloaded.has(c.id), ...(r.inputs.classes[k]!.group ? { group: r.inputs.classes[k]!.group! } : {}) })),
    edges,
    timeUnit: r.timeUnit,
    title: `Compatibility graph of ${r.scenario}`,
    ...(r.todayInstability ? { ringLabel: 'overloaded group (cannot keep up)' } : {}),
  };
  const ring = !r.todayStable
    ? ' The dashed orange ring marks the overloaded group: its classes arrive faster than the classes that can serve them.'
    : r.bottleneck
      ? ` The dashed orange ring marks the tightest group (${r.bottleneck.set.length === 1 ? 'one class' : `${r.bottleneck.set.length} classes`}): the classes that can serve it have the least capacity to spare.`
      : '';
  return html`<p class="explain">Each disc is a class of ${r.itemWord}; its area follows how many arrive per ${r.timeUnit}. A line joins two classes whose ${r.itemWord} can be matched${r.todayStable ? '; its width follows how many matches it carries today' : ''}. Candidate compatibilities are dashed: the ones the recommendation funds in dark blue, the ones that would raise waiting if added to the recommended design dotted in orange and labelled.${ring}</p>
${figure('chart-graph', graphSvg(pic), `Compatibility graph of ${r.scenario}${r.todayStable ? ", with today's match rates" : ''}.`)}`;
}

function paretoSection(r: ReportRecord, name: Namer): Markup {
  const d = r.decision!;
  const costUnit = r.costUnit ?? 'cost units';
  const chart = paretoChart({
    front: d.pareto.filter((p) => p.backlog !== null).map((p) => ({ cost: p.cost, backlog: p.backlog! })),
    baselines: d.baselines.filter((b) => b.backlog !== null).map((b) => ({ name: b.name, cost: b.cost, backlog: b.backlog! })),
    ...(d.recommended.backlog !== null ? { chosen: { cost: d.recommended.cost, backlog: d.recommended.backlog } } : {}),
    ...(r.budget !== null ? { budget: r.budget } : {}),
    costUnit,
    itemWord: r.itemWord,
  });
  const shown = frontRows(d.pareto);
  const giving = d.pareto.some((p) => p.abandonShare !== undefined);
  const limited = d.pareto.some((p) => p.abandonmentLimits !== undefined);
  const interval = (p: (typeof shown)[number]): string => (p.backlogCi95 ? ` (${num(p.backlogCi95[0])}–${num(p.backlogCi95[1])})` : '');
  const rows = shown.map(
    (p) =>
      html`<tr${p.recommended ? raw(' class="flag-good"') : ''}><td class="n">${num(p.cost)}</td><td class="n">${p.backlog === null ? '—' : num(p.backlog) + interval(p)}</td><td class="n">${p.maxWait === null ? '—' : num(p.maxWait)}</td>${giving ? html`<td class="n">${p.abandonShare === undefined ? '—' : pct(p.abandonShare)}</td>` : ''}${limited ? html`<td>${limitsWords(p.abandonmentLimits, name)}</td>` : ''}<td>${changeList(p, name)}${p.recommended ? html` <span class="tag good">recommended</span>` : ''}</td></tr>`,
  );
  const simulatedFront = d.pareto.some((p) => p.method === 'simulation');
  const base = d.baselines.map((b) => {
    const verdict = !b.stable
      ? 'cannot keep up'
      : b.gap === null
        ? (b.noGap ?? '—')
        : b.gap > 1e-9 * Math.max(1, b.objective ?? 1)
          ? `${num(b.gap)} more than the best design at this cost`
          : 'as good as the best design at this cost';
    return html`<tr><td>${b.name}</td><td class="n">${num(b.cost)}</td><td class="n">${b.backlog === null ? 'unstable' : num(b.backlog)}</td><td>${verdict}</td></tr>`;
  });
  return html`<p class="explain">Each dot of the front is a design that no other design beats on both cost and waiting: moving right buys less waiting. The grey shapes are rules of thumb to compare against. Costs count added candidates minus the savings of dropped compatibilities, in ${costUnit}.</p>
${figure('chart-pareto', chart, `Added cost (${costUnit}) against the mean number of ${r.itemWord} waiting.`)}
<h3>The best designs</h3>${shown.length < d.pareto.length ? html`<p class="muted">${shown.length} of the ${d.pareto.length} designs of the front, spread over its cost range (the recommended one included); <code>edgewise recommend</code> lists them all.</p>` : ''}${simulatedFront ? html`<p class="muted">Simulated figures: the number waiting with its 95 % interval${giving ? '; "giving up" is the share of all arrivals that abandon' : ''}${limited ? '; "abandonment limits" compares each limited class with its maxAbandonment ("within noise" where the interval contains the limit, so the simulation cannot tell the side)' : ''}.</p>` : ''}<table><thead><tr><th class="n">cost</th><th class="n">${r.itemWord} waiting</th><th class="n">longest mean wait (${plural(r.timeUnit)})</th>${giving ? html`<th class="n">giving up</th>` : ''}${limited ? html`<th>abandonment limits</th>` : ''}<th>changes to today's design</th></tr></thead><tbody>${rows}</tbody></table>
<h3>Rules of thumb for comparison</h3><table><thead><tr><th>design</th><th class="n">cost</th><th class="n">${r.itemWord} waiting</th><th>against the front</th></tr></thead><tbody>${base}</tbody></table>`;
}

/** A design's abandonment limits in words: "within every limit", "within noise: a, b", "over: a". */
function limitsWords(limits: ReadonlyArray<{ class: string; within: boolean; withinNoise: boolean }> | undefined, name: Namer): string {
  if (!limits) return '—';
  const over = limits.filter((l) => !l.within).map((l) => name(l.class));
  if (over.length > 0) return `over: ${over.join(', ')}`;
  const noise = limits.filter((l) => l.withinNoise).map((l) => name(l.class));
  return noise.length > 0 ? `within noise: ${noise.join(', ')}` : 'within every limit';
}

function waitSection(r: ReportRecord, name: Namer): Markup {
  const ids = r.classes.map((c) => c.id);
  const series = r.designs.map((d) => ({ name: d.name, role: d.role, waits: d.figures.waits ? ids.map((id) => d.figures.waits![id] ?? NaN) : null }));
  const unstable = r.designs.filter((d) => !d.figures.stable);
  const chart = waitChart({ classes: r.classes.map((c) => ({ label: name(c.id) })), series, timeUnit: r.timeUnit });
  const sim = r.simulated.length > 0 ? simulatedTable(r, name) : '';
  return html`<p class="explain">Mean time an arrival of each class waits before it is matched, in ${plural(r.timeUnit)}.${unstable.length > 0 ? ` ${listWords(unstable.map((d) => d.name))}: not shown, because waits grow without bound.` : ''}</p>
${r.designs.length > 0 ? figure('chart-waits', chart, r.designs.some((d) => d.figures.method === 'simulation') ? `Mean wait per class (${plural(r.timeUnit)}), simulated (95 % intervals in the JSON record)${r.inputs.classes.some((c) => c.patience !== null) ? ', items giving up included' : ''}.` : `Mean wait per class (${plural(r.timeUnit)}), exact, items assumed patient.`) : ''}
${sim}`;
}

function simulatedTable(r: ReportRecord, name: Namer): Markup {
  const exact = new Map(r.designs.map((d) => [d.role, d] as const));
  const ci = (c: [number, number] | null, f: (x: number) => string): string => (c ? ` (${f(c[0])}–${f(c[1])})` : '');
  const who = (role: string): string => (role === 'today' ? "today's design" : 'the recommended design');
  const head = html`<tr><th rowspan="2">class</th><th class="n" rowspan="2">patience (${plural(r.timeUnit)})</th>${r.simulated.map((s) => html`<th class="n group" colspan="3">${who(s.role)}</th>`)}</tr>
<tr>${r.simulated.map(() => html`<th class="n">exact wait</th><th class="n">simulated wait</th><th class="n">giving up</th>`)}</tr>`;
  const rows = r.classes.map((c) => {
    const cells = r.simulated.map((s) => {
      const e = exact.get(s.role)?.figures.waits?.[c.id] ?? null;
      const x = s.byClass[c.id]!;
      return html`<td class="n">${e === null ? '—' : num(e)}</td><td class="n">${x.wait === null ? '—' : num(x.wait)}</td><td class="n">${x.abandonShare === null ? '—' : pct(x.abandonShare)}</td>`;
    });
    const p = r.simulated[0]!.byClass[c.id]?.patience ?? null;
    return html`<tr><td>${name(c.id)}</td><td class="n">${p === null ? 'patient' : num(p)}</td>${cells}</tr>`;
  });
  const totals = r.simulated.map(
    (s) => `${who(s.role)}: ${num(s.backlog.mean ?? NaN)}${ci(s.backlog.ci95, num)} ${r.itemWord} waiting, ${pct(s.abandonShare.mean ?? NaN)}${ci(s.abandonShare.ci95, (x) => pct(x))} giving up`,
  );
  const s0 = r.simulated[0]!;
  return html`<h3>With patience: simulated figures</h3>
<p class="explain">The inputs give some classes a patience: their ${r.itemWord} give up after a random time (exponential, with that mean). ${r.method === 'simulation' ? 'The figures above are simulated with giving up too; this table sets them beside the exact figures, which assume everyone waits. These simulated figures' : 'The exact figures above assume everyone waits; these simulated figures'} (${s0.replications} replications of ${num(s0.arrivals)} arrivals, seed ${s0.seed}; ranges are 95 % intervals) include giving up. ${totals.join('; ')}.</p>
<table class="sim"><thead>${head}</thead><tbody>${rows}</tbody></table>`;
}

function sweepSection(r: ReportRecord, name: Namer): Markup {
  const s = r.sweep!;
  const grow = listWords(s.grow.map(name));
  const roles = ['today', 'recommended', r.sweepAddition?.why === 'harmful' ? 'warning' : 'alternative'] as const;
  const hasRec = r.designs.some((d) => d.role === 'recommended');
  const chart = sweepChart({
    curves: s.curves.map((c, i) => ({
      name: curveWords(r, c.name, name),
      role: i === 0 ? 'today' : i === 1 && hasRec ? 'recommended' : roles[2],
      points: c.points.filter((p) => p.stable && p.backlog !== null).map((p) => ({ load: p.factor, backlog: p.backlog! })),
    })),
    crossovers: s.crossovers.map((c) => ({ load: c.factor, label: `${curveWords(r, c.variant, name)} starts to ${c.direction === 'starts-to-hurt' ? 'hurt' : 'help'}` })),
    loadLabel: `Demand of ${grow} (× today)`,
    itemWord: r.itemWord,
  });
  return html`<p class="explain">What happens if the tightest group, ${grow}, grows while every other class stays as today. ${s.method === 'simulation' ? 'Each curve is simulated (95 % intervals in the JSON record; a crossover is bracketed between two steps)' : 'Each curve is exact'}; a curve ends where that design can no longer keep up.${s.crossovers.length > 0 ? ' Where two curves cross, a change that helps at today’s demand starts to hurt, or the other way round.' : ''}</p>
${figure('chart-sweep', chart, `Mean number of ${r.itemWord} waiting as the demand of ${grow} grows.`)}`;
}

const ADVICE: Record<string, { tag: string; cls: string; words: string }> = {
  harmful: { tag: 'harmful', cls: 'bad', words: 'Waiting goes up: do not pay for it.' },
  'no effect': { tag: '', cls: '', words: 'No measurable effect on waiting.' },
  'over budget': { tag: '', cls: '', words: 'Helps, but costs more than the budget allows.' },
  'not allowed': { tag: '', cls: '', words: 'Helps, but the limits or wait targets do not allow it.' },
  keep: { tag: '', cls: '', words: 'Keep: dropping it raises waiting.' },
  'needed for stability': { tag: 'needed', cls: 'stop', words: 'Keep: without it the design cannot keep up.' },
  'take it': { tag: 'helps', cls: 'good', words: 'Take it.' },
};

function changesSection(r: ReportRecord, name: Namer): Markup {
  const d = r.decision!;
  const today = new Map(d.verdicts.filter((v) => v.against === 'today').map((v) => [key(v.pair), v] as const));
  const base = d.recommended.backlog ?? NaN;
  const rows = d.verdicts
    .filter((v) => v.against === 'recommended')
    .sort((a, b) => (a.advice === 'harmful' ? 0 : 1) - (b.advice === 'harmful' ? 0 : 1) || (a.change === b.change ? 0 : a.change === 'add' ? -1 : 1) || (a.backlogDelta ?? Infinity) - (b.backlogDelta ?? Infinity))
    .map((v) => changeRow(v, today.get(key(v.pair)), base, r, name));
  return html`<p class="explain">Each row changes the recommended design by one compatibility — adding a candidate it leaves out, or dropping one it keeps — and evaluates the result exactly. A <span class="tag bad">harmful</span> addition raises waiting although it adds flexibility. The last column measures the same pair against today's design, for reference only: the advice is about the recommended design.</p>
<p class="muted">Costs and savings in ${r.costUnit ?? 'cost units'}; waiting is the mean number of ${r.itemWord} waiting.</p>
<table class="changes"><thead><tr><th class="change">single change</th><th class="n">cost</th><th class="n">difference</th><th class="advice">what to do</th><th class="n">from today's design</th></tr></thead><tbody>${rows}</tbody></table>`;
}

function changeRow(v: VerdictRecord, t: VerdictRecord | undefined, base: number, r: ReportRecord, name: Namer): Markup {
  const a = ADVICE[v.advice ?? ''] ?? { tag: '', cls: '', words: v.advice ?? '' };
  const cls = a.cls === 'bad' ? ' class="flag-bad"' : '';
  const what = html`${changeWord(v)} ${pairMarkup(v.pair, name)}`;
  const money = v.change === 'add' ? num(v.price) : `−${num(v.price)}`;
  const diff = v.backlogDelta === null ? 'unbounded' : `${signed(v.backlogDelta)} (${base > 0 ? signedPct(v.backlogDelta / base) : '—'})`;
  const fromToday = !t ? '—' : t.backlogDelta === null ? 'unbounded' : signed(t.backlogDelta);
  return html`<tr${raw(cls)}><td>${what}</td><td class="n">${money}</td><td class="n">${diff}</td><td>${a.tag ? html`<span class="tag ${a.cls}">${a.tag}</span> ` : ''}${a.words}</td><td class="n">${fromToday}</td></tr>`;
}

function variantSection(r: ReportRecord, name: Namer): Markup {
  const head = html`<tr><th>design</th><th class="n">today</th>${r.variants.map((v) => html`<th class="n">${v}</th>`)}<th class="n">worst case</th></tr>`;
  const cell = (stable: boolean, backlog: number | null): Markup => (stable && backlog !== null ? html`${num(backlog)}` : html`<span class="tag stop">unstable</span>`);
  const rows = r.designs.map((d: ShownDesign) => {
    let worst = d.figures.backlog ?? Infinity;
    let where = 'today';
    d.underVariants.forEach((o, k) => {
      const b = o.stable ? o.backlog! : Infinity;
      if (b > worst) {
        worst = b;
        where = r.variants[k]!;
      }
    });
    return html`<tr><td><b>${d.name}</b><br><span class="muted">${changeList(d.figures, name)}</span></td><td class="n">${cell(d.figures.stable, d.figures.backlog)}</td>${d.underVariants.map((o) => html`<td class="n">${cell(o.stable, o.backlog)}</td>`)}<td class="n"><b>${Number.isFinite(worst) ? num(worst) : 'unstable'}</b><br><span class="muted">${where}</span></td></tr>`;
  });
  return html`<p class="explain">Mean number of ${r.itemWord} waiting for each design under today's rates and under every demand variant of the scenario. The worst case shows how robust a choice is.</p>
<table><thead>${head}</thead><tbody>${rows}</tbody></table>`;
}

function inputsSection(r: ReportRecord, name: Namer): Markup {
  const inp = r.inputs;
  const u = r.timeUnit;
  const costUnit = r.costUnit ?? 'cost units';
  const ruleWords = (rule: string | null, reason: string | null): string => (rule === null ? '' : `${rule === 'must-keep' ? 'must keep' : 'forbidden'}${reason ? `: ${reason}` : ''}`);
  // an optional column shows only when some class has a value in it
  const optional = [
    { head: `patience (${plural(u)})`, cell: (c: (typeof inp.classes)[number]) => (c.patience === null ? 'patient' : num(c.patience)), any: inp.classes.some((c) => c.patience !== null) },
    { head: `wait target (${plural(u)})`, cell: (c: (typeof inp.classes)[number]) => (c.waitTarget === null ? '—' : num(c.waitTarget)), any: inp.classes.some((c) => c.waitTarget !== null) },
    { head: 'max compatibilities', cell: (c: (typeof inp.classes)[number]) => (c.maxCompatibilities === null ? '—' : String(c.maxCompatibilities)), any: inp.classes.some((c) => c.maxCompatibilities !== null) },
    { head: 'weight', cell: (c: (typeof inp.classes)[number]) => (c.weight === null ? '1' : num(c.weight)), any: inp.classes.some((c) => c.weight !== null) },
  ].filter((o) => o.any);
  const hasLabels = inp.classes.some((c) => c.label !== null);
  const classes = inp.classes.map(
    (c) => html`<tr><td class="id">${c.id}</td>${hasLabels ? html`<td>${c.label ?? ''}</td>` : ''}<td class="n">${num(c.rate)}</td>${optional.map((o) => html`<td class="n">${o.cell(c)}</td>`)}</tr>`,
  );
  const compat = inp.compatibilities.map(
    (c) => html`<tr><td>${pairMarkup(c.pair, name)}</td><td>${c.removable ? 'may be dropped' : 'fixed'}</td><td class="n">${c.removable ? num(c.saving) : '—'}</td><td>${ruleWords(c.rule, c.reason)}</td></tr>`,
  );
  const cands = inp.candidates.map((c) => html`<tr><td>${pairMarkup(c.pair, name)}</td><td class="n">${num(c.cost)}</td><td>${ruleWords(c.rule, c.reason)}</td></tr>`);
  const demand =
    inp.demand.length > 0
      ? html`<h3>Demand variants</h3><table><thead><tr><th>variant</th><th>rates per ${u} that differ from today's</th></tr></thead><tbody>${inp.demand.map((d) => html`<tr><td>${d.name}</td><td>${Object.entries(d.rates).map(([id, x]) => `${name(id)} ${num(x)}`).join(', ')}</td></tr>`)}</tbody></table>`
      : '';
  return html`<p class="explain">What this report was computed from. Budget: ${r.budget === null ? 'none' : money(r.budget, costUnit)}.</p>
<h3>Classes</h3><table><thead><tr><th>id</th>${hasLabels ? html`<th>label</th>` : ''}<th class="n">rate per ${u}</th>${optional.map((o) => html`<th class="n">${o.head}</th>`)}</tr></thead><tbody>${classes}</tbody></table>
<h3>Compatibilities today</h3><table><thead><tr><th>pair</th><th>status</th><th class="n">saving if dropped</th><th>rule</th></tr></thead><tbody>${compat}</tbody></table>
${cands.length > 0 ? html`<h3>Candidates</h3><table><thead><tr><th>pair</th><th class="n">cost</th><th>rule</th></tr></thead><tbody>${cands}</tbody></table>` : ''}
${demand}`;
}
