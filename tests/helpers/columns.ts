/**
 * Terminal columns of a line, written here without the width library the product uses
 * (string-width), after the usual terminal rules (wcwidth, from memory): combining marks take no
 * column, East Asian wide and fullwidth characters and emoji take two, everything else one. Arrows
 * such as ↔ are one column (ambiguous width, narrow outside East Asian locales).
 */
const ZERO = /[\p{Mn}\p{Me}\u200b-\u200f\ufe00-\ufe0f]/u;
const WIDE = /[\u1100-\u115f\u2e80-\u303e\u3041-\u33ff\u3400-\u4dbf\u4e00-\u9fff\ua000-\ua4cf\uac00-\ud7a3\uf900-\ufaff\ufe30-\ufe4f\uff00-\uff60\uffe0-\uffe6\u{1f300}-\u{1f64f}\u{1f900}-\u{1f9ff}\u{20000}-\u{3fffd}]/u;

export function columns(line: string): number {
  let w = 0;
  for (const ch of line) {
    if (ZERO.test(ch)) continue;
    w += WIDE.test(ch) ? 2 : 1;
  }
  return w;
}

/** The lines of `text` wider than `limit` columns, with their widths. */
export function tooWide(text: string, limit: number): Array<{ width: number; line: string }> {
  return text
    .split('\n')
    .map((line) => ({ width: columns(line), line }))
    .filter((x) => x.width > limit);
}
