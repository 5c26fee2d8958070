/**
 * `fit`: arrival rates (with exact Poisson intervals), patience (exponential, censored) and a
 * dispersion check per class, from the text of an arrival log; per time band when asked.
 *
 * The observation window is [--from, --to] when given. Otherwise it is estimated from the log: with
 * N arrivals (all classes) between the first t₁ and the last t_N, the window is extended by one mean
 * gap g = (t_N − t₁)/(N − 1) on each side. For N points uniform on an unknown interval, the range
 * times (N + 1)/(N − 1) is the unbiased estimate of its length (derived by hand: the range of N
 * uniform points on [0, L] has mean L (N − 1)/(N + 1)); the extension is exactly that.
 */
import { InvalidTableError, UsageError, type TableProblem } from '../errors.js';
import { readArrivalLog, type LogColumns, type LoggedArrival } from './arrival-log.js';
import { clockExposureHours, equalBands, inClockBand, parseBandHours, type Band } from './bands.js';
import { dispersionTest, type Dispersion } from './dispersion.js';
import { fitPatience, type PatienceFit } from './patience-fit.js';
import { poissonRateInterval } from './poisson-interval.js';
import { knownUnit, readTime, UNIT_MS, type TimeFormat, type Timestamp } from './time-values.js';

export interface FitOptions extends LogColumns {
  /** Unit of numeric times and of every output (default "hour"); a known unit for timestamps. */
  readonly timeUnit?: string;
  /** N equal parts of the window. */
  readonly bands?: number;
  /** Hours of the day, e.g. "0-7,7-10,10-16,16-19,19-24". */
  readonly bandHours?: string;
  /** Window start and end, in the format of the time column. */
  readonly from?: string;
  readonly to?: string;
}

export interface BandFit {
  readonly band: string;
  /** Equal parts only: the part's start and end (time units from the window's origin). */
  readonly start?: number;
  readonly end?: number;
  readonly exposure: number;
  readonly count: number;
  readonly rate: number;
  readonly ci95: [number, number];
}

export interface ClassFit {
  readonly id: string;
  readonly count: number;
  /** Observation time (time units): the window's length. */
  readonly exposure: number;
  readonly rate: number;
  readonly ci95: [number, number];
  /** Undefined below DISPERSION_MIN_COUNT (25) arrivals. */
  readonly dispersion?: Dispersion;
  /** Where the log has outcomes and waits for this class. */
  readonly patience?: PatienceFit;
  readonly bands?: readonly BandFit[];
}

export interface FitResult {
  readonly source: string;
  readonly timeUnit: string;
  readonly timeFormat: TimeFormat;
  /** Timestamps: the UTC milliseconds of time 0 (the earliest arrival); times are units after it. */
  readonly originMs?: number;
  readonly window: { readonly from: number; readonly to: number; readonly length: number; readonly estimated: boolean };
  /** Arrivals in the window, and those left out (outside --from/--to). */
  readonly arrivals: number;
  readonly leftOut: number;
  readonly classes: readonly ClassFit[];
  readonly bands?: readonly Band[];
  /** Plain sentences: classes whose counts look not Poisson, arrivals left out. */
  readonly warnings: readonly string[];
}

/** Significance level of the dispersion warning. */
export const DISPERSION_LEVEL = 0.01;

function checkOptions(o: FitOptions, format: TimeFormat): { unit: string; unitMs?: number } {
  const unit = (o.timeUnit ?? 'hour').trim();
  if (unit === '') throw new UsageError('--time-unit needs a name, e.g. --time-unit hour');
  const known = knownUnit(unit);
  const units = Object.keys(UNIT_MS).join(', ');
  if (format === 'iso' && known === undefined) throw new UsageError(`--time-unit must be one of ${units} when the times are timestamps, got "${unit}"`);
  if (o.bandHours !== undefined && known === undefined) throw new UsageError(`--band-hours needs --time-unit to be one of ${units}, got "${unit}"`);
  if (o.bands !== undefined && o.bandHours !== undefined) throw new UsageError('give --bands or --band-hours, not both');
  if (o.bands !== undefined && !(Number.isInteger(o.bands) && o.bands >= 1)) throw new UsageError(`--bands must be a whole number >= 1, got ${o.bands}`);
  if ((o.outcome === undefined) !== (o.wait === undefined)) throw new UsageError('patience needs both --outcome and --wait (or neither)');
  return { unit: known ?? unit, ...(known === undefined ? {} : { unitMs: UNIT_MS[known]! }) };
}

