/** A placed text block (label-placement.ts) as SVG: one <text>, one <tspan> per line. */
import { html, raw, type Markup } from './escape.js';
import { blockSize, type PlacedText } from './label-placement.js';
import { PAPER } from './palette.js';

const f1 = (x: number): string => (Math.round(x * 10) / 10).toString();

/**
 * `fills` colours the lines in order (the last one repeats; a line's own fill wins); `halo` draws
 * a paper-coloured outline under the glyphs so that lines behind the text do not cut through it.
 */
export function textSvg(t: PlacedText, cls: string, fills: readonly string[], halo = true): Markup {
  const { baselines } = blockSize(t.lines);
  const x = t.anchor === 'start' ? t.box.x0 : t.anchor === 'end' ? t.box.x1 : (t.box.x0 + t.box.x1) / 2;
  const spans = t.lines.map(
    (l, k) =>
      html`<tspan x="${f1(x)}" y="${f1(t.box.y0 + baselines[k]!)}" font-size="${l.size}"${l.bold ? raw(' font-weight="700"') : ''} fill="${l.fill ?? fills[Math.min(k, fills.length - 1)]!}">${l.text}</tspan>`,
  );
  const haloAttrs = halo ? raw(` paint-order="stroke" stroke="${PAPER}" stroke-width="3" stroke-linejoin="round"`) : '';
  return html`<text class="${cls}" font-family="system-ui, sans-serif" text-anchor="${t.anchor}"${haloAttrs}>${spans}</text>`;
}
