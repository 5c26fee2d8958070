import { sampleAlias } from './alias.js';
import { waitingCapError } from './cap.js';
import type { Counters } from './counters.js';
import { flushAreas, newCounters, resetCounters } from './counters.js';
import { Queues } from './queues.js';
import { nextOpenUnit, nextUint32 } from './random.js';
import { selectPartner } from './select.js';
import type { SimModel } from './sim-model.js';
import { timeBin } from './wait-bins.js';

/**
 * The timed engine, for impatient classes (and on request for patient ones): a continuous-time
 * simulation with explicit clock. Events compete: arrivals at total rate Λ, abandonments at rate
 * A = Σ_k γ_k·n_k (γ_k = 1/patience_k, n_k waiting items of class k). Exponential patience is
 * memoryless, so when an abandonment fires the item that leaves is uniform among the n_k items of
 * its class, whatever their ages — an exact simulation without per-item deadlines.
 *
 * Removal from the middle of a queue is lazy: the slot is flagged "gone" and skipped when it
 * reaches the head; a ring is compacted when gone slots outnumber live ones (amortised O(1)).
 * Queues hold arrival times.
 */
export class TimedEngine {
  readonly counters: Counters;
  /** Current time. */
  clock = 0;
  arrivalsDone = 0;
  waiting = 0;
  /** Live waiting items per class. */
  readonly counts: Int32Array;
  readonly headVal: Float64Array;
  readonly queues: Queues;
  private readonly rng: Uint32Array;
  private abandonTotal = 0;
  private events = 0;

  constructor(
    readonly model: SimModel,
    rngState: Uint32Array,
    readonly maxWaiting: number,
  ) {
    this.rng = Uint32Array.from(rngState);
    this.counts = new Int32Array(model.n);
    this.headVal = new Float64Array(model.n).fill(Infinity);
    this.queues = new Queues(model.n, true);
    this.counters = newCounters(model.n, model.m, 'time');
  }

  startMeasuring(): void {
    resetCounters(this.counters, this.clock);
  }

  finish(): void {
    flushAreas(this.counters, this.counts, this.clock);
  }

  /** Simulates events until `count` more arrivals have happened (the clock stops at the last one). */
  run(count: number): void {
    const model = this.model;
    const { nbr, nbrEdge, alias } = model;
    const lambda = model.totalRate;
    const { counts, headVal, rng, counters } = this;
    const { arrivals, immediate, waitedMatched, waitSum, edgeMatches, hist, bins, abandoned } = counters;
    let done = 0;
    while (done < count) {
      if ((++this.events & 0xfff) === 0) this.resyncAbandonRate();
      const A = this.waiting === 0 ? 0 : this.abandonTotal;
      const rate = lambda + A;
      this.clock += -Math.log(nextOpenUnit(rng)) / rate;
      const now = this.clock;
      if (A > 0 && nextOpenUnit(rng) * rate >= lambda) {
        // an abandonment: class by weight γ_k n_k, then a uniform live item of that class
        const k = this.pickAbandoningClass();
        if (k < 0) {
          this.resyncAbandonRate(); // only rounding left in the running sum
          continue;
        }
        this.removeRandomItem(k, now);
        abandoned[k]++;
        continue;
      }
      done++;
      this.arrivalsDone++;
      const k = sampleAlias(alias, nextUint32(rng));
      arrivals[k]++;
      const bp = selectPartner(model, counts, headVal, k, rng);
      if (bp < 0) {
        this.push(k, now);
        if (this.waiting > this.maxWaiting) {
          throw waitingCapError(this.maxWaiting, counts, model.ids, `after ${this.arrivalsDone.toLocaleString('en-US')} arrivals`);
        }
      } else {
        const j = nbr[bp]!;
        const born = this.popHead(j, now);
        immediate[k]++;
        edgeMatches[nbrEdge[bp]!]++;
        const w = now - born;
        waitedMatched[j]++;
        waitSum[j] += w;
        hist[j * bins + timeBin(w * lambda)]++;
      }
    }
  }

