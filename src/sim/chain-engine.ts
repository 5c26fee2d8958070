import { waitingCapError } from './cap.js';
import type { Counters } from './counters.js';
import { newCounters, resetCounters } from './counters.js';
import { Queues } from './queues.js';
import { selectPartner } from './select.js';
import type { SimModel } from './sim-model.js';
import { EXACT_ARRIVAL_BINS, largeArrivalBin, sumBins } from './wait-bins.js';

const TWO_POW_M32 = 2.3283064365386963e-10;
/** Arrivals per call of an FCFM loop kernel (see ChainEngine.runFcfm). */
const LOOP_CHUNK = 1 << 14;
/** Empty calls of a kernel before its first real one, once per thread (see the constructor). */
export const PRIMING_CALLS = 64;
const primed = { mask: false, scan: false };

/**
 * The patient engine (no class abandons): it simulates the sequence of arrival classes, which
 * alone drives every policy, and integrates the Poisson clock out. Arrival epochs of the merged
 * stream are separated by independent Exp(Λ) gaps, independent of the classes, so
 *  - the time average of a count equals (in expectation, exactly) its average over post-arrival
 *    states: each post-arrival state lasts 1/Λ on average (conditional Monte Carlo);
 *  - an item that waits for K arrivals waits a Gamma(K, Λ) time: mean K/Λ, and its distribution is
 *    recovered from the histogram of K (see percentiles.ts).
 * The clock of the counters is therefore the arrival index.
 *
 * Queues hold arrival indices; headVal[k] is the index of the oldest waiting item of class k
 * (Infinity when none), so FCFM is a minimum over the candidate list. Nothing is allocated per
 * arrival.
 *
 * The hot loops count only what cannot be recovered later: matches per (arriving class, partner
 * class) pair, and the wait K and its bin of each item matched after waiting. finish() derives the
 * rest exactly (integers throughout, so no rounding):
 *  - waited-matched items of class j: Σ of its histogram bins K ≥ 1 (every such item has K ≥ 1);
 *  - arrivals of k that waited = (waiting now − waiting at the start) + waited-matched items of k,
 *    since every item that waited is either matched after waiting or still waiting;
 *  - matched at once (class k) = Σ_j pairs(k, j); arrivals = matched at once + those that waited;
 *  - the integral of the queue length of class k over the window = Σ over its items of their time
 *    in queue inside the window = waitSum(k) + Σ_{waiting at the end} (end − stamp)
 *    − Σ_{waiting at the start} (start − stamp): a matched item that was already waiting at the
 *    start has its wait counted from its arrival, and an item waiting at both ends is counted
 *    from the start to the end;
 *  - matches per compatibility from the pair counts.
 * So the counters are complete after finish() only.
 */
export class ChainEngine {
  readonly counters: Counters;
  /**
   * [arrivals simulated so far (the clock), items waiting now]: in a typed array, so that the FCFM
   * kernels leave their loop with element stores (see the constructor).
   */
  private readonly loop = new Float64Array(2);
  /** Arrivals simulated so far (the clock). */
  get clock(): number {
    return this.loop[0]!;
  }
  set clock(v: number) {
    this.loop[0] = v;
  }
  /** Items waiting now. */
  get waiting(): number {
    return this.loop[1]!;
  }
  set waiting(v: number) {
    this.loop[1] = v;
  }
  readonly counts: Int32Array;
  readonly headVal: Float64Array;
  readonly queues: Queues;
  private readonly rng: Uint32Array;
  /** pairs[k·n + j]: arrivals of k that took a waiting j. */
  private readonly pairs: Float64Array;
  /** Per class at the start of the window or the last finish(): items waiting, waited-matched items. */
  private readonly baseCount: Float64Array;
  private readonly baseWaited: Float64Array;
  /** Per class at the start of the window: Σ (start − stamp) over the items waiting then. */
  private readonly startAge: Float64Array;
  /** candMask[k]: bit j set when j is a candidate of k (FCFM with at most 32 classes). */
  private readonly candMask: Int32Array;

