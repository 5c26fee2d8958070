/**
 * Times in an arrival log: plain numbers (already in the time unit) or ISO 8601 timestamps
 * ("2025-03-14T08:30:00Z", "2025-03-14 08:30", "2025-03-14T08:30:00+01:00"). A timestamp without an
 * offset is read as UTC, so that the result never depends on the machine's time zone; its clock time
 * as written is kept for time-of-day bands.
 */
import { readNumber } from './cells.js';

/** Milliseconds per known time unit (singular names; plurals are accepted too). */
export const UNIT_MS: Readonly<Record<string, number>> = {
  second: 1_000,
  minute: 60_000,
  hour: 3_600_000,
  day: 86_400_000,
  week: 604_800_000,
};

/** The known unit named `unit` ("hours" → "hour"), or undefined. */
export function knownUnit(unit: string): string | undefined {
  const u = unit.trim().toLowerCase();
  const singular = u.endsWith('s') && UNIT_MS[u.slice(0, -1)] !== undefined ? u.slice(0, -1) : u;
  return UNIT_MS[singular] === undefined ? undefined : singular;
}

export interface Timestamp {
  /** Milliseconds since 1970-01-01T00:00:00Z (the offset applied). */
  readonly utcMs: number;
  /** Hour of the day as written (0 ≤ h < 24), minutes and seconds as fractions. */
  readonly clockHour: number;
}

const ISO = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?)?\s*(Z|[+-]\d{2}(?::?\d{2})?)?$/i;

/** Reads an ISO 8601 date or date-time; undefined when it is not one (or not a real date). */
export function readTimestamp(cell: string): Timestamp | undefined {
  const m = ISO.exec(cell);
  if (!m) return undefined;
  const [year, month, day, hour = 0, minute = 0, second = 0] = m.slice(1, 7).map((v) => (v === undefined ? undefined : Number(v))) as number[];
  const fraction = m[7] === undefined ? 0 : Number(`0.${m[7]}`);
  if (month! < 1 || month! > 12 || hour > 23 || minute > 59 || second > 59) return undefined;
  const wall = Date.UTC(year!, month! - 1, day!, hour, minute, second) + fraction * 1000;
  if (new Date(wall).getUTCDate() !== day) return undefined; // 2025-02-30 and the like
  let offsetMin = 0;
  const zone = m[8];
  if (zone !== undefined && zone.toUpperCase() !== 'Z') {
    const digits = zone.replace(':', '');
    offsetMin = (zone[0] === '-' ? -1 : 1) * (Number(digits.slice(1, 3)) * 60 + Number(digits.slice(3, 5) || 0));
  }
  return { utcMs: wall - offsetMin * 60_000, clockHour: hour + minute / 60 + (second + fraction) / 3600 };
}

export type TimeFormat = 'number' | 'iso';

/** A time cell read in the given format: a number of time units, or a timestamp. */
export function readTime(cell: string, format: TimeFormat): number | Timestamp | undefined {
  return format === 'number' ? readNumber(cell) : readTimestamp(cell);
}

/** The format of a column, from its first non-empty cell: numbers if it reads as one, else ISO. */
export function guessTimeFormat(cells: readonly string[]): TimeFormat {
  const first = cells.find((c) => c !== '');
  return first !== undefined && readNumber(first) !== undefined ? 'number' : 'iso';
}

/** A timestamp as written in outputs: UTC, ISO 8601, without milliseconds when they are zero. */
export function formatTimestamp(utcMs: number): string {
  return new Date(Math.round(utcMs)).toISOString().replace('.000Z', 'Z');
}
