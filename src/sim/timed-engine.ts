import { sampleAlias } from './alias.js';
import { waitingCapError } from './cap.js';
import { PRIMING_CALLS } from './chain-engine.js';
import type { Counters } from './counters.js';
import { flushAreas, newCounters, resetCounters } from './counters.js';
import { Queues } from './queues.js';
import { nextOpenUnit, nextUint32 } from './random.js';
import { selectPartner } from './select.js';
import type { SimModel } from './sim-model.js';
import { expBeyond, nextExp, ZIG_K, ZIG_W } from './exponential.js';
import { BIN_E0, BIN_P, BIN_START, BIN_THRESHOLD, fastTimeBin } from './fast-time-bin.js';
import { TIME_BINS } from './wait-bins.js';

const TWO_POW_M32 = 2.3283064365386963e-10;
/** The deadline kernel's scratch for the bits of a double (fastTimeBin inlined). */
const BIN_WORD = new Float64Array(1);
const BIN_BITS = new Uint32Array(BIN_WORD.buffer);

/** Arrivals per call of the deadline kernel (see TimedEngine.runDeadlines). */
const LOOP_CHUNK = 1 << 14;
/** Whether the kernel ran its priming calls in this thread, for at most 32 classes and for more. */
const primed = [false, false];
/** Kernel exits (besides −1, a whole chunk done, and k ≥ 0, the ring of class k just filled). */
const OVER_LIMIT = -2;

export interface TimedEngineOptions {
  /**
   * Simulate by competing events (every policy's loop) even where the deadline kernel applies
   * (FCFM): the tests compare the two engines in distribution.
   */
  readonly events?: boolean;
}

/**
 * The timed engine, for impatient classes (and on request for patient ones): a continuous-time
 * simulation with explicit clock. Two exact ways of simulating the same model, chosen once:
 *
 * Deadlines (FCFM): arrivals come at Exp(Λ) gaps; an arrival that waits
 * draws its own exponential patience, and its deadline (arrival + patience) is stored beside its
 * arrival time. Independent exponential patiences are the model itself, so nothing is
 * approximated, and an arrival is the only event: about two random draws per arrival (gap, class)
 * and one more per item that waits, against three or more per event for competing events. An item
 * past its deadline has left; it is found lazily, when it is at the head of a ring an arrival looks
 * at (FCFM needs only the oldest live item of each candidate class), or when a full ring is
 * compacted. Its abandonment happened at its deadline, which is all the counters need:
 *  - abandonments in the window [S, E] = found after S + expired items still queued at E with a
 *    deadline ≤ E − expired items queued at S with a deadline < S (those are found later, or still
 *    queued at E: either way counted once and taken off once);
 *  - the integral of the queue length of class k over the window = Σ over its items of their time
 *    in queue inside the window = waits of the items matched after S + patiences of the items found
 *    expired after S + Σ over the items queued at E of (min(deadline, E) − arrival) − the same sum
 *    over the items queued at S with S for E (the identity of the patient engine, chain-engine.ts,
 *    with each item's leaving time its match or its deadline);
 * so the loop touches no integral, and finish() derives both (repeatable: assignments).
 * The rings then hold live and expired items (`counts` = ring occupancy); the memory cap is checked
 * on live items whenever the rings hold more than max(maxWaiting, twice the live items of the last
 * check), after dropping every expired item: a cap exceeded is found at once when the queues hold
 * no expired items (patient classes), and before the rings hold more than 2 × maxWaiting items.
 *
 * Competing events (every other policy): arrivals at total rate Λ,
 * abandonments at rate A = Σ_k γ_k·n_k (γ_k = 1/patience_k, n_k waiting items of class k).
 * Exponential patience is memoryless, so when an abandonment fires the item that leaves is uniform
 * among the n_k items of its class, whatever their ages — exact without per-item deadlines.
 * Removal from the middle of a queue is lazy: the slot is flagged "gone" and skipped when it
 * reaches the head; a ring is compacted when gone slots outnumber live ones (amortised O(1)).
 *
 * Queues hold arrival times.
 */