  constructor(
    readonly model: SimModel,
    rngState: Uint32Array,
    readonly maxWaiting: number,
    scratch?: Counters,
  ) {
    const n = model.n;
    this.rng = Uint32Array.from(rngState);
    this.queues = new Queues(n, false);
    this.counts = this.queues.span; // no gone items here: span = count
    this.headVal = new Float64Array(n).fill(Infinity);
    this.counters = scratch ?? newCounters(n, model.m, 'arrivals');
    this.pairs = new Float64Array(n * n);
    this.baseCount = new Float64Array(n);
    this.baseWaited = new Float64Array(n);
    this.startAge = new Float64Array(n);
    this.candMask = new Int32Array(n);
    if (n <= 32) {
      const { nbrStart, nbr } = model;
      for (let k = 0; k < n; k++) for (let p = nbrStart[k]!; p < nbrStart[k + 1]!; p++) this.candMask[k] |= 1 << nbr[p]!;
    }
    // Run the FCFM kernel's code after its loop first: V8 compiles a hot loop on the stack with the
    // feedback gathered so far, and code it has never run would throw that compiled loop away at
    // every exit. A function records feedback only once V8 has given it a feedback vector, after
    // some bytecode has run in it, hence PRIMING_CALLS empty calls in the first engine of a thread
    // (with one call, measured on Node 20, the compiled loop still left through a deoptimisation
    // at about one call in ten).
    if (model.policy === 0) {
      const mask = n <= 32;
      if (!(mask ? primed.mask : primed.scan)) {
        for (let i = 0; i < PRIMING_CALLS; i++) {
          if (mask) this.fcfmMaskChunk(0);
          else this.fcfmChunk(0);
        }
        if (mask) primed.mask = true;
        else primed.scan = true;
      }
    }
  }

  /** Starts the measured window now (after the warm-up). */
  startMeasuring(): void {
    resetCounters(this.counters, this.clock);
    this.pairs.fill(0);
    this.baseWaited.fill(0); // the histograms start empty
    for (let k = 0; k < this.model.n; k++) {
      this.baseCount[k] = this.counts[k]!;
      this.startAge[k] = this.ageSum(k, this.clock);
    }
  }

  /** Σ (clock − stamp) over the items of class k waiting now. */
  private ageSum(k: number, clock: number): number {
    const { buf, off, head, mask } = this.queues;
    let sum = 0;
    for (let i = 0; i < this.counts[k]!; i++) sum += clock - buf[off[k]! + ((head[k]! + i) & mask[k]!)]!;
    return sum;
  }

  /** Derives the counters the loops leave out (see the class comment); call once at the end. */
  finish(): void {
    const { n, nbrStart, nbr, nbrEdge } = this.model;
    const c = this.counters;
    const { bins, hist } = c;
    const end = this.clock;
    for (let k = 0; k < n; k++) {
      const waited = sumBins(hist, k * bins + 1, (k + 1) * bins);
      c.waitedMatched[k] = waited;
      let immediate = 0;
      for (let p = nbrStart[k]!; p < nbrStart[k + 1]!; p++) {
        const x = this.pairs[k * n + nbr[p]!]!;
        c.edgeMatches[nbrEdge[p]!] += x;
        immediate += x;
      }
      c.immediate[k] += immediate;
      const pushes = this.counts[k]! - this.baseCount[k]! + (waited - this.baseWaited[k]!);
      this.baseCount[k] = this.counts[k]!;
      this.baseWaited[k] = waited;
      c.arrivals[k] += immediate + pushes;
      c.area[k] = c.waitSum[k]! + this.ageSum(k, end) - this.startAge[k]!;
      c.last[k] = end;
    }
    this.pairs.fill(0);
  }

