import { sampleAlias } from './alias.js';
import { waitingCapError } from './cap.js';
import type { Counters } from './counters.js';
import { flushAreas, newCounters, resetCounters } from './counters.js';
import { Queues } from './queues.js';
import { nextOpenUnit, nextUint32 } from './random.js';
import { selectPartner } from './select.js';
import type { SimModel } from './sim-model.js';
import { expBeyond, nextExp, ZIG_K, ZIG_W } from './exponential.js';
import { fastTimeBin } from './fast-time-bin.js';

const TWO_POW_M32 = 2.3283064365386963e-10;

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
  /** [clock, abandonTotal]: doubles kept in a typed array, so that writing them never allocates. */
  private readonly time = new Float64Array(2);
  get clock(): number {
    return this.time[0]!;
  }
  arrivalsDone = 0;
  waiting = 0;
  /** Live waiting items per class. */
  readonly counts: Int32Array;
  readonly headVal: Float64Array;
  readonly queues: Queues;
  private readonly rng: Uint32Array;
  private events = 0;

  constructor(
    readonly model: SimModel,
    rngState: Uint32Array,
    readonly maxWaiting: number,
    scratch?: Counters,
  ) {
    this.rng = Uint32Array.from(rngState);
    this.counts = new Int32Array(model.n);
    this.headVal = new Float64Array(model.n).fill(Infinity);
    this.queues = new Queues(model.n, true);
    this.counters = scratch ?? newCounters(model.n, model.m, 'time');
  }

  startMeasuring(): void {
    resetCounters(this.counters, this.clock);
  }

  finish(): void {
    flushAreas(this.counters, this.counts, this.clock);
  }

  /**
   * Simulates events until `count` more arrivals have happened (the clock stops at the last one).
   * `generic` forces the loop that serves every policy (the tests compare both loops event by event).
   */
  run(count: number, generic = false): void {
    const model = this.model;
    if (model.policy === 0 && model.n <= 32 && !generic) this.runFcfmMask(count);
    else this.runAny(count);
  }

  /**
   * Every policy through selectPartner. The order of the random draws, which the FCFM loop below
   * keeps too: per event the holding time Exp(1)/(Λ + A) (exponential.ts), then, when A > 0, one
   * for "abandonment if u·(Λ + A) ≥ Λ"; an abandonment then draws its class and item (see
   * pickAbandoningClass, removeRandomItem), an arrival draws its class (alias table) and, under the
   * random policy with two or more candidates, the partner.
   */
  private runAny(count: number): void {
    const model = this.model;
    const { nbr, nbrEdge, alias } = model;
    const lambda = model.totalRate;
    const { counts, headVal, rng, counters } = this;
    const { arrivals, immediate, waitedMatched, waitSum, edgeMatches, hist, bins } = counters;
    let done = 0;
    while (done < count) {
      if ((++this.events & 0xfff) === 0) this.resyncAbandonRate();
      const A = this.waiting === 0 ? 0 : this.time[1]!;
      const rate = lambda + A;
      this.time[0] += nextExp(rng) / rate;
      const now = this.clock;
      if (A > 0 && nextOpenUnit(rng) * rate >= lambda) {
        this.abandonment(now);
        continue;
      }
      done++;
      this.arrivalsDone++;
      const k = sampleAlias(alias, nextUint32(rng));
      arrivals[k]++;
      const bp = selectPartner(model, counts, headVal, k, rng);
      if (bp < 0) {
        this.push(k, now);
        if (this.waiting > this.maxWaiting) throw this.capError();
      } else {
        const j = nbr[bp]!;
        const born = this.popHead(j, now);
        immediate[k]++;
        edgeMatches[nbrEdge[bp]!]++;
        const w = now - born;
        waitedMatched[j]++;
        waitSum[j] += w;
        hist[j * bins + fastTimeBin(w * lambda)]++;
      }
    }
  }

  /**
   * FCFM for at most 32 classes, the same events and draws as runAny with the hot path inlined:
   * the random state in locals, a mask of the classes with live items (intersected with the
   * arrival's candidates, as in the patient engine), the alias draw and the queue updates in place.
   * Abandonments (the rarer events) go through the shared methods.
   */
  private runFcfmMask(count: number): void {
    const model = this.model;
    const { n, nbrStart, nbr, nbrEdge, abandonRate } = model;
    const keep = model.alias.keep;
    const alias = model.alias.alias;
    const lambda = model.totalRate;
    const candMask = new Int32Array(n);
    const edgeOf = new Int32Array(n * n);
    for (let k = 0; k < n; k++) {
      for (let p = nbrStart[k]!; p < nbrStart[k + 1]!; p++) {
        candMask[k] |= 1 << nbr[p]!;
        edgeOf[k * n + nbr[p]!] = nbrEdge[p]!;
      }
    }
    const { counts, headVal, rng, counters, queues } = this;
    const { arrivals, immediate, waitedMatched, waitSum, edgeMatches, hist, bins, area, last } = counters;
    const { off, mask, head, span, cap } = queues;
    const scale = n * TWO_POW_M32;
    let busy = 0;
    for (let k = 0; k < n; k++) if (counts[k]! > 0) busy |= 1 << k;
    // the engine's scalars in locals, written back around the shared methods and at the end
    const maxWaiting = this.maxWaiting;
    let buf = queues.buf;
    let gone = queues.gone!;
    let clock = this.clock;
    let waiting = this.waiting;
    let total = this.time[1]!;
    let events = this.events;
    let done = 0;
    try {
      while (done < count) {
        if ((++events & 0xfff) === 0) {
          this.waiting = waiting;
          this.resyncAbandonRate();
          total = this.time[1]!;
        }
        const A = waiting === 0 ? 0 : total;
        const rate = lambda + A;
        // nextExp (exponential.ts) with its fast path inlined
        const ue = nextUint32(rng);
        const je = ue >>> 8;
        const now = (clock += (je < ZIG_K[ue & 255]! ? je * ZIG_W[ue & 255]! : expBeyond(rng, ue)) / rate);
        if (A > 0 && (nextUint32(rng) + 0.5) * TWO_POW_M32 * rate >= lambda) {
          this.time[0] = clock;
          this.waiting = waiting;
          this.time[1] = total;
          const k = this.abandonment(now, busy);
          waiting = this.waiting;
          total = this.time[1]!;
          if (k >= 0 && counts[k] === 0) busy &= ~(1 << k);
          continue;
        }
        done++;
        const xf = nextUint32(rng) * scale;
        let k = xf | 0;
        if (xf - k >= keep[k]!) k = alias[k]!;
        arrivals[k]++;
        let cand = busy & candMask[k]!;
        const c0 = counts[k]!;
        if (cand === 0) {
          // wait (push, as in push())
          const sp = span[k]!;
          if (sp === cap[k]) {
            queues.grow(k);
            buf = queues.buf;
            gone = queues.gone!;
          }
          const p = off[k]! + ((head[k]! + sp) & mask[k]!);
          buf[p] = now;
          gone[p] = 0;
          span[k] = sp + 1;
          if (c0 === 0) {
            headVal[k] = now;
            busy |= 1 << k;
          }
          area[k] += c0 * (now - last[k]!);
          last[k] = now;
          total += abandonRate[k]!;
          counts[k] = c0 + 1;
          if (++waiting > maxWaiting) {
            this.arrivalsDone += done;
            this.waiting = waiting;
            done = 0;
            throw this.capError();
          }
          continue;
        }
        let j = 31 - Math.clz32(cand & -cand);
        let bt = headVal[j]!;
        cand &= cand - 1;
        while (cand !== 0) {
          const i = 31 - Math.clz32(cand & -cand);
          const h = headVal[i]!;
          if (h < bt) {
            bt = h;
            j = i;
          }
          cand &= cand - 1;
        }
        // take the oldest live item of j (as in popHead())
        const hj = (head[j]! + 1) & mask[j]!;
        head[j] = hj;
        span[j]--;
        const cj = counts[j]!;
        if (cj === 1 || gone[off[j]! + hj] === 1) this.skipGone(j);
        else headVal[j] = buf[off[j]! + hj]!;
        area[j] += cj * (now - last[j]!);
        last[j] = now;
        total -= abandonRate[j]!;
        waiting--;
        counts[j] = cj - 1;
        if (cj === 1) busy &= ~(1 << j);
        immediate[k]++;
        edgeMatches[edgeOf[k * n + j]!]++;
        const w = now - bt;
        waitedMatched[j]++;
        waitSum[j] += w;
        hist[j * bins + fastTimeBin(w * lambda)]++;
      }
    } finally {
      this.arrivalsDone += done;
      this.time[0] = clock;
      this.waiting = waiting;
      this.time[1] = total;
      this.events = events;
    }
  }

  private capError(): Error {
    return waitingCapError(this.maxWaiting, this.counts, this.model.ids, `after ${this.arrivalsDone.toLocaleString('en-US')} arrivals`);
  }

  /**
   * An abandonment at `now`: class by weight γ_k n_k, then a uniform live item of it; the class, or
   * −1 (only rounding was left in A). `busy`: see pickAbandoningClass (−1: every class).
   */
  private abandonment(now: number, busy = -1): number {
    const k = this.pickAbandoningClass(busy);
    if (k < 0) {
      this.resyncAbandonRate();
      return -1;
    }
    this.removeRandomItem(k, now);
    this.counters.abandoned[k]++;
    return k;
  }

  private resyncAbandonRate(): void {
    let a = 0;
    for (let k = 0; k < this.model.n; k++) a += this.model.abandonRate[k]! * this.counts[k]!;
    this.time[1] = a;
  }

  /**
   * The class of an abandonment, by weight γ_k n_k. `busy` (at most 32 classes) lists the classes
   * that may have items; the others weigh 0, so skipping them changes no sum.
   */
  private pickAbandoningClass(busy: number): number {
    const { n, abandonRate } = this.model;
    const counts = this.counts;
    const masked = n <= 32;
    let live = n === 32 ? busy : busy & ((1 << n) - 1);
    let total = 0;
    for (let x = live, k = 0; masked ? x !== 0 : k < n; k++) {
      if (masked) {
        k = 31 - Math.clz32(x & -x);
        x &= x - 1;
      }
      total += abandonRate[k]! * counts[k]!;
    }
    let target = nextOpenUnit(this.rng) * total;
    let last = -1;
    for (let k = 0; masked ? live !== 0 : k < n; k++) {
      if (masked) {
        k = 31 - Math.clz32(live & -live);
        live &= live - 1;
      }
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
    this.time[1] += (c - this.counts[k]!) * this.model.abandonRate[k]!;
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
