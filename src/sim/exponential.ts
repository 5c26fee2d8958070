import { nextUint32, type RandomState } from './random.js';

/**
 * Exp(1) variates by the ziggurat method ("The Ziggurat Method for Generating Random Variables",
 * J. Stat. Softw. 2000; constants and set-up from memory of that paper, checked by the tests in
 * tests/sim/exponential.test.ts): 256 layers of equal area under e^−x, R = 7.69711747013104972
 * the start of the tail, V = 3.949659822581572e-3 the area of each layer. A 32-bit draw picks the
 * layer (low 8 bits) and the point in it (high 24 bits); about 99 % of draws return at once
 * (x = j·w[i] with j < k[i]), the rest fall back to an exact rejection step or, in the base
 * layer, to the tail R − ln U. No logarithm on the fast path, which the timed engine pays per event.
 */
const R = 7.69711747013104972;
const V = 3.949659822581572e-3;
const M = 2 ** 24;
/** Accept at once when j < ZIG_K[i], and return j · ZIG_W[i] (hot loops inline this fast path). */
export const ZIG_K = new Float64Array(256);
export const ZIG_W = new Float64Array(256);
const k = ZIG_K;
const w = ZIG_W;
const f = new Float64Array(256); // e^−x at the layer's outer edge
{
  let de = R;
  let te = de;
  const q = V / Math.exp(-de);
  k[0] = (de / q) * M;
  k[1] = 0;
  w[0] = q / M;
  w[255] = de / M;
  f[0] = 1;
  f[255] = Math.exp(-de);
  for (let i = 254; i >= 1; i--) {
    de = -Math.log(V / de + Math.exp(-de));
    k[i + 1] = (de / te) * M;
    te = de;
    f[i] = Math.exp(-de);
    w[i] = de / M;
  }
}

const TWO_POW_M32 = 2.3283064365386963e-10;

/** One Exp(1) variate from the stream (one 32-bit draw on the fast path, more on rare rejections). */
export function nextExp(s: RandomState): number {
  const u = nextUint32(s);
  const j = u >>> 8;
  return j < k[u & 255]! ? j * w[u & 255]! : expBeyond(s, u);
}

/** The rest of nextExp when the first draw u is not accepted at once. */
export function expBeyond(s: RandomState, first: number): number {
  let u = first;
  for (;;) {
    const i = u & 255;
    const j = u >>> 8;
    if (j < k[i]!) return j * w[i]!;
    if (i === 0) return R - Math.log((nextUint32(s) + 0.5) * TWO_POW_M32);
    const x = j * w[i]!;
    if (f[i]! + (nextUint32(s) + 0.5) * TWO_POW_M32 * (f[i - 1]! - f[i]!) < Math.exp(-x)) return x;
    u = nextUint32(s);
  }
}