  /** Simulates `count` more arrivals. */
  run(count: number): void {
    if (this.model.policy === 0) this.runFcfm(count);
    else this.runOther(count);
  }

  /** The cap error; it names the clock at the start of the run() call (a chunk of arrivals). */
  private capError(clock = this.clock): Error {
    return waitingCapError(this.maxWaiting, this.counts, this.model.ids, `after ${clock.toLocaleString('en-US')} arrivals`);
  }

  /**
   * FCFM in chunks of at most LOOP_CHUNK arrivals, each one call of a loop kernel without any call
   * inside its loop. A function called often is optimised whole between calls; one long loop is
   * instead compiled on the stack with the feedback of its first iterations, and that code
   * (measured on Node 20) deoptimised at every exit and re-entered from the interpreter at every
   * run(), about 0.56 × C on the 25-class cycle against 0.67 × as kernels (both under tsx; the
   * built kernels now about 0.86 ×, npm run bench -- simulate).
   * A kernel stops before an arrival that must wait in a full ring (its random draw not yet taken),
   * the ring is grown here and the kernel resumes with that same arrival; it stops after the
   * arrival that puts one item too many in waiting, and the cap error is thrown here. Same draws,
   * same counters as one loop.
   */
  private runFcfm(count: number): void {
    const clockAtCall = this.clock;
    const mask = this.model.n <= 32;
    const end = this.clock + count;
    while (this.clock < end) {
      const left = end - this.clock;
      const step = left < LOOP_CHUNK ? left : LOOP_CHUNK;
      const full = mask ? this.fcfmMaskChunk(step) : this.fcfmChunk(step);
      if (this.waiting > this.maxWaiting) throw this.capError(clockAtCall);
      if (full >= 0) this.queues.grow(full);
    }
  }

  /**
   * Up to `count` arrivals of FCFM with a scan of the candidate list (any number of classes).
   * Returns −1, or the class whose full ring stopped it (see runFcfm).
   */
  private fcfmChunk(count: number): number {
    const { n, nbrStart, nbr } = this.model;
    const keep = this.model.alias.keep;
    const alias = this.model.alias.alias;
    const { counts, headVal, queues, pairs } = this;
    const { head, off, mask, cap, buf } = queues;
    const { waitSum, hist, bins } = this.counters;
    const maxWaiting = this.maxWaiting;
    const scale = n * TWO_POW_M32;
    const rng = this.rng;
    let s0 = rng[0]! | 0;
    let s1 = rng[1]! | 0;
    let s2 = rng[2]! | 0;
    let s3 = rng[3]! | 0;
    const loop = this.loop;
    let t = loop[0]!;
    let waiting = loop[1]!;
    let full = -1;
    for (let it = 0; it < count; it++) {
      // xoshiro128** (see random.ts): the output depends on s1 only, the state advances below
      const x5 = Math.imul(s1, 5);
      const u = Math.imul((x5 << 7) | (x5 >>> 25), 9) >>> 0;
      // class by alias table
      const xf = u * scale;
      let k = xf | 0;
      if (xf - k >= keep[k]!) k = alias[k]!;
      // oldest compatible waiting item
      let bt = Infinity;
      let bp = 0;
      const pe = nbrStart[k + 1]!;
      for (let p = nbrStart[k]!; p < pe; p++) {
        const h = headVal[nbr[p]!]!;
        if (h < bt) {
          bt = h;
          bp = p;
        }
      }
      if (bt === Infinity && counts[k] === cap[k]) {
        full = k;
        break;
      }
      const sh = s1 << 9;
      s2 ^= s0;
      s3 ^= s1;
      s1 ^= s2;
      s0 ^= s3;
      s2 ^= sh;
      s3 = (s3 << 11) | (s3 >>> 21);
      if (bt === Infinity) {
        const c = counts[k]!;
        buf[off[k]! + ((head[k]! + c) & mask[k]!)] = t;
        if (c === 0) headVal[k] = t;
        counts[k] = c + 1;
        if (++waiting > maxWaiting) {
          t++;
          break;
        }
      } else {
        const best = nbr[bp]!;
        const c = counts[best]!;
        const h = (head[best]! + 1) & mask[best]!;
        head[best] = h;
        counts[best] = c - 1;
        headVal[best] = c > 1 ? buf[off[best]! + h]! : Infinity;
        waiting--;
        pairs[k * n + best]++;
        const K = t - bt;
        waitSum[best] += K;
        hist[best * bins + (K < EXACT_ARRIVAL_BINS ? K | 0 : largeArrivalBin(K))]++;
      }
      t++;
    }
    loop[0] = t;
    loop[1] = waiting;
    rng[0] = s0;
    rng[1] = s1;
    rng[2] = s2;
    rng[3] = s3;
    return full;
  }