/** Fits the log `text` (named `file` in messages). Throws InvalidTableError or UsageError. */
export function fitLog(text: string, file: string, options: FitOptions): FitResult {
  const problems: TableProblem[] = [];
  const log = readArrivalLog(text, file, options, problems);
  if (problems.length > 0) throw new InvalidTableError(problems);
  const { unit, unitMs } = checkOptions(options, log.format);
  if (log.arrivals.length === 0) throw new InvalidTableError([{ file, message: 'no arrivals: the log has a header but no rows' }]);

  const originMs = log.format === 'iso' ? log.arrivals.reduce((m, a) => Math.min(m, (a.time as Timestamp).utcMs), Infinity) : undefined;
  const toUnits = (v: number | Timestamp): number => (typeof v === 'number' ? v : (v.utcMs - originMs!) / unitMs!);
  const option = (v: string | undefined, name: string): number | undefined => {
    if (v === undefined) return undefined;
    const t = readTime(v.trim(), log.format);
    if (t === undefined) throw new UsageError(`${name} must be written like the log's times (${log.format === 'number' ? 'a number' : 'an ISO 8601 timestamp'}), got "${v}"`);
    return toUnits(t);
  };
  const times = log.arrivals.map((a) => toUnits(a.time));
  const first = times.reduce((m, t) => Math.min(m, t), Infinity);
  const last = times.reduce((m, t) => Math.max(m, t), -Infinity);
  const n = times.length;
  const gap = n >= 2 ? (last - first) / (n - 1) : 0;
  const fromOpt = option(options.from, '--from');
  const toOpt = option(options.to, '--to');
  if ((fromOpt === undefined || toOpt === undefined) && !(gap > 0)) {
    throw new UsageError('cannot estimate the observation window from fewer than two distinct arrival times: give --from and --to');
  }
  const from = fromOpt ?? first - gap;
  const to = toOpt ?? last + gap;
  if (!(to > from)) throw new UsageError(`the window is empty: --to must come after --from`);

  let bands: Band[] | undefined;
  if (options.bands !== undefined) bands = equalBands(from, to, options.bands);
  if (options.bandHours !== undefined) {
    const parsed = parseBandHours(options.bandHours);
    if ('problems' in parsed) throw new UsageError(`--band-hours: ${parsed.problems.join('; ')}`);
    bands = parsed.bands;
  }
  // hours on one line whose multiples of 24 are midnights (numbers: time 0 is a midnight; timestamps: clock as written)
  const hoursPerUnit = unitMs === undefined ? NaN : unitMs / UNIT_MS['hour']!;
  const firstIso = log.format === 'iso' ? log.arrivals[times.indexOf(first)]!.time as Timestamp : undefined;
  const shift = firstIso ? firstIso.clockHour - first * hoursPerUnit : 0;
  const clockOf = (a: LoggedArrival, t: number): number => (typeof a.time === 'number' ? ((t * hoursPerUnit) % 24 + 24) % 24 : a.time.clockHour);
  const exposureOf = (b: Band): number =>
    b.kind === 'window' ? b.end - b.start : clockExposureHours(b, from * hoursPerUnit + shift, to * hoursPerUnit + shift) / hoursPerUnit;
  const bandOf = (a: LoggedArrival, t: number): number => {
    if (!bands) return -1;
    if (bands[0]!.kind === 'window') return Math.min(bands.length - 1, Math.floor(((t - from) / (to - from)) * bands.length));
    const h = clockOf(a, t);
    return bands.findIndex((b) => inClockBand(b, h));
  };

  interface Acc { times: number[]; bandCounts: number[]; withOutcome: number; abandoned: number; atRisk: number }
  const acc = new Map<string, Acc>();
  let leftOut = 0;
  log.arrivals.forEach((a, i) => {
    const t = times[i]!;
    let c = acc.get(a.cls);
    if (c === undefined) acc.set(a.cls, (c = { times: [], bandCounts: new Array<number>(bands?.length ?? 0).fill(0), withOutcome: 0, abandoned: 0, atRisk: 0 }));
    if (t < from || t > to) {
      leftOut++;
      return;
    }
    c.times.push(t);
    const b = bandOf(a, t);
    if (b >= 0) c.bandCounts[b]!++;
    if (a.outcome !== undefined) {
      c.withOutcome++;
      c.atRisk += a.wait!;
      if (a.outcome === 'abandoned') c.abandoned++;
    }
  });

  const length = to - from;
  const warnings: string[] = [];
  const classes: ClassFit[] = [...acc].map(([id, c]) => {
    const count = c.times.length;
    const dispersion = dispersionTest(c.times, from, to);
    if (dispersion && dispersion.pValue < DISPERSION_LEVEL) {
      const over = dispersion.index > 1;
      warnings.push(
        `${id}: arrivals are visibly not Poisson at a steady rate — counts per interval are ${over ? 'over' : 'under'}-dispersed ` +
          `(index ${dispersion.index.toPrecision(3)} over ${dispersion.intervals} intervals, p = ${dispersion.pValue.toPrecision(2)}); ` +
          (over ? 'bursts or a rate that changes over the window: try --band-hours or --bands' : 'arrivals more regular than random, e.g. booked slots'),
      );
    }
    if (count === 0) warnings.push(`${id}: no arrival inside the window`);
    const bandFits = bands?.map((b, k) => {
      const exposure = exposureOf(b);
      const n = c.bandCounts[k]!;
      return {
        band: b.name,
        ...(b.kind === 'window' ? { start: b.start, end: b.end } : {}),
        exposure,
        count: n,
        rate: exposure > 0 ? n / exposure : 0,
        ci95: exposure > 0 ? poissonRateInterval(n, exposure) : ([0, Infinity] as [number, number]),
      };
    });
    return {
      id,
      count,
      exposure: length,
      rate: count / length,
      ci95: poissonRateInterval(count, length),
      ...(dispersion ? { dispersion } : {}),
      ...(c.withOutcome > 0 ? { patience: fitPatience(c.abandoned, c.withOutcome, c.atRisk) } : {}),
      ...(bandFits ? { bands: bandFits } : {}),
    };
  });
  if (leftOut > 0) warnings.push(`${leftOut} arrival${leftOut === 1 ? '' : 's'} outside the window (--from/--to) left out`);
  return {
    source: file,
    timeUnit: unit,
    timeFormat: log.format,
    ...(originMs === undefined ? {} : { originMs }),
    window: { from, to, length, estimated: fromOpt === undefined || toOpt === undefined },
    arrivals: n - leftOut,
    leftOut,
    classes,
    ...(bands ? { bands } : {}),
    warnings,
  };
}
