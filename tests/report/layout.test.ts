import { describe, expect, it } from 'vitest';
import { graphDistances, layoutGraph, stress, stressPositions } from '../../src/html/layout.js';
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
