/**
 * The cost/backlog chart: the Pareto front (designs no other design beats on both cost and
 * backlog) as a step line with dots, the baselines as distinct shapes with their names beside
 * them, and the budget as a dashed rule. Rendered by Observable Plot (plot-dom.ts).
 */
import type { Markup } from './escape.js';
import { SERIES } from './palette.js';
import { Plot, renderPlot } from './plot-dom.js';

export interface ParetoChartInput {
  readonly front: ReadonlyArray<{ readonly cost: number; readonly backlog: number }>;
  readonly baselines: ReadonlyArray<{ readonly name: string; readonly cost: number; readonly backlog: number }>;
  /** The design the report recommends (ringed). */
  readonly chosen?: { readonly cost: number; readonly backlog: number };
  readonly budget?: number;
  readonly costUnit: string;
  readonly itemWord: string;
}

const FRONT = 'best designs (Pareto front)';
const SHAPES = ['square', 'diamond', 'triangle', 'star', 'cross', 'wye', 'times'] as const;

export function paretoChart(input: ParetoChartInput): Markup {
  const front = [...input.front].sort((a, b) => a.cost - b.cost || a.backlog - b.backlog);
  const bases = input.baselines.filter((b) => Number.isFinite(b.backlog) && Number.isFinite(b.cost));
  const names = [FRONT, ...bases.map((b) => b.name)];
  const points = [
    ...front.map((p) => ({ series: FRONT, cost: p.cost, backlog: p.backlog })),
    ...bases.map((b) => ({ series: b.name, cost: b.cost, backlog: b.backlog })),
  ];
  const colour = names.map((n, k) => (k === 0 ? SERIES.recommended : SERIES.today));
  const symbols = names.map((n, k) => (k === 0 ? 'circle' : SHAPES[(k - 1) % SHAPES.length]!));
  const marks: Plot.Markish[] = [Plot.ruleY([0], { stroke: '#9aa1ac' })];
  if (input.budget !== undefined && Number.isFinite(input.budget)) {
    marks.push(Plot.ruleX([input.budget], { stroke: SERIES.warning, strokeWidth: 1.5, strokeDasharray: '6 4' }));
    marks.push(Plot.text([input.budget], { x: (d: number) => d, frameAnchor: 'bottom', dy: -6, dx: 4, textAnchor: 'start', text: () => 'budget', fill: SERIES.warning, fontWeight: 600, stroke: 'white', strokeWidth: 3, paintOrder: 'stroke' }));
  }
  if (front.length > 1) {
    marks.push(Plot.line(front, { x: 'cost', y: 'backlog', curve: 'step-after', stroke: SERIES.recommended, strokeWidth: 2 }));
  }
  marks.push(Plot.dot(points, { x: 'cost', y: 'backlog', symbol: 'series', stroke: 'series', fill: 'series', fillOpacity: 0.18, r: 5.5, strokeWidth: 2, tip: false }));
  for (const label of baselineLabels(bases, front, input.budget)) {
    marks.push(
      Plot.text([label], { x: 'cost', y: 'backlog', text: 'name', dx: 8, dy: label.dy, textAnchor: 'start', fill: '#3b4250', stroke: 'white', strokeWidth: 3, paintOrder: 'stroke', fontSize: 11 }),
    );
  }
  if (input.chosen) {
    marks.push(Plot.dot([input.chosen], { x: 'cost', y: 'backlog', r: 10, stroke: SERIES.recommended, strokeWidth: 2, fill: 'none' }));
    marks.push(Plot.text([input.chosen], { x: 'cost', y: 'backlog', text: () => 'recommended', dy: -16, fill: SERIES.recommended, fontWeight: 700, stroke: 'white', strokeWidth: 3, paintOrder: 'stroke', fontSize: 11 }));
  }
  const maxCost = Math.max(0, ...points.map((p) => p.cost), input.budget ?? 0);
  return renderPlot({
    width: 760,
    height: 360,
    marginLeft: 64,
    marginRight: 110,
    marginTop: 28,
    marginBottom: 44,
    style: { fontSize: '12px' },
    x: { label: `Added cost (${input.costUnit}) →`, domain: [Math.min(0, ...points.map((p) => p.cost)), maxCost * 1.04 + 1e-9], grid: true, labelAnchor: 'right' },
    y: { label: `↑ Mean number of ${input.itemWord} waiting`, grid: true, zero: true, nice: true, labelAnchor: 'top' },
    insetTop: 14,
    color: { domain: names, range: colour },
    symbol: { domain: names, range: symbols, legend: true },
    marks,
  });
}

/**
 * One label per distinct baseline point (coinciding baselines share one label, "a = b"), nudged
 * down when it would sit on top of the previous label. Positions are estimated on the chart's own
 * scales (same domains and margins as below), so labels rarely collide.
 */
function baselineLabels(
  bases: ReadonlyArray<{ readonly name: string; readonly cost: number; readonly backlog: number }>,
  front: ReadonlyArray<{ readonly cost: number; readonly backlog: number }>,
  budget: number | undefined,
): Array<{ name: string; cost: number; backlog: number; dy: number }> {
  const same = (a: number, b: number): boolean => Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
  const groups: Array<{ name: string; cost: number; backlog: number; dy: number }> = [];
  for (const b of bases) {
    const g = groups.find((x) => same(x.cost, b.cost) && same(x.backlog, b.backlog));
    if (g) g.name = `${g.name} = ${b.name}`;
    else groups.push({ name: b.name, cost: b.cost, backlog: b.backlog, dy: -11 });
  }
  const all = [...front, ...bases];
  const xmin = Math.min(0, ...all.map((p) => p.cost));
  const xmax = Math.max(0, ...all.map((p) => p.cost), budget ?? 0) * 1.04 + 1e-9;
  const ymax = Math.max(1e-9, ...all.map((p) => p.backlog));
  const px = (c: number): number => ((c - xmin) / (xmax - xmin || 1)) * (760 - 64 - 110);
  const py = (b: number): number => (1 - b / ymax) * (360 - 28 - 44 - 14);
  groups.sort((a, b) => b.backlog - a.backlog || a.cost - b.cost);
  const placed: Array<{ x: number; y: number; w: number }> = [];
  for (const g of groups) {
    const x = px(g.cost) + 8;
    const w = g.name.length * 6.2;
    for (const dy of [-11, 14, -25, 28, -39, 42]) {
      const y = py(g.backlog) + dy;
      if (placed.every((p) => Math.abs(p.y - y) > 13 || p.x + p.w < x || x + w < p.x)) {
        g.dy = dy;
        placed.push({ x, y, w });
        break;
      }
    }
  }
  return groups;
}