export class TimedEngine {
  readonly counters: Counters;
  /** [clock, abandonTotal]: doubles kept in a typed array, so that writing them never allocates. */
  private readonly time = new Float64Array(2);
  /** Current time. */
  get clock(): number {
    return this.time[0]!;
  }
  arrivalsDone = 0;
  /** Items waiting now (deadlines: ring occupancy, expired items not yet found included). */
  waiting = 0;
  /** Waiting items per class (deadlines: ring occupancy, = queues.span). */
  readonly counts: Int32Array;
  readonly headVal: Float64Array;
  readonly queues: Queues;
  /** True when the deadline kernel runs (FCFM, not forced to competing events). */
  readonly deadlines: boolean;
  private readonly rng: Uint32Array;
  private events = 0;
  // the deadline kernel's state (see the class comment)
  /** Deadline of the head item of each class (Infinity when none). */
  private readonly headDue: Float64Array;
  /** Per class since the window started: expired items found, and the sum of their patiences. */
  private readonly found: Float64Array;
  private readonly foundPatience: Float64Array;
  /** Per class at the start of the window: Σ (min(deadline, S) − arrival), expired items queued, ring occupancy. */
  private readonly startAge: Float64Array;
  private readonly startExpired: Float64Array;
  private readonly startSpan: Float64Array;
  /**
   * Arrivals of k that took a waiting j since the window started: at pairs[k·n + j] for at most 32
   * classes, else at the position of j in k's candidate list (model.nbr), so linear in the size.
   */
  private readonly pairs: Float64Array;
  /** Mean patience of each class (0: patient). */
  private readonly patience: Float64Array;
  private readonly candMask: Int32Array;
  /** Ring occupancy above which the kernel stops for a cap check. */
  private limit: number;

  constructor(
    readonly model: SimModel,
    rngState: Uint32Array,
    readonly maxWaiting: number,
    scratch?: Counters,
    options: TimedEngineOptions = {},
  ) {
    const n = model.n;
    this.rng = Uint32Array.from(rngState);
    this.deadlines = model.policy === 0 && options.events !== true;
    this.queues = new Queues(n, !this.deadlines, 64, this.deadlines);
    this.counts = this.deadlines ? this.queues.span : new Int32Array(n);
    this.headVal = new Float64Array(n).fill(Infinity);
    this.headDue = new Float64Array(n).fill(Infinity);
    this.counters = scratch ?? newCounters(n, model.m, 'time');
    const perClass = this.deadlines ? n : 0;
    this.found = new Float64Array(perClass);
    this.foundPatience = new Float64Array(perClass);
    this.startAge = new Float64Array(perClass);
    this.startExpired = new Float64Array(perClass);
    this.startSpan = new Float64Array(perClass);
    this.pairs = new Float64Array(!this.deadlines ? 0 : n <= 32 ? n * n : model.nbr.length);
    this.patience = new Float64Array(perClass);
    this.candMask = new Int32Array(perClass);
    this.limit = maxWaiting;
    if (this.deadlines) {
      const { nbrStart, nbr, abandonRate } = model;
      for (let k = 0; k < n; k++) {
        this.patience[k] = abandonRate[k]! > 0 ? 1 / abandonRate[k]! : 0;
        if (n <= 32) for (let p = nbrStart[k]!; p < nbrStart[k + 1]!; p++) this.candMask[k] |= 1 << nbr[p]!;
      }
      // run the kernel's code after its loop first (see ChainEngine's constructor)
      if (!primed[n <= 32 ? 0 : 1]) {
        for (let i = 0; i < PRIMING_CALLS; i++) this.deadlineChunk(0);
        primed[n <= 32 ? 0 : 1] = true;
      }
    }
  }

  startMeasuring(): void {
    const now = this.clock;
    resetCounters(this.counters, now);
    if (!this.deadlines) return;
    this.found.fill(0);
    this.foundPatience.fill(0);
    this.pairs.fill(0);
    for (let k = 0; k < this.model.n; k++) {
      const [age, expired] = this.ringAge(k, now, false);
      this.startAge[k] = age;
      this.startExpired[k] = expired;
      this.startSpan[k] = this.queues.span[k]!;
    }
  }

