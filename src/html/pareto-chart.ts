/**
 * The cost/backlog chart: the Pareto front (designs no other design beats on both cost and
 * backlog) as a step line with dots, the baselines as distinct shapes with their names beside
 * them, the recommended design ringed and the budget as a dashed rule. Baselines at the same point
 * share one label ("A = B"); every label is placed clear of the other labels and of every marker.
 * The legend is drawn inside the chart. Axes by Observable Plot (plot-dom.ts).
 */
import { html, type Markup } from './escape.js';
import { boxAt, boxesMeet, cheapestFree, placeText, polylineMeetsBox, type Box, type PlacedText } from './label-placement.js';
import { markerPath, markerReach, type MarkerShape } from './markers.js';
import { INK, SERIES, SERIES_TEXT } from './palette.js';
import { Plot, renderPlot, type PlotFrame } from './plot-dom.js';
import { legendLayout, legendMarkup, type LegendItem } from './svg-legend.js';
import { textSvg } from './svg-text.js';
import { fitText } from './text-metrics.js';

export interface ParetoChartInput {
  readonly front: ReadonlyArray<{ readonly cost: number; readonly backlog: number }>;
  readonly baselines: ReadonlyArray<{ readonly name: string; readonly cost: number; readonly backlog: number }>;
  /** The design the report recommends (ringed). */
  readonly chosen?: { readonly cost: number; readonly backlog: number };
  readonly budget?: number;
  readonly costUnit: string;
  readonly itemWord: string;
}

const WIDTH = 760;
const PLOT_H = 360;
const FRONT = 'best designs (Pareto front)';
const SHAPES: readonly MarkerShape[] = ['square', 'diamond', 'triangle', 'triangle-down', 'cross', 'times', 'hexagon'];
const MARK = 4.6;
const LABEL_SIZE = 11;
const BASE_INK = SERIES_TEXT.today;

