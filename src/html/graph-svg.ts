/**
 * The compatibility graph as an inline SVG: classes as discs whose area follows their arrival rate,
 * grouped in clusters with a caption, compatibilities as lines whose width follows their match
 * rate, self-loops as small loops, and candidates, recommended changes and harmful candidates each
 * with their own dash pattern, colour and word (never colour alone). Positions and every text box
 * come from graph-layout.ts, so the picture is deterministic and no text overprints another.
 */
import { html, raw, type Markup } from './escape.js';
import { layoutGraphDrawing, RING_GAP, type GraphGeometry } from './graph-layout.js';
import type { Box, PlacedText } from './label-placement.js';
import { CANDIDATE, DASH, INK, MUTED, PANEL, PAPER, RULE, SERIES, SERIES_TEXT } from './palette.js';
import { legendBoxes, legendLayout, legendMarkup, type Legend, type LegendItem } from './svg-legend.js';
import { textSvg } from './svg-text.js';

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
  /**
   * Group the class is drawn in (e.g. its ward or zone). Without any group, classes whose ids
   * share the part before the first '-', '_', '.' or ':' are drawn together.
   */
  readonly group?: string;
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
  /** Width of the drawing in pixels (default 760, the report's column; at least 200). */
  readonly width?: number;
}

const WIDTH = 760;
const DROP_DASH = '4 4';
const CANDIDATE_DASH = '6 5';

const f1 = (x: number): string => (Math.round(x * 10) / 10).toString();

interface Style {
  readonly stroke: string;
  /** Colour of the edge word (a text shade of the stroke). */
  readonly ink: string;
  readonly dash: string;
  readonly width: number;
  readonly word: string | null;
}

function edgeStyle(e: GraphEdge, maxMatch: number, n: number): Style {
  if (e.harmful && e.kind === 'candidate') return { stroke: SERIES.warning, ink: SERIES_TEXT.warning, dash: DASH.warning, width: 3, word: 'harmful' };
  switch (e.kind) {
    case 'today': {
      const share = maxMatch > 0 && e.matchRate !== undefined ? e.matchRate / maxMatch : 0.3;
      const extra = n <= 12 ? 7 : n <= 24 ? 5 : 4;
      return { stroke: INK, ink: INK, dash: '', width: 1.2 + extra * share, word: null };
    }
    case 'drop':
      return { stroke: SERIES.today, ink: SERIES_TEXT.today, dash: DROP_DASH, width: 2, word: 'drop' };
    case 'fund':
      return { stroke: SERIES.recommended, ink: SERIES_TEXT.recommended, dash: DASH.recommended, width: 3.2, word: e.harmful ? 'fund (harmful alone)' : 'fund' };
    case 'candidate':
      return { stroke: CANDIDATE, ink: MUTED, dash: CANDIDATE_DASH, width: 1.6, word: null };
  }
}

/** Every text of the drawing with its box, for tests and for sizing. */
export interface GraphScene {
  readonly width: number;
  readonly height: number;
  readonly geometry: GraphGeometry;
  readonly legend: Legend;
  /** Top of the legend. */
  readonly legendTop: number;
  /** Boxes of every text drawn (labels, numbers, words, captions, key, legend). */
  readonly texts: ReadonlyArray<{ readonly kind: 'label' | 'number' | 'word' | 'caption' | 'key' | 'legend'; readonly box: Box }>;
}

function styles(pic: GraphPicture): Style[] {
  const maxMatch = Math.max(0, ...pic.edges.map((e) => (e.kind === 'today' ? (e.matchRate ?? 0) : 0)));
  return pic.edges.map((e) => edgeStyle(e, maxMatch, pic.nodes.length));
}

