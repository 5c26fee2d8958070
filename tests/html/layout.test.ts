import { describe, expect, it } from 'vitest';
import { groupClasses } from '../../src/html/graph-groups.js';
import { parseHTML } from 'linkedom';
import { graphScene, graphSvg } from '../../src/html/graph-svg.js';
import { boxesMeet, boxInside, discMeetsBox, segmentMeetsBox } from '../../src/html/label-placement.js';
import { graphDistances, layoutGraph, stress, stressPositions } from '../../src/html/layout.js';
import { graphsOf, narrowGraph, zoneBands } from '../helpers/drawing-fixtures.js';
import { Rng } from '../helpers/random.js';

// References: shortest-path distances of paths and cycles, derived by hand (|i − j| on a path,
// min(|i − j|, n − |i − j|) on a cycle); the stress function of "Graph drawing by stress
// majorization", Graph Drawing (GD) 2004 (from memory), evaluated in the test on hand-built
// layouts.

const path = (n: number): Array<[number, number]> => Array.from({ length: n - 1 }, (_, i) => [i, i + 1] as [number, number]);
const cycle = (n: number): Array<[number, number]> => Array.from({ length: n }, (_, i) => [i, (i + 1) % n] as [number, number]);

describe('graphDistances', () => {
  it('path and cycle distances match the hand-derived formulas', () => {
    const n = 7;
    const dp = graphDistances(n, path(n));
    const dc = graphDistances(n, cycle(n));
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        expect(dp[i * n + j]).toBe(Math.abs(i - j));
        expect(dc[i * n + j]).toBe(Math.min(Math.abs(i - j), n - Math.abs(i - j)));
      }
    }
  });

  it('ignores self-loops and puts disconnected parts at (largest distance + 1)', () => {
    const d = graphDistances(5, [[0, 1], [1, 2], [3, 4], [3, 3]]);
    expect(d[0 * 5 + 2]).toBe(2);
    expect(d[3 * 5 + 4]).toBe(1);
    expect(d[0 * 5 + 3]).toBe(3); // largest finite distance 2, plus 1
  });
});

describe('layoutGraph', () => {
  it('draws a path as equally spaced points on a horizontal line (stress 0 is reachable only that way)', () => {
    // Derived by hand: path distances |i − j| are exactly those of equally spaced collinear points,
    // so the stress minimum is 0 and attained only by them (up to rigid motion and scale); the
    // layout turns its widest spread horizontal.
    const L = layoutGraph(5, path(5), 1.6);
    const xs = Array.from(L.x);
    for (let i = 0; i < 5; i++) {
      expect(L.y[i]).toBeCloseTo(0.5, 2);
      if (i > 0) expect(xs[i]! - xs[i - 1]!).toBeCloseTo(0.25, 2);
    }
    expect(xs[0]).toBeLessThan(xs[4]!); // class 0 on the left
  });

  it('a cycle is drawn at least as well as the regular polygon (stress of the hand-built polygon)', () => {
    for (const n of [5, 8, 11]) {
      const { x, y, d } = stressPositions(n, cycle(n));
      // regular polygon, scaled optimally: stress(αP) is minimal at α = Σ w d δ / Σ w δ² (w = d⁻²)
      const px = Array.from({ length: n }, (_, i) => Math.cos((2 * Math.PI * i) / n));
      const py = Array.from({ length: n }, (_, i) => Math.sin((2 * Math.PI * i) / n));
      let num = 0;
      let den = 0;
      for (let i = 0; i < n; i++) {
        for (let j = i + 1; j < n; j++) {
          const dij = d[i * n + j]!;
          const delta = Math.hypot(px[i]! - px[j]!, py[i]! - py[j]!);
          num += delta / dij;
          den += (delta * delta) / (dij * dij);
        }
      }
      const alpha = num / den;
      const polygon = stress(d, n, px.map((v) => v * alpha), py.map((v) => v * alpha));
      expect(stress(d, n, x, y)).toBeLessThanOrEqual(polygon * 1.001 + 1e-9);
    }
  });

  it('is deterministic and keeps classes apart and inside the unit box (seeded random graphs)', () => {
    const rng = new Rng(20240611);
    for (let trial = 0; trial < 12; trial++) {
      const n = rng.int(2, 24);
      const pairs: Array<[number, number]> = [];
      for (let i = 0; i < n; i++) for (let j = i; j < n; j++) if (rng.chance(i === j ? 0.2 : 0.25)) pairs.push([i, j]);
      const a = layoutGraph(n, pairs);
      const b = layoutGraph(n, pairs);
      expect(Array.from(a.x)).toEqual(Array.from(b.x));
      expect(Array.from(a.y)).toEqual(Array.from(b.y));
      let closest = Infinity;
      for (let i = 0; i < n; i++) {
        expect(a.x[i]).toBeGreaterThanOrEqual(-1e-9);
        expect(a.x[i]).toBeLessThanOrEqual(1 + 1e-9);
        expect(a.y[i]).toBeGreaterThanOrEqual(-1e-9);
        expect(a.y[i]).toBeLessThanOrEqual(1 + 1e-9);
        for (let j = i + 1; j < n; j++) closest = Math.min(closest, Math.hypot((a.x[i]! - a.x[j]!) * 1.6, a.y[i]! - a.y[j]!));
      }
      if (n > 1) expect(closest).toBeGreaterThan(0.02);
    }
  });

  it('handles zero and one class', () => {
    expect(layoutGraph(0, []).x.length).toBe(0);
    expect(Array.from(layoutGraph(1, [[0, 0]]).x)).toEqual([0.5]);
  });
});