  private resyncAbandonRate(): void {
    let a = 0;
    for (let k = 0; k < this.model.n; k++) a += this.model.abandonRate[k]! * this.counts[k]!;
    this.abandonTotal = a;
  }

  private pickAbandoningClass(): number {
    const { n, abandonRate } = this.model;
    const counts = this.counts;
    let total = 0;
    for (let k = 0; k < n; k++) total += abandonRate[k]! * counts[k]!;
    let target = nextOpenUnit(this.rng) * total;
    let last = -1;
    for (let k = 0; k < n; k++) {
      const w = abandonRate[k]! * counts[k]!;
      if (w <= 0) continue;
      last = k;
      target -= w;
      if (target < 0) return k;
    }
    return last; // rounding
  }

  private setCount(k: number, c: number, now: number): void {
    const counters = this.counters;
    counters.area[k] += this.counts[k]! * (now - counters.last[k]!);
    counters.last[k] = now;
    this.abandonTotal += (c - this.counts[k]!) * this.model.abandonRate[k]!;
    this.waiting += c - this.counts[k]!;
    this.counts[k] = c;
  }

  private push(k: number, now: number): void {
    const q = this.queues;
    const s = q.span[k]!;
    if (s === q.cap[k]) q.grow(k);
    const p = q.off[k]! + ((q.head[k]! + s) & q.mask[k]!);
    q.buf[p] = now;
    q.gone![p] = 0;
    q.span[k] = s + 1;
    if (this.counts[k] === 0) this.headVal[k] = now;
    this.setCount(k, this.counts[k]! + 1, now);
  }

  /** Removes the oldest live item of class k; returns its arrival time. */
  private popHead(k: number, now: number): number {
    const q = this.queues;
    const born = this.headVal[k]!;
    q.head[k] = (q.head[k]! + 1) & q.mask[k]!;
    q.span[k]--;
    this.skipGone(k);
    this.setCount(k, this.counts[k]! - 1, now);
    return born;
  }

  /** Drops gone slots at the head of ring k and refreshes headVal[k]. */
  private skipGone(k: number): void {
    const q = this.queues;
    const gone = q.gone!;
    const off = q.off[k]!;
    const mask = q.mask[k]!;
    let h = q.head[k]!;
    let s = q.span[k]!;
    while (s > 0 && gone[off + h] === 1) {
      gone[off + h] = 0;
      h = (h + 1) & mask;
      s--;
    }
    q.head[k] = h;
    q.span[k] = s;
    this.headVal[k] = s > 0 ? q.buf[off + h]! : Infinity;
  }

  /** Abandonment: a uniform live item of class k leaves (rejection over the slots, then lazy removal). */
  private removeRandomItem(k: number, now: number): void {
    const q = this.queues;
    const gone = q.gone!;
    const off = q.off[k]!;
    const mask = q.mask[k]!;
    const span = q.span[k]!;
    let p: number;
    for (;;) {
      const i = (nextUint32(this.rng) * span * 2.3283064365386963e-10) | 0;
      p = off + ((q.head[k]! + i) & mask);
      if (gone[p] === 0) break;
    }
    gone[p] = 1;
    this.setCount(k, this.counts[k]! - 1, now);
    if (p === off + q.head[k]!) this.skipGone(k);
    if (q.span[k]! > 2 * this.counts[k]! + 16) this.compactRing(k);
  }

  /** Moves the live items of ring k to the front, in order, clearing the gone flags. */
  private compactRing(k: number): void {
    const q = this.queues;
    const gone = q.gone!;
    const buf = q.buf;
    const off = q.off[k]!;
    const mask = q.mask[k]!;
    const h = q.head[k]!;
    const span = q.span[k]!;
    let w = 0;
    for (let r = 0; r < span; r++) {
      const from = off + ((h + r) & mask);
      if (gone[from] === 1) {
        gone[from] = 0;
        continue;
      }
      const to = off + ((h + w) & mask);
      buf[to] = buf[from]!;
      w++;
    }
    q.span[k] = w;
  }
}
