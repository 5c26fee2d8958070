/**
 * The self-contained HTML report: one file, inline CSS and inline SVG, no script, no external
 * font, image or link, so it opens offline and prints. All user text goes through escape.ts.
 */
import { html, raw, type Markup } from './escape.js';
import { graphSvg } from './graph-svg.js';
import { paretoChart } from './pareto-chart.js';
import { REPORT_CSS } from './report-css.js';
import type { DesignView, Pair, ReportData, SensitivityRow } from '../report/report-data.js';
import { sweepChart } from './sweep-chart.js';
import { namerOf, pairWords, rowAdvice, worstCase, type Namer } from '../report/verdicts.js';
import { waitChart } from './wait-chart.js';
import { fmt, listWords, plural, signed } from '../report/units.js';

export interface ReportMeta {
  /** Shown in the footer, e.g. "edgewise 0.1.0". */
  readonly generator: string;
}

/** The whole page as a string. */
export function renderReport(data: ReportData, meta: ReportMeta): string {
  const name = namerOf(data);
  const sections: Markup[] = [];
  let num = 0;
  const section = (id: string, title: string, body: Markup): void => {
    num++;
    sections.push(html`<section id="${id}"><h2><span class="num">${num}</span>${title}</h2>${body}</section>`);
  };

  section('graph', 'Who can be matched with whom', graphSection(data));
  if (data.front.length > 0 || data.baselines.length > 0) section('cost-vs-waiting', 'Cost against waiting', paretoSection(data, name));
  section('waits', 'Waits per class', waitSection(data));
  if (data.sweep) section('growth', 'If demand grows', sweepSection(data, name));
  if (data.sensitivity.length > 0) section('single-changes', 'Every single change, exactly', sensitivitySection(data, name));
  if (data.variants.length > 0) section('demand-futures', 'Demand futures', variantSection(data, name));

  const facts = html`<ul class="facts">
<li><b>${data.classes.length}</b> classes</li>
<li><b>${data.compatibilityCount}</b> compatibilities today</li>
<li><b>${data.candidateCount}</b> candidates</li>
<li>budget <b>${data.budget === null ? 'none' : `${fmt(data.budget)} ${data.costUnit}`}</b></li>
<li>rates per <b>${data.timeUnit}</b></li>
${data.variants.length > 0 ? html`<li>demand futures: <b>${listWords(data.variants.map((v) => `“${v}”`))}</b></li>` : ''}
</ul>`;
  const notes = data.notes.length > 0 ? html`<p class="note">${data.notes.map((n, i) => html`${i > 0 ? raw('<br>') : ''}${n}`)}</p>` : '';

  const page = html`<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="${meta.generator}">
<title>Design report: ${data.scenario}</title>
<style>${raw(REPORT_CSS)}</style>
</head>
<body>
<main>
<header class="top">
<p class="kicker">Design report · exact steady state under first come, first matched</p>
<h1>${data.scenario}</h1>
${data.description ? html`<p class="lede">${data.description}</p>` : ''}
${facts}
</header>
<section id="verdicts" aria-label="What to do">
<ol class="verdicts">${data.verdicts.map((v) => html`<li>${v}</li>`)}</ol>
${notes}
</section>
${sections}
<footer>
<p>All figures are exact long-run averages for first come, first matched (each arrival is matched with the oldest compatible waiting item), computed from the product form of the stationary distribution (“A product form for the general stochastic matching model”, J. Appl. Probab. 2021). Stability follows “Stability of the stochastic matching model” (J. Appl. Probab. 2016). Waits follow from the number waiting by Little's law. Arrivals are assumed to be Poisson streams with the rates given; patience is ignored.</p>
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

function graphSection(data: ReportData): Markup {
  const b = data.bottleneck;
  return html`<p class="explain">Each disc is a class of ${data.itemWord}; its area follows how many arrive per ${data.timeUnit}. A line joins two classes whose ${data.itemWord} can be matched${data.today.stable ? '; its width follows how many matches it carries today' : ''}. Candidate compatibilities are dashed: the ones the recommendation funds in dark blue, harmful ones dotted in orange and labelled.${ringWords(data, b)}</p>
${figure('chart-graph', graphSvg(data.graph), `Compatibility graph of ${data.scenario}${data.today.stable ? ", with today's match rates" : ''}.`)}`;
}

function ringWords(data: ReportData, b: ReportData['bottleneck']): string {
  if (!data.today.stable) {
    return data.graph.nodes.some((v) => v.bottleneck) ? ' The dashed orange ring marks the overloaded group: its classes arrive faster than the classes that can serve them.' : '';
  }
  return b ? ` The dashed orange ring marks the tightest group (${b.set.length === 1 ? 'one class' : `${b.set.length} classes`}): the classes that can serve it have the least capacity to spare.` : '';
}

function changeList(d: { added: readonly Pair[]; removed: readonly Pair[] }, name: Namer): Markup {
  if (d.added.length === 0 && d.removed.length === 0) return html`<span class="muted">no change</span>`;
  return html`${d.added.length > 0 ? html`fund ${listWords(d.added.map((p) => pairWords(p, name)))}` : ''}${d.added.length > 0 && d.removed.length > 0 ? '; ' : ''}${d.removed.length > 0 ? html`drop ${listWords(d.removed.map((p) => pairWords(p, name)))}` : ''}`;
}

function paretoSection(data: ReportData, name: Namer): Markup {
  const chosen = data.designs[0];
  const chart = paretoChart({
    front: data.front,
    baselines: data.baselines.filter((b) => Number.isFinite(b.backlog)),
    ...(chosen && chosen.stable ? { chosen: { cost: chosen.cost, backlog: chosen.backlog } } : {}),
    ...(data.budget !== null ? { budget: data.budget } : {}),
    costUnit: data.costUnit,
    itemWord: data.itemWord,
  });
  const rows = data.front.map(
    (p) => html`<tr${chosen && p.cost === chosen.cost && p.backlog === chosen.backlog ? raw(' class="flag-good"') : ''}><td class="n">${fmt(p.cost)}</td><td class="n">${fmt(p.backlog)}</td><td class="n">${fmt(p.maxWait)}</td><td>${changeList(p, name)}</td></tr>`,
  );
  const base = data.baselines.map((b) => {
    const gap = Number.isFinite(b.backlog) && Number.isFinite(b.frontAtCost) ? b.backlog - b.frontAtCost : NaN;
    const verdict = !Number.isFinite(b.backlog)
      ? 'cannot keep up'
      : !b.withinBudget
        ? 'over the budget'
        : !Number.isFinite(gap)
          ? '—'
          : gap > 1e-9 * Math.max(1, b.backlog)
            ? `${fmt(gap)} more waiting than the best design at this cost`
            : 'on the front';
    return html`<tr><td>${b.name}</td><td class="n">${fmt(b.cost)}</td><td class="n">${Number.isFinite(b.backlog) ? fmt(b.backlog) : 'unstable'}</td><td>${verdict}</td></tr>`;
  });
  return html`<p class="explain">Each dot of the front is a design that no other design beats on both cost and waiting: moving right buys less waiting. The grey shapes are simple designs to compare against. Costs count added candidates minus savings of dropped compatibilities.</p>
${figure('chart-pareto', chart, `Added cost (${data.costUnit}) against the mean number of ${data.itemWord} waiting.`)}
${data.front.length > 0 ? html`<h3>The best designs</h3><table><thead><tr><th class="n">cost</th><th class="n">${data.itemWord} waiting</th><th class="n">longest mean wait (${plural(data.timeUnit)})</th><th>changes to today's design</th></tr></thead><tbody>${rows}</tbody></table>` : ''}
${data.baselines.length > 0 ? html`<h3>Simple designs for comparison</h3><table><thead><tr><th>design</th><th class="n">cost</th><th class="n">${data.itemWord} waiting</th><th>against the front</th></tr></thead><tbody>${base}</tbody></table>` : ''}`;
}

function waitSection(data: ReportData): Markup {
  const series = [data.today, ...data.designs].map((d) => ({ name: d.name, role: d.role, waits: d.stable ? d.waits : null }));
  const unstable = [data.today, ...data.designs].filter((d) => !d.stable);
  const chart = waitChart({ classes: data.classes, series, timeUnit: data.timeUnit });
  return html`<p class="explain">Mean time an arrival of each class waits before it is matched, in ${plural(data.timeUnit)}.${unstable.length > 0 ? ` ${listWords(unstable.map((d) => d.name))}: not shown, because waits grow without bound.` : ''}</p>
${figure('chart-waits', chart, `Mean wait per class (${plural(data.timeUnit)}), today's design and the recommended design${data.designs.length > 1 ? 's' : ''}.`)}`;
}

function sweepSection(data: ReportData, name: Namer): Markup {
  const s = data.sweep!;
  const grow = listWords(s.grow.map(name));
  const chart = sweepChart({
    curves: s.curves,
    crossovers: s.crossovers,
    loadLabel: `Demand of ${grow} (× today)`,
    itemWord: data.itemWord,
  });
  return html`<p class="explain">What happens if the busiest group, ${grow}, grows while every other class stays as today. Each curve is exact; a curve ends where that design can no longer keep up.${s.crossovers.length > 0 ? ' Where two curves cross, a change that helps at today’s demand starts to hurt, or the other way round.' : ''}</p>
${figure('chart-sweep', chart, `Mean number of ${data.itemWord} waiting as the demand of ${grow} grows.`)}`;
}

function sensitivitySection(data: ReportData, name: Namer): Markup {
  const base = data.today.stable ? data.today.backlog : NaN;
  const rows = [...data.sensitivity].sort(sensitivityOrder).map((r) => sensitivityRow(r, base, data, name));
  return html`<p class="explain">Each row changes today's design by one compatibility and evaluates the result exactly. A <span class="tag bad">harmful</span> addition raises waiting although it adds flexibility; a <span class="tag good">worth dropping</span> removal lowers waiting or keeps it while saving money. “Predicted” says whether the published near-saturation condition (“Flexibility can hurt dynamic matching system performance”, SIGMETRICS Perform. Eval. Rev. 2022, from memory) expected it; the verdict itself is always the exact one.</p>
<p class="muted">Costs and savings in ${data.costUnit}; waiting is the mean number of ${data.itemWord} waiting.</p>
<table class="changes"><thead><tr><th>single change</th><th class="n">cost</th><th class="n">${data.itemWord} waiting</th><th class="n">difference</th><th>flag</th><th>what to do</th></tr></thead><tbody>${rows}</tbody></table>`;
}

function sensitivityOrder(a: SensitivityRow, b: SensitivityRow): number {
  const rank = (r: SensitivityRow): number => (r.flagged ? 0 : !r.stable ? 2 : 1);
  return rank(a) - rank(b) || (a.kind === b.kind ? 0 : a.kind === 'add' ? -1 : 1) || a.delta - b.delta;
}

function sensitivityRow(r: SensitivityRow, base: number, data: ReportData, name: Namer): Markup {
  const cls = r.flagged ? (r.kind === 'add' ? ' class="flag-bad"' : ' class="flag-good"') : '';
  const tag = r.flagged
    ? r.kind === 'add'
      ? html`<span class="tag bad">harmful</span>`
      : html`<span class="tag good">worth dropping</span>`
    : !r.stable
      ? html`<span class="tag stop">breaks stability</span>`
      : '';
  const pred = r.predicted === null ? '' : html`${tag ? raw('<br>') : ''}<span class="muted">${r.predicted ? 'predicted' : 'not predicted'}</span>`;
  const money = r.kind === 'add' ? fmt(r.money) : `−${fmt(r.money)}`;
  const what = r.kind === 'add' ? `add ${pairWords(r.pair, name)}` : `drop ${pairWords(r.pair, name)}`;
  return html`<tr${raw(cls)}><td>${what}</td><td class="n">${money}</td><td class="n">${r.stable ? fmt(r.backlog) : 'unbounded'}</td><td class="n">${r.stable && Number.isFinite(r.delta) ? signed(r.delta) : '—'}</td><td>${tag}${pred}</td><td>${rowAdvice(r, base)}${r.instability ? html`<br><span class="muted">${r.instability}</span>` : ''}${r.why ? html`<br><span class="why">${r.why}</span>` : ''}</td></tr>`;
}

function variantSection(data: ReportData, name: Namer): Markup {
  const designs: DesignView[] = [data.today, ...data.designs];
  const head = html`<tr><th>design</th><th class="n">today</th>${data.variants.map((v) => html`<th class="n">${v}</th>`)}<th class="n">worst case</th></tr>`;
  const cell = (stable: boolean, backlog: number): Markup => (stable ? html`${fmt(backlog)}` : html`<span class="tag stop">unstable</span>`);
  const rows = designs.map((d) => {
    const w = worstCase(d, data.variants);
    return html`<tr><td><b>${d.name}</b><br><span class="muted">${changeList(d, name)}</span></td><td class="n">${cell(d.stable, d.backlog)}</td>${d.underVariants.map((o) => html`<td class="n">${cell(o.stable, o.backlog)}</td>`)}<td class="n"><b>${Number.isFinite(w.backlog) ? fmt(w.backlog) : 'unstable'}</b><br><span class="muted">${w.where}</span></td></tr>`;
  });
  return html`<p class="explain">Mean number of ${data.itemWord} waiting for each design under today's rates and under every demand variant of the scenario. The worst case shows how robust a choice is.</p>
<table><thead>${head}</thead><tbody>${rows}</tbody></table>`;
}

