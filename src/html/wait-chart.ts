/**
 * Per-class mean waits, grouped by class: today's design beside the recommended design(s), with
 * the value printed at the end of each bar; above 20 classes one row of markers per class instead
 * (the values are in the report's tables). Class names longer than the left margin are shortened
 * (with "…"); the legend is drawn inside the chart. Rendered by Observable Plot (plot-dom.ts).
 */
import { html, type Markup } from './escape.js';
import { EXTRA_SHAPES, markerPath, type MarkerShape } from './markers.js';
import { INK, SERIES, SYMBOL } from './palette.js';
import { Plot, renderPlot, type PlotFrame } from './plot-dom.js';
import { legendLayout, legendMarkup, type LegendItem } from './svg-legend.js';
import { fitText, textWidth } from './text-metrics.js';
import { num as fmt, plural } from '../output/format.js';

export interface WaitSeries {
  /** Legend name, e.g. "today" or "recommended (cost 30)". */
  readonly name: string;
  readonly role: 'today' | 'recommended' | 'alternative';
  /** Mean wait per class, in class order; null when the design is unstable. */
  readonly waits: ArrayLike<number> | null;
}

export interface WaitChartInput {
  readonly classes: ReadonlyArray<{ readonly label: string }>;
  readonly series: readonly WaitSeries[];
  readonly timeUnit: string;
}

const WIDTH = 760;
const CLASS_SIZE = 12;
const VALUE_SIZE = 10;
/** Height of one bar (a value label of 10 px needs about 12 px). */
const BAR = 14;

export function waitChart(input: WaitChartInput): Markup {
  return input.classes.length > DOTS_FROM ? waitDots(input) : waitBars(input);
}

/** Classes from which the chart draws one row of markers per class instead of one bar per design. */
export const DOTS_FROM = 20;

function classNames(input: WaitChartInput): { marginLeft: number; names: string[] } {
  const longest = Math.max(0, ...input.classes.map((c) => textWidth(c.label, CLASS_SIZE)));
  const marginLeft = Math.ceil(Math.min(230, 16 + longest));
  return { marginLeft, names: input.classes.map((c) => fitText(c.label, marginLeft - 14, CLASS_SIZE)) };
}

function legendOf(items: LegendItem[]): { height: number; markup: Markup } {
  const legend = legendLayout(items, WIDTH, 12);
  return { height: legend.height + 4, markup: legendMarkup(legend, 2, INK) };
}

function waitBars(input: WaitChartInput): Markup {
  const shown = input.series.filter((s) => s.waits !== null);
  const keys = input.classes.map((_, k) => String(k));
  const { marginLeft, names } = classNames(input);
  const rows: Array<{ cls: string; design: string; wait: number }> = [];
  input.classes.forEach((_, k) => {
    for (const s of shown) rows.push({ cls: keys[k]!, design: s.name, wait: s.waits![k]! });
  });
  const designs = shown.map((s) => s.name);
  const colours = shown.map((s) => SERIES[s.role]);
  const facet = Math.max(1, shown.length) * BAR + 10;
  const height = 26 + 40 + input.classes.length * facet;
  const maxWait = Math.max(1e-9, ...rows.map((r) => r.wait).filter((w) => Number.isFinite(w)));
  const longestValue = Math.max(0, ...rows.map((r) => textWidth(fmt(r.wait), VALUE_SIZE)));
  const items: LegendItem[] = shown.map((s) => ({ sample: html`<rect x="0" y="-6" width="14" height="12" fill="${SERIES[s.role]}"/>`, sampleWidth: 14, text: s.name }));
  return renderPlot(
    {
      width: WIDTH,
      height,
      marginLeft,
      marginRight: Math.ceil(Math.max(24, longestValue + 10)),
      marginTop: 26,
      marginBottom: 40,
      style: { fontSize: '12px' },
      x: { label: `Mean wait (${plural(input.timeUnit)}) →`, grid: true, domain: [0, maxWait * 1.04], labelAnchor: 'right' },
      y: { axis: null, domain: designs, paddingInner: 0, paddingOuter: 0 },
      fy: { label: null, domain: keys, padding: 10 / facet, tickFormat: (k: string) => names[Number(k)] ?? '' },
      color: { domain: designs, range: colours },
      marks: [
        Plot.barX(rows, { x: 'wait', y: 'design', fy: 'cls', fill: 'design', insetTop: 0.5, insetBottom: 0.5 }),
        Plot.text(rows, { x: 'wait', y: 'design', fy: 'cls', text: (d: { wait: number }) => fmt(d.wait), dx: 4, textAnchor: 'start', fontSize: VALUE_SIZE, fill: '#3b4250' }),
        Plot.ruleX([0], { stroke: '#9aa1ac' }),
      ],
    },
    { header: legendOf(items) },
  );
}

