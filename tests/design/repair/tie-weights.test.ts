import { describe, expect, it } from 'vitest';
import { priceResolution, tieWeights } from '../../../src/design/repair/tie-weights.js';
import { Rng } from '../../helpers/random.js';

// The tie weights of the repair MILP (src/design/repair/tie-weights.ts). The claim, derived by hand in
// that file: ordering sets by the sum of their weighted prices is ordering them by cost, then by
// size, then by the sum of their positions. Checked here over every pair of subsets.

describe('tie weights', () => {
  it('price resolution: the largest step every price is a multiple of (derived by hand)', () => {
    expect(priceResolution([2, 4, 6])).toBe(2); // gcd 2
    expect(priceResolution([100, 250])).toBe(50);
    expect(priceResolution([0.5, 1.25])).toBe(0.25); // 50 and 125 hundredths: gcd 25 hundredths
    expect(priceResolution([0, 0])).toBe(1);
    expect(priceResolution([1 / 3])).toBe(1e-6);
  });

  it('weighted sums order subsets by cost, then size, then sum of positions', () => {
    const rng = new Rng(404);
    for (let round = 0; round < 6; round++) {
      const k = 8;
      const prices = Array.from({ length: k }, () => rng.int(0, 3) * (round % 2 === 0 ? 1 : 0.25));
      const w = tieWeights(prices);
      const subsets = Array.from({ length: 1 << k }, (_, m) => Array.from({ length: k }, (_, j) => j).filter((j) => (m >>> j) & 1));
      const key = (s: number[]): [number, number, number] => [s.reduce((a, j) => a + prices[j]!, 0), s.length, s.reduce((a, j) => a + j, 0)];
      const weight = (s: number[]): number => s.reduce((a, j) => a + w[j]!, 0);
      for (let x = 0; x < subsets.length; x += 3) {
        for (let y = 0; y < subsets.length; y += 5) {
          const [kx, ky] = [key(subsets[x]!), key(subsets[y]!)];
          const byKey = kx[0] !== ky[0] ? Math.sign(kx[0] - ky[0]) : kx[1] !== ky[1] ? Math.sign(kx[1] - ky[1]) : Math.sign(kx[2] - ky[2]);
          const byWeight = Math.sign(weight(subsets[x]!) - weight(subsets[y]!));
          // equal keys may differ by rounding only
          if (byKey === 0) expect(Math.abs(weight(subsets[x]!) - weight(subsets[y]!))).toBeLessThan(1e-9);
          else expect(byWeight).toBe(byKey);
        }
      }
    }
  });
});
