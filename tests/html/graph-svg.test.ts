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

  it('draws one disc per class, area proportional to the rate above a floor ((r / r_max)² = rate / max rate)', () => {
    const discs = [...svg.querySelectorAll('g.node')].map((g) => Number(g.querySelectorAll('circle')[g.querySelectorAll('circle').length - 1]!.getAttribute('r')));
    expect(discs.length).toBe(4);
    const max = Math.max(...pic.nodes.map((v) => v.rate));
    const rMax = Math.max(...discs);
    discs.forEach((r, i) => {
      const share = pic.nodes[i]!.rate / max;
      if ((rMax * Math.sqrt(share)) > 5.6) expect((r / rMax) ** 2).toBeCloseTo(share, 2);
      else expect(r).toBeGreaterThanOrEqual(5.5); // the floor keeps tiny classes visible
    });
  });

  it('marks the bottleneck class with a ring and lists it in the legend', () => {
    const rings = [...svg.querySelectorAll('g.node')].map((g) => g.querySelectorAll('circle').length);
    expect(rings).toEqual([1, 2, 1, 1]);
    expect(svg.querySelector('g.legend')!.textContent).toContain('bottleneck group');
  });

  it('draws every compatibility: lines for pairs, a loop for the self-pair', () => {
    expect(svg.querySelectorAll('path.edge').length).toBe(6);
    expect(svg.querySelectorAll('circle.edge').length).toBe(1);
  });

  it("today's lines get wider with their match rate", () => {
    const width = (title: string): number => {
      const el = [...svg.querySelectorAll('.edge-today')].find((e) => e.querySelector('title')!.textContent!.startsWith(title))!;
      return Number(el.getAttribute('stroke-width'));
    };
    expect(width('Pro & "co" ↔ Ghost')).toBeGreaterThan(width('Rookie <b> ↔ Pro'));
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

describe('graphSvg with groups', () => {
  // Invented: four wards × two shifts. Ids share a ward prefix, labels a ward name; the drawing
  // should name each ward once (a caption) and each shift once (a column header), not 8 times.
  const wards = ['icu', 'ed', 'med', 'surg'];
  const names = ['Intensive care', 'Emergency department', 'Medical ward', 'Surgical ward'];
  const nodes = wards.flatMap((w, k) =>
    ['day', 'night'].map((s) => ({ id: `${w}-${s}`, label: `${names[k]}: ${s} shift offered`, rate: 1 + k * 0.5 + (s === 'night' ? 0.3 : 0) })),
  );
  const edges = [
    ...wards.map((_, k) => ({ a: 2 * k, b: 2 * k + 1, kind: 'today' as const, matchRate: 0.5 })),
    ...wards.slice(1).map((_, k) => ({ a: 2 * k, b: 2 * k + 2, kind: 'candidate' as const })),
  ];
  const groupPic: GraphPicture = { title: 'Wards', timeUnit: 'day', nodes, edges };

  it('writes every ward and every shift exactly once, as captions', () => {
    const doc = parse(graphSvg(groupPic).html);
    const captions = [...doc.querySelectorAll('text.caption')].map((t) => t.textContent);
    for (const n of names) expect(captions.filter((c) => c === n || c!.startsWith(n.slice(0, 8))).length).toBe(1);
    expect(captions).toContain('day');
    expect(captions).toContain('night');
  });

  it('an explicit group field wins over the id prefix', () => {
    const byShift: GraphPicture = { ...groupPic, nodes: nodes.map((v) => ({ ...v, group: v.id.endsWith('day') ? 'Day shifts' : 'Night shifts' })) };
    const captions = [...parse(graphSvg(byShift).html).querySelectorAll('text.caption')].map((t) => t.textContent);
    expect(captions).toContain('Day shifts');
    expect(captions).toContain('Night shifts');
    expect(captions).not.toContain('Intensive care');
  });

  it('escapes group captions and column headers (text read back equals the original)', () => {
    const odd: GraphPicture = { ...groupPic, nodes: nodes.map((v, i) => ({ ...v, group: i < 4 ? 'A <b> & "co"' : "B's" })) };
    const doc = parse(graphSvg(odd).html);
    const captions = [...doc.querySelectorAll('text.caption')].map((t) => t.textContent);
    expect(captions).toContain('A <b> & "co"');
    expect(captions).toContain("B's");
    expect(doc.querySelectorAll('b').length).toBe(0);
  });

  it('keeps the full name of every class in its tooltip', () => {
    const titles = [...parse(graphSvg(groupPic).html).querySelectorAll('g.node > title')].map((t) => t.textContent);
    nodes.forEach((v, i) => expect(titles[i]).toContain(v.label));
  });

  it('sizes the SVG to hold its legend: every legend row lies inside the viewBox', () => {
    const doc = parse(graphSvg(groupPic).html);
    const [, , w, h] = doc.querySelector('svg')!.getAttribute('viewBox')!.split(' ').map(Number);
    const texts = [...doc.querySelectorAll('g.legend text')];
    expect(texts.length).toBeGreaterThan(2);
    for (const t of texts) {
      expect(Number(t.getAttribute('y'))).toBeLessThan(h! - 3);
      expect(Number(t.getAttribute('x'))).toBeLessThan(w!);
    }
  });
});
