import { describe, expect, it } from 'vitest';
import { block, br, brIf, f64, Fn, i32, i64, loop, module, ret, when } from '../../src/wasm/assemble.js';
import { Rng } from '../helpers/random.js';

/**
 * The assembler against the WebAssembly engine itself: the engine rejects a malformed module, and
 * each function's result is compared with the same computation in plain JavaScript.
 */

function instantiate(fns: Fn[]): Record<string, (...args: never[]) => unknown> {
  const memory = new WebAssembly.Memory({ initial: 1 });
  const inst = new WebAssembly.Instance(new WebAssembly.Module(module(fns)), { env: { memory } });
  return inst.exports as Record<string, (...args: never[]) => unknown>;
}

describe('wasm assembler', () => {
  it('encodes signed LEB128 constants (hand-computed: −123456 = 0x78 0x3b 0x40 in 7-bit groups)', () => {
    // −123456 in two's complement, 7 bits at a time from the low end: 1000000 (0x40), 0111011 (0x3b),
    // 1111000 (0x78, sign bit set, so it ends); continuation bits on all but the last
    expect(i32.const(-123456)).toEqual([0x41, 0xc0, 0xbb, 0x78]);
    // 64 = 1000000: bit 6 would read as a sign, so one more group follows
    expect(i64.const(64)).toEqual([0x42, 0xc0, 0x00]);
    expect(i32.const(63)).toEqual([0x41, 0x3f]);
  });

  it('bit operations on 64-bit masks agree with JavaScript bigint arithmetic', () => {
    const f = new Fn('bits', { x: 'i64', c: 'i32' }, 'i64');
    const { get } = f;
    // popcnt(x & ((1 << c) − 1)) · 2^16 + ctz(x) · 2^8 + clz(x)
    f.define(
      i64.add(
        i64.add(
          i64.shl(i64.popcnt(i64.and(get('x'), i64.sub(i64.shl(i64.const(1), i64.extend_u(get('c'))), i64.const(1)))), i64.const(16)),
          i64.shl(i64.ctz(get('x')), i64.const(8)),
        ),
        i64.clz(get('x')),
      ),
    );
    const run = instantiate([f]).bits as unknown as (x: bigint, c: number) => bigint;
    const rng = new Rng(5);
    for (let t = 0; t < 500; t++) {
      const x = BigInt.asIntN(64, (BigInt(Math.floor(rng.next() * 2 ** 32)) << 32n) | BigInt(Math.floor(rng.next() * 2 ** 32)));
      const c = rng.int(0, 63);
      const u = BigInt.asUintN(64, x);
      let pop = 0n;
      for (let b = 0n; b < BigInt(c); b++) pop += (u >> b) & 1n;
      let ctz = 0n;
      while (ctz < 64n && ((u >> ctz) & 1n) === 0n) ctz++;
      let clz = 0n;
      while (clz < 64n && ((u >> (63n - clz)) & 1n) === 0n) clz++;
      expect(run(x, c)).toBe((pop << 16n) + (ctz << 8n) + clz);
    }
  });

  it('loops, named branches and memory: a sum over an f64 array', () => {
    const f = new Fn('sum', { base: 'i32', len: 'i32' }, 'f64').locals({ i: 'i32', acc: 'f64' });
    const { get, set } = f;
    f.define(
      set('acc', f64.const(0.5)),
      block('done',
        loop('next',
          brIf('done', i32.ge_s(get('i'), get('len'))),
          when(i32.eq(get('i'), i32.const(3)), [set('i', i32.add(get('i'), i32.const(1))), br('next')]), // skip element 3
          set('acc', f64.add(get('acc'), f64.load(i32.add(get('base'), i32.shl(get('i'), i32.const(3)))))),
          set('i', i32.add(get('i'), i32.const(1))),
          br('next'),
        ),
      ),
      ret(get('acc')),
    );
    const memory = new WebAssembly.Memory({ initial: 1 });
    const inst = new WebAssembly.Instance(new WebAssembly.Module(module([f])), { env: { memory } });
    const data = new Float64Array(memory.buffer, 64, 10);
    for (let k = 0; k < 10; k++) data[k] = k * 1.25;
    const sum = (inst.exports.sum as (b: number, l: number) => number)(64, 10);
    expect(sum).toBe(0.5 + data.reduce((a, x, k) => (k === 3 ? a : a + x), 0));
  });

  it('refuses unknown locals and labels', () => {
    const f = new Fn('bad', {}, 'i32');
    expect(() => f.get('nope')).toThrow(/no local nope/);
    expect(() => new Fn('twice', { a: 'i32' }).locals({ a: 'i64' })).toThrow(/declares a twice/);
    const g = new Fn('jump', {}).define(loop('here', br('elsewhere')));
    expect(() => module([g])).toThrow(/no enclosing label elsewhere/);
  });
});