export function paretoChart(input: ParetoChartInput): Markup {
  const front = [...input.front].filter((p) => Number.isFinite(p.cost) && Number.isFinite(p.backlog)).sort((a, b) => a.cost - b.cost || a.backlog - b.backlog);
  const bases = input.baselines.filter((b) => Number.isFinite(b.backlog) && Number.isFinite(b.cost));
  const budget = input.budget !== undefined && Number.isFinite(input.budget) ? input.budget : undefined;
  const all = [...front, ...bases, ...(input.chosen ? [input.chosen] : [])];
  const xmin = Math.min(0, ...all.map((p) => p.cost));
  const xmax = Math.max(0, ...all.map((p) => p.cost), budget ?? 0);

  const items: LegendItem[] = [];
  if (front.length > 0) items.push({ sample: html`<line x1="1" x2="29" y1="0" y2="0" stroke="${SERIES.recommended}" stroke-width="2"/><path d="${markerPath('circle', MARK, 15, 0)}" fill="${SERIES.recommended}" fill-opacity="0.18" stroke="${SERIES.recommended}" stroke-width="2"/>`, sampleWidth: 30, text: FRONT });
  if (input.chosen) items.push({ sample: html`<circle cx="11" cy="0" r="9" fill="none" stroke="${SERIES.recommended}" stroke-width="2"/>`, sampleWidth: 22, text: 'recommended' });
  bases.forEach((b, k) => items.push({ sample: html`<path d="${markerPath(SHAPES[k % SHAPES.length]!, MARK, 9, 0)}" fill="${SERIES.today}" fill-opacity="0.18" stroke="${SERIES.today}" stroke-width="2"/>`, sampleWidth: 18, text: b.name }));
  if (budget !== undefined) items.push({ sample: html`<line x1="1" x2="29" y1="0" y2="0" stroke="${SERIES.warning}" stroke-width="1.5" stroke-dasharray="6 4"/>`, sampleWidth: 30, text: 'budget' });
  const legend = legendLayout(items, WIDTH, 12);

  const marks: Plot.Markish[] = [Plot.ruleY([0], { stroke: '#9aa1ac' })];
  if (budget !== undefined) marks.push(Plot.ruleX([budget], { stroke: SERIES.warning, strokeWidth: 1.5, strokeDasharray: '6 4' }));
  if (front.length > 1) marks.push(Plot.line(front, { x: 'cost', y: 'backlog', curve: 'step-after', stroke: SERIES.recommended, strokeWidth: 2 }));

  const overlay = (f: PlotFrame): Markup => {
    const reach = markerReach(MARK);
    const markerBoxes: Box[] = [];
    const frontPx = front.map((p) => [f.x(p.cost), f.y(p.backlog)] as const);
    const basePx = bases.map((b) => [f.x(b.cost), f.y(b.backlog)] as const);
    const frontDots = frontPx.map(([x, y]) => html`<circle class="marker front" cx="${r1(x)}" cy="${r1(y)}" r="${MARK}"/>`);
    for (const [x, y] of [...frontPx, ...basePx]) markerBoxes.push(boxAt(x, y, 2 * reach, 2 * reach, 0.5, 0.5));
    const chosenPx = input.chosen ? ([f.x(input.chosen.cost), f.y(input.chosen.backlog)] as const) : null;
    if (chosenPx) markerBoxes.push(boxAt(chosenPx[0], chosenPx[1], 24, 24, 0.5, 0.5));
    // the front as drawn (step-after), and the budget rule, for "crosses a line" costs
    const step: number[] = [];
    frontPx.forEach(([x, y], k) => {
      if (k > 0) step.push(x, frontPx[k - 1]![1]);
      step.push(x, y);
    });
    const rule = budget !== undefined ? [f.x(budget), f.top, f.x(budget), f.bottom] : [];
    const crossings = (b: Box): number => (step.length >= 4 && polylineMeetsBox(step, b) ? 1 : 0) + (rule.length > 0 && polylineMeetsBox(rule, b) ? 1 : 0);
    const area: Box = { x0: f.left + 2, y0: f.top - 14, x1: WIDTH - 2, y1: f.bottom - 2 };
    const yLabel = placeText([{ text: fitText(`↑ Mean number of ${input.itemWord} waiting`, WIDTH - 20, 12), size: 12 }], 6, f.top - 10, 0, 1);
    const placed: PlacedText[] = [yLabel];
    const free = (b: Box): boolean =>
      b.x0 >= area.x0 && b.x1 <= area.x1 && b.y0 >= area.y0 && b.y1 <= area.y1 && placed.every((o) => !boxesMeet(o.box, b, 2)) && markerBoxes.every((m) => !boxesMeet(m, b, 1));
    const around = (x: number, y: number, lines: PlacedText['lines'], gap: number): PlacedText[] => {
      const out: PlacedText[] = [];
      for (let t = 0; t < 4; t++) {
        const d = gap + t * 11;
        out.push(
          placeText(lines, x + d, y, 0, 0.5),
          placeText(lines, x + d * 0.75, y - d * 0.75, 0, 1),
          placeText(lines, x + d * 0.75, y + d * 0.75, 0, 0),
          placeText(lines, x, y - d, 0.5, 1),
          placeText(lines, x, y + d, 0.5, 0),
          placeText(lines, x - d, y, 1, 0.5),
          placeText(lines, x - d * 0.75, y - d * 0.75, 1, 1),
          placeText(lines, x - d * 0.75, y + d * 0.75, 1, 0),
        );
      }
      return out;
    };
    const labels: Markup[] = [];
    const put = (cands: readonly PlacedText[], cls: string, fill: string): void => {
      const got = cheapestFree(cands, (k) => (k % 8) + Math.floor(k / 8) * 6, free, (b) => crossings(b) * 4);
      if (!got) return;
      placed.push(got);
      labels.push(textSvg(got, cls, [fill]));
    };
    if (chosenPx) put(around(chosenPx[0], chosenPx[1], [{ text: 'recommended', size: LABEL_SIZE, bold: true }], 13), 'chosen-label', SERIES.recommended);
    // baselines at the same point (within a pixel) share one label
    const groups: Array<{ names: string[]; x: number; y: number }> = [];
    bases.forEach((b, k) => {
      const [x, y] = basePx[k]!;
      const g = groups.find((o) => Math.abs(o.x - x) <= 1 && Math.abs(o.y - y) <= 1);
      if (g) g.names.push(b.name);
      else groups.push({ names: [b.name], x, y });
    });
    for (const g of groups) put(around(g.x, g.y, [{ text: fitText(g.names.join(' = '), 300, LABEL_SIZE), size: LABEL_SIZE }], reach + 4), 'baseline-label', BASE_INK);
    if (budget !== undefined) {
      const bx = f.x(budget);
      const lines = [{ text: 'budget', size: LABEL_SIZE, bold: true }];
      const cands: PlacedText[] = [];
      for (let k = 0; k < 16; k++) cands.push(placeText(lines, bx + 4, f.bottom - 6 - k * 14, 0, 1), placeText(lines, bx - 4, f.bottom - 6 - k * 14, 1, 1));
      const got = cheapestFree(cands, (k) => k, free, (b) => (step.length >= 4 && polylineMeetsBox(step, b) ? 3 : 0));
      if (got) {
        placed.push(got);
        labels.push(textSvg(got, 'budget-label', [SERIES_TEXT.warning]));
      }
    }
    const baseMarks = bases.map((_, k) => html`<path class="marker baseline" transform="translate(${r1(basePx[k]![0])},${r1(basePx[k]![1])})" d="${markerPath(SHAPES[k % SHAPES.length]!, MARK)}"/>`);
    const ring = chosenPx ? html`<circle class="chosen" cx="${r1(chosenPx[0])}" cy="${r1(chosenPx[1])}" r="10" fill="none" stroke="${SERIES.recommended}" stroke-width="2"/>` : '';
    return html`${textSvg(yLabel, 'axis-label', [INK], false)}<g class="front" fill="${SERIES.recommended}" fill-opacity="0.18" stroke="${SERIES.recommended}" stroke-width="2">${frontDots}</g><g class="baselines" fill="${SERIES.today}" fill-opacity="0.18" stroke="${SERIES.today}" stroke-width="2">${baseMarks}</g>${ring}${labels}`;
  };

  return renderPlot(
    {
      width: WIDTH,
      height: PLOT_H,
      marginLeft: 64,
      marginRight: 24,
      marginTop: 28,
      marginBottom: 44,
      style: { fontSize: '12px' },
      x: { label: fitText(`Added cost (${input.costUnit}) →`, WIDTH - 120, 12), domain: [xmin, xmax * 1.04 + 1e-9], grid: true, labelAnchor: 'right' },
      y: { label: null, grid: true, zero: true, nice: true },
      insetTop: 14,
      marks,
    },
    { header: { height: legend.height + 4, markup: legendMarkup(legend, 2, INK) }, overlay },
  );
}

const r1 = (x: number): string => (Math.round(x * 10) / 10).toString();
