/**
 * A text document for the terminal: titles, paragraphs, bullet lists and tables, rendered so that
 * no line is wider than the width given (120 columns when standard output is not a terminal).
 * Every command's text output is built from these blocks, so it fits whatever it says.
 */
import { renderTable, type Fit, type Table } from './table.js';
import { wrap } from './wrap.js';

export type Block =
  | { readonly kind: 'title'; readonly text: string }
  | { readonly kind: 'para'; readonly text: string }
  | { readonly kind: 'list'; readonly items: readonly string[]; readonly heading?: string }
  | { readonly kind: 'table'; readonly table: Table; readonly heading?: string };

export const title = (text: string): Block => ({ kind: 'title', text });
export const para = (text: string): Block => ({ kind: 'para', text });
export const list = (items: readonly string[], heading?: string): Block => ({ kind: 'list', items, ...(heading === undefined ? {} : { heading }) });
export const tableBlock = (table: Table, heading?: string): Block => ({ kind: 'table', table, ...(heading === undefined ? {} : { heading }) });

/** The document as text ending in a newline; blocks are separated by an empty line. */
export function renderDoc(blocks: ReadonlyArray<Block | null | undefined | false>, fit: Fit): string {
  const w = fit.width;
  const out: string[][] = [];
  for (const b of blocks) {
    if (!b) continue;
    switch (b.kind) {
      case 'title':
        out.push(wrap(b.text, w, '  '));
        break;
      case 'para':
        out.push(wrap(b.text, w, ''));
        break;
      case 'list': {
        const lines = b.heading ? wrap(b.heading, w, '') : [];
        for (const item of b.items) lines.push(...wrap(`  - ${item}`, w, '    '));
        out.push(lines);
        break;
      }
      case 'table': {
        if (b.table.rows.length === 0) break;
        const lines = b.heading ? wrap(b.heading, w, '') : [];
        lines.push(...renderTable(b.table, fit));
        out.push(lines);
        break;
      }
    }
  }
  return `${out.map((lines) => lines.join('\n')).join('\n\n')}\n`;
}