/** Positions, text boxes and legend of the drawing (what graphSvg draws). */
export function graphScene(pic: GraphPicture): GraphScene {
  const W = Math.max(200, Math.round(pic.width ?? WIDTH));
  const s = styles(pic);
  const geometry = layoutGraphDrawing({
    nodes: pic.nodes.map((v) => ({ id: v.id, label: v.label, rate: v.rate, ...(v.group !== undefined ? { group: v.group } : {}), ...(v.bottleneck ? { ringed: true } : {}) })),
    edges: pic.edges.map((e, k) => ({ a: e.a, b: e.b, word: s[k]!.word })),
    rateLines: pic.nodes.map((v) => `${fmtRate(v.rate)}/${pic.timeUnit}`),
    width: W,
  });
  const legend = legendLayout(legendItems(pic), W, W < 400 ? 8 : 20);
  const legendTop = geometry.height + 8;
  const texts: Array<GraphScene['texts'][number]> = [];
  for (const l of geometry.labels) if (l) texts.push({ kind: l.number === null ? 'label' : 'number', box: l.text.box });
  for (const w of geometry.words) if (w) texts.push({ kind: 'word', box: w.box });
  for (const c of geometry.captions) texts.push({ kind: 'caption', box: c.box });
  for (const k of geometry.key) texts.push({ kind: 'key', box: k.box });
  for (const b of legendBoxes(legend, legendTop)) texts.push({ kind: 'legend', box: b });
  return { width: W, height: Math.ceil(legendTop + legend.height + 6), geometry, legend, legendTop, texts };
}

/** The SVG markup of the graph (760 wide unless told otherwise; the height grows with the drawing). */
export function graphSvg(pic: GraphPicture): Markup {
  const scene = graphScene(pic);
  const g = scene.geometry;
  const s = styles(pic);
  const total = scene.height;
  const W = scene.width;

  const hulls = g.hulls.map((d) => html`<circle class="cluster" cx="${f1(d.x)}" cy="${f1(d.y)}" r="${f1(d.r)}" fill="${PANEL}" stroke="${RULE}"/>`);
  const captions = g.captions.map((c) => textMarkup(c, 'caption', [MUTED]));

  // draw the quiet kinds first so that the marked ones sit on top
  const order: EdgeKind[] = ['candidate', 'today', 'drop', 'fund'];
  const rank = (k: number): number => order.indexOf(pic.edges[k]!.kind) + (pic.edges[k]!.harmful ? 0.5 : 0);
  const sorted = pic.edges.map((_, k) => k).sort((p, q) => rank(p) - rank(q) || p - q);
  const lines: Markup[] = [];
  const words: Markup[] = [];
  for (const k of sorted) {
    const e = pic.edges[k]!;
    const st = s[k]!;
    const shape = g.edges[k]!;
    const dash = st.dash ? raw(` stroke-dasharray="${st.dash}"`) : '';
    const title = `${pic.nodes[e.a]!.label} ↔ ${pic.nodes[e.b]!.label}: ${describeEdge(e, pic.timeUnit)}`;
    const cls = `edge edge-${e.kind}${e.harmful ? ' edge-harmful' : ''}`;
    if (shape.loop) {
      lines.push(html`<circle class="${cls}" cx="${f1(shape.loop.x)}" cy="${f1(shape.loop.y)}" r="${f1(shape.loop.r)}" fill="none" stroke="${st.stroke}" stroke-width="${f1(st.width)}"${dash}><title>${title}</title></circle>`);
    } else {
      lines.push(html`<path class="${cls}" d="${shape.d}" fill="none" stroke="${st.stroke}" stroke-width="${f1(st.width)}" stroke-linecap="round"${dash}><title>${title}</title></path>`);
    }
    const w = g.words[k];
    if (w) words.push(textMarkup(w, 'edge-word', [st.ink]));
  }

  const discs: Markup[] = [];
  const labels: Markup[] = [];
  pic.nodes.forEach((v, i) => {
    const d = g.discs[i]!;
    const ring = v.bottleneck
      ? html`<circle cx="${f1(d.x)}" cy="${f1(d.y)}" r="${f1(d.r + RING_GAP)}" fill="none" stroke="${SERIES.warning}" stroke-width="2" stroke-dasharray="3 2"/>`
      : '';
    discs.push(
      html`<g class="node"><title>${v.label} (${v.id}): ${fmtRate(v.rate)} per ${pic.timeUnit}${v.bottleneck ? `; in the ${pic.ringLabel ?? 'bottleneck group'}` : ''}</title>${ring}<circle cx="${f1(d.x)}" cy="${f1(d.y)}" r="${f1(d.r)}" fill="${SERIES.alternative}" stroke="${PAPER}" stroke-width="1.5"/></g>`,
    );
    const l = g.labels[i];
    if (!l) return;
    if (l.number !== null) labels.push(textMarkup(l.text, l.inside ? 'node-number inside' : 'node-number', [l.inside ? PAPER : INK]));
    else labels.push(textMarkup(l.text, 'node-label', [INK, MUTED]));
  });
  const key = g.key.map((t, k) => textMarkup(t, k === 0 ? 'key-head' : 'key-entry', [INK]));
  const legend = html`<line x1="${scene.legend.cells[0]?.x ?? 20}" x2="${W - (scene.legend.cells[0]?.x ?? 20)}" y1="${f1(scene.legendTop)}" y2="${f1(scene.legendTop)}" stroke="${RULE}"/>${legendMarkup(scene.legend, scene.legendTop, INK)}`;
  return html`<svg class="chart graph" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${total}" width="${W}" height="${total}" role="img" aria-labelledby="graph-title"><title id="graph-title">${pic.title}</title><style>.graph text{font-family:system-ui,sans-serif;fill:${INK}}</style><rect width="${W}" height="${total}" fill="${PAPER}"/><g class="clusters">${hulls}</g><g class="edges">${lines}</g><g class="nodes">${discs}</g><g class="labels">${captions}${labels}${words}</g>${key.length > 0 ? html`<g class="key">${key}</g>` : ''}${legend}</svg>`;
}