describe('box and line tests (label-placement.ts)', () => {
  // Independent check: dense sampling along the segment. A sampled point strictly inside the box
  // means the clipping test must say "meets"; a "meets" without such a sample is allowed only for
  // segments that graze the box (some sample within 0.02 px of it).
  it('segmentMeetsBox agrees with dense sampling on seeded random segments', () => {
    const rng = new Rng(5150);
    const box = { x0: 10, y0: 20, x1: 40, y1: 35 };
    let hits = 0;
    for (let k = 0; k < 2000; k++) {
      const [x1, y1, x2, y2] = [rng.uniform(0, 60), rng.uniform(0, 60), rng.uniform(0, 60), rng.uniform(0, 60)];
      let sampled = false;
      let nearest = Infinity;
      for (let s = 0; s <= 4000; s++) {
        const t = s / 4000;
        const x = x1 + t * (x2 - x1);
        const y = y1 + t * (y2 - y1);
        if (x > box.x0 + 1e-6 && x < box.x1 - 1e-6 && y > box.y0 + 1e-6 && y < box.y1 - 1e-6) sampled = true;
        nearest = Math.min(nearest, Math.hypot(Math.max(0, box.x0 - x, x - box.x1), Math.max(0, box.y0 - y, y - box.y1)));
      }
      const clipped = segmentMeetsBox(x1, y1, x2, y2, box);
      if (sampled) expect(clipped).toBe(true);
      if (clipped && !sampled) expect(nearest).toBeLessThan(0.02);
      if (!clipped) expect(sampled).toBe(false);
      if (sampled) hits++;
    }
    expect(hits).toBeGreaterThan(100);
  });

  it('boxes meet only when they share area; a disc meets a box when its nearest point is closer than r', () => {
    const a = { x0: 0, y0: 0, x1: 10, y1: 10 };
    expect(boxesMeet(a, { x0: 10, y0: 0, x1: 20, y1: 10 })).toBe(false); // touching edge
    expect(boxesMeet(a, { x0: 9.9, y0: 9.9, x1: 20, y1: 20 })).toBe(true);
    expect(boxesMeet(a, { x0: 11, y0: 0, x1: 20, y1: 10 }, 2)).toBe(true); // within the gap
    // nearest point of a to (13, 14) is the corner (10, 10): distance 5 (a 3-4-5 triangle)
    expect(discMeetsBox({ x: 13, y: 14, r: 5.01 }, a)).toBe(true);
    expect(discMeetsBox({ x: 13, y: 14, r: 4.99 }, a)).toBe(false);
  });
});

