/**
 * Reads the text of a CSV file into a header and rows, each row with the line where it starts, using
 * csv-parse (sync API). Lines starting with '#' are comments; blank lines and rows whose cells are
 * all empty are skipped; cells are trimmed; a byte-order mark is dropped. The delimiter is a comma,
 * or a semicolon or tab when the header line has one of those and no comma (spreadsheets in some
 * locales export so).
 */
import { parse } from 'csv-parse/sync';
import type { TableProblem } from '../errors.js';

export interface CsvRow {
  /** Line where the row starts, the first line of the file being 1. */
  readonly row: number;
  readonly cells: readonly string[];
}

export interface CsvTable {
  readonly file: string;
  /** Header cells as written (trimmed). */
  readonly header: readonly string[];
  /** Line of the header. */
  readonly headerRow: number;
  readonly rows: readonly CsvRow[];
  /** The delimiter used. */
  readonly delimiter: string;
}

function guessDelimiter(text: string): string {
  const first = text.split('\n').find((l) => l.trim() !== '' && !l.trimStart().startsWith('#')) ?? '';
  if (first.includes(',')) return ',';
  if (first.includes(';')) return ';';
  if (first.includes('\t')) return '\t';
  return ',';
}

interface Parsed {
  readonly record: string[];
  readonly info: { readonly lines: number };
}

const COMMENT_LINE = /^[ \t]*#.*$/gm;

/**
 * All records with the line where each starts. Without any quote character no cell can span lines,
 * so comment lines are blanked first and record i is line i + 1 (csv-parse's per-record `info`
 * triples the parse time of a large log); otherwise csv-parse skips comments and reports lines.
 */
function parseRows(clean: string, delimiter: string): CsvRow[] {
  const common = { delimiter, relax_column_count: true, trim: true } as const;
  if (!clean.includes('"')) {
    const records = parse(clean.replace(COMMENT_LINE, ''), { ...common, skip_empty_lines: false }) as string[][];
    return records.map((cells, i) => ({ row: i + 1, cells }));
  }
  const parsed = parse(clean, { ...common, comment: '#', comment_no_infix: true, info: true, skip_empty_lines: true }) as unknown as Parsed[];
  // csv-parse gives the line where a record ends; a quoted cell may span lines
  return parsed.map(({ record, info }) => ({
    row: info.lines - record.reduce((n, cell) => n + (cell.match(/\n/g)?.length ?? 0), 0),
    cells: record,
  }));
}

/**
 * Parses `text` (the contents of `file`). Malformed CSV (an unclosed quote, say) is reported as a
 * problem with its line; the result is then undefined.
 */
export function readCsvTable(text: string, file: string, problems: TableProblem[]): CsvTable | undefined {
  const clean = text.replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n');
  const delimiter = guessDelimiter(clean);
  let rows: CsvRow[];
  try {
    rows = parseRows(clean, delimiter).filter((r) => r.cells.some((c) => c !== ''));
  } catch (e) {
    const err = e as Error & { lines?: number };
    problems.push({ file, ...(typeof err.lines === 'number' ? { row: err.lines } : {}), message: `not readable as CSV: ${err.message}` });
    return undefined;
  }
  const head = rows[0];
  if (head === undefined) {
    problems.push({ file, message: 'empty: no header row (the first line that is not a comment names the columns)' });
    return undefined;
  }
  return { file, header: head.cells, headerRow: head.row, rows: rows.slice(1), delimiter };
}
