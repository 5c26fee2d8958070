/**
 * Where the classes of the compatibility graph sit, before any label is placed. Four
 * arrangements, all deterministic:
 * - grid: groups as rows and their members as columns, named by a caption at the left of each row
 *   and a header above each column (when the members' names line up across groups, as zone ×
 *   time band designs do: "Harbour: early", "Harbour: late", "Old Mill: early"…);
 * - clusters: each group on its own circle, clusters packed in rows that run left to right, then
 *   right to left, so that consecutive groups stay neighbours;
 * - stress: the stress layout of layout.ts, for up to 12 classes without groups;
 * - ring: more classes without groups on one circle (an ellipse when the circle would be too
 *   wide), in the angular order of the stress layout.
 * When both the grid and the clusters are possible, the one with fewer line crossings and fewer
 * lines over other discs is kept.
 */
import type { Grouping } from './graph-groups.js';
import { blockSize, boxAt, discBox, placeText, pointSegmentDistance, sideAnchor, unionBox, type Box, type Disc, type PlacedText, type TextLine } from './label-placement.js';
import { layoutGraph } from './layout.js';
import { fitText } from './text-metrics.js';

export interface ArrangeInput {
  readonly pairs: ReadonlyArray<readonly [number, number]>;
  /** Radius each class takes (disc and ring). */
  readonly reach: readonly number[];
  readonly grouping: Grouping;
  /** Width of each class's label block (name and rate line), for the room labels need. */
  readonly labelWidth: readonly number[];
  /** Height of each class's label block. */
  readonly labelHeight: readonly number[];
  /** Height of a rate line alone (the grid's labels). */
  readonly rateHeight: number;
  readonly width: number;
}

export interface Arrangement {
  readonly kind: 'grid' | 'clusters' | 'stress' | 'ring';
  readonly x: Float64Array;
  readonly y: Float64Array;
  /** Direction in which each class's label is tried first. */
  readonly prefer: ReadonlyArray<readonly [number, number]>;
  /** Soft discs drawn behind the clusters. */
  readonly hulls: readonly Disc[];
  /** Captions and headers: for each, candidate placements, the first free one wins. */
  readonly captions: ReadonlyArray<readonly PlacedText[]>;
  /** Whether each class's name is written beside it (false in the grid, where headers name it). */
  readonly named: boolean;
}

export const PAD = 8;
export const CAPTION_SIZE = 12;

export function arrange(input: ArrangeInput): Arrangement {
  const n = input.reach.length;
  if (!input.grouping.grouped) {
    if (n >= 2 && n <= 12) {
      const s = stressArrangement(input);
      if (s) return s;
    }
    return clusterArrangement(input, [{ caption: null, members: stressOrder(n, input.pairs) }], false);
  }
  const clusters = clusterArrangement(input, input.grouping.groups, true);
  const grid = gridArrangement(input);
  if (grid && score(grid, input) <= score(clusters, input)) return grid;
  return clusters;
}

/** Line crossings plus three times the number of (line, disc) pairs where a straight line passes over a disc. */
function score(a: Arrangement, input: ArrangeInput): number {
  const { x, y } = a;
  const pairs = input.pairs;
  let s = 0;
  for (let p = 0; p < pairs.length; p++) {
    const [a1, b1] = pairs[p]!;
    for (let q = p + 1; q < pairs.length; q++) {
      const [a2, b2] = pairs[q]!;
      if (a1 === a2 || a1 === b2 || b1 === a2 || b1 === b2) continue;
      if (segmentsCross(x[a1]!, y[a1]!, x[b1]!, y[b1]!, x[a2]!, y[a2]!, x[b2]!, y[b2]!)) s++;
    }
    for (let k = 0; k < x.length; k++) {
      if (k === a1 || k === b1) continue;
      if (pointSegmentDistance(x[k]!, y[k]!, x[a1]!, y[a1]!, x[b1]!, y[b1]!) < input.reach[k]! + 3) s += 3;
    }
  }
  return s;
}

function segmentsCross(ax: number, ay: number, bx: number, by: number, cx: number, cy: number, dx: number, dy: number): boolean {
  const o = (px: number, py: number, qx: number, qy: number, rx: number, ry: number): number => Math.sign((qx - px) * (ry - py) - (qy - py) * (rx - px));
  return o(ax, ay, bx, by, cx, cy) * o(ax, ay, bx, by, dx, dy) < 0 && o(cx, cy, dx, dy, ax, ay) * o(cx, cy, dx, dy, bx, by) < 0;
}

