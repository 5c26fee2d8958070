import Table from 'cli-table3';

/** Number formatting shared by the human-readable outputs. */

/** Fixed significant digits without trailing noise: 0.8333 → "0.833", 12 → "12". */
export function num(x: number, digits = 4): string {
  if (!Number.isFinite(x)) return x > 0 ? '∞' : x < 0 ? '-∞' : '—';
  if (x === 0) return '0';
  const a = Math.abs(x);
  if (a >= 1e6 || a < 1e-4) return x.toExponential(digits - 1);
  return Number(x.toPrecision(digits)).toString();
}

export function pct(x: number, digits = 1): string {
  return Number.isFinite(x) ? `${(x * 100).toFixed(digits)}%` : '—';
}

/** Rounds for JSON output: keeps 12 significant digits so that files stay readable and stable. */
export function round(x: number): number | null {
  if (!Number.isFinite(x)) return null;
  return Number(x.toPrecision(12));
}


/** A compact cli-table3 table (no rule between rows), shared by every command. */
export function table(head: string[], colAligns?: Array<'left' | 'right' | 'center'>): Table.Table {
  return new Table({
    head,
    ...(colAligns ? { colAligns } : {}),
    style: { head: [], border: [], compact: true },
    chars: { mid: '', 'left-mid': '', 'mid-mid': '', 'right-mid': '' },
  });
}
