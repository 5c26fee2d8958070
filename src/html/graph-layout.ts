/**
 * Where everything of the compatibility graph goes: discs, lines, loops, labels, edge words, group
 * captions and the key of numbered classes, with no two texts overprinting each other, a disc or
 * an edge word, and everything inside the drawing.
 *
 * Steps (all deterministic: the same input gives the same numbers):
 * 1. Groups (graph-groups.ts). Each group becomes a cluster: its members on a circle (an ellipse
 *    when the circle would be wider than the drawing), first member top left, clockwise in input
 *    order. Clusters are packed in rows, in input order. A graph without groups is one cluster;
 *    up to 12 classes it keeps the stress layout of layout.ts instead (when its classes stay far
 *    enough apart), and a larger one is a ring in the angular order of that stress layout.
 * 2. Lines run straight unless they would pass over another disc; then they bend (a quadratic
 *    curve) by the first of a few growing offsets that clears every disc. Self-loops point in the
 *    free direction nearest to "outward" that no other line leaves by.
 * 3. Captions first, then labels, most arrivals first: candidate boxes on 8 sides of the disc, at
 *    3 distances, the side facing away from the cluster first; the cheapest free one wins (farther
 *    and across lines cost more). When none is free, the label is tried again shorter, and last the
 *    class gets a number (beside its disc, or inside it) explained in a key under the drawing.
 *    The whole placement is run with and without the rate line under each name, and the run that
 *    numbers fewer classes is kept.
 * 4. Edge words along their line, on the first free spot.
 */
import { groupClasses, type GroupInput } from './graph-groups.js';
import {
  blockSize,
  cheapestFree,
  boxesMeet,
  directionsFrom,
  discBox,
  discsMeet,
  Obstacles,
  placeText,
  pointPolylineDistance,
  polylineMeetsBox,
  sideAnchor,
  unionBox,
  type Box,
  type Disc,
  type PlacedText,
  type TextLine,
} from './label-placement.js';
import { arrange, PAD, unitOr, type Arrangement } from './graph-positions.js';
import { fitMiddle, fitText, textWidth, wrapText } from './text-metrics.js';

export interface LayoutNode extends GroupInput {
  readonly rate: number;
  /** Drawn with a ring around the disc (takes room). */
  readonly ringed?: boolean;
}

export interface LayoutEdge {
  readonly a: number;
  readonly b: number;
  /** Word written along the line (null for none). */
  readonly word: string | null;
}

export interface GraphLayoutInput {
  readonly nodes: readonly LayoutNode[];
  readonly edges: readonly LayoutEdge[];
  /** Second line under each name, e.g. "0.5/hour" (tried with and without). */
  readonly rateLines: readonly string[];
  /** Width of the drawing in pixels. */
  readonly width: number;
}

export interface NodeLabel {
  readonly node: number;
  readonly text: PlacedText;
  /** The class's number in the key when its name did not fit (null when it is named). */
  readonly number: number | null;
  /** The number sits inside the disc. */
  readonly inside: boolean;
}

export interface EdgeShape {
  /** SVG path data of the line: straight, or a quadratic curve (empty for a self-loop). */
  readonly d: string;
  /** The line as a polyline (flat x, y list; empty for a self-loop). */
  readonly pts: readonly number[];
  /** The self-loop's circle (null for a line). */
  readonly loop: Disc | null;
}

export interface GraphGeometry {
  /** How the classes are arranged (graph-positions.ts). */
  readonly kind: Arrangement['kind'];
  readonly width: number;
  /** Height of everything but the legend. */
  readonly height: number;
  readonly discs: readonly Disc[];
  /** Soft discs drawn behind clusters of a group. */
  readonly hulls: readonly Disc[];
  /** Group captions, and column headers of the grid. */
  readonly captions: readonly PlacedText[];
  readonly edges: readonly EdgeShape[];
  /** One per class; null when a class of the grid has no room for its rate line (its row and column name it). */
  readonly labels: ReadonlyArray<NodeLabel | null>;
  /** Edge words, in edge order (null where the edge has none or no free spot was found). */
  readonly words: ReadonlyArray<PlacedText | null>;
  /** Heading and entries of the key to numbered classes (empty when every class is named). */
  readonly key: readonly PlacedText[];
}