function stressArrangement(input: ArrangeInput): Arrangement | null {
  const n = input.reach.length;
  const W = input.width;
  const reachMax = Math.max(...input.reach);
  const side = Math.min(Math.max(...input.labelWidth), 120);
  const innerW = W - 2 * (PAD + side / 2 + reachMax);
  for (const aspect of [1.6, 1.25]) {
    const L = layoutGraph(n, input.pairs, aspect);
    const innerH = innerW / aspect;
    let closest = Infinity;
    for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) closest = Math.min(closest, Math.hypot((L.x[i]! - L.x[j]!) * innerW, (L.y[i]! - L.y[j]!) * innerH));
    if (closest < 2 * reachMax + 30) continue;
    const x = new Float64Array(n);
    const y = new Float64Array(n);
    let gx = 0;
    let gy = 0;
    for (let i = 0; i < n; i++) {
      x[i] = W / 2 + (L.x[i]! - 0.5) * innerW;
      y[i] = PAD + 40 + L.y[i]! * innerH;
      gx += x[i]! / n;
      gy += y[i]! / n;
    }
    const prefer = Array.from({ length: n }, (_, i) => unitOr(x[i]! - gx, y[i]! - gy, 0, 1));
    return { kind: 'stress', x, y, prefer, hulls: [], captions: [], named: true };
  }
  return null;
}

/** Points on a circle, or an ellipse when the circle would be wider than 2·maxHalf, at equal arc lengths; first point top left. */
export function ring(m: number, spacing: number, maxHalf: number): { dx: number[]; dy: number[]; rx: number; ry: number } {
  if (m === 1) return { dx: [0], dy: [0], rx: 0, ry: 0 };
  const R = m === 2 ? spacing / 2 : spacing / (2 * Math.sin(Math.PI / m));
  const start = m % 2 === 0 ? -Math.PI / 2 - Math.PI / m : -Math.PI / 2;
  if (R <= maxHalf || m <= 3) {
    const a = Array.from({ length: m }, (_, k) => start + (2 * Math.PI * k) / m);
    return { dx: a.map((t) => R * Math.cos(t)), dy: a.map((t) => R * Math.sin(t)), rx: R, ry: R };
  }
  const rx = Math.max(maxHalf, spacing);
  // the ellipse keeps the circle's perimeter 2πR (Ramanujan's approximation π(3(a+b) − √((3a+b)(a+3b)))), b by bisection
  const want = 2 * Math.PI * R;
  const perimeter = (a: number, b: number): number => Math.PI * (3 * (a + b) - Math.sqrt((3 * a + b) * (a + 3 * b)));
  let lo = rx;
  let hi = want;
  for (let it = 0; it < 60; it++) {
    const mid = (lo + hi) / 2;
    if (perimeter(rx, mid) < want) lo = mid;
    else hi = mid;
  }
  const ry = hi;
  const S = 1440;
  const at = (k: number): [number, number] => {
    const t = start + (2 * Math.PI * k) / S;
    return [rx * Math.cos(t), ry * Math.sin(t)];
  };
  const cum = new Float64Array(S + 1);
  for (let k = 1; k <= S; k++) {
    const [x0, y0] = at(k - 1);
    const [x1, y1] = at(k);
    cum[k] = cum[k - 1]! + Math.hypot(x1 - x0, y1 - y0);
  }
  const dx: number[] = [];
  const dy: number[] = [];
  let k = 0;
  for (let j = 0; j < m; j++) {
    const target = (cum[S]! * j) / m;
    while (k < S && cum[k + 1]! < target) k++;
    const [px, py] = at(k);
    dx.push(px);
    dy.push(py);
  }
  return { dx, dy, rx, ry };
}

/** Angular order of the classes in the stress layout (class 0 first, then towards its lower-numbered neighbour). */
function stressOrder(n: number, pairs: ReadonlyArray<readonly [number, number]>): number[] {
  if (n <= 2) return Array.from({ length: n }, (_, i) => i);
  const L = layoutGraph(n, pairs, 1);
  let cx = 0;
  let cy = 0;
  for (let i = 0; i < n; i++) {
    cx += L.x[i]! / n;
    cy += L.y[i]! / n;
  }
  const angle = Array.from({ length: n }, (_, i) => Math.atan2(L.y[i]! - cy, L.x[i]! - cx));
  const sorted = Array.from({ length: n }, (_, i) => i).sort((p, q) => angle[p]! - angle[q]! || p - q);
  const z = sorted.indexOf(0);
  const rot = [...sorted.slice(z), ...sorted.slice(0, z)];
  return rot[1]! > rot[n - 1]! ? [rot[0]!, ...rot.slice(1).reverse()] : rot;
}

