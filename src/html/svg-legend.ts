/**
 * A legend drawn inside its SVG: items (a small sample and its words) flowed left to right in
 * rows that wrap before the drawing's edge. The rows are computed first, so the drawing can be
 * sized to hold them.
 */
import { html, type Markup } from './escape.js';
import { boxAt, type Box } from './label-placement.js';
import { ASCENT, DESCENT, fitText, textWidth } from './text-metrics.js';

export interface LegendItem {
  /** Sample drawn with its vertical centre at y = 0, from x = 0 to x = sampleWidth. */
  readonly sample: Markup;
  readonly sampleWidth: number;
  readonly text: string;
}

export interface LegendCell {
  readonly x: number;
  /** Vertical centre of the row, from the legend's top. */
  readonly y: number;
  readonly item: LegendItem;
  readonly text: string;
}

export interface Legend {
  readonly height: number;
  readonly cells: readonly LegendCell[];
  readonly size: number;
}

const ROW = 20;
const GAP = 6;
const SPACE = 18;

export function legendLayout(items: readonly LegendItem[], width: number, left = 12, size = 11): Legend {
  const cells: LegendCell[] = [];
  let x = left;
  let row = 0;
  const room = width - 2 * left;
  for (const item of items) {
    const text = fitText(item.text, room - item.sampleWidth - GAP, size);
    const w = item.sampleWidth + GAP + textWidth(text, size);
    if (x + w > width - left && x > left) {
      x = left;
      row++;
    }
    cells.push({ x, y: row * ROW + ROW / 2, item, text });
    x += w + SPACE;
  }
  return { height: cells.length === 0 ? 0 : (row + 1) * ROW + 4, cells, size };
}

/** Text boxes of the legend when its top is at y0. */
export function legendBoxes(legend: Legend, y0: number): Box[] {
  return legend.cells.map((c) => {
    const base = y0 + c.y + ((ASCENT - DESCENT) / 2) * legend.size;
    return boxAt(c.x + c.item.sampleWidth + GAP, base - ASCENT * legend.size, textWidth(c.text, legend.size), (ASCENT + DESCENT) * legend.size, 0, 0);
  });
}

/** The legend's markup with its top at y0. */
export function legendMarkup(legend: Legend, y0: number, fill: string): Markup {
  const f1 = (v: number): string => (Math.round(v * 10) / 10).toString();
  return html`<g class="legend" font-size="${legend.size}" font-family="system-ui, sans-serif">${legend.cells.map((c) => {
    const base = y0 + c.y + ((ASCENT - DESCENT) / 2) * legend.size;
    return html`<g transform="translate(${f1(c.x)},${f1(y0 + c.y)})">${c.item.sample}</g><text x="${f1(c.x + c.item.sampleWidth + GAP)}" y="${f1(base)}" text-anchor="start" fill="${fill}">${c.text}</text>`;
  })}</g>`;
}
