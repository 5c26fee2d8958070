import { parseHTML } from 'linkedom';
import { describe, expect, it } from 'vitest';
import { paretoChart } from '../../src/html/pareto-chart.js';
import { sweepChart } from '../../src/html/sweep-chart.js';
import { waitChart } from '../../src/html/wait-chart.js';

// The charts are rendered by Observable Plot (npm) in a linkedom DOM and read back with linkedom.
// Checks: every chart is an SVG with a viewBox and size, axis labels name the units, and the marks
// encode the data faithfully (positions affine in the values, bar lengths proportional to them;
// derived by hand from the definition of a linear scale with a zero baseline).

const doc = (markup: string) => parseHTML(`<!doctype html><html><body>${markup}</body></html>`).document;
function mainSvg(markup: string) {
  const d = doc(markup);
  const svgs = [...d.querySelectorAll('svg')].filter((s) => s.getAttribute('viewBox') && Number(s.getAttribute('width')) > 100);
  expect(svgs.length).toBe(1);
  return svgs[0]!;
}
const translate = (el: { getAttribute(name: string): string | null }): [number, number] => {
  const m = /translate\(([-\d.e]+),([-\d.e]+)\)/.exec(el.getAttribute('transform') ?? '')!;
  return [Number(m[1]), Number(m[2])];
};
function affine(values: number[], pixels: number[]): void {
  const k = (pixels[1]! - pixels[0]!) / (values[1]! - values[0]!);
  values.forEach((v, i) => expect(pixels[i]).toBeCloseTo(pixels[0]! + k * (v - values[0]!), 1));
}

describe('paretoChart', () => {
  const input = {
    front: [
      { cost: 0, backlog: 12 },
      { cost: 10, backlog: 7 },
      { cost: 25, backlog: 4 },
    ],
    baselines: [
      { name: 'long chain', cost: 30, backlog: 9 },
      { name: 'two <per> class & "more"', cost: 18, backlog: 6.5 },
    ],
    chosen: { cost: 25, backlog: 4 },
    budget: 28,
    costUnit: 'credits per week',
    itemWord: 'riders',
  };
  const markup = paretoChart(input).html;
  const svg = mainSvg(markup);

  it('is an SVG with a viewBox and labelled axes with units', () => {
    expect(svg.getAttribute('viewBox')).toBe('0 0 760 360');
    const text = svg.textContent!;
    expect(text).toContain('Added cost (credits per week)');
    expect(text).toContain('Mean number of riders waiting');
    expect(text).toContain('budget');
  });

  it('places front dots and baselines at positions affine in cost and backlog', () => {
    const dots = [...svg.querySelectorAll('g[aria-label="dot"]')[0]!.querySelectorAll('path')];
    expect(dots.length).toBe(5);
    const pts = [...input.front, ...input.baselines];
    const xy = dots.map(translate);
    affine(pts.map((p) => p.cost), xy.map((p) => p[0]));
    affine(pts.map((p) => p.backlog), xy.map((p) => p[1]));
    expect(xy[1]![1]).toBeGreaterThan(xy[0]![1]); // lower backlog is drawn lower (SVG y grows down)
  });

  it('gives baselines distinct shapes and names them in a legend and beside the points', () => {
    const dots = [...svg.querySelectorAll('g[aria-label="dot"]')[0]!.querySelectorAll('path')];
    const shapes = new Set(dots.slice(3).map((d) => d.getAttribute('d')));
    expect(shapes.size).toBe(2);
    expect(dots[0]!.getAttribute('d')).not.toBe(dots[3]!.getAttribute('d'));
    const all = doc(markup).body.textContent!;
    expect(all).toContain('two <per> class & "more"');
    expect(markup).not.toContain('two <per>');
  });
});

describe('waitChart', () => {
  const input = {
    classes: [{ label: 'north' }, { label: 'centre & co' }, { label: 'east' }],
    series: [
      { name: 'today', role: 'today' as const, waits: [0.5, 2, 1] },
      { name: 'recommended', role: 'recommended' as const, waits: [0.25, 0.5, 1.5] },
      { name: 'unstable one', role: 'alternative' as const, waits: null },
    ],
    timeUnit: 'minute',
  };
  const svg = mainSvg(waitChart(input).html);

  it('labels the axis with the plural time unit', () => {
    expect(svg.textContent).toContain('Mean wait (minutes)');
  });

  it('draws one bar per class and stable design, lengths proportional to the waits', () => {
    const bars = [...svg.querySelectorAll('g[aria-label="bar"] rect')];
    expect(bars.length).toBe(6);
    const widths = bars.map((b) => Number(b.getAttribute('width')));
    // bars are grouped by class facet; within a facet in series order
    const waits = [0.5, 0.25, 2, 0.5, 1, 1.5];
    // facets may come in another order: compare sorted lengths against one constant ratio
    const k = Math.max(...widths) / Math.max(...waits);
    const expected = waits.map((w) => w * k).sort((a, b) => a - b);
    const got = [...widths].sort((a, b) => a - b);
    expected.forEach((e, i) => expect(got[i]).toBeCloseTo(e, 1));
  });
});

describe('sweepChart', () => {
  it('draws one line per curve, switches to a log scale when the backlog spans more than 30×', () => {
    const curves = [
      { name: 'today', role: 'today' as const, points: [1, 1.1, 1.2, 1.3].map((l) => ({ load: l, backlog: 2 / (1.35 - l) })) },
      { name: 'with a–b', role: 'warning' as const, points: [1, 1.1, 1.2].map((l) => ({ load: l, backlog: 2.2 / (1.25 - l) })) },
    ];
    const lin = mainSvg(sweepChart({ curves, crossovers: [{ load: 1.05, label: 'a–b starts to hurt' }], loadLabel: 'Demand of a (× today)', itemWord: 'players' }).html);
    expect(lin.querySelectorAll('g[aria-label="line"] path').length).toBe(2);
    expect(lin.textContent).toContain('Demand of a (× today)');
    expect(lin.textContent).toContain('a–b starts to hurt');
    expect(lin.textContent).not.toContain('log scale');
    const steep = [{ name: 'today', role: 'today' as const, points: [1, 1.3, 1.34].map((l) => ({ load: l, backlog: 1 / (1.345 - l) })) }];
    const log = mainSvg(sweepChart({ curves: steep, crossovers: [], loadLabel: 'Demand (× today)', itemWord: 'players' }).html);
    expect(log.textContent).toContain('log scale');
  });
});
