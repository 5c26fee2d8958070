/**
 * Marker shapes for the charts, drawn by us (not by the chart library) so that the legend shows
 * exactly the shape drawn in the chart. Each is an SVG path centred on (0, 0), of about the same
 * visual weight at the same `size` (the radius of the circle).
 */
export type MarkerShape = 'circle' | 'square' | 'diamond' | 'triangle' | 'triangle-down' | 'cross' | 'times' | 'hexagon';

/** Shapes used after the series' own ones, in order. */
export const EXTRA_SHAPES: readonly MarkerShape[] = ['triangle-down', 'cross', 'times', 'hexagon'];

const r2 = (v: number): string => (Math.round(v * 100) / 100).toString();

function polygon(points: ReadonlyArray<readonly [number, number]>): string {
  return `M${points.map(([x, y]) => `${r2(x)},${r2(y)}`).join('L')}Z`;
}

/** Path data of a marker of radius-like `size` centred at (cx, cy). */
export function markerPath(shape: MarkerShape, size: number, cx = 0, cy = 0): string {
  const s = size;
  const at = (pts: ReadonlyArray<readonly [number, number]>): string => polygon(pts.map(([x, y]) => [cx + x * s, cy + y * s] as const));
  switch (shape) {
    case 'circle':
      return `M${r2(cx + s)},${r2(cy)}A${r2(s)},${r2(s)} 0 1,1 ${r2(cx - s)},${r2(cy)}A${r2(s)},${r2(s)} 0 1,1 ${r2(cx + s)},${r2(cy)}Z`;
    case 'square':
      return at([[-0.88, -0.88], [0.88, -0.88], [0.88, 0.88], [-0.88, 0.88]]);
    case 'diamond':
      return at([[0, -1.25], [1.25, 0], [0, 1.25], [-1.25, 0]]);
    case 'triangle':
      return at([[0, -1.3], [1.15, 0.72], [-1.15, 0.72]]);
    case 'triangle-down':
      return at([[0, 1.3], [1.15, -0.72], [-1.15, -0.72]]);
    case 'cross': {
      const a = 0.38;
      const b = 1.15;
      return at([[-a, -b], [a, -b], [a, -a], [b, -a], [b, a], [a, a], [a, b], [-a, b], [-a, a], [-b, a], [-b, -a], [-a, -a]]);
    }
    case 'times': {
      const pts: Array<[number, number]> = [];
      const a = 0.38;
      const b = 1.15;
      const base: Array<[number, number]> = [[-a, -b], [a, -b], [a, -a], [b, -a], [b, a], [a, a], [a, b], [-a, b], [-a, a], [-b, a], [-b, -a], [-a, -a]];
      const c = Math.SQRT1_2;
      for (const [x, y] of base) pts.push([c * (x - y), c * (x + y)]);
      return at(pts);
    }
    case 'hexagon':
      return at(Array.from({ length: 6 }, (_, k) => [1.1 * Math.cos((Math.PI / 3) * k), 1.1 * Math.sin((Math.PI / 3) * k)] as const));
  }
}

/** Half the width (and height) of the box a marker of `size` covers. */
export function markerReach(size: number): number {
  return 1.35 * size;
}