describe('groupClasses', () => {
  it('groups by the id prefix and moves the shared label words into the caption', () => {
    const g = groupClasses([
      { id: 'icu-day', label: 'Intensive care: day shift' },
      { id: 'icu-night', label: 'Intensive care: night shift' },
      { id: 'ed-day', label: 'ed-day' },
      { id: 'ed-night', label: 'ed-night' },
    ]);
    expect(g.grouped).toBe(true);
    expect(g.groups.map((x) => x.caption)).toEqual(['Intensive care', 'ed']);
    expect(g.groups.map((x) => x.members)).toEqual([[0, 1], [2, 3]]);
    expect(g.names).toEqual(['day shift', 'night shift', 'day', 'night']);
  });

  it('strips parentheses around what is left, and never leaves bare numbers', () => {
    const g = groupClasses([
      { id: 'gold-eu', label: 'Gold (Europe)' },
      { id: 'gold-na', label: 'Gold (North America)' },
      { id: 'seat_1', label: 'Team seat 1' },
      { id: 'seat_2', label: 'Team seat 2' },
    ]);
    expect(g.names.slice(0, 2)).toEqual(['Europe', 'North America']);
    expect(g.names.slice(2)).toEqual(['seat 1', 'seat 2']);
  });

  it('uses explicit groups when any class has one; classes without one stand alone', () => {
    const g = groupClasses([
      { id: 'a-1', label: 'north early', group: 'North' },
      { id: 'a-2', label: 'north late', group: 'North' },
      { id: 'b-1', label: 'south early' },
    ]);
    expect(g.groups.map((x) => [x.caption, x.members])).toEqual([['North', [0, 1]], [null, [2]]]);
    expect(g.names).toEqual(['early', 'late', 'south early']);
  });

  it('does not group when no two classes share a prefix, or when all share one', () => {
    expect(groupClasses([{ id: 'harbour', label: 'Harbour' }, { id: 'mill', label: 'Mill' }]).grouped).toBe(false);
    expect(groupClasses([{ id: 'x-1', label: 'x 1' }, { id: 'x-2', label: 'x 2' }]).grouped).toBe(false);
  });
});

