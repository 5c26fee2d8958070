/**
 * Reads an arrival log: a CSV table with one row per arrival, of which four columns are used — the
 * time, the class, and optionally the outcome (matched / abandoned / waiting) and the wait. Other
 * columns are ignored. Column names are matched case-insensitively; every problem is collected with
 * its row and column.
 */
import type { TableProblem } from '../errors.js';
import { readNumber } from './cells.js';
import { readCsvTable } from './csv-table.js';
import { didYouMean, normaliseName } from './suggest.js';
import { guessTimeFormat, readTime, type TimeFormat, type Timestamp } from './time-values.js';

export const OUTCOMES = ['matched', 'abandoned', 'waiting'] as const;
export type Outcome = (typeof OUTCOMES)[number];

export interface LogColumns {
  readonly time: string;
  readonly class: string;
  readonly outcome?: string;
  readonly wait?: string;
}

export interface LoggedArrival {
  readonly row: number;
  /** A number of time units, or a timestamp. */
  readonly time: number | Timestamp;
  readonly cls: string;
  readonly outcome?: Outcome;
  /** Time spent waiting (time units): until matched, until leaving, or until the log ends. */
  readonly wait?: number;
}

export interface ArrivalLog {
  readonly format: TimeFormat;
  readonly arrivals: readonly LoggedArrival[];
}

/** Reads the log; problems go to `problems`, and only rows without problems are returned. */
export function readArrivalLog(text: string, file: string, columns: LogColumns, problems: TableProblem[]): ArrivalLog {
  const table = readCsvTable(text, file, problems);
  if (table === undefined) return { format: 'number', arrivals: [] };
  const find = (name: string | undefined, option: string): number | undefined => {
    if (name === undefined) return undefined;
    const i = table.header.findIndex((h) => normaliseName(h) === normaliseName(name));
    if (i < 0) {
      problems.push({
        file,
        row: table.headerRow,
        message: `no column "${name}" (${option})${didYouMean(name, table.header)}; the columns are ${table.header.join(', ')}`,
      });
    }
    return i < 0 ? undefined : i;
  };
  const t = find(columns.time, '--time');
  const c = find(columns.class, '--class');
  const o = find(columns.outcome, '--outcome');
  const w = find(columns.wait, '--wait');
  if (t === undefined || c === undefined || (columns.outcome !== undefined && o === undefined) || (columns.wait !== undefined && w === undefined)) {
    return { format: 'number', arrivals: [] };
  }
  const format = guessTimeFormat(table.rows.map((r) => r.cells[t] ?? ''));
  const arrivals: LoggedArrival[] = [];
  for (const { row, cells } of table.rows) {
    const at = (i: number, message: string) => problems.push({ file, row, column: table.header[i], message });
    const before = problems.length;
    const timeCell = cells[t] ?? '';
    const time = timeCell === '' ? undefined : readTime(timeCell, format);
    if (timeCell === '') at(t, 'empty: every arrival needs a time');
    else if (time === undefined) {
      at(t, format === 'number' ? `must be a number of time units like the rows above, found "${timeCell}"` : `must be an ISO 8601 timestamp like 2025-03-14T08:30:00Z (as the rows above), found "${timeCell}"`);
    }
    const cls = cells[c] ?? '';
    if (cls === '') at(c, 'empty: every arrival needs a class');
    let outcome: Outcome | undefined;
    if (o !== undefined && (cells[o] ?? '') !== '') {
      const v = cells[o]!.toLowerCase();
      if ((OUTCOMES as readonly string[]).includes(v)) outcome = v as Outcome;
      else at(o, `must be one of ${OUTCOMES.join(', ')} (or empty), found "${cells[o]}"${didYouMean(v, OUTCOMES)}`);
    }
    let wait: number | undefined;
    if (w !== undefined && (cells[w] ?? '') !== '') {
      wait = readNumber(cells[w]!);
      if (wait === undefined || wait < 0) at(w, `must be a number >= 0 (time units), found "${cells[w]}"`);
    } else if (outcome !== undefined && w !== undefined) at(w, `empty: a wait is needed where the outcome is given (${outcome})`);
    if (problems.length > before) continue;
    arrivals.push({ row, time: time!, cls, ...(outcome === undefined ? {} : { outcome }), ...(wait === undefined ? {} : { wait }) });
  }
  return { format, arrivals };
}
