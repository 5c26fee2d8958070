/**
 * Maximum flow by the level-graph (blocking-flow) augmenting-path method on real (Float64)
 * capacities. Arcs are stored in pairs (arc e and its reverse e ^ 1) as residual capacities, so a
 * computed flow can be kept and augmented further after capacities grow (warm start), and restored
 * from a snapshot.
 */
export class FlowNetwork {
  readonly nodes: number;
  private head: Int32Array;
  private next: Int32Array;
  private to: Int32Array;
  /** Residual capacity of each arc. */
  private res: Float64Array;
  private arcs = 0;
  private level: Int32Array;
  private iter: Int32Array;
  private queue: Int32Array;
  private stackArc: Int32Array;
  /** Residual capacities at or below eps count as zero. */
  eps: number;

  constructor(nodes: number, expectedArcs = 16, eps = 0) {
    this.nodes = nodes;
    this.head = new Int32Array(nodes).fill(-1);
    const cap = Math.max(2, expectedArcs * 2);
    this.next = new Int32Array(cap);
    this.to = new Int32Array(cap);
    this.res = new Float64Array(cap);
    this.level = new Int32Array(nodes);
    this.iter = new Int32Array(nodes);
    this.queue = new Int32Array(nodes);
    this.stackArc = new Int32Array(nodes);
    this.eps = eps;
  }

  private grow(): void {
    const n = this.next.length * 2;
    const next = new Int32Array(n);
    next.set(this.next);
    const to = new Int32Array(n);
    to.set(this.to);
    const res = new Float64Array(n);
    res.set(this.res);
    this.next = next;
    this.to = to;
    this.res = res;
  }

  /** Adds an arc u → v (capacity may be Infinity) and returns its index; its reverse is index ^ 1. */
  addArc(u: number, v: number, capacity: number): number {
    if (this.arcs + 2 > this.next.length) this.grow();
    const e = this.arcs;
    this.to[e] = v;
    this.res[e] = capacity;
    this.next[e] = this.head[u]!;
    this.head[u] = e;
    this.to[e + 1] = u;
    this.res[e + 1] = 0;
    this.next[e + 1] = this.head[v]!;
    this.head[v] = e + 1;
    this.arcs += 2;
    return e;
  }

  /** Raises (or lowers, down to the flow already on it) the capacity of arc e by delta. */
  addCapacity(e: number, delta: number): void {
    this.res[e] = this.res[e]! + delta;
  }

  /** Flow currently on arc e (the residual capacity of its reverse). */
  flowOn(e: number): number {
    return this.res[e ^ 1]!;
  }

  /** Copy of the residual state, for restore(). */
  snapshot(): Float64Array {
    return this.res.slice(0, this.arcs);
  }

  restore(state: Float64Array): void {
    this.res.set(state);
  }

  private bfs(s: number, t: number): boolean {
    const { level, queue, head, next, to, res, eps } = this;
    level.fill(-1);
    let qh = 0;
    let qt = 0;
    level[s] = 0;
    queue[qt++] = s;
    while (qh < qt) {
      const u = queue[qh++]!;
      if (level[t] !== -1 && level[u]! >= level[t]!) break; // deeper levels cannot lie on a shortest path
      for (let e = head[u]!; e !== -1; e = next[e]!) {
        const v = to[e]!;
        if (level[v] === -1 && res[e]! > eps) {
          level[v] = level[u]! + 1;
          queue[qt++] = v;
        }
      }
    }
    return level[t] !== -1;
  }

  /**
   * One augmenting path from s to t along the level graph (iterative depth-first search with the
   * current-arc pointers of the blocking-flow method); returns the amount pushed, 0 when the level graph
   * is blocked.
   */
  private path(s: number, t: number): number {
    const { level, iter, next, to, res, eps, stackArc } = this;
    let depth = 0;
    let u = s;
    for (;;) {
      if (u === t) {
        let f = Infinity;
        for (let i = 0; i < depth; i++) f = Math.min(f, res[stackArc[i]!]!);
        for (let i = 0; i < depth; i++) {
          const e = stackArc[i]!;
          res[e] = res[e]! - f;
          res[e ^ 1] = res[e ^ 1]! + f;
        }
        return f;
      }
      let e = iter[u]!;
      const want = level[u]! + 1;
      while (e !== -1 && !(res[e]! > eps && level[to[e]!] === want)) e = next[e]!;
      iter[u] = e;
      if (e !== -1) {
        stackArc[depth++] = e;
        u = to[e]!;
        continue;
      }
      // dead end: remove u from the level graph and retreat
      level[u] = -1;
      if (depth === 0) return 0;
      const back = stackArc[--depth]!;
      u = to[back ^ 1]!;
      iter[u] = next[iter[u]!]!;
    }
  }

  /** Augments the current flow to a maximum s–t flow; returns the amount added. */
  augment(s: number, t: number): number {
    let total = 0;
    while (this.bfs(s, t)) {
      this.iter.set(this.head);
      for (;;) {
        const f = this.path(s, t);
        if (!(f > 0)) break;
        if (f === Infinity) throw new RangeError('a path of unbounded capacity joins source and sink');
        total += f;
      }
    }
    return total;
  }

  /**
   * After augment(): 1 for the nodes that can still reach t in the residual network. Their
   * complement is the largest source side among minimum cuts.
   */
  reachesSink(t: number): Uint8Array {
    const { head, next, to, res, eps, queue } = this;
    const mark = new Uint8Array(this.nodes);
    let qh = 0;
    let qt = 0;
    mark[t] = 1;
    queue[qt++] = t;
    while (qh < qt) {
      const w = queue[qh++]!;
      for (let e = head[w]!; e !== -1; e = next[e]!) {
        const u = to[e]!; // e is w → u, so e ^ 1 is u → w
        if (!mark[u] && res[e ^ 1]! > eps) {
          mark[u] = 1;
          queue[qt++] = u;
        }
      }
    }
    return mark;
  }
}
