/**
 * Display width and word wrapping for terminal text. Widths are terminal columns (string-width:
 * wide East Asian characters count two, combining marks zero), so a table lines up whatever the ids.
 */
import stringWidth from 'string-width';

/**
 * Characters string-width counts as emoji (two columns) although terminals draw them one column
 * wide without an emoji selector: the pair arrow of format.ts among them.
 */
const TEXT_PRESENTATION = /\u2194(?!\ufe0f)/g;

export const width = (s: string): number => stringWidth(s.replace(TEXT_PRESENTATION, '-'));

/** Pads to `w` columns (left- or right-aligned). */
export function pad(s: string, w: number, align: 'left' | 'right'): string {
  const gap = Math.max(0, w - width(s));
  return align === 'right' ? ' '.repeat(gap) + s : s + ' '.repeat(gap);
}

/** Splits a word that is wider than `w` into pieces of at most `w` columns. */
function hardBreak(word: string, w: number): string[] {
  // "name ↔": break the name, and the arrow ends the last piece
  if (word.endsWith(' ↔') && w > 2) {
    const pieces = hardBreak(word.slice(0, -2), w - 2);
    pieces[pieces.length - 1] += ' ↔';
    return pieces;
  }
  const out: string[] = [];
  let cur = '';
  for (const ch of word) {
    if (width(cur + ch) > w && cur !== '') {
      out.push(cur);
      cur = '';
    }
    cur += ch;
  }
  if (cur !== '') out.push(cur);
  return out;
}

/** A word that belongs to the number before it: a percent sign ("73.8 %"), with what closes after it. */
const UNIT_AFTER_NUMBER = /^%[)\].,;:]*$/;

/**
 * Words with a pair "a ↔ b" kept as one unit, so that a line never ends inside a pair, and a
 * number kept with its percent sign ("73.82 %").
 */
function glued(words: readonly string[]): string[] {
  const out: string[] = [];
  for (let i = 0; i < words.length; i++) {
    if (UNIT_AFTER_NUMBER.test(words[i]!) && out.length > 0) {
      out[out.length - 1] = `${out[out.length - 1]} ${words[i]}`;
    } else if (words[i] === '↔' && out.length > 0 && i + 1 < words.length) {
      out[out.length - 1] = `${out[out.length - 1]} ↔ ${words[i + 1]}`;
      i++;
    } else out.push(words[i]!);
  }
  // a change marker ("+ a ↔ b", "− a ↔ b") stays with the pair it marks
  const marked: string[] = [];
  for (let i = 0; i < out.length; i++) {
    if ((out[i] === '+' || out[i] === '−') && i + 1 < out.length) marked.push(`${out[i]} ${out[++i]}`);
    else marked.push(out[i]!);
  }
  return marked;
}

/** The pieces of a glued unit too wide for a line: "a ↔" and "b" first; then at spaces, "↔" kept with the word before it. */
function splitWide(word: string): string[] {
  const at = word.indexOf(' ↔ ');
  if (at >= 0) return [word.slice(0, at + 2), word.slice(at + 3)];
  // a change marker stays with its class name ("+ a ↔" is broken by hardBreak, never after the "+")
  if (/^[+−] /.test(word)) return [word];
  const parts = word.split(' ');
  const out: string[] = [];
  for (const p of parts) {
    if (p === '↔' && out.length > 0) out[out.length - 1] += ' ↔';
    else out.push(p);
  }
  return out;
}

/**
 * Wraps text to lines of at most `w` columns, breaking at spaces but not inside a pair "a ↔ b"
 * unless the pair is wider than the line; a word wider than the line is broken where it must.
 * Explicit newlines are kept. `indent` prefixes every line after the first (a hanging indent).
 */
export function wrap(text: string, w: number, indent = ''): string[] {
  const lines: string[] = [];
  const limit = Math.max(width(indent) + 4, w);
  const push = (s: string): void => void lines.push((lines.length === 0 ? '' : indent) + s);
  const room = (): number => limit - (lines.length === 0 ? 0 : width(indent));
  for (const para of text.split('\n')) {
    const words = glued(para.split(' ').filter((x) => x !== ''));
    if (words.length === 0) {
      push('');
      continue;
    }
    let cur = '';
    for (let i = 0; i < words.length; i++) {
      const word = words[i]!;
      if (cur !== '' && width(cur) + 1 + width(word) <= room()) {
        cur += ` ${word}`;
        continue;
      }
      if (word.includes(' ') && width(word) > limit - width(indent) && splitWide(word).length > 1) {
        // a pair wider than any line: break it after its "↔" (the arrow ends the line, never starts
        // one), then, if still too wide, at its other spaces
        words.splice(i, 1, ...splitWide(word));
        i--;
        continue;
      }
      if (cur !== '') push(cur);
      if (width(word) <= room()) cur = word;
      else {
        const pieces = hardBreak(word, limit - width(indent));
        for (let j = 0; j < pieces.length - 1; j++) push(pieces[j]!);
        cur = pieces[pieces.length - 1]!;
      }
    }
    push(cur);
  }
  return lines;
}
