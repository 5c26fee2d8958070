import { parseHTML } from 'linkedom';
import { describe, expect, it } from 'vitest';
import { graphSvg, type GraphPicture } from '../../src/html/graph-svg.js';
import { DASH, SERIES } from '../../src/html/palette.js';

// The drawing is read back with linkedom (a general-purpose HTML/SVG parser from npm) and checked
// against the picture's definition: one disc per class with area proportional to the rate, one line
// (or loop) per compatibility with width increasing in its match rate, harmful candidates with
// their own dash pattern and the word "harmful".

const pic: GraphPicture = {
  title: 'Kart lobby <graph> & "friends"',
  timeUnit: 'minute',
  nodes: [
    { id: 'rookie', label: 'Rookie <b>', rate: 1 },
    { id: 'pro', label: 'Pro & "co"', rate: 4, bottleneck: true },
    { id: 'ghost', label: "Ghost's", rate: 2.25 },
    { id: 'coach', label: 'Coach', rate: 0.25 },
  ],
  edges: [
    { a: 0, b: 1, kind: 'today', matchRate: 1 },
    { a: 1, b: 2, kind: 'today', matchRate: 3 },
    { a: 1, b: 1, kind: 'today', matchRate: 0.5 },
    { a: 2, b: 3, kind: 'fund' },
    { a: 0, b: 2, kind: 'candidate', harmful: true },
    { a: 0, b: 3, kind: 'candidate' },
    { a: 1, b: 3, kind: 'drop', matchRate: 0.2 },
  ],
};

function parse(markup: string) {
  const { document } = parseHTML(`<!doctype html><html><body>${markup}</body></html>`);
  return document;
}

describe('graphSvg', () => {
  const doc = parse(graphSvg(pic).html);
  const svg = doc.querySelector('svg')!;

  it('is one SVG with a viewBox, a width and a height, and an accessible title', () => {
    expect(doc.querySelectorAll('svg').length).toBe(1);
    expect(svg.getAttribute('viewBox')).toMatch(/^0 0 \d+ \d+$/);
    expect(Number(svg.getAttribute('width'))).toBeGreaterThan(0);
    expect(svg.getAttribute('role')).toBe('img');
    expect(svg.querySelector('title')!.textContent).toBe(pic.title);
  });

  it('draws one disc per class, area proportional to the rate (r = 7 + 17·sqrt(rate / max), so (r − 7)² ∝ rate)', () => {
    const discs = [...svg.querySelectorAll('g.node')].map((g) => Number(g.querySelectorAll('circle')[g.querySelectorAll('circle').length - 1]!.getAttribute('r')));
    expect(discs.length).toBe(4);
    const max = Math.max(...pic.nodes.map((v) => v.rate));
    discs.forEach((r, i) => expect(((r - 7) / 17) ** 2).toBeCloseTo(pic.nodes[i]!.rate / max, 2));
  });

  it('marks the bottleneck class with a ring and lists it in the legend', () => {
    const rings = [...svg.querySelectorAll('g.node')].map((g) => g.querySelectorAll('circle').length);
    expect(rings).toEqual([1, 2, 1, 1]);
    expect(svg.querySelector('g.legend')!.textContent).toContain('bottleneck group');
  });

  it('draws every compatibility: lines for pairs, a loop for the self-pair', () => {
    expect(svg.querySelectorAll('line.edge').length).toBe(6);
    expect(svg.querySelectorAll('circle.edge').length).toBe(1);
  });

  it("today's lines get wider with their match rate", () => {
    const width = (title: string): number => {
      const el = [...svg.querySelectorAll('.edge-today')].find((e) => e.querySelector('title')!.textContent!.startsWith(title))!;
      return Number(el.getAttribute('stroke-width'));
    };
    expect(width('Pro & "co" – Ghost')).toBeGreaterThan(width('Rookie <b> – Pro'));
  });

  it('harmful candidates have their own dash pattern, colour and the word "harmful" (not colour alone)', () => {
    const harmful = svg.querySelectorAll('.edge-harmful');
    expect(harmful.length).toBe(1);
    expect(harmful[0]!.getAttribute('stroke-dasharray')).toBe(DASH.warning);
    expect(harmful[0]!.getAttribute('stroke')).toBe(SERIES.warning);
    const words = [...svg.querySelectorAll('text.edge-word')].map((t) => t.textContent);
    expect(words).toContain('harmful');
    expect(words).toContain('fund');
    expect(words).toContain('drop');
    const dashes = new Set([...svg.querySelectorAll('.edge')].map((e) => e.getAttribute('stroke-dasharray') ?? 'solid'));
    expect(dashes.size).toBe(5); // each kind its own: solid today, fund, drop, harmful, plain candidate
  });

  it('escapes class labels and the title (text read back equals the original)', () => {
    const labels = [...svg.querySelectorAll('text.node-label tspan:first-child')].map((t) => t.textContent);
    expect(labels).toEqual(['Rookie <b>', 'Pro & "co"', "Ghost's", 'Coach']);
    expect(svg.querySelectorAll('b').length).toBe(0);
  });

  it('is deterministic', () => {
    expect(graphSvg(pic).html).toBe(graphSvg(pic).html);
  });
});
