import { describe, expect, it } from 'vitest';
import { Queues } from '../../src/sim/queues.js';
import { Rng } from '../helpers/random.js';

describe('ring buffers', () => {
  it('keep FIFO order through growth and compaction (checked against plain arrays)', () => {
    const rng = new Rng(17);
    const n = 5;
    const q = new Queues(n, false, 4);
    const ref: number[][] = Array.from({ length: n }, () => []);
    let stamp = 0;
    for (let step = 0; step < 40_000; step++) {
      const k = rng.int(0, n - 1);
      // drift towards growth so that every ring doubles several times
      if (rng.chance(0.6) || ref[k]!.length === 0) {
        if (q.span[k] === q.cap[k]) q.grow(k);
        q.buf[q.off[k]! + ((q.head[k]! + q.span[k]!) & q.mask[k]!)] = stamp;
        q.span[k]++;
        ref[k]!.push(stamp++);
      } else {
        expect(q.buf[q.off[k]! + q.head[k]!]).toBe(ref[k]!.shift());
        q.head[k] = (q.head[k]! + 1) & q.mask[k]!;
        q.span[k]--;
      }
    }
    for (let k = 0; k < n; k++) {
      expect(q.items(k)).toEqual(ref[k]);
      expect(q.cap[k]! & (q.cap[k]! - 1)).toBe(0); // powers of two
    }
  });

  it('moves gone flags together with the items', () => {
    const q = new Queues(2, true, 4);
    for (let i = 0; i < 4; i++) {
      q.buf[q.off[1]! + i] = i;
      q.span[1]++;
    }
    q.gone![q.off[1]! + 2] = 1;
    q.grow(1);
    expect(q.items(1)).toEqual([0, 1, 3]);
  });
});
