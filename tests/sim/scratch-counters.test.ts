import { describe, expect, it } from 'vitest';
import { compileGraph } from '../../src/model/compile.js';
import { streamStates } from '../../src/sim/random.js';
import type { ReplicationRecord } from '../../src/sim/record.js';
import { runReplication } from '../../src/sim/replication.js';
import { buildSimModel } from '../../src/sim/sim-model.js';

// Replications without quantiles reuse this thread's counters (src/sim/counters.ts: scratchCounters).
// The oracle is the run with fresh counters (quantiles on): every figure but the quantiles must be
// the same number, whatever ran before in the same thread (another design, another engine, a
// replication that left its counters full).

const plain = { arrivals: 30_000, warmup: 3_000, maxWaiting: 1e6, timed: false };
const fast = { ...plain, noQuantiles: true };
const ring = compileGraph(['a', 'b', 'c', 'd', 'e'], [1, 1.2, 0.9, 1.1, 0.8], [[0, 1], [1, 2], [2, 3], [3, 4], [4, 0], [2, 2]]);
const other = compileGraph(['a', 'b', 'c', 'd', 'e'], [1, 1.2, 0.9, 1.1, 0.8], [[0, 1], [1, 2], [2, 3], [3, 4], [0, 0], [4, 4]]);

/** The figures a record without quantiles carries. */
function figures(r: ReplicationRecord) {
  return {
    backlog: Array.from(r.backlog),
    backlogTotal: r.backlogTotal,
    waitMean: Array.from(r.waitMean),
    immediate: Array.from(r.immediate),
    matchRates: Array.from(r.matchRates),
    abandonShare: Array.from(r.abandonShare),
    duration: r.duration,
  };
}

describe('counters reused between replications', () => {
  for (const patience of [undefined, Float64Array.from([2, Infinity, 1.5, Infinity, 3])]) {
    const label = patience ? 'timed engine (patience)' : 'patient engine';
    it(`${label}: same figures as fresh counters, in any order of runs`, () => {
      const sim = buildSimModel(ring, patience ? { patience } : {});
      const sim2 = buildSimModel(other, patience ? { patience } : {});
      const states = streamStates(11, 3);
      const fresh = [0, 1, 2].map((i) => runReplication(sim, plain, i, states[i]!));
      // interleave another design of the same size (the same scratch) between the reused runs
      const reused = [2, 0, 1].map((i) => {
        runReplication(sim2, fast, i, states[i]!);
        return runReplication(sim, fast, i, states[i]!);
      });
      for (const r of reused) {
        const f = fresh[r.index]!;
        expect(figures(r)).toEqual(figures(f));
        expect(r.hist.length).toBe(0);
        expect(Number.isNaN(r.waitQuantiles[0]!)).toBe(true);
        expect(f.hist.length).toBeGreaterThan(0);
        expect(Number.isFinite(f.waitQuantiles[0]!)).toBe(true);
      }
      // the replications differ from one another: the comparison above could fail
      expect(fresh[0]!.backlogTotal).not.toBe(fresh[1]!.backlogTotal);
      // and the timed case did run the timed engine: items abandoned
      if (patience) expect(fresh[0]!.abandonShareTotal).toBeGreaterThan(0);
    });
  }
});
