import { describe, expect, it } from 'vitest';
import { jump, nextOpenUnit, nextUint32, seedState, streamState, streamStates } from '../../src/sim/random.js';

/**
 * The generator's update is linear over GF(2) on its 128 state bits (xor, shifts and rotations
 * only; the scrambled output is not part of the state). Derived by hand: the column j of its matrix
 * T is the state reached in one step from the unit state e_j, and jumping 2^64 steps is T^(2^64),
 * obtained by squaring T 64 times. This is an independent check of the jump polynomial.
 */
type Cols = Uint32Array[];
function applyCols(cols: Cols, v: Uint32Array): Uint32Array {
  const out = new Uint32Array(4);
  for (let j = 0; j < 128; j++) {
    if ((v[j >> 5]! >>> (j & 31)) & 1) for (let w = 0; w < 4; w++) out[w] ^= cols[j]![w]!;
  }
  return out;
}
function stepMatrixPower(squarings: number): Cols {
  let cols: Cols = [];
  for (let j = 0; j < 128; j++) {
    const v = new Uint32Array(4);
    v[j >> 5] = 1 << (j & 31);
    nextUint32(v);
    cols.push(v);
  }
  for (let i = 0; i < squarings; i++) cols = cols.map((c) => applyCols(cols, c));
  return cols;
}

describe('xoshiro128** streams', () => {
  it('one step equals the GF(2) matrix (sanity of the matrix construction)', () => {
    const T = stepMatrixPower(0);
    const s = seedState(123);
    const expected = applyCols(T, s);
    nextUint32(s);
    expect(Array.from(s)).toEqual(Array.from(expected));
  });

  it('jump() advances exactly 2^64 steps: T^(2^64) by 64 squarings', () => {
    const J = stepMatrixPower(64);
    for (const seed of [0, 1, 987654321]) {
      const s = seedState(seed);
      const expected = applyCols(J, s);
      jump(s);
      expect(Array.from(s)).toEqual(Array.from(expected));
    }
  });

  it('streams are reproducible, distinct, and streamStates agrees with streamState', () => {
    const all = streamStates(42, 5);
    for (let r = 0; r < 5; r++) expect(Array.from(all[r]!)).toEqual(Array.from(streamState(42, r)));
    const firsts = all.map((s) => nextUint32(Uint32Array.from(s)));
    expect(new Set(firsts).size).toBe(5);
    expect(Array.from(seedState(42))).toEqual(Array.from(seedState(42)));
    expect(Array.from(seedState(42))).not.toEqual(Array.from(seedState(43)));
    // both halves of a large seed matter
    expect(Array.from(seedState(2 ** 40))).not.toEqual(Array.from(seedState(0)));
  });

  it('rejects seeds that are not non-negative safe integers', () => {
    expect(() => seedState(-1)).toThrow(RangeError);
    expect(() => seedState(1.5)).toThrow(RangeError);
    expect(() => seedState(2 ** 53)).toThrow(RangeError);
  });

  it('uniformity: chi-square over 64 cells and mean of −ln U (derived by hand)', () => {
    // 64 equal cells, 640 000 draws: the statistic has 63 degrees of freedom, mean 63 and standard
    // deviation √126 ≈ 11.2; 120 is more than five standard deviations above the mean.
    const s = seedState(2024);
    const cells = new Float64Array(64);
    const N = 640_000;
    let logSum = 0;
    let outside = 0;
    for (let i = 0; i < N; i++) {
      cells[nextUint32(s) >>> 26]++;
      const u = nextOpenUnit(s);
      if (!(u > 0 && u < 1)) outside++;
      logSum -= Math.log(u);
    }
    expect(outside).toBe(0);
    const expected = N / 64;
    let chi = 0;
    for (const c of cells) chi += (c - expected) ** 2 / expected;
    expect(chi).toBeLessThan(120);
    // −ln U is Exp(1): mean 1, standard deviation of the mean 1/√N; allow five of them
    expect(Math.abs(logSum / N - 1)).toBeLessThan(5 / Math.sqrt(N));
  });
});
