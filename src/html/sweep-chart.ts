/**
 * Load-sweep curves: the exact mean backlog of today's design and of its variants as the demand of
 * the bottleneck classes grows towards the stability limit. Every curve has its own colour, dash
 * pattern and marker shape, a legend entry inside the chart and a direct label at its end placed
 * clear of other labels and markers; curves that coincide (within a pixel along their whole
 * length) share one label "A = B" and show their markers alternately. Crossovers are marked by
 * rules with labels that keep clear of each other. Axes by Observable Plot (plot-dom.ts).
 */
import { html, raw, type Markup } from './escape.js';
import { boxAt, boxesMeet, cheapestFree, placeText, polylineMeetsBox, type Box, type PlacedText } from './label-placement.js';
import { EXTRA_SHAPES, markerPath, markerReach, type MarkerShape } from './markers.js';
import { DASH, INK, MUTED, SERIES, SERIES_TEXT, SYMBOL, type SeriesRole } from './palette.js';
import { Plot, renderPlot, type PlotFrame } from './plot-dom.js';
import { legendLayout, legendMarkup, type LegendItem } from './svg-legend.js';
import { textSvg } from './svg-text.js';
import { fitText, textWidth, wrapText } from './text-metrics.js';
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

const WIDTH = 760;
const PLOT_H = 360;
const LABEL_SIZE = 11;
/** Dash patterns for a second, third… curve of the same role (none equals a role's own). */
const EXTRA_DASHES = ['8 3 2 3', '14 4', '3 2 3 6', '1 3'];
const MARK = 3.3;

export interface CurveStyle {
  readonly colour: string;
  readonly dash: string;
  readonly shape: MarkerShape;
}

/** Colour from the role; dash pattern and marker from the role for its first curve, then unused ones. */
export function curveStyles(curves: readonly SweepCurve[]): CurveStyle[] {
  const usedDash = new Set<string>();
  const usedShape = new Set<MarkerShape>();
  const roleDashes = new Set(Object.values(DASH));
  return curves.map((c) => {
    let dash = DASH[c.role];
    if (usedDash.has(dash)) dash = EXTRA_DASHES.find((d) => !usedDash.has(d) && !roleDashes.has(d)) ?? dash;
    usedDash.add(dash);
    let shape = SYMBOL[c.role] as MarkerShape;
    if (usedShape.has(shape)) shape = EXTRA_SHAPES.find((s) => !usedShape.has(s)) ?? shape;
    usedShape.add(shape);
    return { colour: SERIES[c.role], dash, shape };
  });
}

/**
 * Curves that coincide: same load range and backlogs within `tolerance` pixels at every point of
 * either (the other interpolated there). Returns groups of curve indices, in curve order.
 */
export function coincidentGroups(pixels: ReadonlyArray<ReadonlyArray<readonly [number, number]>>, tolerance = 1): number[][] {
  const at = (p: ReadonlyArray<readonly [number, number]>, x: number): number | null => {
    if (p.length === 0 || x < p[0]![0] - 1e-9 || x > p[p.length - 1]![0] + 1e-9) return null;
    for (let k = 0; k < p.length; k++) {
      if (Math.abs(p[k]![0] - x) <= 1e-9) return p[k]![1];
      if (k + 1 < p.length && p[k]![0] < x && x < p[k + 1]![0]) {
        const t = (x - p[k]![0]) / (p[k + 1]![0] - p[k]![0]);
        return p[k]![1] + t * (p[k + 1]![1] - p[k]![1]);
      }
    }
    return null;
  };
  const same = (a: ReadonlyArray<readonly [number, number]>, b: ReadonlyArray<readonly [number, number]>): boolean => {
    if (a.length === 0 || b.length === 0) return false;
    if (Math.abs(a[0]![0] - b[0]![0]) > tolerance || Math.abs(a[a.length - 1]![0] - b[b.length - 1]![0]) > tolerance) return false;
    for (const [p, q] of [[a, b], [b, a]] as const) {
      for (const [x, y] of p) {
        const xc = Math.min(Math.max(x, q[0]![0]), q[q.length - 1]![0]);
        const v = at(q, xc);
        if (v === null || Math.abs(v - y) > tolerance) return false;
      }
    }
    return true;
  };
  const group = pixels.map((_, i) => i);
  for (let i = 0; i < pixels.length; i++) {
    for (let j = 0; j < i; j++) {
      if (group[j] === j && same(pixels[i]!, pixels[j]!)) {
        group[i] = j;
        break;
      }
    }
  }
  const out: number[][] = [];
  group.forEach((g, i) => {
    if (g === i) out.push([i]);
    else out.find((o) => o[0] === g)!.push(i);
  });
  return out;
}

