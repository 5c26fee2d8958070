/**
 * The compatibility graph as an inline SVG: classes as discs whose area follows their arrival rate,
 * compatibilities as lines whose width follows their match rate, self-loops as small loops, and
 * candidates, recommended changes and harmful candidates each with their own dash pattern, colour
 * and word (never colour alone). Positions come from layout.ts, so the picture is deterministic.
 */
import { html, raw, type Markup } from './escape.js';
import { layoutGraph } from './layout.js';
import { CANDIDATE, DASH, INK, MUTED, PAPER, RULE, SERIES } from './palette.js';

export type EdgeKind =
  /** In today's design and kept. */
  | 'today'
  /** In today's design; the recommendation drops it. */
  | 'drop'
  /** A candidate the recommendation funds. */
  | 'fund'
  /** A candidate left out. */
  | 'candidate';

export interface GraphNode {
  readonly id: string;
  readonly label: string;
  readonly rate: number;
  /** Part of the bottleneck group (the tightest independent set). */
  readonly bottleneck?: boolean;
}

export interface GraphEdge {
  readonly a: number;
  readonly b: number;
  readonly kind: EdgeKind;
  /** Matches per time unit along it (today's design), for the line width. */
  readonly matchRate?: number;
  /** Adding it alone raises the backlog. */
  readonly harmful?: boolean;
}

export interface GraphPicture {
  readonly nodes: readonly GraphNode[];
  readonly edges: readonly GraphEdge[];
  readonly timeUnit: string;
  /** Accessible title of the figure. */
  readonly title: string;
  /** Legend text of the ring drawn around marked classes (default "bottleneck group"). */
  readonly ringLabel?: string;
}

const W = 760;
const H = 420;
const PAD = { left: 70, right: 70, top: 56, bottom: 58 };
const LEGEND_H = 64;

const f1 = (x: number): string => (Math.round(x * 10) / 10).toString();

interface Style {
  readonly stroke: string;
  readonly dash: string;
  readonly width: number;
  readonly word?: string;
}

function edgeStyle(e: GraphEdge, maxMatch: number): Style {
  if (e.harmful && e.kind === 'candidate') return { stroke: SERIES.warning, dash: DASH.warning, width: 3, word: 'harmful' };
  switch (e.kind) {
    case 'today': {
      const share = maxMatch > 0 && e.matchRate !== undefined ? e.matchRate / maxMatch : 0.3;
      return { stroke: INK, dash: '', width: 1.2 + 7 * share };
    }
    case 'drop':
      return { stroke: SERIES.today, dash: '4 4', width: 2, word: 'drop' };
    case 'fund':
      return { stroke: SERIES.recommended, dash: DASH.recommended, width: 3.2, word: e.harmful ? 'fund (harmful alone)' : 'fund' };
    case 'candidate':
      return { stroke: CANDIDATE, dash: '6 5', width: 1.6 };
  }
}

function shortLabel(n: GraphNode): string {
  return n.label.length <= 18 ? n.label : n.id.length <= 18 ? n.id : `${n.id.slice(0, 16)}…`;
}

