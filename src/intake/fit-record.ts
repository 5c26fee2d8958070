/**
 * The JSON record of a fit (`fit --json`): plain numbers in the time unit, timestamps as UTC ISO
 * strings when the log had timestamps, null for an infinite value (no abandonment seen).
 */
import { DISPERSION_LEVEL, type FitResult } from './fit-log.js';
import { formatTimestamp, UNIT_MS } from './time-values.js';

const finite = (x: number): number | null => (Number.isFinite(x) ? x : null);
const pair = (p: readonly [number, number]): [number | null, number | null] => [finite(p[0]), finite(p[1])];

export function fitRecord(r: FitResult) {
  const when = (t: number): number | string => (r.originMs === undefined ? t : formatTimestamp(r.originMs + t * UNIT_MS[r.timeUnit]!));
  return {
    source: r.source,
    timeUnit: r.timeUnit,
    time: { format: r.timeFormat, ...(r.originMs === undefined ? {} : { origin: formatTimestamp(r.originMs) }) },
    window: { from: when(r.window.from), to: when(r.window.to), length: r.window.length, estimated: r.window.estimated },
    arrivals: r.arrivals,
    leftOut: r.leftOut,
    classes: r.classes.map((c) => ({
      id: c.id,
      rate: c.rate,
      ci95: pair(c.ci95),
      count: c.count,
      exposure: c.exposure,
      dispersion: c.dispersion ? { ...c.dispersion, poisson: c.dispersion.pValue >= DISPERSION_LEVEL } : null,
      ...(c.patience
        ? {
            patience: {
              mean: finite(c.patience.mean),
              ci95: pair(c.patience.meanCi95),
              abandoned: c.patience.abandoned,
              censored: c.patience.censored,
              timeAtRisk: c.patience.timeAtRisk,
              abandonmentRate: c.patience.abandonmentRate,
              abandonmentRateCi95: pair(c.patience.abandonmentRateCi95),
            },
          }
        : {}),
      ...(c.bands
        ? {
            bands: c.bands.map((b) => ({
              band: b.band,
              ...(b.start === undefined ? {} : { start: when(b.start), end: when(b.end!) }),
              exposure: b.exposure,
              count: b.count,
              rate: b.rate,
              ci95: pair(b.ci95),
            })),
          }
        : {}),
    })),
    warnings: r.warnings,
  };
}
