/**
 * Boxes and the tests that keep labels apart: axis-aligned boxes, whether a box meets another box,
 * a disc or a line, and the box of a block of text set at a point. Shared by the graph drawing and
 * the charts; every placement in them is "the first candidate that is free", so it is deterministic.
 */
import { ASCENT, DESCENT, textWidth } from './text-metrics.js';

export interface Box {
  readonly x0: number;
  readonly y0: number;
  readonly x1: number;
  readonly y1: number;
}

export interface Disc {
  readonly x: number;
  readonly y: number;
  readonly r: number;
}

export type Anchor = 'start' | 'middle' | 'end';

/** One line of a text block. */
export interface TextLine {
  readonly text: string;
  readonly size: number;
  readonly bold?: boolean;
  /** Fill colour; the drawing's default when absent. */
  readonly fill?: string;
}

/** A text block placed in a box: lines set one under the other, aligned by `anchor`. */
export interface PlacedText {
  readonly box: Box;
  readonly lines: readonly TextLine[];
  readonly anchor: Anchor;
}

/** Extra space between a line's advance and the next line (fraction of the next line's size). */
const LINE_GAP = 1.2;

/** Width and height of a text block, and the baseline of each line below the block's top. */
export function blockSize(lines: readonly TextLine[]): { w: number; h: number; baselines: number[] } {
  let w = 0;
  const baselines: number[] = [];
  let y = 0;
  lines.forEach((l, i) => {
    w = Math.max(w, textWidth(l.text, l.size, l.bold));
    y += i === 0 ? ASCENT * l.size : LINE_GAP * l.size;
    baselines.push(y);
  });
  const last = lines[lines.length - 1];
  return { w, h: last ? y + DESCENT * last.size : 0, baselines };
}

/**
 * The box of a text block whose reference point is (x, y): `ax` and `ay` in [0, 1] say where the
 * point sits on the box (0 = left/top edge, 0.5 = centre, 1 = right/bottom edge).
 */
export function boxAt(x: number, y: number, w: number, h: number, ax: number, ay: number): Box {
  const x0 = x - ax * w;
  const y0 = y - ay * h;
  return { x0, y0, x1: x0 + w, y1: y0 + h };
}

export function grow(b: Box, by: number): Box {
  return { x0: b.x0 - by, y0: b.y0 - by, x1: b.x1 + by, y1: b.y1 + by };
}

/** Do two boxes share area (touching edges do not count)? `gap` keeps them that far apart. */
export function boxesMeet(a: Box, b: Box, gap = 0): boolean {
  return a.x0 < b.x1 + gap && b.x0 < a.x1 + gap && a.y0 < b.y1 + gap && b.y0 < a.y1 + gap;
}

/** Does the disc meet the box (nearest point of the box closer than r + gap to the centre)? */
export function discMeetsBox(d: Disc, b: Box, gap = 0): boolean {
  const nx = Math.max(b.x0, Math.min(d.x, b.x1));
  const ny = Math.max(b.y0, Math.min(d.y, b.y1));
  return Math.hypot(d.x - nx, d.y - ny) < d.r + gap;
}

export function discsMeet(a: Disc, b: Disc, gap = 0): boolean {
  return Math.hypot(a.x - b.x, a.y - b.y) < a.r + b.r + gap;
}

/** Does the segment (x1, y1)–(x2, y2) pass through the box? (Liang–Barsky clipping.) */
export function segmentMeetsBox(x1: number, y1: number, x2: number, y2: number, b: Box): boolean {
  let t0 = 0;
  let t1 = 1;
  const dx = x2 - x1;
  const dy = y2 - y1;
  const clip = (p: number, q: number): boolean => {
    if (p === 0) return q >= 0;
    const r = q / p;
    if (p < 0) {
      if (r > t1) return false;
      if (r > t0) t0 = r;
    } else {
      if (r < t0) return false;
      if (r < t1) t1 = r;
    }
    return true;
  };
  return clip(-dx, x1 - b.x0) && clip(dx, b.x1 - x1) && clip(-dy, y1 - b.y0) && clip(dy, b.y1 - y1) && t0 <= t1;
}

/** Does a polyline (flat list x0, y0, x1, y1, …) pass through the box? */
export function polylineMeetsBox(pts: ArrayLike<number>, b: Box): boolean {
  for (let i = 0; i + 3 < pts.length; i += 2) if (segmentMeetsBox(pts[i]!, pts[i + 1]!, pts[i + 2]!, pts[i + 3]!, b)) return true;
  return false;
}