/** The SVG markup of the graph (viewBox W × (H + legend)). */
export function graphSvg(pic: GraphPicture): Markup {
  const n = pic.nodes.length;
  const pairs = pic.edges.map((e) => [e.a, e.b] as const);
  const innerW = W - PAD.left - PAD.right;
  const innerH = H - PAD.top - PAD.bottom;
  const lay = layoutGraph(n, pairs, innerW / innerH);
  const px = (i: number): number => PAD.left + lay.x[i]! * innerW;
  const py = (i: number): number => PAD.top + lay.y[i]! * innerH;
  const maxRate = Math.max(...pic.nodes.map((v) => v.rate), 1e-12);
  const radius = (i: number): number => 7 + 17 * Math.sqrt(pic.nodes[i]!.rate / maxRate);
  const maxMatch = Math.max(0, ...pic.edges.map((e) => (e.kind === 'today' ? (e.matchRate ?? 0) : 0)));
  let cx = 0;
  let cy = 0;
  for (let i = 0; i < n; i++) {
    cx += px(i) / n;
    cy += py(i) / n;
  }
  /** Unit vector pointing away from the centre of the drawing (or up for the centre itself). */
  const outward = (i: number): [number, number] => {
    const dx = px(i) - cx;
    const dy = py(i) - cy;
    const len = Math.hypot(dx, dy);
    return len < 1e-6 ? [0, -1] : [dx / len, dy / len];
  };

  /** Labels go below a class unless it sits at the top of the drawing. */
  const labelBelow = (i: number): boolean => outward(i)[1] >= -0.35;
  /** Self-loops point away from the centre, turned sideways when the label is on that side. */
  const loopDirection = (i: number): [number, number] => {
    const [ux, uy] = outward(i);
    if ((uy > 0.35 && labelBelow(i)) || (uy < -0.35 && !labelBelow(i))) {
      const sx = ux >= 0 ? 1 : -1;
      const len = Math.hypot(sx, uy * 0.3);
      return [sx / len, (uy * 0.3) / len];
    }
    return [ux, uy];
  };
  const segments = pic.edges.filter((e) => e.a !== e.b).map((e) => ({ x1: px(e.a), y1: py(e.a), x2: px(e.b), y2: py(e.b) }));
  // words on edges: the first spot along the edge that keeps clear of discs, other lines and earlier words
  const taken: Array<{ x: number; y: number; w: number }> = [];
  for (let i = 0; i < n; i++) taken.push({ x: px(i), y: py(i), w: 2 * radius(i) });
  /** Beside the line (offset along its normal, upwards or to the right), clear of discs and earlier words. */
  const placeWord = (x1: number, y1: number, x2: number, y2: number, text: string): [number, number, string] => {
    const w = 6.6 * text.length + 6;
    const len = Math.hypot(x2 - x1, y2 - y1) || 1;
    let nx = -(y2 - y1) / len;
    let ny = (x2 - x1) / len;
    if (ny > 0 || (Math.abs(ny) < 1e-9 && nx < 0)) {
      nx = -nx;
      ny = -ny;
    }
    const anchor = nx > 0.6 ? 'start' : nx < -0.6 ? 'end' : 'middle';
    const centreShift = anchor === 'start' ? w / 2 : anchor === 'end' ? -w / 2 : 0;
    for (const t of [0.5, 0.38, 0.62, 0.28, 0.72, 0.2, 0.8]) {
      const x = x1 + t * (x2 - x1) + nx * 9;
      const y = y1 + t * (y2 - y1) + ny * 11;
      const cx = x + centreShift;
      const crossesLine = segments.some(
        (sg) => !(sg.x1 === x1 && sg.y1 === y1 && sg.x2 === x2 && sg.y2 === y2) && segmentHitsBox(sg, cx - w / 2, y - 7, cx + w / 2, y + 7),
      );
      if (!crossesLine && taken.every((o) => Math.abs(o.x - cx) > (o.w + w) / 2 || Math.abs(o.y - y) > 15)) {
        taken.push({ x: cx, y, w });
        return [x, y, anchor];
      }
    }
    const x = (x1 + x2) / 2 + nx * 9;
    const y = (y1 + y2) / 2 + ny * 11;
    taken.push({ x: x + centreShift, y, w });
    return [x, y, anchor];
  };

  const lines: Markup[] = [];
  const words: Markup[] = [];
  // draw the quiet kinds first so that the marked ones sit on top
  const order: EdgeKind[] = ['candidate', 'today', 'drop', 'fund'];
  const sorted = [...pic.edges].sort((p, q) => order.indexOf(p.kind) - order.indexOf(q.kind) + (p.harmful ? 0.5 : 0) - (q.harmful ? 0.5 : 0));
  for (const e of sorted) {
    const s = edgeStyle(e, maxMatch);
    const dash = s.dash ? raw(` stroke-dasharray="${s.dash}"`) : '';
    const title = `${pic.nodes[e.a]!.label} – ${pic.nodes[e.b]!.label}: ${describeEdge(e, pic.timeUnit)}`;
    let mx: number;
    let my: number;
    let anchor = 'middle';
    if (e.a === e.b) {
      const [ux, uy] = loopDirection(e.a);
      const r = radius(e.a);
      const lr = 0.55 * r + 6;
      const lx = px(e.a) + ux * (r + lr - 4);
      const ly = py(e.a) + uy * (r + lr - 4);
      lines.push(html`<circle class="edge edge-${e.kind}${e.harmful ? ' edge-harmful' : ''}" cx="${f1(lx)}" cy="${f1(ly)}" r="${f1(lr)}" fill="none" stroke="${s.stroke}" stroke-width="${f1(s.width)}"${dash}><title>${title}</title></circle>`);
      mx = lx + ux * (lr + 8 + (s.word ? 3.5 * s.word.length * Math.abs(ux) : 0));
      my = ly + uy * (lr + 10);
    } else {
      lines.push(html`<line class="edge edge-${e.kind}${e.harmful ? ' edge-harmful' : ''}" x1="${f1(px(e.a))}" y1="${f1(py(e.a))}" x2="${f1(px(e.b))}" y2="${f1(py(e.b))}" stroke="${s.stroke}" stroke-width="${f1(s.width)}" stroke-linecap="round"${dash}><title>${title}</title></line>`);
      [mx, my, anchor] = s.word ? placeWord(px(e.a), py(e.a), px(e.b), py(e.b), s.word) : [0, 0, 'middle'];
    }
    if (s.word) {
      words.push(html`<text class="edge-word" x="${f1(mx)}" y="${f1(my)}" dy="0.35em" text-anchor="${anchor}" fill="${s.stroke}">${s.word}</text>`);
    }
  }

  const discs: Markup[] = [];
  const labels: Markup[] = [];
  for (let i = 0; i < n; i++) {
    const v = pic.nodes[i]!;
    const r = radius(i);
    const below = labelBelow(i);
    const ty = below ? py(i) + r + 14 : py(i) - r - 20;
    const ring = v.bottleneck
      ? html`<circle cx="${f1(px(i))}" cy="${f1(py(i))}" r="${f1(r + 4.5)}" fill="none" stroke="${SERIES.warning}" stroke-width="2" stroke-dasharray="3 2"/>`
      : '';
    discs.push(
      html`<g class="node"><title>${v.label} (${v.id}): ${fmtRate(v.rate)} per ${pic.timeUnit}${v.bottleneck ? `; in the ${pic.ringLabel ?? 'bottleneck group'}` : ''}</title>${ring}<circle cx="${f1(px(i))}" cy="${f1(py(i))}" r="${f1(r)}" fill="${SERIES.alternative}" stroke="${PAPER}" stroke-width="1.5"/></g>`,
    );
    labels.push(
      html`<text class="node-label" x="${f1(px(i))}" y="${f1(ty)}" text-anchor="middle"><tspan font-weight="600">${shortLabel(v)}</tspan><tspan x="${f1(px(i))}" dy="1.15em" fill="${MUTED}">${fmtRate(v.rate)}/${pic.timeUnit}</tspan></text>`,
    );
  }

  const legend = legendRow(H + 4, pic.timeUnit, pic.edges, pic.nodes.some((v) => v.bottleneck) ? (pic.ringLabel ?? 'bottleneck group') : null);
  const total = H + LEGEND_H;
  return html`<svg class="chart graph" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${total}" width="${W}" height="${total}" role="img" aria-labelledby="graph-title"><title id="graph-title">${pic.title}</title><style>.graph text{font:12px system-ui,sans-serif;fill:${INK};paint-order:stroke;stroke:${PAPER};stroke-width:3px;stroke-linejoin:round}.graph .edge-word{font-size:11px;font-weight:700}.graph .legend text{stroke:none}</style><rect width="${W}" height="${total}" fill="${PAPER}"/><g class="edges">${lines}</g><g class="nodes">${discs}</g><g class="labels">${labels}${words}</g>${legend}</svg>`;
}