const NAME_SIZE = 12;
const RATE_SIZE = 11;
const WORD_SIZE = 11;
const KEY_SIZE = 11;
/** Ring drawn around marked classes: extra radius. */
export const RING_GAP = 4.5;
const NAME_WIDTH = 118;
const SHORT_NAME_WIDTH = 74;

/** Disc radii: area proportional to the rate above a floor; smaller discs for larger graphs. */
export function discRadii(rates: readonly number[]): number[] {
  const n = rates.length;
  const rMax = n <= 10 ? 22 : Math.max(12, 22 - 0.35 * (n - 10));
  const rMin = 5.5;
  const max = Math.max(1e-12, ...rates);
  return rates.map((r) => Math.max(rMin, rMax * Math.sqrt(Math.max(0, r) / max)));
}

function labelLines(name: string, rate: string | null): TextLine[] {
  const lines: TextLine[] = [{ text: name, size: NAME_SIZE, bold: true }];
  if (rate !== null) lines.push({ text: rate, size: RATE_SIZE });
  return lines;
}

/** Polyline of a quadratic curve from (x1, y1) to (x2, y2) with control point (qx, qy). */
function quadPoints(x1: number, y1: number, qx: number, qy: number, x2: number, y2: number, steps = 16): number[] {
  const pts: number[] = [];
  for (let k = 0; k <= steps; k++) {
    const t = k / steps;
    const u = 1 - t;
    pts.push(u * u * x1 + 2 * u * t * qx + t * t * x2, u * u * y1 + 2 * u * t * qy + t * t * y2);
  }
  return pts;
}

const f1 = (x: number): string => (Math.round(x * 10) / 10).toString();