  /**
   * FCFM for at most 32 classes: a bitmask of the classes with waiting items, intersected with the
   * candidate mask of the arrival, gives the non-empty candidates directly (often none or one).
   * The candidates' oldest items are read from the rings, so the loop keeps no headVal (one store
   * and one unpredictable branch fewer per arrival; about 5 % faster, bench/simulate.ts); headVal
   * is set once on leaving. Returns −1, or the class whose full ring stopped it (see runFcfm).
   */
  private fcfmMaskChunk(count: number): number {
    const { n } = this.model;
    const keep = this.model.alias.keep;
    const alias = this.model.alias.alias;
    const candMask = this.candMask;
    const { counts, headVal, queues, pairs } = this;
    const { head, off, mask, buf } = queues;
    const { waitSum, hist, bins } = this.counters;
    const maxWaiting = this.maxWaiting;
    const exactBins = EXACT_ARRIVAL_BINS; // a local: one register, not a module binding
    const scale = n * TWO_POW_M32;
    const rng = this.rng;
    let s0 = rng[0]! | 0;
    let s1 = rng[1]! | 0;
    let s2 = rng[2]! | 0;
    let s3 = rng[3]! | 0;
    const loop = this.loop;
    let t = loop[0]!;
    let waiting = loop[1]!;
    let full = -1;
    let busy = 0;
    for (let k = 0; k < n; k++) if (counts[k]! > 0) busy |= 1 << k;
    for (let it = 0; it < count; it++) {
      const x5 = Math.imul(s1, 5);
      const u = Math.imul((x5 << 7) | (x5 >>> 25), 9) >>> 0;
      const xf = u * scale;
      let k = xf | 0;
      if (xf - k >= keep[k]!) k = alias[k]!;
      let cand = busy & candMask[k]!;
      if (cand === 0 && counts[k]! > mask[k]!) {
        // the ring is full (count = cap = mask + 1)
        full = k;
        break;
      }
      const sh = s1 << 9;
      s2 ^= s0;
      s3 ^= s1;
      s1 ^= s2;
      s0 ^= s3;
      s2 ^= sh;
      s3 = (s3 << 11) | (s3 >>> 21);
      if (cand === 0) {
        const c = counts[k]!;
        buf[off[k]! + ((head[k]! + c) & mask[k]!)] = t;
        busy |= 1 << k;
        counts[k] = c + 1;
        if (++waiting > maxWaiting) {
          t++;
          break;
        }
      } else {
        // the oldest head among the candidates, read from the rings (headVal is not kept here)
        let best = 31 - Math.clz32(cand & -cand);
        let hb = head[best]!;
        let bt = buf[off[best]! + hb]!;
        cand &= cand - 1;
        while (cand !== 0) {
          const j = 31 - Math.clz32(cand & -cand);
          const hj = head[j]!;
          const h = buf[off[j]! + hj]!;
          if (h < bt) {
            bt = h;
            best = j;
            hb = hj;
          }
          cand &= cand - 1;
        }
        const c = counts[best]! - 1;
        head[best] = (hb + 1) & mask[best]!;
        counts[best] = c;
        busy &= ~((((c | -c) >>> 31) ^ 1) << best); // clears the bit when c = 0, without a branch
        waiting--;
        pairs[k * n + best]++;
        const K = t - bt;
        waitSum[best] += K;
        hist[best * bins + (K < exactBins ? K | 0 : largeArrivalBin(K))]++;
      }
      t++;
    }
    for (let j = 0; j < n; j++) headVal[j] = counts[j]! > 0 ? buf[off[j]! + head[j]!]! : Infinity;
    loop[0] = t;
    loop[1] = waiting;
    rng[0] = s0;
    rng[1] = s1;
    rng[2] = s2;
    rng[3] = s3;
    return full;
  }

