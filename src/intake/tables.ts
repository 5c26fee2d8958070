/**
 * The three design tables (classes, compatibilities, candidates): their columns and how a row
 * becomes a scenario entry, with the place it came from so that validation problems can be
 * reported at the row and column of the CSV file.
 */
import type { TableProblem } from '../errors.js';
import { readCsvTable } from './csv-table.js';
import { readRecords, type ColumnSpec, type TableRecord } from './records.js';

export const CLASS_COLUMNS: readonly ColumnSpec[] = [
  { name: 'id', kind: 'text', required: true },
  { name: 'rate', kind: 'positive', required: true },
  { name: 'label', kind: 'text' },
  { name: 'group', kind: 'text' },
  { name: 'note', kind: 'text' },
  { name: 'patience', kind: 'positive' },
  { name: 'weight', kind: 'nonNegative' },
  { name: 'waitTarget', kind: 'positive' },
  { name: 'maxCompatibilities', kind: 'count' },
  { name: 'maxAbandonment', kind: 'share' },
];

export const COMPATIBILITY_COLUMNS: readonly ColumnSpec[] = [
  { name: 'a', kind: 'text', required: true },
  { name: 'b', kind: 'text', required: true },
  { name: 'removable', kind: 'boolean' },
  { name: 'saving', kind: 'nonNegative' },
  { name: 'value', kind: 'number' },
  { name: 'note', kind: 'text' },
];

export const CANDIDATE_COLUMNS: readonly ColumnSpec[] = [
  { name: 'a', kind: 'text', required: true },
  { name: 'b', kind: 'text', required: true },
  { name: 'cost', kind: 'nonNegative', required: true },
  { name: 'value', kind: 'number' },
  { name: 'note', kind: 'text' },
];

/** Where a scenario entry came from. */
export interface Origin {
  readonly file: string;
  readonly row?: number;
  /** Field name → column header as written. */
  readonly columnOf?: ReadonlyMap<string, string>;
}

/** A scenario entry (plain JSON object) and its origin. */
export interface Located {
  readonly entry: Record<string, unknown>;
  readonly origin: Origin;
}

/** The text of one input table and its name for messages. */
export interface TableText {
  readonly text: string;
  readonly file: string;
}

const dataOf = (r: TableRecord) => (r.data === undefined ? {} : { data: r.data });

function readTable(t: TableText, columns: readonly ColumnSpec[], problems: TableProblem[]) {
  const table = readCsvTable(t.text, t.file, problems);
  return table === undefined ? undefined : readRecords(table, columns, problems);
}

/**
 * Classes from a classes table. A row whose rate is unreadable keeps a stand-in rate (the problem is
 * already reported), so that pairs naming the class are not reported again as unknown.
 */
export function classEntries(t: TableText, problems: TableProblem[]): Located[] {
  const read = readTable(t, CLASS_COLUMNS, problems);
  if (read === undefined) return [];
  return read.records
    .filter((r) => typeof r.values['id'] === 'string')
    .map((r) => ({
      entry: { ...r.values, ...(r.values['rate'] === undefined ? { rate: 1 } : {}), ...dataOf(r) },
      origin: { file: t.file, row: r.row, columnOf: read.columnOf },
    }));
}

/** The pair of a row, or undefined when a class id is missing (already reported). */
function pairOf(r: TableRecord): [string, string] | undefined {
  const a = r.values['a'];
  const b = r.values['b'];
  return typeof a === 'string' && typeof b === 'string' ? [a, b] : undefined;
}

/** Pair entries from a table: rows without both class ids are skipped (already reported). */
function pairEntries(t: TableText, columns: readonly ColumnSpec[], problems: TableProblem[], make: (pair: [string, string], values: Record<string, unknown>) => Record<string, unknown>): Located[] {
  const read = readTable(t, columns, problems);
  if (read === undefined) return [];
  const out: Located[] = [];
  for (const r of read.records) {
    const pair = pairOf(r);
    if (pair === undefined) continue;
    const { a: _a, b: _b, ...values } = r.values;
    out.push({ entry: { ...make(pair, values), ...dataOf(r) }, origin: { file: t.file, row: r.row, columnOf: read.columnOf } });
  }
  return out;
}

/** Compatibilities from a table: `removable` defaults to false, `saving` to 0. */
export function compatibilityEntries(t: TableText, problems: TableProblem[]): Located[] {
  return pairEntries(t, COMPATIBILITY_COLUMNS, problems, (pair, { removable, saving, ...rest }) => ({ pair, removable: removable ?? false, saving: saving ?? 0, ...rest }));
}

/** Candidates from a table; an unreadable cost keeps a stand-in 0 (already reported). */
export function candidateEntries(t: TableText, problems: TableProblem[]): Located[] {
  return pairEntries(t, CANDIDATE_COLUMNS, problems, (pair, { cost, ...rest }) => ({ pair, cost: cost ?? 0, ...rest }));
}
