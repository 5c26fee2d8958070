import { describe, expect, it } from 'vitest';
import { DASH, INK, MUTED, SERIES, SERIES_TEXT, SYMBOL, type SeriesRole } from '../../src/html/palette.js';

// References:
// - relative luminance and contrast ratio: "Web Content Accessibility Guidelines (WCAG) 2.1", W3C
//   Recommendation, 2018 (non-text contrast ≥ 3:1, text ≥ 4.5:1);
// - colour-vision-deficiency simulation matrices (severity 1) of "A Physiologically-based Model for
//   Simulation of Color Vision Deficiency", IEEE Trans. Vis. Comput. Graph. 2009 (coefficients
//   from memory), applied to linear RGB;
// - CIE 1976 L*a*b* from linear sRGB (IEC 61966-2-1 primaries, D65 white) and ΔE*ab (Euclidean).

const hex = (h: string): number[] => [1, 3, 5].map((i) => parseInt(h.slice(i, i + 2), 16) / 255);
const toLinear = (c: number): number => (c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4);
const luminance = (h: string): number => {
  const [r, g, b] = hex(h).map(toLinear) as [number, number, number];
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
};
const contrast = (a: string, b: string): number => {
  const [x, y] = [luminance(a), luminance(b)].sort((p, q) => q - p) as [number, number];
  return (x + 0.05) / (y + 0.05);
};
const VISION: Record<string, number[][]> = {
  normal: [[1, 0, 0], [0, 1, 0], [0, 0, 1]],
  protanopia: [[0.152286, 1.052583, -0.204868], [0.114503, 0.786281, 0.099216], [-0.003882, -0.048116, 1.051998]],
  deuteranopia: [[0.367322, 0.860646, -0.227968], [0.280085, 0.672501, 0.047413], [-0.01182, 0.04294, 0.968881]],
  tritanopia: [[1.255528, -0.076749, -0.178779], [-0.078411, 0.930809, 0.147602], [0.004733, 0.691367, 0.3039]],
};
function lab(linear: number[]): number[] {
  const [r, g, b] = linear as [number, number, number];
  const x = (0.4124 * r + 0.3576 * g + 0.1805 * b) / 0.95047;
  const y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  const z = (0.0193 * r + 0.1192 * g + 0.9505 * b) / 1.08883;
  const f = (t: number): number => (t > 216 / 24389 ? Math.cbrt(t) : (24389 / 27 * t + 16) / 116);
  return [116 * f(y) - 16, 500 * (f(x) - f(y)), 200 * (f(y) - f(z))];
}
function seen(h: string, m: number[][]): number[] {
  const c = hex(h).map(toLinear);
  return m.map((row) => Math.min(1, Math.max(0, row[0]! * c[0]! + row[1]! * c[1]! + row[2]! * c[2]!)));
}

describe('report palette', () => {
  it('the contrast formula reproduces the WCAG reference points (black/white 21:1, equal colours 1:1)', () => {
    expect(contrast('#000000', '#ffffff')).toBeCloseTo(21, 10);
    expect(contrast('#777777', '#777777')).toBe(1);
  });

  it('text colours reach 4.5:1 on white, series colours 3:1 (WCAG 2.1)', () => {
    expect(contrast(INK, '#ffffff')).toBeGreaterThanOrEqual(4.5);
    expect(contrast(MUTED, '#ffffff')).toBeGreaterThanOrEqual(4.5);
    for (const c of Object.values(SERIES)) expect(contrast(c, '#ffffff')).toBeGreaterThanOrEqual(3);
  });

  it('text written in a series colour reaches 4.5:1 on white and keeps its series hue (within 25°, CIELAB)', () => {
    const hue = (h: string): number => {
      const [, a, b] = lab(seen(h, VISION['normal']!));
      return (Math.atan2(b!, a!) * 180) / Math.PI;
    };
    for (const role of Object.keys(SERIES) as SeriesRole[]) {
      expect(contrast(SERIES_TEXT[role], '#ffffff'), role).toBeGreaterThanOrEqual(4.5);
      const d = Math.abs(((hue(SERIES_TEXT[role]) - hue(SERIES[role]) + 540) % 360) - 180);
      expect(d, role).toBeLessThan(25);
    }
  });

  for (const [vision, m] of Object.entries(VISION)) {
    it(`every pair of series colours stays apart (ΔE*ab ≥ 20) for ${vision}`, () => {
      const colours = Object.values(SERIES);
      for (let i = 0; i < colours.length; i++) {
        for (let j = i + 1; j < colours.length; j++) {
          const a = lab(seen(colours[i]!, m));
          const b = lab(seen(colours[j]!, m));
          const d = Math.hypot(a[0]! - b[0]!, a[1]! - b[1]!, a[2]! - b[2]!);
          expect(d, `${colours[i]} vs ${colours[j]}`).toBeGreaterThanOrEqual(20);
        }
      }
    });
  }

  it('colour is never the only cue: each series has its own dash pattern and symbol', () => {
    const roles = Object.keys(SERIES) as SeriesRole[];
    expect(new Set(roles.map((r) => DASH[r])).size).toBe(roles.length);
    expect(new Set(roles.map((r) => SYMBOL[r])).size).toBe(roles.length);
  });
});
