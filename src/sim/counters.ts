import { ARRIVAL_BINS, TIME_BINS } from './wait-bins.js';

/**
 * What one replication counts during its measured window. The clock is either the arrival index
 * (patient engine) or the time (timed engine); `area`/`last` integrate each class's number of
 * waiting items over that clock, updated only when the count changes.
 */
export interface Counters {
  readonly arrivals: Float64Array;
  /** Arrivals matched at once (wait 0). */
  readonly immediate: Float64Array;
  /** Items matched after waiting. */
  readonly waitedMatched: Float64Array;
  /** Sum of the waits of the items matched after waiting (clock units). */
  readonly waitSum: Float64Array;
  readonly abandoned: Float64Array;
  readonly area: Float64Array;
  readonly last: Float64Array;
  readonly edgeMatches: Float64Array;
  /** Wait histogram of class k at hist[k·bins .. (k+1)·bins); bin 0 is left for the caller. */
  readonly hist: Float64Array;
  readonly bins: number;
  readonly kind: 'arrivals' | 'time';
}

export function newCounters(n: number, m: number, kind: 'arrivals' | 'time'): Counters {
  const bins = kind === 'arrivals' ? ARRIVAL_BINS : TIME_BINS;
  return {
    arrivals: new Float64Array(n),
    immediate: new Float64Array(n),
    waitedMatched: new Float64Array(n),
    waitSum: new Float64Array(n),
    abandoned: new Float64Array(n),
    area: new Float64Array(n),
    last: new Float64Array(n),
    edgeMatches: new Float64Array(m),
    hist: new Float64Array(n * bins),
    bins,
    kind,
  };
}

const scratch = new Map<string, Counters>();

/**
 * Counters reused from one replication to the next in this thread, for runs whose records do not
 * carry the histograms (`noQuantiles`): allocating and zeroing n × 6 401 bins for every short
 * replication of a design search cost about as much as simulating it at 100 classes. The engine
 * writes them during the warm-up and zeroes them all when it starts measuring (`resetCounters`),
 * so nothing of the previous replication is read.
 */
export function scratchCounters(n: number, m: number, kind: 'arrivals' | 'time'): Counters {
  const key = `${kind}:${n}:${m}`;
  let c = scratch.get(key);
  if (!c) {
    if (scratch.size >= 8) scratch.clear();
    c = newCounters(n, m, kind);
    scratch.set(key, c);
  }
  return c;
}

/** Zeroes every counter and starts the integrals at `clock`. */
export function resetCounters(c: Counters, clock: number): void {
  c.arrivals.fill(0);
  c.immediate.fill(0);
  c.waitedMatched.fill(0);
  c.waitSum.fill(0);
  c.abandoned.fill(0);
  c.area.fill(0);
  c.last.fill(clock);
  c.edgeMatches.fill(0);
  c.hist.fill(0);
}

/** Closes the integrals at `clock` given the current counts. */
export function flushAreas(c: Counters, counts: ArrayLike<number>, clock: number): void {
  for (let k = 0; k < c.area.length; k++) {
    c.area[k] += counts[k]! * (clock - c.last[k]!);
    c.last[k] = clock;
  }
}