interface Cluster {
  readonly members: readonly number[];
  readonly caption: string | null;
  readonly dx: readonly number[];
  readonly dy: readonly number[];
  readonly hull: number;
  readonly foot: Box;
  cx: number;
  cy: number;
}

function clusterArrangement(input: ArrangeInput, groups: ReadonlyArray<{ readonly caption: string | null; readonly members: readonly number[] }>, grouped: boolean): Arrangement {
  const n = input.reach.length;
  const W = input.width;
  const clusters: Cluster[] = groups.map((g) => {
    const m = g.members.length;
    const rm = Math.max(...g.members.map((i) => input.reach[i]!));
    const widest = Math.max(...g.members.map((i) => Math.min(input.labelWidth[i]!, 120)));
    const maxHalf = (W - 2 * PAD) / 2 - widest - rm - 6;
    const rg = ring(m, 2 * rm + (grouped ? 20 : 12), maxHalf);
    const hull = m >= 2 && grouped ? Math.max(rg.rx, rg.ry) + rm + 7 : 0;
    const boxes: Box[] = [];
    g.members.forEach((i, k) => {
      boxes.push(discBox({ x: rg.dx[k]!, y: rg.dy[k]!, r: input.reach[i]! }));
      const [ux, uy] = unitOr(rg.dx[k]!, rg.dy[k]!, 0, 1);
      const [ax, ay] = sideAnchor(ux, uy);
      boxes.push(boxAt(rg.dx[k]! + ux * (input.reach[i]! + 4), rg.dy[k]! + uy * (input.reach[i]! + 4), input.labelWidth[i]!, input.labelHeight[i]!, ax, ay));
    });
    if (hull > 0) boxes.push({ x0: -hull, y0: -hull, x1: hull, y1: hull });
    if (g.caption && hull > 0) boxes.push(boxAt(0, -hull - 3, Math.min(blockSize(captionLines(g.caption, W)).w, W - 2 * PAD), 16, 0.5, 1));
    const u = unionBox(boxes)!;
    return { members: g.members, caption: g.caption, dx: rg.dx, dy: rg.dy, hull, foot: { x0: u.x0 - 4, y0: u.y0 - 4, x1: u.x1 + 4, y1: u.y1 + 4 }, cx: 0, cy: 0 };
  });
  // rows, alternately left to right and right to left, each centred
  const rowGap = 10;
  const colGap = 14;
  let top = PAD;
  let k = 0;
  let rowIndex = 0;
  while (k < clusters.length) {
    const row: Cluster[] = [];
    let used = 0;
    while (k < clusters.length) {
      const w = clusters[k]!.foot.x1 - clusters[k]!.foot.x0;
      if (row.length > 0 && used + colGap + w > W - 2 * PAD) break;
      used += (row.length > 0 ? colGap : 0) + w;
      row.push(clusters[k]!);
      k++;
    }
    if (rowIndex % 2 === 1) row.reverse();
    const rowH = Math.max(...row.map((c) => c.foot.y1 - c.foot.y0));
    let left = (W - used) / 2;
    for (const c of row) {
      c.cx = left - c.foot.x0;
      c.cy = top + (rowH - (c.foot.y1 - c.foot.y0)) / 2 - c.foot.y0;
      left += c.foot.x1 - c.foot.x0 + colGap;
    }
    top += rowH + rowGap;
    rowIndex++;
  }
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (const c of clusters) {
    c.members.forEach((i, j) => {
      x[i] = c.cx + c.dx[j]!;
      y[i] = c.cy + c.dy[j]!;
    });
  }
  let gx = 0;
  let gy = 0;
  for (let i = 0; i < n; i++) {
    gx += x[i]! / n;
    gy += y[i]! / n;
  }
  const prefer: Array<[number, number]> = new Array(n);
  for (const c of clusters) for (const i of c.members) prefer[i] = c.members.length >= 2 ? unitOr(x[i]! - c.cx, y[i]! - c.cy, 0, 1) : unitOr(x[i]! - gx, y[i]! - gy, 0, 1);
  const hulls: Disc[] = [];
  const captions: PlacedText[][] = [];
  for (const c of clusters) {
    if (c.hull === 0) continue;
    hulls.push({ x: c.cx, y: c.cy, r: c.hull });
    if (!c.caption) continue;
    const lines = captionLines(c.caption, Math.max(120, c.foot.x1 - c.foot.x0));
    captions.push(
      (
        [
          [c.cx, c.cy - c.hull - 3, 0.5, 1],
          [c.cx, c.cy - c.hull - 17, 0.5, 1],
          [c.cx, c.cy + c.hull + 3, 0.5, 0],
          [c.cx - c.hull * 0.7, c.cy - c.hull * 0.7 - 3, 1, 1],
          [c.cx + c.hull * 0.7, c.cy - c.hull * 0.7 - 3, 0, 1],
        ] as const
      ).map(([px, py, ax, ay]) => placeText(lines, px, py, ax, ay)),
    );
  }
  return { kind: grouped ? 'clusters' : 'ring', x, y, prefer, hulls, captions, named: true };
}

