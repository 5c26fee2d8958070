/**
 * Per-class mean waits, grouped by class: today's design beside the recommended design(s), with
 * the value printed at the end of each bar. Rendered by Observable Plot (plot-dom.ts).
 */
import type { Markup } from './escape.js';
import { SERIES } from './palette.js';
import { Plot, renderPlot } from './plot-dom.js';
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

export function waitChart(input: WaitChartInput): Markup {
  const shown = input.series.filter((s) => s.waits !== null);
  const rows: Array<{ cls: string; design: string; wait: number }> = [];
  input.classes.forEach((c, k) => {
    for (const s of shown) rows.push({ cls: c.label, design: s.name, wait: s.waits![k]! });
  });
  const names = shown.map((s) => s.name);
  const colours = shown.map((s) => SERIES[s.role]);
  const barH = 13;
  const height = 48 + input.classes.length * (shown.length * barH + 12);
  const maxWait = Math.max(1e-9, ...rows.map((r) => r.wait));
  const longest = Math.max(...input.classes.map((c) => c.label.length));
  return renderPlot({
    width: 760,
    height,
    marginLeft: Math.min(230, 14 + longest * 6.6),
    marginRight: 56,
    marginTop: 26,
    marginBottom: 40,
    style: { fontSize: '12px' },
    x: { label: `Mean wait (${plural(input.timeUnit)}) →`, grid: true, domain: [0, maxWait * 1.08], labelAnchor: 'right' },
    y: { axis: null, domain: names },
    fy: { label: null, domain: input.classes.map((c) => c.label), padding: 0.12 },
    color: { domain: names, range: colours, legend: true },
    marks: [
      Plot.barX(rows, { x: 'wait', y: 'design', fy: 'cls', fill: 'design', insetTop: 0.5, insetBottom: 0.5 }),
      Plot.text(rows, { x: 'wait', y: 'design', fy: 'cls', text: (d: { wait: number }) => fmt(d.wait), dx: 4, textAnchor: 'start', fontSize: 10, fill: '#3b4250' }),
      Plot.ruleX([0], { stroke: '#9aa1ac' }),
    ],
  });
}
