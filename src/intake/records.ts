/**
 * Turns a CSV table into typed records following a column specification. Header names are matched
 * case-insensitively (spaces, '_' and '-' ignored, so "Wait target" is `waitTarget`); a column named
 * `data.<key>` goes into the record's free-form `data` object; any other column is refused with a
 * "did you mean" suggestion. Every problem is collected with its file, row and column.
 */
import type { TableProblem } from '../errors.js';
import { readCell, readDataCell, type CellKind } from './cells.js';
import type { CsvTable } from './csv-table.js';
import { didYouMean, normaliseName } from './suggest.js';

export interface ColumnSpec {
  /** Field name in the scenario (and canonical column name). */
  readonly name: string;
  readonly kind: CellKind;
  readonly required?: boolean;
}

export interface TableRecord {
  /** Line where the row starts. */
  readonly row: number;
  /** Values of the non-empty, readable cells, by field name, in the order of the specification. */
  readonly values: Readonly<Record<string, string | number | boolean>>;
  /** The `data.<key>` cells, when there are any non-empty ones. */
  readonly data?: Readonly<Record<string, string | number>>;
  /** Fields whose cell was present but unreadable (already reported). */
  readonly failed: ReadonlySet<string>;
}

export interface ReadRecords {
  readonly records: readonly TableRecord[];
  /** Field name → the column header as written, for messages. */
  readonly columnOf: ReadonlyMap<string, string>;
}

const DATA_PREFIX = /^data\.(.+)$/i;

/** Reads `table` by `specs`; problems go to `problems` (rows with problems are still returned). */
export function readRecords(table: CsvTable, specs: readonly ColumnSpec[], problems: TableProblem[]): ReadRecords {
  const { file } = table;
  const byNorm = new Map(specs.map((s) => [normaliseName(s.name), s] as const));
  const fieldAt: Array<ColumnSpec | { data: string } | undefined> = [];
  const columnOf = new Map<string, string>();
  const seenData = new Set<string>();
  table.header.forEach((h, i) => {
    const data = DATA_PREFIX.exec(h);
    if (data) {
      const key = data[1]!.trim();
      if (seenData.has(key)) problems.push({ file, row: table.headerRow, column: h, message: `column "${h}" appears twice` });
      else seenData.add(key);
      fieldAt[i] = { data: key };
      return;
    }
    const spec = h === '' ? undefined : byNorm.get(normaliseName(h));
    if (spec === undefined) {
      const known = specs.map((s) => s.name);
      problems.push({
        file,
        row: table.headerRow,
        column: h === '' ? `#${i + 1}` : h,
        message: h === ''
          ? 'a column without a name: name it or delete it'
          : `unknown column "${h}"${didYouMean(h, known)}; the columns are ${known.join(', ')} (and data.<name> for your own fields)`,
      });
      return;
    }
    if (columnOf.has(spec.name)) {
      problems.push({ file, row: table.headerRow, column: h, message: `column "${spec.name}" appears twice (also as "${columnOf.get(spec.name)}")` });
      return;
    }
    columnOf.set(spec.name, h);
    fieldAt[i] = spec;
  });
  for (const s of specs) {
    if (s.required && !columnOf.has(s.name)) {
      problems.push({ file, row: table.headerRow, message: `missing column "${s.name}" (the header has: ${table.header.join(', ') || 'nothing'})` });
    }
  }

  const records: TableRecord[] = table.rows.map(({ row, cells }) => {
    if (cells.length > table.header.length) {
      problems.push({ file, row, message: `${cells.length} cells but the header names ${table.header.length} columns (a stray delimiter?)` });
    }
    const found: Record<string, string | number | boolean> = {};
    const data: Array<[string, string | number]> = [];
    const failed = new Set<string>();
    cells.forEach((cell, i) => {
      const f = fieldAt[i];
      if (f === undefined || cell === '') return;
      if ('data' in f) {
        data.push([f.data, readDataCell(cell)]);
        return;
      }
      const r = readCell(cell, f.kind);
      if (r.ok) found[f.name] = r.value;
      else {
        failed.add(f.name);
        problems.push({ file, row, column: table.header[i], message: r.message });
      }
    });
    for (const s of specs) {
      if (s.required && columnOf.has(s.name) && found[s.name] === undefined && !failed.has(s.name)) {
        failed.add(s.name);
        problems.push({ file, row, column: columnOf.get(s.name), message: 'empty: this column is required' });
      }
    }
    const values: Record<string, string | number | boolean> = {};
    for (const s of specs) if (found[s.name] !== undefined) values[s.name] = found[s.name]!;
    // fromEntries defines own properties, so even a "__proto__" key stays data
    return { row, values, ...(data.length > 0 ? { data: Object.fromEntries(data) } : {}), failed };
  });
  return { records, columnOf };
}
