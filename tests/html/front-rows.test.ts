import { describe, expect, it } from 'vitest';
import { frontRows } from '../../src/html/report-html.js';

// The report's table of the front shows at most 14 designs of a long front: the cheapest, the
// dearest, the recommended one, and designs spread over the cost range (src/html/report-html.ts).

const front = (n: number, rec: number) => Array.from({ length: n }, (_, i) => ({ cost: i * i - 40, recommended: i === rec }));

describe('frontRows', () => {
  it('keeps a short front whole', () => {
    const f = front(9, 3);
    expect(frontRows(f)).toEqual(f);
  });

  it('on a long front keeps the ends and the recommended design, in cost order, without repeats', () => {
    for (const n of [15, 40, 65, 200]) {
      for (const rec of [0, 7, n - 1, Math.floor(n / 2)]) {
        const f = front(n, rec);
        const rows = frontRows(f);
        expect(rows.length).toBe(14);
        expect(rows[0]).toBe(f[0]);
        expect(rows.at(-1)).toBe(f[n - 1]);
        expect(rows).toContain(f[rec]);
        expect(new Set(rows).size).toBe(rows.length);
        for (let i = 1; i < rows.length; i++) expect(rows[i]!.cost).toBeGreaterThan(rows[i - 1]!.cost);
      }
    }
  });

  it('spreads the rows over the cost range: no gap between shown costs wider than twice an even share', () => {
    // an evenly spaced front: the shown rows' costs leave no gap wider than 2 × range / 13
    const f = Array.from({ length: 100 }, (_, i) => ({ cost: i, recommended: i === 50 }));
    const rows = frontRows(f);
    for (let i = 1; i < rows.length; i++) expect(rows[i]!.cost - rows[i - 1]!.cost).toBeLessThanOrEqual((2 * 99) / 13);
  });
});
