/**
 * Tables for terminals that fit the width they are given. Columns are separated by two spaces,
 * the header is underlined. When the natural layout is too wide:
 *   1. headers wrap at spaces;
 *   2. columns marked `wrap` (long text) wrap their cells, the widest first;
 *   3. columns marked `secondary` fold, rightmost first, into a further table keyed by the key
 *      column (the row's name), printed below; and if even that is not enough, other columns fold
 *      the same way. Nothing is ever cut off.
 * With `wide`, the natural layout is used whatever the width.
 */
import { pad, width, wrap } from './wrap.js';

export interface Column {
  readonly header: string;
  /** Default 'left'. */
  readonly align?: 'left' | 'right';
  /** Folds into a further table first when the table is too wide. */
  readonly secondary?: boolean;
  /** Cells may wrap onto several lines. */
  readonly wrap?: boolean;
}

export interface Table {
  readonly columns: readonly Column[];
  readonly rows: ReadonlyArray<readonly string[]>;
  /** Rows before which a rule is drawn (e.g. a total row). */
  readonly ruleBefore?: readonly number[];
  /** The column that names a row, repeated in folded tables (default 0). */
  readonly key?: number;
}

export interface Fit {
  /** Terminal columns available. */
  readonly width: number;
  /** Ignore the width: one table with every column. */
  readonly wide?: boolean;
}

const SEP = '  ';

/** The widest piece a cell wraps to: a word, or a class name with the "↔" that follows it ("a ↔"). */
function longestWord(s: string): number {
  let m = 0;
  const words = s.split(/\s+/);
  for (let i = 0; i < words.length; i++) {
    if (words[i] === '↔' && i > 0) continue;
    m = Math.max(m, width(words[i]!) + (words[i + 1] === '↔' ? 2 : 0));
  }
  return m;
}

function cellWidth(s: string): number {
  let m = 0;
  for (const line of s.split('\n')) m = Math.max(m, width(line));
  return m;
}

/** Widths per column, or undefined when even the narrowest layout of these columns is too wide. */
function fitWidths(t: Table, cols: readonly number[], limit: number, wide: boolean): number[] | undefined {
  const natural = cols.map((c) => Math.max(cellWidth(t.columns[c]!.header), ...t.rows.map((r) => cellWidth(r[c] ?? ''))));
  const total = (w: readonly number[]): number => w.reduce((a, b) => a + b, 0) + SEP.length * (w.length - 1);
  if (wide || total(natural) <= limit) return natural;
  // 1. headers wrap
  const w = cols.map((c, i) => Math.max(longestWord(t.columns[c]!.header), ...t.rows.map((r) => cellWidth(r[c] ?? ''))) || natural[i]!);
  if (total(w) <= limit) return w;
  // 2. wrapping columns shrink, widest first, down to their longest word (at most 16 columns)
  const floor = cols.map((c, i) =>
    t.columns[c]!.wrap ? Math.max(longestWord(t.columns[c]!.header), Math.min(16, Math.max(...t.rows.map((r) => longestWord(r[c] ?? '')), 1))) : w[i]!,
  );
  for (;;) {
    const over = total(w) - limit;
    if (over <= 0) return w;
    let widest = -1;
    for (let i = 0; i < cols.length; i++) if (w[i]! > floor[i]! && (widest < 0 || w[i]! > w[widest]!)) widest = i;
    if (widest < 0) return undefined;
    w[widest] = Math.max(floor[widest]!, w[widest]! - over);
  }
}

function renderPart(t: Table, cols: readonly number[], widths: readonly number[]): string[] {
  const align = (c: number): 'left' | 'right' => t.columns[c]!.align ?? 'left';
  const block = (cells: readonly string[]): string[] => {
    const parts = cells.map((s, i) => (cellWidth(s) <= widths[i]! ? s.split('\n') : wrap(s, widths[i]!, '')));
    const height = Math.max(...parts.map((p) => p.length));
    const out: string[] = [];
    for (let l = 0; l < height; l++) {
      out.push(
        parts
          .map((p, i) => pad(p[l] ?? '', widths[i]!, align(cols[i]!)))
          .join(SEP)
          .replace(/\s+$/, ''),
      );
    }
    return out;
  };
  const lines = block(cols.map((c) => t.columns[c]!.header));
  const rule = widths.map((w) => '─'.repeat(w)).join(SEP);
  lines.push(rule);
  const before = new Set(t.ruleBefore ?? []);
  t.rows.forEach((r, i) => {
    if (before.has(i)) lines.push(rule);
    lines.push(...block(cols.map((c) => r[c] ?? '')));
  });
  return lines;
}

/** Equal widths for `n` columns that must fit `width` whatever their cells (cells then wrap hard). */
function hardWidths(n: number, width: number): number[] {
  return new Array<number>(n).fill(Math.max(4, Math.floor((width - SEP.length * (n - 1)) / n)));
}

/** The table as lines of at most `fit.width` columns (unless `fit.wide`). */
export function renderTable(t: Table, fit: Fit): string[] {
  const key = t.key ?? 0;
  const all = t.columns.map((_, c) => c);
  let shown = [...all];
  const folded: number[][] = [];
  const wide = fit.wide === true;
  /** The main part, then every folded group keyed by the key column, then the note saying so. */
  const withFolded = (out: string[]): string[] => {
    for (const group of folded) {
      const cols = [key, ...group];
      out.push('', ...renderPart(t, cols, fitWidths(t, cols, fit.width, wide) ?? hardWidths(cols.length, fit.width)));
    }
    const n = folded.flat().length;
    if (n > 0) out.push(...wrap(`(${n} column${n === 1 ? '' : 's'} folded below to fit ${fit.width} columns; --wide shows one table)`, fit.width));
    return out;
  };
  for (;;) {
    const widths = fitWidths(t, shown, fit.width, wide);
    if (widths) return withFolded(renderPart(t, shown, widths));
    // fold one more column: the rightmost secondary one, else the rightmost non-key one
    const candidates = shown.filter((c) => c !== key);
    const secondary = candidates.filter((c) => t.columns[c]!.secondary);
    const pick = (secondary.length > 0 ? secondary : candidates).at(-1);
    if (pick === undefined || shown.length <= 2) {
      // two columns that cannot fit: wrap everything hard (the folded groups still follow)
      return withFolded(renderPart({ ...t, columns: t.columns.map((c) => ({ ...c, wrap: true })) }, shown, hardWidths(shown.length, fit.width)));
    }
    shown = shown.filter((c) => c !== pick);
    const target = folded.at(-1);
    if (target && fitWidths(t, [key, pick, ...target], fit.width, false)) target.unshift(pick);
    else folded.push([pick]);
  }
}