function captionLines(text: string, maxWidth: number): TextLine[] {
  return [{ text: fitText(text, maxWidth, CAPTION_SIZE, true), size: CAPTION_SIZE, bold: true }];
}

/**
 * Rows = groups, columns = the names their members share, when those names line up: every member
 * of every group has a column, no group has two members in one column, there are 2 to 8 columns
 * and at least two groups share a column.
 */
function gridArrangement(input: ArrangeInput): Arrangement | null {
  const { grouping, width: W } = input;
  const groups = grouping.groups;
  if (groups.length < 2 || groups.some((g) => g.caption === null)) return null;
  const columns: string[] = [];
  const colOf = new Map<string, number>();
  const norm = (s: string): string => s.trim().toLowerCase();
  for (const g of groups) {
    const seen = new Set<number>();
    for (const i of g.members) {
      const key = norm(grouping.names[i]!);
      if (!colOf.has(key)) {
        colOf.set(key, columns.length);
        columns.push(grouping.names[i]!);
      }
      const c = colOf.get(key)!;
      if (seen.has(c)) return null;
      seen.add(c);
    }
  }
  const C = columns.length;
  if (C < 2 || C > 8) return null;
  const shared = columns.filter((_, c) => groups.filter((g) => g.members.some((i) => colOf.get(norm(grouping.names[i]!)) === c)).length >= 2).length;
  if (shared === 0) return null;
  const n = input.reach.length;
  const reachMax = Math.max(...input.reach);
  const minCell = Math.max(2 * reachMax + 16, 84);
  const capMax = Math.max(110, Math.min(220, W - 2 * PAD - C * minCell - 14));
  const capW = Math.min(capMax, Math.max(...groups.map((g) => blockSize(captionLines(g.caption!, capMax)).w))) + 14;
  const cellW = Math.min(170, (W - 2 * PAD - capW) / C);
  if (cellW < 2 * reachMax + 16) return null;
  const left = (W - (capW + C * cellW)) / 2;
  const headerH = 22;
  const pitch = 2 * reachMax + 8 + input.rateHeight + 14;
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  const captions: PlacedText[][] = [];
  columns.forEach((name, c) => {
    const lines: TextLine[] = [{ text: fitText(name, cellW - 8, CAPTION_SIZE, true), size: CAPTION_SIZE, bold: true }];
    captions.push([placeText(lines, left + capW + (c + 0.5) * cellW, PAD + headerH - 6, 0.5, 1)]);
  });
  groups.forEach((g, r) => {
    const rowY = PAD + headerH + (r + 0.5) * pitch - (input.rateHeight + 6) / 2;
    captions.push([placeText(captionLines(g.caption!, capW - 14), left, rowY, 0, 0.5)]);
    for (const i of g.members) {
      const c = colOf.get(norm(grouping.names[i]!))!;
      x[i] = left + capW + (c + 0.5) * cellW;
      y[i] = rowY;
    }
  });
  const prefer = Array.from({ length: n }, () => [0, 1] as const);
  return { kind: 'grid', x, y, prefer, hulls: [], captions, named: false };
}

export function unitOr(dx: number, dy: number, fx: number, fy: number): [number, number] {
  const len = Math.hypot(dx, dy);
  return len < 1e-9 ? [fx, fy] : [dx / len, dy / len];
}