export function layoutGraphDrawing(input: GraphLayoutInput): GraphGeometry {
  const { nodes, edges, width: W } = input;
  const n = nodes.length;
  if (n === 0) return { kind: 'ring', width: W, height: 2 * PAD, discs: [], hulls: [], captions: [], edges: [], labels: [], words: [], key: [] };
  const radii = discRadii(nodes.map((v) => v.rate));
  const reach = radii.map((r, i) => r + (nodes[i]!.ringed ? RING_GAP + 1 : 0));
  const grouping = groupClasses(nodes);
  // names to try, longest first: cut at the end, else in the middle (which keeps a distinguishing
  // tail such as a number); a cut name that another class shares is not tried (it would mislead)
  const variants = [
    (s: string) => fitText(s, NAME_WIDTH, NAME_SIZE, true),
    (s: string) => fitMiddle(s, NAME_WIDTH, NAME_SIZE, true),
    (s: string) => fitText(s, SHORT_NAME_WIDTH, NAME_SIZE, true),
    (s: string) => fitMiddle(s, SHORT_NAME_WIDTH, NAME_SIZE, true),
  ].map((cut) => {
    const names = grouping.names.map(cut);
    const count = new Map<string, number>();
    for (const s of names) count.set(s, (count.get(s) ?? 0) + 1);
    return names.map((s, i) => (s === grouping.names[i] || count.get(s) === 1 ? s : null));
  });
  const tries = Array.from({ length: n }, (_, i) => [...new Set(variants.map((v) => v[i]).filter((s): s is string => s !== null))]);
  const shortNames = tries.map((t, i) => t[0] ?? fitText(grouping.names[i]!, NAME_WIDTH, NAME_SIZE, true));
  const pairs = edges.filter((e) => e.a !== e.b).map((e) => [e.a, e.b] as const);

  // 1. positions
  const labelBlock = (i: number): { w: number; h: number } => blockSize(labelLines(shortNames[i]!, input.rateLines[i] ?? null));
  const blocks = Array.from({ length: n }, (_, i) => labelBlock(i));
  const arrangement = arrange({
    pairs,
    reach,
    grouping,
    labelWidth: blocks.map((b) => b.w),
    labelHeight: blocks.map((b) => b.h),
    rateHeight: blockSize([{ text: '0', size: RATE_SIZE }]).h,
    width: W,
  });
  const { x, y } = arrangement;
  const discs: Disc[] = Array.from({ length: n }, (_, i) => ({ x: x[i]!, y: y[i]!, r: radii[i]! }));
  const reachDiscs: Disc[] = Array.from({ length: n }, (_, i) => ({ x: x[i]!, y: y[i]!, r: reach[i]! }));
  const outward = (i: number): [number, number] => [arrangement.prefer[i]![0], arrangement.prefer[i]![1]];

  // 2. lines and loops
  const shapes: Array<EdgeShape & { q?: [number, number] | null }> = [];
  const loops: Disc[] = [];
  const incident: Array<Array<[number, number]>> = Array.from({ length: n }, () => []);
  const lineShape = (e: LayoutEdge): EdgeShape & { q: [number, number] | null } => {
    const x1 = x[e.a]!;
    const y1 = y[e.a]!;
    const x2 = x[e.b]!;
    const y2 = y[e.b]!;
    const len = Math.hypot(x2 - x1, y2 - y1) || 1;
    const nx = -(y2 - y1) / len;
    const ny = (x2 - x1) / len;
    const intrusions = (pts: number[]): number => {
      let bad = 0;
      for (let k = 0; k < pts.length; k += 2) if (pts[k]! < PAD / 2 || pts[k]! > W - PAD / 2) bad += 1000;
      for (let k = 0; k < n; k++) {
        if (k === e.a || k === e.b) continue;
        const d = pointPolylineDistance(x[k]!, y[k]!, pts);
        if (d < reach[k]! + 3) bad += reach[k]! + 3 - d;
      }
      return bad;
    };
    let best: { pts: number[]; q: [number, number] | null; bad: number } | null = null;
    for (const o of [0, 0.14, -0.14, 0.28, -0.28, 0.42, -0.42, 0.6, -0.6]) {
      const off = Math.sign(o) * Math.min(Math.abs(o) * len, 160);
      const qx = (x1 + x2) / 2 + nx * off;
      const qy = (y1 + y2) / 2 + ny * off;
      const pts = o === 0 ? [x1, y1, x2, y2] : quadPoints(x1, y1, qx, qy, x2, y2);
      const bad = intrusions(pts);
      if (!best || bad < best.bad - 1e-9) best = { pts, q: o === 0 ? null : [qx, qy], bad };
      if (bad === 0) break;
    }
    // the directions in which the line leaves its two discs
    incident[e.a]!.push(unitOr(best!.pts[2]! - x1, best!.pts[3]! - y1, 1, 0));
    const m = best!.pts.length;
    incident[e.b]!.push(unitOr(best!.pts[m - 4]! - x2, best!.pts[m - 3]! - y2, 1, 0));
    return { d: '', q: best!.q, pts: best!.pts, loop: null };
  };
  const lineShapes = edges.map((e) => (e.a === e.b ? null : lineShape(e)));
  edges.forEach((e, k) => {
    if (e.a !== e.b) {
      shapes.push(lineShapes[k]!);
      return;
    }
    const i = e.a;
    const r = radii[i]!;
    const lr = 0.45 * r + 6;
    let best: { loop: Disc; cost: number } | null = null;
    directionsFrom(...outward(i), 16).forEach(([ux, uy], rank) => {
      const loop = { x: x[i]! + ux * (reach[i]! + lr - 5), y: y[i]! + uy * (reach[i]! + lr - 5), r: lr + 1.5 };
      if (reachDiscs.some((d, j) => j !== i && discsMeet(d, loop, 3))) return;
      if (loops.some((l) => discsMeet(l, loop, 2))) return;
      const crowd = incident[i]!.filter(([vx, vy]) => vx * ux + vy * uy > Math.cos((40 * Math.PI) / 180)).length;
      const cross = lineShapes.filter((s) => s !== null && pointPolylineDistance(loop.x, loop.y, s.pts) < loop.r).length;
      const cost = rank * 0.3 + crowd * 4 + cross * 2;
      if (!best || cost < best.cost) best = { loop, cost };
    });
    const chosen: Disc = (best as { loop: Disc } | null)?.loop ?? { x: x[i]!, y: y[i]! - reach[i]! - lr + 5, r: lr + 1.5 };
    loops.push(chosen);
    shapes.push({ d: '', pts: [], loop: { x: chosen.x, y: chosen.y, r: lr } });
  });
  const linePts = lineShapes.flatMap((s) => (s ? [s.pts] : []));
  const crossings = (b: Box, except?: readonly number[]): number => {
    let c = 0;
    for (const p of linePts) if (p !== except && polylineMeetsBox(p, b)) c++;
    return c;
  };
  const inBounds = (b: Box): boolean => b.x0 >= PAD / 2 && b.x1 <= W - PAD / 2;

  // 3. captions and labels
  const base = new Obstacles(2);
  for (const d of reachDiscs) base.addDisc(d);
  for (const l of loops) base.addDisc(l);
  const captions: PlacedText[] = [];
  for (const cands of arrangement.captions) {
    const t = cands.find((c) => inBounds(c.box) && base.free(c.box) && captions.every((o) => !boxesMeet(o.box, c.box, 3)));
    if (t) {
      captions.push(t);
      base.addBox(t.box);
    }
  }
  const order = Array.from({ length: n }, (_, i) => i).sort((p, q) => Number(!!nodes[q]!.ringed) - Number(!!nodes[p]!.ringed) || nodes[q]!.rate - nodes[p]!.rate || p - q);
  const candidates = (i: number, lines: readonly TextLine[], tiers: number): PlacedText[] => {
    const out: PlacedText[] = [];
    const dirs = directionsFrom(...outward(i), 8);
    for (let t = 0; t < tiers; t++) {
      for (const [ux, uy] of dirs) {
        const [ax, ay] = sideAnchor(ux, uy);
        const dist = reach[i]! + 3 + t * 13;
        out.push(placeText(lines, x[i]! + ux * dist, y[i]! + uy * dist, ax, ay));
      }
    }
    return out;
  };
  const choose = (cands: readonly PlacedText[], obstacles: Obstacles): PlacedText | null =>
    cheapestFree(
      cands,
      (k) => Math.floor(k / 8) * 4 + (k % 8),
      (b) => inBounds(b) && obstacles.free(b),
      (b) => crossings(b) * 3,
    );
  const attempt = (withRates: boolean): { labels: Array<NodeLabel | null>; numbered: number; obstacles: Obstacles } => {
    const obstacles = new Obstacles(2);
    for (const b of base.boxes) obstacles.addBox(b);
    for (const d of base.discs) obstacles.addDisc(d);
    const labels: Array<NodeLabel | null> = new Array(n).fill(null);
    const failed: number[] = [];
    for (const i of order) {
      const rate = withRates ? (input.rateLines[i] ?? null) : null;
      if (!arrangement.named) {
        const got = rate === null ? null : choose(candidates(i, [{ text: rate, size: RATE_SIZE }], 2), obstacles);
        if (got) obstacles.addBox(got.box);
        labels[i] = got ? { node: i, text: got, number: null, inside: false } : null;
        continue;
      }
      let got: PlacedText | null = null;
      for (const name of tries[i]!) {
        got = choose(candidates(i, labelLines(name, rate), 3), obstacles);
        if (got) break;
      }
      if (got) {
        obstacles.addBox(got.box);
        labels[i] = { node: i, text: got, number: null, inside: false };
      } else failed.push(i);
    }
    failed.sort((p, q) => p - q);
    failed.forEach((i, k) => {
      const lines: TextLine[] = [{ text: String(k + 1), size: 11, bold: true }];
      const got = choose(candidates(i, lines, 2), obstacles);
      if (got) {
        obstacles.addBox(got.box);
        labels[i] = { node: i, text: got, number: k + 1, inside: false };
      } else {
        const inside = placeText([{ text: String(k + 1), size: 10, bold: true }], x[i]!, y[i]!, 0.5, 0.5);
        labels[i] = { node: i, text: inside, number: k + 1, inside: true };
      }
    });
    return { labels, numbered: failed.length, obstacles };
  };
  const withRates = attempt(true);
  const run = withRates.numbered === 0 ? withRates : (() => {
    const without = attempt(false);
    return without.numbered < withRates.numbered ? without : withRates;
  })();
  const { labels, obstacles } = run;

  // 4. edge words
  const words: Array<PlacedText | null> = edges.map(() => null);
  const wordOrder = edges.map((_, k) => k).filter((k) => edges[k]!.word);
  for (const k of wordOrder) {
    const e = edges[k]!;
    const lines: TextLine[] = [{ text: e.word!, size: WORD_SIZE, bold: true }];
    const { w, h } = blockSize(lines);
    let best: PlacedText | null = null;
    let bestCost = Infinity;
    const consider = (cx: number, cy: number, cost: number, own: readonly number[] | null): void => {
      if (cost >= bestCost) return;
      const t = placeText(lines, cx, cy, 0.5, 0.5);
      if (!inBounds(t.box) || !obstacles.free(t.box)) return;
      if (words.some((o) => o && boxesMeet(o.box, t.box, 3))) return;
      if (own && polylineMeetsBox(own, t.box)) return;
      const total = cost + crossings(t.box, own ?? undefined) * 3;
      if (total < bestCost) {
        best = t;
        bestCost = total;
      }
    };
    const shape = shapes[k]!;
    if (shape.loop) {
      const L = shape.loop;
      const [ux, uy] = unitOr(L.x - x[e.a]!, L.y - y[e.a]!, 0, -1);
      directionsFrom(ux, uy, 8).forEach(([vx, vy], rank) => {
        for (let t = 0; t < 2; t++) {
          const ext = Math.abs(vx) * (w / 2) + Math.abs(vy) * (h / 2) + L.r + 4 + t * 10;
          consider(L.x + vx * ext, L.y + vy * ext, rank + t * 4, null);
        }
      });
    } else {
      const pts = shape.pts;
      const segs = pts.length / 2 - 1;
      [0.5, 0.4, 0.6, 0.3, 0.7, 0.22, 0.78, 0.15, 0.85].forEach((t, rank) => {
        const s = Math.min(segs - 1, Math.floor(t * segs));
        const f = t * segs - s;
        const ax = pts[2 * s]!;
        const ay = pts[2 * s + 1]!;
        const bx = pts[2 * s + 2]!;
        const by = pts[2 * s + 3]!;
        const px = ax + f * (bx - ax);
        const py = ay + f * (by - ay);
        const [tx, ty] = unitOr(bx - ax, by - ay, 1, 0);
        for (const side of [1, -1]) {
          let nx = -ty * side;
          let ny = tx * side;
          if (side === 1 && (ny > 0 || (Math.abs(ny) < 1e-9 && nx < 0))) {
            nx = -nx;
            ny = -ny;
          } else if (side === -1 && (ny < 0 || (Math.abs(ny) < 1e-9 && nx > 0))) {
            nx = -nx;
            ny = -ny;
          }
          const ext = Math.abs(nx) * (w / 2) + Math.abs(ny) * (h / 2) + 4;
          consider(px + nx * ext, py + ny * ext, rank + (side === 1 ? 0 : 0.5), pts);
        }
      });
    }
    if (best) {
      words[k] = best;
      obstacles.addBox((best as PlacedText).box);
    }
  }

  // 5. the key, under everything drawn so far
  const named = labels.filter((l): l is NodeLabel => l !== null);
  const drawn: Box[] = [...reachDiscs.map(discBox), ...loops.map(discBox), ...arrangement.hulls.map(discBox), ...named.map((l) => l.text.box), ...captions.map((t) => t.box)];
  for (const p of linePts) for (let k = 0; k < p.length; k += 2) drawn.push({ x0: p[k]!, y0: p[k + 1]! - 3, x1: p[k]!, y1: p[k + 1]! + 3 });
  for (const t of words) if (t) drawn.push(t.box);
  const content = unionBox(drawn) ?? { x0: 0, y0: 0, x1: W, y1: 0 };
  const numbered = named.filter((l) => l.number !== null).sort((p, q) => p.number! - q.number!);
  const key: PlacedText[] = [];
  let bottom = content.y1 + PAD;
  if (numbered.length > 0) {
    const head = placeText([{ text: 'Numbered classes', size: KEY_SIZE, bold: true }], PAD + 4, bottom + 6, 0, 0);
    key.push(head);
    const entries = numbered.map((l) => `${l.number}: ${nodes[l.node]!.label}`);
    const colW = Math.min(W - 2 * PAD - 8, Math.max(...entries.map((s) => textWidth(s, KEY_SIZE))) + 16);
    const cols = Math.max(1, Math.min(4, Math.floor((W - 2 * PAD - 8 + 16) / Math.max(colW, 150))));
    const cellW = (W - 2 * PAD - 8) / cols;
    const rows = Math.ceil(entries.length / cols);
    // column by column; a name longer than its column wraps onto more lines
    const top = head.box.y1 + 4;
    let yy = top;
    entries.forEach((s, k) => {
      const col = Math.floor(k / rows);
      if (k % rows === 0) yy = top;
      const t = placeText(wrapText(s, cellW - 12, KEY_SIZE).map((text) => ({ text, size: KEY_SIZE })), PAD + 4 + col * cellW, yy, 0, 0);
      key.push(t);
      yy = t.box.y1 + 2;
    });
    bottom = key[key.length - 1] ? Math.max(...key.map((t) => t.box.y1)) + PAD : bottom;
  }

  // 6. shift everything so that the top sits at PAD
  const dy = PAD - Math.min(content.y0, PAD);
  const sb = (b: Box): Box => ({ x0: b.x0, y0: b.y0 + dy, x1: b.x1, y1: b.y1 + dy });
  const sd = (d: Disc): Disc => ({ x: d.x, y: d.y + dy, r: d.r });
  const st = (t: PlacedText): PlacedText => ({ ...t, box: sb(t.box) });
  const spts = (p: readonly number[]): number[] => p.map((v, k) => (k % 2 === 1 ? v + dy : v));
  return {
    kind: arrangement.kind,
    width: W,
    height: bottom + dy,
    discs: discs.map(sd),
    hulls: arrangement.hulls.map(sd),
    captions: captions.map(st),
    edges: shapes.map((s, k) => {
      if (s.loop) return { d: '', pts: [], loop: sd(s.loop) };
      const e = edges[k]!;
      const [x1, y1, x2, y2] = [x[e.a]!, y[e.a]! + dy, x[e.b]!, y[e.b]! + dy];
      const d = s.q ? `M${f1(x1)} ${f1(y1)}Q${f1(s.q[0])} ${f1(s.q[1] + dy)} ${f1(x2)} ${f1(y2)}` : `M${f1(x1)} ${f1(y1)}L${f1(x2)} ${f1(y2)}`;
      return { d, pts: spts(s.pts), loop: null };
    }),
    labels: labels.map((l) => (l ? { ...l, text: st(l.text) } : null)),
    words: words.map((t) => (t ? st(t) : null)),
    key: key.map(st),
  };
}

