/** The metrics every oracle produces, in the same shape as the evaluator's result (plain arrays). */
export interface Metrics {
  readonly emptyProbability: number;
  readonly backlogTotal: number;
  readonly backlog: ArrayLike<number>;
  readonly wait: ArrayLike<number>;
  readonly immediateMatch: ArrayLike<number>;
  /** Per edge, model edge order. */
  readonly matchRates: ArrayLike<number>;
}

const FIELDS = ['emptyProbability', 'backlogTotal', 'backlog', 'wait', 'immediateMatch', 'matchRates'] as const;

/** Largest relative difference |a − b| / max(|a|, |b|, floor) over every metric, and where it occurs. */
export function maxRelativeDifference(a: Metrics, b: Metrics, floor = 1e-300): { value: number; where: string } {
  let value = 0;
  let where = '';
  const see = (x: number, y: number, label: string): void => {
    const d = x === y ? 0 : Math.abs(x - y) / Math.max(Math.abs(x), Math.abs(y), floor);
    if (!(d <= value)) {
      value = Number.isNaN(d) ? Infinity : d;
      where = `${label}: ${x} vs ${y}`;
    }
  };
  for (const f of FIELDS) {
    const x = a[f];
    const y = b[f];
    if (typeof x === 'number' && typeof y === 'number') see(x, y, f);
    else {
      const xs = x as ArrayLike<number>;
      const ys = y as ArrayLike<number>;
      if (xs.length !== ys.length) return { value: Infinity, where: `${f}: length ${xs.length} vs ${ys.length}` };
      for (let i = 0; i < xs.length; i++) see(xs[i]!, ys[i]!, `${f}[${i}]`);
    }
  }
  return { value, where };
}

/** Largest absolute difference over every metric. */
export function maxAbsoluteDifference(a: Metrics, b: Metrics): number {
  let value = 0;
  for (const f of FIELDS) {
    const x = a[f];
    const y = b[f];
    if (typeof x === 'number' && typeof y === 'number') value = Math.max(value, Math.abs(x - y));
    else {
      const xs = x as ArrayLike<number>;
      const ys = y as ArrayLike<number>;
      for (let i = 0; i < xs.length; i++) value = Math.max(value, Math.abs(xs[i]! - ys[i]!));
    }
  }
  return value;
}
