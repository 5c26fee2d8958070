import { describe, expect, it } from 'vitest';
import { aliasProbabilities, buildAlias, sampleAlias } from '../../src/sim/alias.js';
import { Rng } from '../helpers/random.js';

describe('alias table', () => {
  it('column masses add up to each weight / total (derived by hand: column c gives keep[c]/n to c and the rest to alias[c])', () => {
    const rng = new Rng(5);
    for (let t = 0; t < 50; t++) {
      const n = rng.int(1, 40);
      const w: number[] = Array.from({ length: n }, () => (rng.chance(0.1) ? 0 : rng.uniform(0.01, 5)));
      if (!w.some((x) => x > 0)) w[0] = 1;
      const total = w.reduce((s, x) => s + x, 0);
      const p = aliasProbabilities(buildAlias(w));
      for (let k = 0; k < n; k++) expect(p[k]).toBeCloseTo(w[k]! / total, 12);
    }
  });

  it('sampleAlias maps evenly spread 32-bit draws to the right frequencies', () => {
    const w = [3, 1, 0, 6];
    const t = buildAlias(w);
    const counts = [0, 0, 0, 0];
    const M = 1 << 16;
    // a deterministic sweep of the 32-bit range: frequencies equal the probabilities up to 1/M per column
    for (let i = 0; i < M; i++) counts[sampleAlias(t, Math.floor(((i + 0.5) / M) * 4294967296))]!++;
    counts.forEach((c, k) => expect(Math.abs(c / M - w[k]! / 10)).toBeLessThan(4 / M));
  });

  it('rejects bad weights', () => {
    expect(() => buildAlias([0, 0])).toThrow(RangeError);
    expect(() => buildAlias([1, -1])).toThrow(RangeError);
    expect(() => buildAlias([1, Infinity])).toThrow(RangeError);
  });
});
