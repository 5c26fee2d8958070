/**
 * Load-sweep curves: the exact mean backlog of today's design and of its variants as the demand of
 * the bottleneck classes grows towards the stability limit; each curve has its own colour, dash
 * pattern and end label, and crossovers are marked. Rendered by Observable Plot (plot-dom.ts).
 */
import { html, raw, type Markup } from './escape.js';
import { DASH, SERIES, type SeriesRole } from './palette.js';
import { Plot, renderPlot } from './plot-dom.js';
import { num as fmt } from '../output/format.js';

export interface SweepCurve {
  readonly name: string;
  readonly role: SeriesRole;
  /** Points (load, backlog); unstable points are left out by the caller. */
  readonly points: ReadonlyArray<{ readonly load: number; readonly backlog: number }>;
}

export interface SweepChartInput {
  readonly curves: readonly SweepCurve[];
  /** Loads where a variant starts to help or hurt. */
  readonly crossovers: ReadonlyArray<{ readonly load: number; readonly label: string }>;
  /** Axis label of the load, e.g. "Demand of archer and mage (× today)". */
  readonly loadLabel: string;
  readonly itemWord: string;
}

export function sweepChart(input: SweepChartInput): Markup {
  const all = input.curves.flatMap((c) => c.points);
  const ys = all.map((p) => p.backlog).filter((v) => v > 0 && Number.isFinite(v));
  const lo = Math.min(...ys);
  const hi = Math.max(...ys);
  const log = hi / lo > 30;
  const marks: Plot.Markish[] = [];
  for (const x of input.crossovers) {
    marks.push(Plot.ruleX([x.load], { stroke: SERIES.warning, strokeDasharray: '3 3', strokeWidth: 1.5 }));
    marks.push(Plot.text([x], { x: 'load', text: (d: { load: number; label: string }) => `${d.label} at ×${fmt(d.load)}`, frameAnchor: 'bottom', dy: -6, dx: 4, textAnchor: 'start', fill: SERIES.warning, fontWeight: 600, stroke: 'white', strokeWidth: 3, paintOrder: 'stroke' }));
  }
  input.curves.forEach((c) => {
    const pts = c.points.filter((p) => Number.isFinite(p.backlog) && p.backlog > 0);
    if (pts.length === 0) return;
    marks.push(Plot.line(pts, { x: 'load', y: 'backlog', stroke: SERIES[c.role], strokeWidth: 2.4, strokeDasharray: DASH[c.role] || undefined }));
    marks.push(Plot.dot(pts, { x: 'load', y: 'backlog', fill: SERIES[c.role], r: 2.2 }));
  });
  // the legend pairs each name with its line sample (colour and dash), so curves that meet near
  // the limit stay identifiable without end labels fighting for the same spot
  const legend = html`<div class="line-legend">${input.curves.map(
    (c) =>
      html`<span class="line-key"><svg width="36" height="12" viewBox="0 0 36 12" aria-hidden="true"><line x1="2" y1="6" x2="34" y2="6" stroke="${SERIES[c.role]}" stroke-width="2.6" stroke-linecap="round"${DASH[c.role] ? raw(` stroke-dasharray="${DASH[c.role]}"`) : ''}/></svg>${c.name}</span>`,
  )}</div>`;
  const chart = renderPlot({
    width: 760,
    height: 360,
    marginLeft: 64,
    marginRight: 24,
    marginTop: 28,
    marginBottom: 44,
    style: { fontSize: '12px' },
    x: { label: `${input.loadLabel} →`, grid: true, labelAnchor: 'right' },
    y: log
      ? { type: 'log', label: `↑ Mean number of ${input.itemWord} waiting (log scale)`, grid: true, labelAnchor: 'top' }
      : { label: `↑ Mean number of ${input.itemWord} waiting`, grid: true, zero: true, labelAnchor: 'top' },
    marks,
  });
  return html`${legend}${chart}`;
}
