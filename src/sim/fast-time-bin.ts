import { TIME_BINS, TIME_PER_OCTAVE, timeBinRange } from './wait-bins.js';

/**
 * timeBin of wait-bins.ts without a logarithm, for the timed engine's hot loop. With x = m·2^e
 * (1 ≤ m < 2), floor((log2 x − e0)·P) + 1 = (e − e0)·P + j + 1, where j is the bin of m inside its
 * octave: THRESHOLD[j] = 2^(j/P) <= m < THRESHOLD[j+1]. The exponent and the top 8 bits of the
 * mantissa come from the bits of x; START[t] is the bin at m = 1 + t/256, and since one 1/256 step
 * of m is narrower than a bin (2^(1/P) − 1 > 1/256 for P <= 177), one comparison finishes. Equal
 * to timeBin except where rounding puts x on the other side of a bin edge (within an ulp of one).
 */
/** The tables of fastTimeBin, exported for kernels that inline it (timed-engine.ts). */
export const BIN_P = TIME_PER_OCTAVE;
const P = BIN_P;
export const BIN_E0 = Math.round(Math.log2(timeBinRange(1)[0])); // the lowest exponent (edge of bin 1)
export const BIN_THRESHOLD = Float64Array.from({ length: P + 1 }, (_, j) => 2 ** (j / P));
export const BIN_START = Int32Array.from({ length: 256 }, (_, t) => {
  let j = 0;
  while (BIN_THRESHOLD[j + 1]! <= 1 + t / 256) j++;
  return j;
});
const THRESHOLD = BIN_THRESHOLD;
const START = BIN_START;
const E0 = BIN_E0;
const word = new Float64Array(1);
const bits = new Uint32Array(word.buffer);

export function fastTimeBin(x: number): number {
  if (!(x > 0)) return 0;
  word[0] = x;
  const hi = bits[1]!;
  const e = (hi >>> 20) - 1023; // x > 0: no sign bit (a subnormal x lands in bin 1 below)
  let j = START[(hi >>> 12) & 255]!;
  bits[1] = (hi & 0x000fffff) | 0x3ff00000; // m = x with its exponent set to 0
  if (word[0]! >= THRESHOLD[j + 1]!) j++;
  const b = (e - E0) * P + j + 1;
  return b < 1 ? 1 : b >= TIME_BINS ? TIME_BINS - 1 : b;
}