  finish(): void {
    const now = this.clock;
    const c = this.counters;
    if (!this.deadlines) {
      flushAreas(c, this.counts, now);
      return;
    }
    const { n, nbrStart, nbr, nbrEdge } = this.model;
    const pairs = this.pairs;
    c.edgeMatches.fill(0);
    c.waitedMatched.fill(0);
    for (let k = 0; k < n; k++) {
      let immediate = 0;
      for (let p = nbrStart[k]!; p < nbrStart[k + 1]!; p++) {
        const x = pairs[n <= 32 ? k * n + nbr[p]! : p]!;
        c.edgeMatches[nbrEdge[p]!] += x;
        c.waitedMatched[nbr[p]!] += x;
        immediate += x;
      }
      c.immediate[k] = immediate;
    }
    for (let k = 0; k < n; k++) {
      const [age, expired] = this.ringAge(k, now, true);
      c.area[k] = c.waitSum[k]! + this.foundPatience[k]! + age - this.startAge[k]!;
      c.last[k] = now;
      c.abandoned[k] = this.found[k]! + expired - this.startExpired[k]!;
      // every arrival that waited is still queued, matched after waiting, or found expired
      c.arrivals[k] = c.immediate[k]! + this.queues.span[k]! - this.startSpan[k]! + c.waitedMatched[k]! + this.found[k]!;
    }
  }

  /**
   * Over the items queued in ring k: Σ (min(deadline, t) − arrival), and the number with a deadline
   * before t (at or before t when `atEnd`; see the class comment).
   */
  private ringAge(k: number, t: number, atEnd: boolean): [number, number] {
    const { buf, off, head, mask, span } = this.queues;
    const due = this.queues.due!;
    let age = 0;
    let expired = 0;
    for (let i = 0; i < span[k]!; i++) {
      const p = off[k]! + ((head[k]! + i) & mask[k]!);
      const d = due[p]!;
      age += (d < t ? d : t) - buf[p]!;
      if (atEnd ? d <= t : d < t) expired++;
    }
    return [age, expired];
  }

  /**
   * Simulates until `count` more arrivals have happened (the clock stops at the last one).
   */
  run(count: number): void {
    if (this.deadlines) this.runDeadlines(count);
    else this.runAny(count);
  }

  /**
   * The deadline kernel in chunks of at most LOOP_CHUNK arrivals, each one call without any call
   * inside its loop but the rare tail of an exponential (see ChainEngine.runFcfm for why). A
   * kernel stops after the arrival that fills a ring (it is compacted or grown here, so every ring
   * keeps a free slot) or that takes the rings past `limit` (the cap check); then it resumes.
   */
  private runDeadlines(count: number): void {
    let left = count;
    while (left > 0) {
      const step = left < LOOP_CHUNK ? left : LOOP_CHUNK;
      const before = this.arrivalsDone;
      const exit = this.deadlineChunk(step);
      left -= this.arrivalsDone - before;
      if (exit === OVER_LIMIT) {
        this.checkCap();
        // the arrival that crossed the limit may also have filled its ring
        for (let k = 0; k < this.model.n; k++) if (this.queues.span[k] === this.queues.cap[k]) this.makeRoom(k);
      } else if (exit >= 0) this.makeRoom(exit);
    }
  }

  /** Ring k is full: drop its expired items, and double it unless that freed half of it. */
  private makeRoom(k: number): void {
    this.dropExpired(k);
    if (this.queues.span[k]! * 2 > this.queues.cap[k]!) this.queues.grow(k);
  }

  /** Drops every expired item, then throws the cap error if more than maxWaiting live items wait. */
  private checkCap(): void {
    let live = 0;
    for (let k = 0; k < this.model.n; k++) live += this.dropExpired(k);
    if (live > this.maxWaiting) throw this.capError();
    this.limit = Math.max(this.maxWaiting, 2 * live);
  }

  /**
   * Removes the expired items of ring k (deadline ≤ now), keeping the order of the others, counts
   * them as found, refreshes the head; returns the live items left.
   */
  private dropExpired(k: number): number {
    const q = this.queues;
    const { buf, off, mask, head, span } = q;
    const due = q.due!;
    const now = this.clock;
    const o = off[k]!;
    const mk = mask[k]!;
    const h = head[k]!;
    const s = span[k]!;
    let w = 0;
    for (let r = 0; r < s; r++) {
      const from = o + ((h + r) & mk);
      const d = due[from]!;
      if (d <= now) {
        this.found[k]++;
        this.foundPatience[k] += d - buf[from]!;
        continue;
      }
      const to = o + ((h + w) & mk);
      buf[to] = buf[from]!;
      due[to] = d;
      w++;
    }
    span[k] = w;
    this.waiting -= s - w;
    this.headVal[k] = w > 0 ? buf[o + h]! : Infinity;
    this.headDue[k] = w > 0 ? due[o + h]! : Infinity;
    return w;
  }