/**
 * Many classes: one row per class, one marker per design (its own shape and colour) on a thin rule
 * from the shortest to the longest wait, so that 40 classes fit on a page.
 */
function waitDots(input: WaitChartInput): Markup {
  const shown = input.series.filter((s) => s.waits !== null);
  const n = input.classes.length;
  const { marginLeft, names } = classNames(input);
  const shapes = shown.map((s, k) => (shown.findIndex((o) => o.role === s.role) === k ? (SYMBOL[s.role] as MarkerShape) : EXTRA_SHAPES[k % EXTRA_SHAPES.length]!));
  const waits = shown.flatMap((s) => Array.from({ length: n }, (_, k) => s.waits![k]!)).filter((w) => Number.isFinite(w));
  const maxWait = Math.max(1e-9, ...waits);
  const items: LegendItem[] = shown.map((s, k) => ({ sample: html`<path d="${markerPath(shapes[k]!, DOT, 7, 0)}" fill="${SERIES[s.role]}" stroke="white" stroke-width="0.8"/>`, sampleWidth: 14, text: s.name }));
  const ticks = Array.from({ length: n }, (_, k) => k);
  const overlay = (f: PlotFrame): Markup => {
    const rules: Markup[] = [];
    const dots: Markup[] = [];
    for (let k = 0; k < n; k++) {
      const xs = shown.map((s) => s.waits![k]!).filter((w) => Number.isFinite(w));
      if (xs.length === 0) continue;
      const y = f.y(k);
      rules.push(html`<line x1="${r1(f.x(Math.min(...xs)))}" x2="${r1(f.x(Math.max(...xs)))}" y1="${r1(y)}" y2="${r1(y)}" stroke="${RULE_INK}" stroke-width="1.5"/>`);
      shown.forEach((s, j) => {
        const w = s.waits![k]!;
        if (!Number.isFinite(w)) return;
        dots.push(html`<path class="marker" data-series="${j}" transform="translate(${r1(f.x(w))},${r1(y)})" d="${markerPath(shapes[j]!, DOT)}" fill="${SERIES[s.role]}" stroke="white" stroke-width="0.8"/>`);
      });
    }
    return html`${rules}${dots}`;
  };
  return renderPlot(
    {
      width: WIDTH,
      height: 26 + 40 + n * ROW,
      marginLeft,
      marginRight: 24,
      marginTop: 26,
      marginBottom: 40,
      style: { fontSize: '12px' },
      x: { label: `Mean wait (${plural(input.timeUnit)}) →`, grid: true, domain: [0, maxWait * 1.04], labelAnchor: 'right' },
      y: { label: null, domain: [n - 0.5, -0.5], ticks, tickFormat: (k: number) => names[k] ?? '', tickSize: 0 },
      marks: [Plot.ruleX([0], { stroke: '#9aa1ac' }), Plot.gridY(ticks, { stroke: '#e3e6eb', strokeOpacity: 1 })],
    },
    { header: legendOf(items), overlay },
  );
}

const DOT = 4.2;
/** Height of one class's row in the marker chart. */
const ROW = 17;
const RULE_INK = '#c3c8d0';
const r1 = (x: number): string => (Math.round(x * 10) / 10).toString();