export function sweepChart(input: SweepChartInput): Markup {
  const curves = input.curves.map((c) => ({ ...c, points: [...c.points].filter((p) => Number.isFinite(p.backlog) && p.backlog > 0 && Number.isFinite(p.load)).sort((a, b) => a.load - b.load) }));
  const styles = curveStyles(curves);
  const ys = curves.flatMap((c) => c.points.map((p) => p.backlog));
  const lo = ys.length > 0 ? Math.min(...ys) : 1;
  const hi = ys.length > 0 ? Math.max(...ys) : 1;
  const log = hi / lo > 30;

  const legendItems: LegendItem[] = curves.map((c, k) => ({ sample: lineSample(styles[k]!), sampleWidth: 36, text: c.name }));
  const legend = legendLayout(legendItems, WIDTH, 12);
  const names = curves.map((c) => c.name);
  // room on the right for end labels: the longest group label, within reason
  const longest = Math.max(40, ...names.map((s) => textWidth(`${s} =`, LABEL_SIZE, true)));
  const marginRight = Math.min(190, longest + 18);
  const marginLeft = 64;
  const xLabel = wrapText(`${input.loadLabel} →`, WIDTH - marginLeft - 12, 12);
  const footerH = xLabel.length * 15 + 4;

  const marks: Plot.Markish[] = [];
  for (const x of input.crossovers) marks.push(Plot.ruleX([x.load], { stroke: SERIES.warning, strokeDasharray: '3 3', strokeWidth: 1.5 }));
  curves.forEach((c, k) => {
    if (c.points.length === 0) return;
    marks.push(Plot.line(c.points, { x: 'load', y: 'backlog', stroke: styles[k]!.colour, strokeWidth: 2.4, strokeDasharray: styles[k]!.dash || undefined }));
  });

  const overlay = (f: PlotFrame): Markup => {
    const pix = curves.map((c) => c.points.map((p) => [f.x(p.load), f.y(p.backlog)] as const));
    const groups = coincidentGroups(pix);
    const groupOf = new Map<number, number[]>();
    for (const g of groups) for (const i of g) groupOf.set(i, g);
    // markers: every point (or every s-th), members of a coincident group take turns
    const markers: Markup[] = [];
    const markerBoxes: Box[] = [];
    curves.forEach((c, k) => {
      const g = groupOf.get(k)!;
      const turn = g.indexOf(k);
      const step = Math.max(g.length, Math.ceil(c.points.length / 10));
      const shape = markerPath(styles[k]!.shape, MARK);
      const dots: Markup[] = [];
      pix[k]!.forEach(([x, y], j) => {
        if ((j + turn) % step !== 0) return;
        dots.push(html`<path transform="translate(${r1(x)},${r1(y)})" d="${shape}"/>`);
        markerBoxes.push(boxAt(x, y, 2 * markerReach(MARK), 2 * markerReach(MARK), 0.5, 0.5));
      });
      markers.push(html`<g class="markers" data-curve="${k}" fill="${styles[k]!.colour}" stroke="white" stroke-width="0.8">${dots}</g>`);
    });
    const polylines = pix.map((p) => p.flatMap(([x, y]) => [x, y]));
    const area: Box = { x0: f.left + 2, y0: f.top - 14, x1: WIDTH - 2, y1: f.bottom - 2 };
    const inside = (b: Box): boolean => b.x0 >= area.x0 && b.x1 <= area.x1 && b.y0 >= area.y0 && b.y1 <= area.y1;
    const yLabel = placeText([{ text: fitText(`↑ Mean number of ${input.itemWord} waiting${log ? ' (log scale)' : ''}`, WIDTH - 20, 12), size: 12 }], 6, f.top - 10, 0, 1);
    const placed: PlacedText[] = [yLabel];
    const leaders: Markup[] = [];
    const free = (b: Box): boolean => inside(b) && placed.every((o) => !boxesMeet(o.box, b, 2)) && markerBoxes.every((m) => !boxesMeet(m, b, 1));
    const crossings = (b: Box): number => polylines.filter((p) => polylineMeetsBox(p, b)).length;
    const labels: Markup[] = [];
    // end labels, the curve ending highest first
    const heads = groups.filter((g) => pix[g[0]!]!.length > 0).sort((a, b) => pix[a[0]!]!.at(-1)![1] - pix[b[0]!]!.at(-1)![1] || a[0]! - b[0]!);
    for (const g of heads) {
      const [ex, ey] = pix[g[0]!]!.at(-1)!;
      // one line per name, "A =" over "B" when curves coincide
      const room = Math.max(marginRight - 10, WIDTH - 12 - ex);
      const lines = g.flatMap((i, k) => wrapText(`${names[i]!}${k + 1 < g.length ? ' =' : ''}`, room, LABEL_SIZE, true).map((text) => ({ text, size: LABEL_SIZE, bold: true })));
      const cands: Array<PlacedText & { lead: boolean }> = [];
      for (let k = 0; k <= 8; k++) {
        for (const s of k === 0 ? [0] : [-1, 1]) cands.push({ ...placeText(lines, ex + 8, ey + s * k * 9, 0, 0.5), lead: k > 1 });
      }
      for (const [ax, ay, dx, dy] of [[0.5, 1, 0, -8], [0.5, 0, 0, 8], [1, 1, -6, -6], [1, 0, -6, 6], [1, 0.5, -8, 0], [1, 1, -6, -18], [1, 0, -6, 18]] as const) cands.push({ ...placeText(lines, ex + dx, ey + dy, ax, ay), lead: false });
      const got = cheapestFree(cands, (k) => k, free, (b) => crossings(b) * 6);
      if (!got) continue;
      placed.push(got);
      if (got.lead) leaders.push(html`<line x1="${r1(ex + 3)}" y1="${r1(ey)}" x2="${r1(got.box.x0 - 1)}" y2="${r1((got.box.y0 + got.box.y1) / 2)}" stroke="${MUTED}" stroke-width="0.8"/>`);
      labels.push(textSvg(got, 'curve-label', [SERIES_TEXT[curves[g[0]!]!.role]]));
    }
    // crossover labels along the bottom of the frame, stacked upwards when they would collide
    for (const c of input.crossovers) {
      const x = f.x(c.load);
      // one line when it fits beside the rule, otherwise wrapped into lines of at most a third of the chart
      const whole = `${c.label} at ×${fmt(c.load)}`;
      const roomBeside = Math.max(x - f.left - 8, WIDTH - 6 - x);
      const width = textWidth(whole, LABEL_SIZE, true) <= roomBeside ? roomBeside : Math.max(120, (WIDTH - marginLeft - marginRight) / 3);
      const lines = wrapText(whole, width, LABEL_SIZE, true).map((text) => ({ text, size: LABEL_SIZE, bold: true }));
      const cands: PlacedText[] = [];
      for (let k = 0; k < 20; k++) {
        cands.push(placeText(lines, x + 4, f.top + 4 + k * 14, 0, 0));
        cands.push(placeText(lines, x - 4, f.top + 4 + k * 14, 1, 0));
      }
      const got = cheapestFree(cands, (k) => k, free, (b) => crossings(b) * 3);
      if (!got) continue;
      placed.push(got);
      labels.push(textSvg(got, 'crossover-label', [SERIES_TEXT.warning]));
    }
    return html`${textSvg(yLabel, 'axis-label', [INK], false)}${markers}${leaders}${labels}`;
  };

  const chart = renderPlot(
    {
      width: WIDTH,
      height: PLOT_H,
      marginLeft,
      marginRight,
      marginTop: 28,
      marginBottom: 30,
      style: { fontSize: '12px' },
      x: { label: null, grid: true },
      y: log ? { type: 'log', label: null, grid: true } : { label: null, grid: true, zero: true },
      marks,
    },
    {
      header: { height: legend.height + 4, markup: legendMarkup(legend, 2, INK) },
      footer: { height: footerH, markup: html`${xLabel.map((l, k) => html`<text class="axis-label" x="${WIDTH - 12}" y="${12 + k * 15}" text-anchor="end" font-size="12" font-family="system-ui, sans-serif" fill="${INK}">${l}</text>`)}` },
      overlay,
    },
  );
  return chart;
}

const r1 = (x: number): string => (Math.round(x * 10) / 10).toString();

/** A legend sample: the curve's line with its dash pattern and its marker in the middle. */
export function lineSample(s: CurveStyle): Markup {
  return html`<line x1="1" y1="0" x2="35" y2="0" stroke="${s.colour}" stroke-width="2.6" stroke-linecap="round"${s.dash ? raw(` stroke-dasharray="${s.dash}"`) : ''}/><path d="${markerPath(s.shape, 4, 18, 0)}" fill="${s.colour}" stroke="white" stroke-width="0.8"/>`;
}

