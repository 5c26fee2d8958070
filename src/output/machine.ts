/**
 * Machine output: JSON and CSV, both from a record, both rounded the same way.
 *
 * JSON: every non-integer number is rounded to the record's supported significant digits
 * (`precision`, default MACHINE_DIGITS); an object holding `mean` and `ci95` (a simulated estimate)
 * is rounded to what its interval supports, and so is a `…Ci95` interval beside a figure. A record
 * never holds NaN or ±Infinity: finding one is a bug (InternalError). A figure that does not apply
 * (null in the record: an unstable design has no backlog) is left out of the object, so the JSON
 * never shows a null figure; the fields that say why (`stable`, `instability`, …) stay.
 *
 * CSV: RFC 4180 quoting by csv-stringify, numbers rounded like JSON, pairs in the ASCII notation.
 */
import { InternalError } from '../errors.js';
import { MACHINE_DIGITS, roundEstimate, roundFigure } from './format.js';
import { createRequire } from 'node:module';

type CsvSync = typeof import('csv-stringify/sync');
let csvSync: CsvSync | undefined;
/** csv-stringify, loaded on the first CSV only: commands that print text or JSON never load it. */
const csvStringify = (): CsvSync['stringify'] => (csvSync ??= createRequire(import.meta.url)('csv-stringify/sync') as CsvSync).stringify;

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };

function isInterval(v: unknown): v is [number, number] {
  return Array.isArray(v) && v.length === 2 && typeof v[0] === 'number' && typeof v[1] === 'number';
}

/** An estimate rounded to its interval; a non-finite mean or end is a bug (InternalError naming where). */
function estimateAt(mean: number, lo: number, hi: number, path: string): { mean: number; ci95: [number, number] } {
  for (const [x, what] of [[mean, 'its value'], [lo, 'its interval'], [hi, 'its interval']] as const) {
    if (!Number.isFinite(x)) throw new InternalError(`an estimate at ${path || 'the top'} has ${x} as ${what}; it should have been a number or null`);
  }
  return roundEstimate(mean, lo, hi);
}

function rounded(value: unknown, digits: number, path: string): Json {
  if (value === null || value === undefined) return null;
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new InternalError(`a figure at ${path || 'the top'} is ${value}; it should have been a number or null`);
    return roundFigure(value, digits);
  }
  if (typeof value === 'string' || typeof value === 'boolean') return value;
  if (ArrayBuffer.isView(value)) return rounded(Array.from(value as unknown as ArrayLike<number>), digits, path);
  if (Array.isArray(value)) return value.map((v, i) => rounded(v, digits, `${path}[${i}]`));
  if (typeof value === 'object') {
    const o = value as Record<string, unknown>;
    const out: Record<string, Json> = {};
    const est = typeof o['mean'] === 'number' && isInterval(o['ci95']) ? estimateAt(o['mean'] as number, o['ci95'][0], o['ci95'][1], path) : undefined;
    for (const [k, v] of Object.entries(o)) {
      if (v === undefined || v === null) continue;
      const at = path ? `${path}.${k}` : k;
      if (est && k === 'mean') out[k] = est.mean;
      else if (est && k === 'ci95') out[k] = est.ci95;
      else if (k.endsWith('Ci95') && isInterval(v)) {
        const base = o[k.slice(0, -4)];
        out[k] = typeof base === 'number' ? estimateAt(base, v[0], v[1], at).ci95 : (rounded(v, digits, at) as [number, number]);
      } else if (typeof v === 'number' && isInterval(o[`${k}Ci95`])) {
        const ci = o[`${k}Ci95`] as [number, number];
        out[k] = estimateAt(v, ci[0], ci[1], at).mean;
      } else out[k] = rounded(v, digits, at);
    }
    return out;
  }
  throw new InternalError(`cannot write ${typeof value} at ${path} as JSON`);
}

/** The record as pretty JSON text (ends with a newline). */
export function renderJson(record: object, digits?: number): string {
  const d = digits ?? (typeof (record as { precision?: unknown }).precision === 'number' ? (record as { precision: number }).precision : MACHINE_DIGITS);
  return `${JSON.stringify(rounded(record, d, ''), null, 2)}\n`;
}

export type CsvCell = string | number | boolean | null | undefined;

/** CSV text with a header line; numbers rounded to `digits` significant digits. */
export function renderCsv(header: readonly string[], rows: ReadonlyArray<readonly CsvCell[]>, digits = MACHINE_DIGITS): string {
  const cell = (v: CsvCell): string => {
    if (v === null || v === undefined) return '';
    if (typeof v === 'number') {
      if (!Number.isFinite(v)) throw new InternalError(`a CSV figure is ${v}`);
      return String(roundFigure(v, digits));
    }
    return String(v);
  };
  return csvStringify()([header as string[], ...rows.map((r) => r.map(cell))], { eof: true, record_delimiter: '\n' });
}
