/**
 * Typed reading of one CSV cell. An empty cell never reaches these readers (empty = absent); each
 * returns the value, or a message saying what was expected.
 */

export type CellKind = 'text' | 'number' | 'positive' | 'nonNegative' | 'count' | 'share' | 'boolean';

export type CellResult = { readonly ok: true; readonly value: string | number | boolean } | { readonly ok: false; readonly message: string };

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const DECIMAL_COMMA = /^[+-]?\d+,\d+$/;

const TRUE = new Set(['true', 'yes', '1']);
const FALSE = new Set(['false', 'no', '0']);

/** A plain decimal number ("12", "0.5", "1e3"); undefined for anything else. */
export function readNumber(cell: string): number | undefined {
  if (!NUMBER.test(cell)) return undefined;
  const x = Number(cell);
  return Number.isFinite(x) ? x : undefined;
}

function notANumber(cell: string): string {
  const hint = DECIMAL_COMMA.test(cell) ? ` (write a decimal point: ${cell.replace(',', '.')})` : /%$/.test(cell) ? ' (write a plain number, without %)' : '';
  return `must be a number, found "${cell}"${hint}`;
}

/** Reads `cell` as `kind`. */
export function readCell(cell: string, kind: CellKind): CellResult {
  if (kind === 'text') return { ok: true, value: cell };
  if (kind === 'boolean') {
    const v = cell.toLowerCase();
    if (TRUE.has(v)) return { ok: true, value: true };
    if (FALSE.has(v)) return { ok: true, value: false };
    return { ok: false, message: `must be true or false (also yes/no, 1/0), found "${cell}"` };
  }
  const x = readNumber(cell);
  if (x === undefined) return { ok: false, message: notANumber(cell) };
  switch (kind) {
    case 'positive':
      return x > 0 ? { ok: true, value: x } : { ok: false, message: `must be a number > 0, found ${cell}` };
    case 'nonNegative':
      return x >= 0 ? { ok: true, value: x } : { ok: false, message: `must be a number >= 0, found ${cell}` };
    case 'count':
      return Number.isInteger(x) && x >= 0 ? { ok: true, value: x } : { ok: false, message: `must be a whole number >= 0, found ${cell}` };
    case 'share':
      return x >= 0 && x < 1
        ? { ok: true, value: x }
        : { ok: false, message: `must be a share from 0 up to (not including) 1, e.g. 0.05 for 5 %, found ${cell}` };
    default:
      return { ok: true, value: x };
  }
}

/** A free-form `data.<key>` cell: a number when it reads as one, else the text. */
export function readDataCell(cell: string): string | number {
  return readNumber(cell) ?? cell;
}