/** Does the segment pass through the box? (sampled every few pixels: labels are small) */
function segmentHitsBox(sg: { x1: number; y1: number; x2: number; y2: number }, left: number, top: number, right: number, bottom: number): boolean {
  const steps = Math.max(2, Math.ceil(Math.hypot(sg.x2 - sg.x1, sg.y2 - sg.y1) / 3));
  for (let i = 0; i <= steps; i++) {
    const x = sg.x1 + ((sg.x2 - sg.x1) * i) / steps;
    const y = sg.y1 + ((sg.y2 - sg.y1) * i) / steps;
    if (x >= left && x <= right && y >= top && y <= bottom) return true;
  }
  return false;
}

function fmtRate(x: number): string {
  return Number(x.toPrecision(3)).toString();
}

function describeEdge(e: GraphEdge, unit: string): string {
  const m = e.matchRate !== undefined ? `${fmtRate(e.matchRate)} matches per ${unit}` : '';
  switch (e.kind) {
    case 'today':
      return `today's compatibility${m ? `, ${m}` : ''}`;
    case 'drop':
      return `today's compatibility, dropped by the recommendation${m ? ` (today ${m})` : ''}`;
    case 'fund':
      return `candidate funded by the recommendation${e.harmful ? ' (raises the backlog when added alone)' : ''}`;
    case 'candidate':
      return e.harmful ? 'harmful candidate: adding it alone raises the backlog' : 'candidate, not funded';
  }
}

