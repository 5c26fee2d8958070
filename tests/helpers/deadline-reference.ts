import { sampleAlias } from '../../src/sim/alias.js';
import { nextExp } from '../../src/sim/exponential.js';
import { fastTimeBin } from '../../src/sim/fast-time-bin.js';
import { nextUint32 } from '../../src/sim/random.js';
import type { SimModel } from '../../src/sim/sim-model.js';
import { TIME_BINS } from '../../src/sim/wait-bins.js';

interface Item {
  readonly born: number;
  readonly due: number;
}

/** What the reference counted over its window (the fields of the engine's Counters it checks). */
export interface ReferenceCounts {
  readonly arrivals: number[];
  readonly immediate: number[];
  readonly waitedMatched: number[];
  readonly waitSum: number[];
  readonly abandoned: number[];
  readonly area: number[];
  readonly edgeMatches: number[];
  readonly hist: Float64Array;
}

/**
 * A plain reading of FCFM with exponential patience and one deadline per item, for the tests of
 * the timed engine's deadline kernel (src/sim/timed-engine.ts): one array of items per class, every
 * item past its deadline removed at each arrival (eagerly, where the kernel finds them lazily), and
 * each integral summed item by item as the overlap of [arrival, leaving) with the window, where the
 * kernel derives them from identities. It takes the kernel's random draws in the kernel's order,
 * through the library's plain stream functions: per arrival the gap Exp(1)·(1/Λ), the class (alias
 * table), and, when the arrival waits and its class has a patience θ, its patience Exp(1)·θ.
 */
export class DeadlineReference {
  clock = 0;
  private start = 0;
  private readonly rng: Uint32Array;
  readonly queues: Item[][];
  private c: {
    arrivals: number[];
    immediate: number[];
    waitedMatched: number[];
    waitSum: number[];
    abandoned: number[];
    area: number[];
    edgeMatches: number[];
    hist: Float64Array;
  };

  constructor(
    readonly model: SimModel,
    state: Uint32Array,
  ) {
    this.rng = Uint32Array.from(state);
    this.queues = Array.from({ length: model.n }, () => []);
    this.c = this.zero();
  }

  private zero(): DeadlineReference['c'] {
    const { n, m } = this.model;
    const z = (len: number): number[] => new Array<number>(len).fill(0);
    return { arrivals: z(n), immediate: z(n), waitedMatched: z(n), waitSum: z(n), abandoned: z(n), area: z(n), edgeMatches: z(m), hist: new Float64Array(n * TIME_BINS) };
  }

  startMeasuring(): void {
    this.start = this.clock;
    this.c = this.zero();
  }

  /** Time spent inside the window by an item that arrived at `born` and left at `leave`. */
  private inside(born: number, leave: number): number {
    return Math.max(0, leave - Math.max(born, this.start));
  }

  run(count: number): void {
    const { n, nbrStart, nbr, nbrEdge, alias, abandonRate, totalRate: lambda } = this.model;
    const c = this.c;
    for (let i = 0; i < count; i++) {
      this.clock += nextExp(this.rng) * (1 / lambda);
      const now = this.clock;
      for (let j = 0; j < n; j++) {
        this.queues[j] = this.queues[j]!.filter((it) => {
          if (it.due > now) return true;
          if (it.due >= this.start) c.abandoned[j]!++;
          c.area[j] += this.inside(it.born, it.due);
          return false;
        });
      }
      const k = sampleAlias(alias, nextUint32(this.rng));
      c.arrivals[k]!++;
      let best = -1;
      let edge = -1;
      for (let p = nbrStart[k]!; p < nbrStart[k + 1]!; p++) {
        const j = nbr[p]!;
        const q = this.queues[j]!;
        if (q.length === 0) continue;
        const older = best < 0 || q[0]!.born < this.queues[best]![0]!.born;
        const tieToLower = best >= 0 && q[0]!.born === this.queues[best]![0]!.born && j < best;
        if (older || tieToLower) {
          best = j;
          edge = nbrEdge[p]!;
        }
      }
      if (best < 0) {
        const due = abandonRate[k]! > 0 ? now + nextExp(this.rng) * (1 / abandonRate[k]!) : Infinity;
        this.queues[k]!.push({ born: now, due });
        continue;
      }
      const it = this.queues[best]!.shift()!;
      c.immediate[k]!++;
      c.edgeMatches[edge]!++;
      const w = now - it.born;
      c.waitedMatched[best]!++;
      c.waitSum[best] += w;
      c.hist[best * TIME_BINS + fastTimeBin(w * lambda)]!++;
      c.area[best] += this.inside(it.born, now);
    }
  }

  /** The counts over the window so far, the items still queued included (leaving at min(deadline, now)). */
  counts(): ReferenceCounts {
    const c = this.c;
    const area = [...c.area];
    const abandoned = [...c.abandoned];
    this.queues.forEach((q, j) => {
      for (const it of q) area[j] += this.inside(it.born, Math.min(it.due, this.clock));
    });
    return { ...c, area, abandoned };
  }
}