  /**
   * Up to `count` arrivals under FCFM with deadlines (see the class comment). Random draws per
   * arrival, in this order: the gap Exp(1)/Λ (ziggurat, exponential.ts), the class (alias table),
   * and when the arrival waits and its class is impatient, its patience Exp(1)·θ_k. A candidate
   * class whose head is past its deadline loses its expired head items first. Returns −1, the class
   * whose ring this chunk's last arrival filled, or OVER_LIMIT.
   */
  private deadlineChunk(count: number): number {
    const model = this.model;
    const n = model.n;
    const lambda = model.totalRate;
    const invLambda = 1 / lambda;
    const keep = model.alias.keep;
    const alias = model.alias.alias;
    const { candMask, patience, headVal, headDue, found, foundPatience, queues, counters, pairs } = this;
    const { off, mask, head, span, cap } = queues;
    const buf = queues.buf;
    const due = queues.due!;
    const { waitSum, hist, bins } = counters;
    const zk = ZIG_K;
    const zw = ZIG_W;
    const binStart = BIN_START;
    const binThreshold = BIN_THRESHOLD;
    const binE0 = BIN_E0;
    const binP = BIN_P;
    const lastBin = TIME_BINS - 1;
    const word = BIN_WORD;
    const bits = BIN_BITS;
    const tail = expBeyond;
    const scale = n * TWO_POW_M32;
    // at most 32 classes: a mask of the classes with queued items, intersected with the arrival's
    // candidates (as in the patient engine); otherwise a scan of the candidate list
    const masked = n <= 32;
    const { nbrStart, nbr } = model;
    const rng = this.rng;
    let s0 = rng[0]! | 0;
    let s1 = rng[1]! | 0;
    let s2 = rng[2]! | 0;
    let s3 = rng[3]! | 0;
    let now = this.time[0]!;
    let waiting = this.waiting;
    const limit = this.limit;
    let busy = 0;
    if (masked) for (let k = 0; k < n; k++) if (span[k]! > 0) busy |= 1 << k;
    let exit = -1;
    let done = 0;
    while (done < count) {
      done++;
      // the gap: xoshiro128** (random.ts) inlined, then the ziggurat's fast path
      let x5 = Math.imul(s1, 5);
      let u = Math.imul((x5 << 7) | (x5 >>> 25), 9) >>> 0;
      let sh = s1 << 9;
      s2 ^= s0;
      s3 ^= s1;
      s1 ^= s2;
      s0 ^= s3;
      s2 ^= sh;
      s3 = (s3 << 11) | (s3 >>> 21);
      let layer = u & 255;
      let e: number;
      if (u >>> 8 < zk[layer]!) e = (u >>> 8) * zw[layer]!;
      else {
        rng[0] = s0;
        rng[1] = s1;
        rng[2] = s2;
        rng[3] = s3;
        e = tail(rng, u);
        s0 = rng[0]! | 0;
        s1 = rng[1]! | 0;
        s2 = rng[2]! | 0;
        s3 = rng[3]! | 0;
      }
      now += e * invLambda;
      // the class, by alias table
      x5 = Math.imul(s1, 5);
      u = Math.imul((x5 << 7) | (x5 >>> 25), 9) >>> 0;
      sh = s1 << 9;
      s2 ^= s0;
      s3 ^= s1;
      s1 ^= s2;
      s0 ^= s3;
      s2 ^= sh;
      s3 = (s3 << 11) | (s3 >>> 21);
      const xf = u * scale;
      let k = xf | 0;
      if (xf - k >= keep[k]!) k = alias[k]!;
      // the oldest live item among the candidates, expired heads dropped on the way
      let cand = masked ? busy & candMask[k]! : 0;
      let p = nbrStart[k]!;
      const pe = nbrStart[k + 1]!;
      let best = -1;
      let bestAt = 0;
      let bt = Infinity;
      for (;;) {
        let j: number;
        if (masked) {
          if (cand === 0) break;
          j = 31 - Math.clz32(cand & -cand);
          cand &= cand - 1;
        } else {
          if (p === pe) break;
          j = nbr[p++]!;
          if (span[j] === 0) continue;
        }
        if (headDue[j]! <= now) {
          const o = off[j]!;
          const mk = mask[j]!;
          let hd = head[j]!;
          let sp = span[j]!;
          let f = 0;
          let fp = 0;
          do {
            f++;
            fp += due[o + hd]! - buf[o + hd]!;
            hd = (hd + 1) & mk;
            sp--;
          } while (sp > 0 && due[o + hd]! <= now);
          found[j] += f;
          foundPatience[j] += fp;
          waiting -= f;
          head[j] = hd;
          span[j] = sp;
          if (sp > 0) {
            headVal[j] = buf[o + hd]!;
            headDue[j] = due[o + hd]!;
          } else {
            headVal[j] = Infinity;
            headDue[j] = Infinity;
            busy &= ~(1 << j);
            continue;
          }
        }
        const h = headVal[j]!;
        if (h < bt) {
          bt = h;
          best = j;
          bestAt = masked ? k * n + j : p - 1;
        }
      }
      if (best < 0) {
        // wait, with a deadline
        let d = Infinity;
        const theta = patience[k]!;
        if (theta > 0) {
          x5 = Math.imul(s1, 5);
          u = Math.imul((x5 << 7) | (x5 >>> 25), 9) >>> 0;
          sh = s1 << 9;
          s2 ^= s0;
          s3 ^= s1;
          s1 ^= s2;
          s0 ^= s3;
          s2 ^= sh;
          s3 = (s3 << 11) | (s3 >>> 21);
          layer = u & 255;
          if (u >>> 8 < zk[layer]!) e = (u >>> 8) * zw[layer]!;
          else {
            rng[0] = s0;
            rng[1] = s1;
            rng[2] = s2;
            rng[3] = s3;
            e = tail(rng, u);
            s0 = rng[0]! | 0;
            s1 = rng[1]! | 0;
            s2 = rng[2]! | 0;
            s3 = rng[3]! | 0;
          }
          d = now + e * theta;
        }
        const sp = span[k]!;
        const p = off[k]! + ((head[k]! + sp) & mask[k]!);
        buf[p] = now;
        due[p] = d;
        span[k] = sp + 1;
        if (sp === 0) {
          headVal[k] = now;
          headDue[k] = d;
          busy |= 1 << k;
        }
        if (++waiting > limit) {
          exit = OVER_LIMIT;
          break;
        }
        if (sp + 1 === cap[k]) {
          exit = k;
          break;
        }
        continue;
      }
      // take the head of best (live: expired heads were dropped above)
      const o = off[best]!;
      const hb = (head[best]! + 1) & mask[best]!;
      head[best] = hb;
      const sb = span[best]! - 1;
      span[best] = sb;
      if (sb > 0) {
        headVal[best] = buf[o + hb]!;
        headDue[best] = due[o + hb]!;
      } else {
        headVal[best] = Infinity;
        headDue[best] = Infinity;
        busy &= ~(1 << best);
      }
      waiting--;
      pairs[bestAt]++;
      const w = now - bt;
      waitSum[best] += w;
      // fastTimeBin(w·Λ) (fast-time-bin.ts) inlined
      const x = w * lambda;
      let b = 0;
      if (x > 0) {
        word[0] = x;
        const hi = bits[1]!;
        let jb = binStart[(hi >>> 12) & 255]!;
        bits[1] = (hi & 0x000fffff) | 0x3ff00000;
        if (word[0]! >= binThreshold[jb + 1]!) jb++;
        b = ((hi >>> 20) - 1023 - binE0) * binP + jb + 1;
        if (b < 1) b = 1;
        else if (b > lastBin) b = lastBin;
      }
      hist[best * bins + b]++;
    }
    this.time[0] = now;
    this.waiting = waiting;
    this.arrivalsDone += done;
    rng[0] = s0;
    rng[1] = s1;
    rng[2] = s2;
    rng[3] = s3;
    return exit;
  }

  /**
   * Every policy through selectPartner (competing events). The order of the random draws: per
   * event the holding time Exp(1)/(Λ + A) (exponential.ts), then, when A > 0, one for "abandonment
   * if u·(Λ + A) ≥ Λ"; an abandonment then draws its class and item (see pickAbandoningClass,
   * removeRandomItem), an arrival draws its class (alias table) and, under the random policy with
   * two or more candidates, the partner.
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

  private capError(): Error {
    const label = `after ${this.arrivalsDone.toLocaleString('en-US')} arrivals`;
    return waitingCapError(this.maxWaiting, this.counts, this.model.ids, label, this.deadlines ? 16 : 9);
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