function textMarkup(t: PlacedText, cls: string, fills: readonly string[]): Markup {
  return textSvg(t, cls, fills, !(cls === 'node-number inside' || cls.startsWith('key')));
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

function legendItems(pic: GraphPicture): LegendItem[] {
  const { edges, timeUnit: unit } = pic;
  const ringLabel = pic.nodes.some((v) => v.bottleneck) ? (pic.ringLabel ?? 'bottleneck group') : null;
  const items: LegendItem[] = [];
  const line = (stroke: string, width: number, dash: string): Markup =>
    html`<line x1="0" y1="0" x2="34" y2="0" stroke="${stroke}" stroke-width="${width}" stroke-linecap="round"${dash ? raw(` stroke-dasharray="${dash}"`) : ''}/>`;
  const add = (sample: Markup, text: string, sampleWidth = 34): void => {
    items.push({ sample, text, sampleWidth });
  };
  const widths = edges.some((e) => e.kind === 'today' && e.matchRate !== undefined);
  add(line(INK, widths ? 4 : 2, ''), widths ? `compatibility today (width: matches per ${unit})` : 'compatibility today');
  if (edges.some((e) => e.kind === 'fund')) add(line(SERIES.recommended, 3.2, DASH.recommended), 'fund (recommended)');
  if (edges.some((e) => e.kind === 'drop')) add(line(SERIES.today, 2, DROP_DASH), 'drop (recommended)');
  if (edges.some((e) => e.kind === 'candidate' && !e.harmful)) add(line(CANDIDATE, 1.6, CANDIDATE_DASH), 'candidate, not funded');
  if (edges.some((e) => e.kind === 'candidate' && e.harmful)) add(line(SERIES.warning, 3, DASH.warning), 'harmful candidate');
  add(html`<circle cx="8" cy="0" r="7" fill="${SERIES.alternative}"/>`, `class (area: arrivals per ${unit})`, 16);
  if (ringLabel) add(html`<circle cx="9" cy="0" r="8" fill="none" stroke="${SERIES.warning}" stroke-width="2" stroke-dasharray="3 2"/>`, ringLabel, 18);
  return items;
}
