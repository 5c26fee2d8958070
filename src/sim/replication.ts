import { ChainEngine } from './chain-engine.js';
import { scratchCounters, type Counters } from './counters.js';
import { waitQuantile } from './percentiles.js';
import { QUANTILE_LEVELS, type ReplicationPlan, type ReplicationRecord } from './record.js';
import type { SimModel } from './sim-model.js';
import { TimedEngine } from './timed-engine.js';
import { addBins } from './wait-bins.js';

/** Arrivals per chunk between progress reports. */
export const CHUNK = 1 << 21;

/**
 * Runs replication `index` from its own random stream `state` (see random.ts: streamStates) and
 * returns its estimates. Pure and synchronous: the same (model, plan, index, state) always gives the
 * same record, in a worker thread or not. `progress(n)` is called after each chunk of n arrivals.
 */
export function runReplication(
  model: SimModel,
  plan: ReplicationPlan,
  index: number,
  state: Uint32Array,
  progress?: (arrivals: number) => void,
): ReplicationRecord {
  const timed = plan.timed || model.impatient;
  // a record without quantiles does not carry the histograms: the counters are this thread's scratch
  const scratch = plan.noQuantiles === true ? scratchCounters(model.n, model.m, timed ? 'time' : 'arrivals') : undefined;
  const engine = timed ? new TimedEngine(model, state, plan.maxWaiting, scratch) : new ChainEngine(model, state, plan.maxWaiting, scratch);
  const advance = (total: number): void => {
    for (let left = total; left > 0; ) {
      const step = Math.min(CHUNK, left);
      engine.run(step);
      left -= step;
      progress?.(step);
    }
  };
  advance(plan.warmup);
  engine.startMeasuring();
  const start = engine.clock;
  advance(plan.arrivals);
  engine.finish();
  // the patient engine's clock counts arrivals; one arrival lasts 1/Λ on average
  const duration = timed ? engine.clock - start : plan.arrivals / model.totalRate;
  const clockScale = timed ? 1 : 1 / model.totalRate;
  return summarise(model, engine.counters, index, plan.arrivals, duration, engine.clock - start, clockScale, plan.noQuantiles === true);
}

function summarise(
  model: SimModel,
  c: Counters,
  index: number,
  arrivals: number,
  duration: number,
  clockSpan: number,
  clockScale: number,
  noQuantiles = false,
): ReplicationRecord {
  const { n, m } = model;
  const bins = c.bins;
  const backlog = new Float64Array(n);
  const waitMean = new Float64Array(n);
  const immediate = new Float64Array(n);
  const abandonRate = new Float64Array(n);
  const abandonShare = new Float64Array(n);
  const waitQuantiles = new Float64Array((n + 1) * QUANTILE_LEVELS.length);
  const totalHist = new Float64Array(noQuantiles ? 0 : bins);
  let backlogTotal = 0;
  let waitSumAll = 0;
  let matchedAll = 0;
  let immediateAll = 0;
  let abandonedAll = 0;
  for (let k = 0; k < n; k++) {
    backlog[k] = clockSpan > 0 ? c.area[k]! / clockSpan : NaN;
    backlogTotal += backlog[k]!;
    const matched = c.immediate[k]! + c.waitedMatched[k]!;
    waitMean[k] = matched > 0 ? (c.waitSum[k]! * clockScale) / matched : NaN;
    waitSumAll += c.waitSum[k]! * clockScale;
    matchedAll += matched;
    immediate[k] = c.arrivals[k]! > 0 ? c.immediate[k]! / c.arrivals[k]! : NaN;
    immediateAll += c.immediate[k]!;
    abandonRate[k] = c.abandoned[k]! / duration;
    abandonShare[k] = c.arrivals[k]! > 0 ? c.abandoned[k]! / c.arrivals[k]! : NaN;
    abandonedAll += c.abandoned[k]!;
    if (noQuantiles) continue;
    c.hist[k * bins] = c.immediate[k]!; // bin 0: matched on arrival
    addBins(totalHist, c.hist, k * bins, bins);
    QUANTILE_LEVELS.forEach((p, i) => {
      waitQuantiles[k * QUANTILE_LEVELS.length + i] = waitQuantile(c.kind, c.hist, k * bins, bins, model.totalRate, p);
    });
  }
  if (noQuantiles) waitQuantiles.fill(NaN);
  else {
    QUANTILE_LEVELS.forEach((p, i) => {
      waitQuantiles[n * QUANTILE_LEVELS.length + i] = waitQuantile(c.kind, totalHist, 0, bins, model.totalRate, p);
    });
  }
  const matchRates = new Float64Array(m);
  for (let e = 0; e < m; e++) matchRates[e] = c.edgeMatches[e]! / duration;
  return {
    index,
    arrivals,
    duration,
    backlog,
    backlogTotal,
    waitMean,
    waitMeanTotal: matchedAll > 0 ? waitSumAll / matchedAll : NaN,
    waitQuantiles,
    immediate,
    immediateTotal: immediateAll / arrivals,
    matchRates,
    abandonRate,
    abandonRateTotal: abandonedAll / duration,
    abandonShare,
    abandonShareTotal: abandonedAll / arrivals,
    // without quantiles the counters are scratch, reused by the next replication: no histogram leaves
    hist: noQuantiles ? new Float64Array(0) : c.hist,
    histKind: c.kind,
    histBins: bins,
  };
}
