/**
 * Per-class ring buffers of waiting items inside one Float64Array (a value per item: its arrival
 * index or arrival time), with an optional parallel Uint8Array of "gone" flags for the lazy deletion
 * of abandoned items or a parallel Float64Array of a second value per item (`due`). Class k owns the region buf[off[k] .. off[k] + cap[k]) (cap a power of two);
 * its items sit at off[k] + ((head[k] + i) & mask[k]) for i < span[k], oldest first.
 *
 * Growing a class appends a region twice as large at the end of the buffer and copies only that
 * class; when the buffer is full, all regions are compacted into a buffer twice as large. Both
 * steps are amortised O(1) per item. Hot loops read the arrays directly (see the engines) and call
 * `grow` when a ring is full, then reload `buf`/`gone`.
 */
export class Queues {
  buf: Float64Array;
  gone: Uint8Array | undefined;
  /** A second value per item (the deadline engine's: when the item gives up), when asked for. */
  due: Float64Array | undefined;
  readonly off: Int32Array;
  readonly cap: Int32Array;
  readonly mask: Int32Array;
  readonly head: Int32Array;
  /** Slots in use (live items plus gone ones not yet skipped). */
  readonly span: Int32Array;
  private used: number;

  constructor(readonly n: number, withGone: boolean, initialCap = 64, withDue = false) {
    this.off = new Int32Array(n);
    this.cap = new Int32Array(n).fill(initialCap);
    this.mask = new Int32Array(n).fill(initialCap - 1);
    this.head = new Int32Array(n);
    this.span = new Int32Array(n);
    for (let k = 0; k < n; k++) this.off[k] = k * initialCap;
    this.used = n * initialCap;
    this.buf = new Float64Array(this.used * 2);
    this.gone = withGone ? new Uint8Array(this.used * 2) : undefined;
    this.due = withDue ? new Float64Array(this.used * 2) : undefined;
  }

  /** Doubles the ring of class k (its items keep their order and move to head 0). */
  grow(k: number): void {
    const oldCap = this.cap[k]!;
    const need = oldCap * 2;
    if (need > 0x40000000) throw new RangeError('a queue cannot hold more than 2^30 items');
    if (this.used + need > this.buf.length) this.compact(need);
    const dst = this.used;
    this.copyRing(k, this.buf, this.gone, this.due, dst);
    this.off[k] = dst;
    this.cap[k] = need;
    this.mask[k] = need - 1;
    this.head[k] = 0;
    this.used += need;
  }

  /** The items of class k, oldest first (for tests and checks). */
  items(k: number): number[] {
    const out: number[] = [];
    for (let i = 0; i < this.span[k]!; i++) {
      const p = this.off[k]! + ((this.head[k]! + i) & this.mask[k]!);
      if (!this.gone || !this.gone[p]) out.push(this.buf[p]!);
    }
    return out;
  }

  /** Copies ring k into `buf`/`gone`/`due` at `dst`, in order from position 0. */
  private copyRing(k: number, buf: Float64Array, gone: Uint8Array | undefined, due: Float64Array | undefined, dst: number): void {
    const off = this.off[k]!;
    const mask = this.mask[k]!;
    const head = this.head[k]!;
    const span = this.span[k]!;
    for (let i = 0; i < span; i++) {
      const p = off + ((head + i) & mask);
      buf[dst + i] = this.buf[p]!;
      if (gone) gone[dst + i] = this.gone![p]!;
      if (due) due[dst + i] = this.due![p]!;
    }
  }

  /** Moves every region into a larger buffer with room for `extra` more slots. */
  private compact(extra: number): void {
    let live = 0;
    for (let k = 0; k < this.n; k++) live += this.cap[k]!;
    const size = Math.max(this.buf.length * 2, (live + extra) * 2);
    const buf = new Float64Array(size);
    const gone = this.gone ? new Uint8Array(size) : undefined;
    const due = this.due ? new Float64Array(size) : undefined;
    let at = 0;
    for (let k = 0; k < this.n; k++) {
      this.copyRing(k, buf, gone, due, at);
      this.off[k] = at;
      this.head[k] = 0;
      at += this.cap[k]!;
    }
    this.buf = buf;
    this.gone = gone;
    this.due = due;
    this.used = at;
  }
}