  /** longest, priority and random: the choice is selectPartner's (src/sim/select.ts). */
  private runOther(count: number): void {
    const model = this.model;
    const { n, nbr, policy } = model;
    const keep = this.model.alias.keep;
    const alias = this.model.alias.alias;
    const { counts, headVal, queues, pairs } = this;
    const { head, off, mask, cap } = queues;
    const { waitSum, hist, bins } = this.counters;
    const maxWaiting = this.maxWaiting;
    const scale = n * TWO_POW_M32;
    let buf = queues.buf;
    let s0 = this.rng[0]! | 0;
    let s1 = this.rng[1]! | 0;
    let s2 = this.rng[2]! | 0;
    let s3 = this.rng[3]! | 0;
    let t = this.clock;
    let waiting = this.waiting;
    try {
      for (let it = 0; it < count; it++) {
        const x5 = Math.imul(s1, 5);
        const u = Math.imul((x5 << 7) | (x5 >>> 25), 9) >>> 0;
        const sh = s1 << 9;
        s2 ^= s0;
        s3 ^= s1;
        s1 ^= s2;
        s0 ^= s3;
        s2 ^= sh;
        s3 = (s3 << 11) | (s3 >>> 21);
        const xf = u * scale;
        let k = xf | 0;
        if (xf - k >= keep[k]!) k = alias[k]!;
        let bp: number;
        if (policy === 3) {
          // random draws from the stream: hand it the state and take it back
          const rng = this.rng;
          rng[0] = s0;
          rng[1] = s1;
          rng[2] = s2;
          rng[3] = s3;
          bp = selectPartner(model, counts, headVal, k, rng);
          s0 = rng[0]! | 0;
          s1 = rng[1]! | 0;
          s2 = rng[2]! | 0;
          s3 = rng[3]! | 0;
        } else bp = selectPartner(model, counts, headVal, k, this.rng);
        if (bp < 0) {
          const c = counts[k]!;
          if (c === cap[k]) {
            queues.grow(k);
            buf = queues.buf;
          }
          buf[off[k]! + ((head[k]! + c) & mask[k]!)] = t;
          if (c === 0) headVal[k] = t;
          counts[k] = c + 1;
          if (++waiting > maxWaiting) {
            t++;
            throw this.capError();
          }
        } else {
          const best = nbr[bp]!;
          const bt = headVal[best]!;
          const c = counts[best]!;
          const h = (head[best]! + 1) & mask[best]!;
          head[best] = h;
          counts[best] = c - 1;
          headVal[best] = c > 1 ? buf[off[best]! + h]! : Infinity;
          waiting--;
          pairs[k * n + best]++;
          const K = t - bt;
          waitSum[best] += K;
          hist[best * bins + (K < EXACT_ARRIVAL_BINS ? K | 0 : largeArrivalBin(K))]++;
        }
        t++;
      }
    } finally {
      this.clock = t;
      this.waiting = waiting;
      this.rng[0] = s0;
      this.rng[1] = s1;
      this.rng[2] = s2;
      this.rng[3] = s3;
    }
  }
}