/** Distance from a point to the segment (x1, y1)–(x2, y2). */
export function pointSegmentDistance(px: number, py: number, x1: number, y1: number, x2: number, y2: number): number {
  const dx = x2 - x1;
  const dy = y2 - y1;
  const len2 = dx * dx + dy * dy;
  const t = len2 === 0 ? 0 : Math.max(0, Math.min(1, ((px - x1) * dx + (py - y1) * dy) / len2));
  return Math.hypot(px - (x1 + t * dx), py - (y1 + t * dy));
}

/** Distance from a point to a polyline (flat list). */
export function pointPolylineDistance(px: number, py: number, pts: ArrayLike<number>): number {
  let best = Infinity;
  for (let i = 0; i + 3 < pts.length; i += 2) best = Math.min(best, pointSegmentDistance(px, py, pts[i]!, pts[i + 1]!, pts[i + 2]!, pts[i + 3]!));
  return best;
}

/** Is box a inside box b (with `pad` to spare)? */
export function boxInside(a: Box, b: Box, pad = 0): boolean {
  return a.x0 >= b.x0 + pad && a.y0 >= b.y0 + pad && a.x1 <= b.x1 - pad && a.y1 <= b.y1 - pad;
}

/** Smallest box holding all the given boxes (null for none). */
export function unionBox(boxes: Iterable<Box>): Box | null {
  let u: Box | null = null;
  for (const b of boxes) u = u ? { x0: Math.min(u.x0, b.x0), y0: Math.min(u.y0, b.y0), x1: Math.max(u.x1, b.x1), y1: Math.max(u.y1, b.y1) } : b;
  return u;
}

export function discBox(d: Disc): Box {
  return { x0: d.x - d.r, y0: d.y - d.r, x1: d.x + d.r, y1: d.y + d.r };
}

/**
 * Places a text block with its reference point at (x, y), the point sitting at (ax, ay) of the
 * box; the anchor follows ax so that the text hugs the side nearest the point.
 */
export function placeText(lines: readonly TextLine[], x: number, y: number, ax: number, ay: number): PlacedText {
  const { w, h } = blockSize(lines);
  return { box: boxAt(x, y, w, h, ax, ay), lines, anchor: ax < 0.25 ? 'start' : ax > 0.75 ? 'end' : 'middle' };
}

/** A set of obstacles that labels must keep clear of, and the test of a candidate box against it. */
export class Obstacles {
  readonly boxes: Box[] = [];
  readonly discs: Disc[] = [];
  constructor(private readonly gap = 2) {}
  addBox(b: Box): void {
    this.boxes.push(b);
  }
  addDisc(d: Disc): void {
    this.discs.push(d);
  }
  /** Is the box clear of every obstacle (kept `gap` apart)? */
  free(b: Box): boolean {
    for (const o of this.boxes) if (boxesMeet(o, b, this.gap)) return false;
    for (const d of this.discs) if (discMeetsBox(d, b, this.gap)) return false;
    return true;
  }
}

/** Unit vectors of `count` directions, the first one pointing along (ux, uy), then alternately either side. */
export function directionsFrom(ux: number, uy: number, count: number): Array<[number, number]> {
  const start = Math.atan2(uy, ux);
  const out: Array<[number, number]> = [];
  const step = (2 * Math.PI) / count;
  for (let k = 0; k < count; k++) {
    const j = k === 0 ? 0 : (k % 2 === 1 ? 1 : -1) * Math.ceil(k / 2);
    const a = start + j * step;
    out.push([Math.cos(a), Math.sin(a)]);
  }
  return out;
}

/**
 * Where a label box sits when it is put beside a disc in direction (ux, uy), at distance `dist`
 * from the centre: the fraction (ax, ay) of the box that touches that point, so that the box lies
 * on the far side of the point (to the right for eastward directions, above for northward ones…).
 */
export function sideAnchor(ux: number, uy: number): [number, number] {
  const ax = ux > 0.38 ? 0 : ux < -0.38 ? 1 : 0.5;
  const ay = uy > 0.38 ? 0 : uy < -0.38 ? 1 : 0.5;
  return [ax, ay];
}

/**
 * The cheapest free candidate: `rank(k)` is the cost of candidate k by its position alone (checked
 * first, so that costlier candidates are skipped early), `free` says whether it may go there, and
 * `extra` adds what else it costs (lines it crosses…). Ties go to the earlier candidate.
 */
export function cheapestFree<T extends { readonly box: Box }>(cands: readonly T[], rank: (k: number) => number, free: (b: Box) => boolean, extra: (b: Box) => number = () => 0): T | null {
  let best: T | null = null;
  let bestCost = Infinity;
  cands.forEach((c, k) => {
    const place = rank(k);
    if (place >= bestCost || !free(c.box)) return;
    const cost = place + extra(c.box);
    if (cost < bestCost) {
      best = c;
      bestCost = cost;
    }
  });
  return best;
}
