/**
 * Estimated size of a line of text in the report's drawings, so that labels can be placed before
 * any browser sees them. Advance widths are those of DejaVu Sans (the widest of the common sans
 * serif faces a system-ui font stack falls back to), measured per character in headless Chromium
 * at 100 px and rounded up; text in a narrower face takes less room than estimated, never more.
 * The browser test (tests/browser/drawings.test.ts) checks the estimates against the real boxes.
 */

/** Advance widths in hundredths of an em, characters 32 (space) to 126 ('~'), regular weight. */
const REGULAR = [
  32, 40, 46, 84, 64, 95, 78, 28, 39, 39, 50, 84, 32, 36, 32, 34, 64, 64, 64, 64, 64, 64, 64, 64, 64, 64, 34, 34, 84, 84, 84, 53, 100, 68, 69, 70, 77, 63, 58, 78, 75, 30, 30,
  66, 56, 86, 75, 79, 60, 79, 69, 63, 61, 73, 68, 99, 69, 61, 69, 39, 34, 39, 84, 50, 50, 61, 63, 55, 63, 62, 35, 63, 63, 28, 28, 58, 28, 97, 63, 61, 63, 63, 41, 52, 39, 63,
  59, 82, 59, 59, 53, 64, 34, 64, 84,
];
/** The same, bold. */
const BOLD = [
  35, 46, 52, 84, 70, 100, 87, 31, 46, 46, 52, 84, 38, 42, 38, 37, 70, 70, 70, 70, 70, 70, 70, 70, 70, 70, 40, 40, 84, 84, 84, 58, 100, 77, 76, 73, 83, 68, 68, 82, 84, 37,
  37, 78, 64, 100, 84, 85, 73, 85, 77, 72, 68, 81, 77, 110, 77, 72, 73, 46, 37, 46, 84, 50, 50, 67, 72, 59, 72, 68, 44, 72, 71, 34, 34, 67, 34, 104, 71, 69, 72, 72, 49, 60,
  48, 71, 65, 92, 65, 65, 58, 71, 37, 71, 84,
];

/** Em fractions of one character outside ASCII: wide scripts take a full em, the rest as a capital M. */
function otherWidth(code: number, bold: boolean): number {
  const wide = (code >= 0x1100 && code <= 0x115f) || (code >= 0x2e80 && code <= 0xa4cf) || (code >= 0xac00 && code <= 0xd7a3) || (code >= 0xf900 && code <= 0xfaff) || (code >= 0xfe30 && code <= 0xfe4f) || (code >= 0xff00 && code <= 0xff60) || code >= 0x1f300;
  if (wide) return 1.0;
  if (code >= 0x300 && code <= 0x36f) return 0; // combining marks
  return bold ? 1.0 : 0.86;
}

/** Estimated advance width in pixels of `text` set in `size` px, regular or bold. */
export function textWidth(text: string, size: number, bold = false): number {
  const table = bold ? BOLD : REGULAR;
  let em = 0;
  for (const ch of text) {
    const code = ch.codePointAt(0)!;
    em += code >= 32 && code <= 126 ? table[code - 32]! / 100 : otherWidth(code, bold);
  }
  return Math.ceil(em * size * 1.02 * 10) / 10;
}

/** Ascent and descent of a line, as fractions of the font size (the glyph box a browser reports). */
export const ASCENT = 0.95;
export const DESCENT = 0.25;

/** Shortens `text` to at most `maxWidth` pixels, cutting at a word boundary when one is near, with "…". */
export function fitText(text: string, maxWidth: number, size: number, bold = false): string {
  if (textWidth(text, size, bold) <= maxWidth) return text;
  const chars = [...text];
  let keep = chars.length;
  while (keep > 1 && textWidth(`${chars.slice(0, keep).join('').trimEnd()}…`, size, bold) > maxWidth) keep--;
  const cut = chars.slice(0, keep).join('');
  const space = cut.search(/[\s\-_.:/(,][^\s\-_.:/(,]*$/);
  const base = space >= Math.max(3, cut.length * 0.6) ? cut.slice(0, space) : cut;
  return `${base.replace(/[\s\-_.:/(,]+$/, '')}…`;
}

/** Shortens `text` to at most `maxWidth` pixels by cutting its middle ("Station…ill 12"), keeping both ends. */
export function fitMiddle(text: string, maxWidth: number, size: number, bold = false): string {
  if (textWidth(text, size, bold) <= maxWidth) return text;
  const chars = [...text];
  let keep = chars.length - 1;
  const cut = (k: number): string => {
    const tail = Math.floor(k * 0.45);
    return `${chars.slice(0, k - tail).join('').trimEnd()}…${chars.slice(chars.length - tail).join('').trimStart()}`;
  };
  while (keep > 2 && textWidth(cut(keep), size, bold) > maxWidth) keep--;
  return cut(keep);
}

/** Words of `text` in lines of at most `maxWidth` pixels (a word longer than a line is shortened with "…"). */
export function wrapText(text: string, maxWidth: number, size: number, bold = false): string[] {
  const words = text.split(/\s+/).filter((w) => w !== '');
  const lines: string[] = [];
  let line = '';
  for (const w of words) {
    const next = line ? `${line} ${w}` : w;
    if (textWidth(next, size, bold) <= maxWidth || line === '') line = next;
    else {
      lines.push(line);
      line = w;
    }
  }
  if (line) lines.push(line);
  return lines.map((l) => fitText(l, maxWidth, size, bold));
}