function legendRow(y: number, unit: string, edges: readonly GraphEdge[], ringLabel: string | null): Markup {
  const items: Array<{ sample: Markup; text: string }> = [];
  const line = (stroke: string, width: number, dash: string): Markup =>
    html`<line x1="0" y1="0" x2="34" y2="0" stroke="${stroke}" stroke-width="${width}" stroke-linecap="round"${dash ? raw(` stroke-dasharray="${dash}"`) : ''}/>`;
  const widths = edges.some((e) => e.kind === 'today' && e.matchRate !== undefined);
  items.push({ sample: line(INK, widths ? 4 : 2, ''), text: widths ? `compatibility today (width: matches per ${unit})` : 'compatibility today' });
  if (edges.some((e) => e.kind === 'fund')) items.push({ sample: line(SERIES.recommended, 3.2, DASH.recommended), text: 'fund (recommended)' });
  if (edges.some((e) => e.kind === 'drop')) items.push({ sample: line(SERIES.today, 2, '4 4'), text: 'drop (recommended)' });
  if (edges.some((e) => e.kind === 'candidate' && !e.harmful)) items.push({ sample: line(CANDIDATE, 1.6, '6 5'), text: 'candidate, not funded' });
  if (edges.some((e) => e.kind === 'candidate' && e.harmful)) items.push({ sample: line(SERIES.warning, 3, DASH.warning), text: 'harmful candidate' });
  items.push({ sample: html`<circle cx="17" cy="0" r="7" fill="${SERIES.alternative}"/>`, text: `class (area: arrivals per ${unit})` });
  if (ringLabel) items.push({ sample: html`<circle cx="17" cy="0" r="8" fill="none" stroke="${SERIES.warning}" stroke-width="2" stroke-dasharray="3 2"/>`, text: ringLabel });
  // flow the items left to right, wrapping to a new row when the next one would not fit
  const cells: Markup[] = [];
  let gx = 20;
  let row = 0;
  for (const it of items) {
    const width = 50 + it.text.length * 6.1;
    if (gx + width > W - 20 && gx > 20) {
      gx = 20;
      row++;
    }
    cells.push(html`<g transform="translate(${f1(gx)},${f1(y + 18 + row * 24)})">${it.sample}<text x="42" y="0" dy="0.35em" fill="${INK}">${it.text}</text></g>`);
    gx += width + 14;
  }
  return html`<g class="legend" font-size="11"><line x1="20" x2="${W - 20}" y1="${y}" y2="${y}" stroke="${RULE}"/>${cells}</g>`;
}

export const GRAPH_SIZE = { width: W, height: H + LEGEND_H } as const;