describe('graph drawing at 16–64 classes (seeded synthetic designs)', () => {
  // Invariants of the drawing, checked on the layout's own boxes (the browser test checks the
  // real rendered boxes): no two texts overlap, no text covers a disc, a loop or another class's
  // ring, everything lies inside the viewBox, every class is named (label, number in the key, or
  // row and column captions of the grid), and the same input gives the same bytes.
  const shapes = ['ring with chords', 'zones × time bands', 'dense groups'];
  for (const n of [16, 24, 40, 64]) {
    graphsOf(n, 11 + n).forEach((pic, k) => {
      it(`${shapes[k]}, ${n} classes`, () => {
        const scene = graphScene(pic);
        const g = scene.geometry;
        const view = { x0: 0, y0: 0, x1: scene.width, y1: scene.height };
        const texts = scene.texts;
        for (let i = 0; i < texts.length; i++) {
          expect(boxInside(texts[i]!.box, view), `${texts[i]!.kind} inside the viewBox`).toBe(true);
          for (let j = i + 1; j < texts.length; j++) {
            expect(boxesMeet(texts[i]!.box, texts[j]!.box), `${texts[i]!.kind} ${i} vs ${texts[j]!.kind} ${j}`).toBe(false);
          }
        }
        const insideNumbers = new Set(g.labels.flatMap((l) => (l && l.inside ? [l.node] : [])));
        const free = texts.filter((t) => t.kind !== 'legend' && t.kind !== 'key');
        g.discs.forEach((d, i) => {
          expect(boxInside({ x0: d.x - d.r, y0: d.y - d.r, x1: d.x + d.r, y1: d.y + d.r }, view)).toBe(true);
          for (const t of free) {
            if (insideNumbers.has(i) && t.kind === 'number' && Math.abs((t.box.x0 + t.box.x1) / 2 - d.x) < 0.5) continue;
            expect(discMeetsBox(d, t.box), `${t.kind} over disc ${i}`).toBe(false);
          }
        });
        for (const e of g.edges) {
          if (!e.loop) continue;
          expect(boxInside({ x0: e.loop.x - e.loop.r, y0: e.loop.y - e.loop.r, x1: e.loop.x + e.loop.r, y1: e.loop.y + e.loop.r }, view)).toBe(true);
          for (const t of free) expect(discMeetsBox(e.loop, t.box), `${t.kind} over a loop`).toBe(false);
        }
        // every class is named near its disc, or numbered and listed in the key, or in the grid
        const keyed = g.labels.filter((l) => l && l.number !== null).length;
        expect(g.key.length).toBe(keyed === 0 ? 0 : keyed + 1);
        g.labels.forEach((l, i) => {
          if (g.kind === 'grid') return;
          expect(l, `class ${i} has a label`).not.toBeNull();
          const d = g.discs[i]!;
          const b = l!.text.box;
          const gapX = Math.max(0, b.x0 - d.x, d.x - b.x1);
          const gapY = Math.max(0, b.y0 - d.y, d.y - b.y1);
          expect(Math.hypot(gapX, gapY), `label ${i} near its disc`).toBeLessThan(d.r + 12 + 2 * 13);
        });
        if (g.kind === 'grid') expect(g.captions.length).toBeGreaterThanOrEqual(4);
        expect(graphSvg(pic).html).toBe(graphSvg(structuredClone(pic)).html);
      });
    });
  }

  it('draws the zone × time-band design as a grid, the ring without groups as a ring, dense groups as clusters', () => {
    const [ringPic, zones, dense] = graphsOf(24, 3);
    expect(graphScene(ringPic!).geometry.kind).toBe('ring');
    expect(graphScene(zones!).geometry.kind).toBe('grid');
    expect(graphScene(dense!).geometry.kind).toBe('clusters');
  });

  it('grows in height with the number of classes, never in width', () => {
    const h = [16, 40].map((n) => graphScene(zoneBands(n / 4, 4, 9)));
    expect(h[1]!.height).toBeGreaterThan(h[0]!.height);
    expect(h[0]!.width).toBe(h[1]!.width);
  });
});

describe('numbered key when names do not fit', () => {
  // A drawing far narrower than the report's column leaves no room for some names: those classes
  // get a number beside (or inside) their disc and a line in the key under the drawing.
  it('numbers the classes without room, lists each once in the key with its full name, and keeps every text apart', () => {
    const pic = narrowGraph(3);
    const scene = graphScene(pic);
    const numbered = scene.geometry.labels.filter((l) => l && l.number !== null);
    expect(numbered.length).toBeGreaterThan(0);
    expect(numbered.map((l) => l!.number).sort((a, b) => a! - b!)).toEqual(numbered.map((_, k) => k + 1));
    const view = { x0: 0, y0: 0, x1: scene.width, y1: scene.height };
    for (let i = 0; i < scene.texts.length; i++) {
      expect(boxInside(scene.texts[i]!.box, view)).toBe(true);
      for (let j = i + 1; j < scene.texts.length; j++) expect(boxesMeet(scene.texts[i]!.box, scene.texts[j]!.box)).toBe(false);
    }
    const doc = parseHTML(`<!doctype html><html><body>${graphSvg(pic).html}</body></html>`).document;
    // an entry may wrap onto several lines (one tspan each)
    const key = [...doc.querySelectorAll('text.key-entry')].map((t) => [...t.querySelectorAll('tspan')].map((s) => s.textContent).join(' '));
    expect(key.length).toBe(numbered.length);
    for (const l of numbered) expect(key).toContain(`${l!.number}: Class with a long name ${l!.node} <&>`);
    expect(doc.querySelectorAll('text.key-head').length).toBe(1);
  });
});
