/**
 * Seeded random streams: xoshiro128** (32-bit words, period 2^128 − 1) on Uint32 arithmetic, with
 * a jump of 2^64 steps so that each replication owns a non-overlapping stream. The generator and
 * its jump polynomial are written from memory of the published description ("Scrambled linear
 * pseudorandom number generators", ACM Trans. Math. Softw. 2021); tests/sim/random.test.ts checks
 * the jump against an independent GF(2) matrix power, derived by hand.
 *
 * The state is a Uint32Array(4). Hot loops copy the four words into locals and inline `next`.
 */

/** A generator state: four 32-bit words, never all zero. */
export type RandomState = Uint32Array;

/** Advances the state and returns a uniform 32-bit unsigned integer. */
export function nextUint32(s: RandomState): number {
  const s0 = s[0]!;
  const s1 = s[1]!;
  const s2 = s[2]!;
  const s3 = s[3]!;
  const x = Math.imul(s1, 5);
  const result = Math.imul((x << 7) | (x >>> 25), 9) >>> 0;
  const t = s1 << 9;
  const n2 = s2 ^ s0;
  const n3 = s3 ^ s1;
  s[1] = s1 ^ n2;
  s[0] = s0 ^ n3;
  s[2] = n2 ^ t;
  s[3] = (n3 << 11) | (n3 >>> 21);
  return result;
}

/** Uniform double in (0, 1) with 32 random bits (never 0, never 1). */
export function nextOpenUnit(s: RandomState): number {
  return (nextUint32(s) + 0.5) * 2.3283064365386963e-10;
}

/** Jump polynomial: applying it advances the state by 2^64 steps (from memory; see the header). */
const JUMP = [0x8764000b, 0xf542d2d3, 0x6fa035c3, 0x77f2db5b] as const;

/** Advances the state by 2^64 steps, in place. */
export function jump(s: RandomState): void {
  let a = 0;
  let b = 0;
  let c = 0;
  let d = 0;
  for (let w = 0; w < 4; w++) {
    const word = JUMP[w]!;
    for (let bit = 0; bit < 32; bit++) {
      if ((word >>> bit) & 1) {
        a ^= s[0]!;
        b ^= s[1]!;
        c ^= s[2]!;
        d ^= s[3]!;
      }
      nextUint32(s);
    }
  }
  s[0] = a;
  s[1] = b;
  s[2] = c;
  s[3] = d;
}

/** A 32-bit integer hash with good avalanche (an add-shift-multiply finaliser). */
function mix32(x: number): number {
  x = (x + 0x9e3779b9) | 0;
  x = Math.imul(x ^ (x >>> 16), 0x85ebca6b);
  x = Math.imul(x ^ (x >>> 13), 0xc2b2ae35);
  return (x ^ (x >>> 16)) >>> 0;
}

/**
 * The starting state for a seed: any non-negative safe integer. Both 32-bit halves of the seed go
 * through a chain of hashes, so nearby seeds give unrelated states.
 */
export function seedState(seed: number): RandomState {
  if (!Number.isSafeInteger(seed) || seed < 0) throw new RangeError(`seed must be a non-negative safe integer, found ${seed}`);
  const lo = seed >>> 0;
  const hi = Math.floor(seed / 4294967296) >>> 0;
  const s = new Uint32Array(4);
  let h = mix32(lo ^ mix32(hi));
  for (let i = 0; i < 4; i++) {
    h = mix32(h + i * 0x632be5ab);
    s[i] = h;
  }
  if ((s[0]! | s[1]! | s[2]! | s[3]!) === 0) s[0] = 1;
  // discard a few outputs so that the first draws do not echo the hash
  for (let i = 0; i < 16; i++) nextUint32(s);
  return s;
}

/**
 * The stream of replication `index` for a seed: the seed's state jumped `index` times, i.e.
 * 2^64 · index steps ahead. Streams never overlap for fewer than 2^64 draws each.
 */
export function streamState(seed: number, index: number): RandomState {
  const s = seedState(seed);
  for (let r = 0; r < index; r++) jump(s);
  return s;
}

/** The states of replications 0..count−1, computed with one jump each. */
export function streamStates(seed: number, count: number): RandomState[] {
  const out: RandomState[] = [];
  const s = seedState(seed);
  for (let r = 0; r < count; r++) {
    out.push(Uint32Array.from(s));
    jump(s);
  }
  return out;
}
