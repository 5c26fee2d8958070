import { block, br, brIf, f64, Fn, i32, i64, loop, module, ret, when, type Code } from '../wasm/assemble.js';
import { H } from './kernel-layout.js';

/**
 * The exact evaluator's three inner loops as WebAssembly (assembled by src/wasm/assemble.ts), on the
 * memory laid out by kernel-layout.ts. Each is the loop of the JavaScript it replaced, with 64-bit
 * masks and native popcnt/ctz; the recursions are stated in component.ts (prefixSums, tailPass) and
 * trie.ts (buildTrie). Each kernel works in chunks of at most `steps` sets and keeps its state in
 * the header, returning 1 while work is left, 0 when done (-1: see each kernel): V8 compiles a
 * WebAssembly function with its optimising tier only between calls, so one long call would stay on
 * the baseline code.
 */

/** i32 address of element i of the array at `base` with `shift` = log2(element size). */
const at = (base: Code, index: Code, shift: number): Code => i32.add(base, i32.shl(index, i32.const(shift)));
/** The header slot as an i32. */
const hdr = (slot: number): Code => i32.load(i32.const(slot));
/** i64 mask with bit c (an i32) set. */
const bit = (c: Code): Code => i64.shl(i64.const(1), i64.extend_u(c));
/** x & (x − 1): x without its lowest bit. */
const dropLow = (x: Code): Code => i64.and(x, i64.sub(x, i64.const(1)));
/** Lowest set bit index of a non-zero i64, as i32. */
const low = (x: Code): Code => i32.wrap(i64.ctz(x));
/** Trie record address of set s: node + 12 s. */
const rec = (node: Code, s: Code): Code => i32.add(node, i32.mul(s, i32.const(12)));
/** child(s, c) of trie.ts: first[s] + popcount(cand(s) & below), below = bits under c. */
const child = (node: Code, s: Code, below: Code, tmp: (v: Code) => Code, tmpGet: Code): Code => [
  tmp(rec(node, s)),
  i32.add(i32.load(tmpGet), i32.wrap(i64.popcnt(i64.and(i64.load(tmpGet, 4), below)))),
];

/** λ of a mask: eight byte-table lookups (masks.ts maskRate). */
function maskRate(bytes: Code, mask: Code): Code {
  let sum: Code | undefined;
  for (let b = 0; b < 8; b++) {
    const byte = i32.wrap(i64.and(b === 0 ? mask : i64.shr_u(mask, i64.const(8 * b)), i64.const(255)));
    const term = f64.load(at(bytes, i32.or(i32.const(b << 8), byte), 3));
    sum = sum === undefined ? term : f64.add(sum, term);
  }
  return sum!;
}

/**
 * build(steps): breadth-first trie construction (trie.ts buildTrie). The masks of the sets sit in
 * the tail slot while building. Returns -1 when more sets appear than counted.
 */
function buildKernel(): Fn {
  const f = new Fn('build', { steps: 'i32' }, 'i32').locals({
    count: 'i32', node: 'i32', mu: 'i32', masks: 'i32', nb: 'i32', con: 'i32', bytes: 'i32',
    s: 'i32', size: 'i32', i: 'i32', c: 'i32', r: 'i32',
    A: 'i64', B: 'i64', N: 'i64', x: 'i64', cand: 'i64', all: 'i64',
  });
  const { get, set } = f;
  return f.define(
    set('count', hdr(H.count)),
    set('node', hdr(H.node)),
    set('mu', hdr(H.mu)),
    set('masks', hdr(H.tail)),
    set('nb', hdr(H.nb)),
    set('con', hdr(H.con)),
    set('bytes', hdr(H.bytes)),
    set('all', i64.load(i32.const(H.all))),
    set('s', hdr(H.buildS)),
    set('size', hdr(H.buildSize)),
    block('exit',
      loop('sets',
        brIf('exit', i32.ge_s(get('s'), get('size'))),
        brIf('exit', i32.eqz(get('steps'))),
        set('A', i64.load(at(get('masks'), get('s'), 3))),
        set('B', i64.const(0)),
        set('N', i64.const(0)),
        set('x', get('A')),
        block('done',
          loop('members',
            brIf('done', i64.eqz(get('x'))),
            set('i', low(get('x'))),
            set('B', i64.or(get('B'), i64.load(at(get('con'), get('i'), 3)))),
            set('N', i64.or(get('N'), i64.load(at(get('nb'), get('i'), 3)))),
            set('x', dropLow(get('x'))),
            br('members'),
          ),
        ),
        // candidates: addable and below min(A) (every class for ∅)
        set('cand', i64.and(
          i64.and(get('all'), i64.xor(get('B'), i64.const(-1))),
          i64.sub(i64.and(get('A'), i64.sub(i64.const(0), get('A'))), i64.const(1)),
        )),
        set('r', rec(get('node'), get('s'))),
        i32.store(get('r'), get('size')),
        i32.store(get('r'), i32.wrap(get('cand')), 4),
        i32.store(get('r'), i32.wrap(i64.shr_u(get('cand'), i64.const(32))), 8),
        set('x', get('cand')),
        block('done',
          loop('children',
            brIf('done', i64.eqz(get('x'))),
            when(i32.ge_s(get('size'), get('count')), [ret(i32.const(-1))]),
            set('c', low(get('x'))),
            i64.store(at(get('masks'), get('size'), 3), i64.or(get('A'), bit(get('c')))),
            f64.store(at(get('mu'), get('size'), 3), maskRate(get('bytes'), i64.or(get('N'), i64.load(at(get('nb'), get('c'), 3))))),
            set('size', i32.add(get('size'), i32.const(1))),
            set('x', dropLow(get('x'))),
            br('children'),
          ),
        ),
        set('s', i32.add(get('s'), i32.const(1))),
        set('steps', i32.sub(get('steps'), i32.const(1))),
        br('sets'),
      ),
    ),
    i32.store(i32.const(H.buildS), get('s')),
    i32.store(i32.const(H.buildSize), get('size')),
    ret(i32.ne(get('s'), get('size'))),
  );
}

/** Locals shared by the two walks. */
const WALK_LOCALS = {
  n: 'i32', node: 'i32', mu: 'i32', psi: 'i32', rate: 'i32', rnl: 'i32', idx: 'i32', elem: 'i32', rem: 'i32', r: 'i32', todo: 'i32',
  d: 'i32', e: 'i32', c: 'i32', p: 'i32', s: 'i32', j: 'i32', k: 'i32', q: 'i32', base: 'i32', nxt: 'i32', tr: 'i32',
  t: 'i64', below: 'i64',
} as const;

function loadWalk(f: Fn): Code[] {
  const { set } = f;
  return [
    set('n', hdr(H.n)),
    set('node', hdr(H.node)),
    set('mu', hdr(H.mu)),
    set('psi', hdr(H.psi)),
    set('rate', hdr(H.rate)),
    set('rnl', hdr(H.rnl)),
    set('idx', hdr(H.idx)),
    set('elem', hdr(H.elem)),
    set('rem', hdr(H.rem)),
    set('r', hdr(H.r)),
    set('todo', hdr(H.todo)),
    set('d', hdr(H.depth)),
  ];
}

/**
 * The step down from A_d to A_d ∪ {c} shared by both walks (c, below = bits under c, p = idx[d]
 * set): s = child(p, c); the indices of (A_d ∖ x) ∪ {c} for every member x; r(A_d ∪ c).
 */
function stepDown(f: Fn): Code[] {
  const { get, set } = f;
  const tmp = (v: Code): Code => set('tr', v);
  return [
    set('e', i32.add(get('d'), i32.const(1))),
    set('s', child(get('node'), get('p'), get('below'), tmp, get('tr'))),
    i32.store(at(get('idx'), get('e'), 2), get('s')),
    i32.store(at(get('elem'), get('e'), 2), get('c')),
    set('base', at(get('rem'), i32.mul(get('d'), get('n')), 2)),
    set('nxt', at(get('rem'), i32.mul(get('e'), get('n')), 2)),
    set('j', i32.const(0)),
    block('done',
      loop('members',
        brIf('done', i32.ge_s(get('j'), get('d'))),
        i32.store(at(get('nxt'), get('j'), 2), child(get('node'), i32.load(at(get('base'), get('j'), 2)), get('below'), tmp, get('tr'))),
        set('j', i32.add(get('j'), i32.const(1))),
        br('members'),
      ),
    ),
    i32.store(at(get('nxt'), get('d'), 2), get('p')),
    f64.store(at(get('r'), get('e'), 3), f64.add(f64.load(at(get('r'), get('d'), 3)), f64.load(at(get('rnl'), get('c'), 3)))),
    i64.store(at(get('todo'), get('e'), 3), i64.load(i32.add(rec(get('node'), get('s')), i32.const(4)))),
  ];
}

/**
 * prefix(steps): Ψ in increasing mask order (component.ts prefixSums), and Ψ1 in the tail slot when
 * header.moment is 1. Returns -1 when some set has μ(A) − r(A) <= tol (its mask in header.sat).
 */
function prefixKernel(): Fn {
  const f = new Fn('prefix', { steps: 'i32' }, 'i32').locals({
    ...WALK_LOCALS,
    psi1: 'i32', smask: 'i32', moment: 'i32',
    sum: 'f64', den: 'f64', ps: 'f64', w: 'f64', m1: 'f64', re: 'f64', tol: 'f64',
  });
  const { get, set } = f;
  const psiAt = (s: Code): Code => f64.load(at(get('psi'), s, 3));
  const psi1At = (s: Code): Code => f64.load(at(get('psi1'), s, 3));
  return f.define(
    ...loadWalk(f),
    set('psi1', hdr(H.tail)),
    set('smask', hdr(H.smask)),
    set('moment', hdr(H.moment)),
    set('tol', f64.load(i32.const(H.tol))),
    block('exit',
      loop('walk',
        brIf('exit', i32.lt_s(get('d'), i32.const(0))),
        brIf('exit', i32.eqz(get('steps'))),
        set('t', i64.load(at(get('todo'), get('d'), 3))),
        when(i64.eqz(get('t')), [set('d', i32.sub(get('d'), i32.const(1))), br('walk')]),
        // the lowest child left
        set('c', low(get('t'))),
        i64.store(at(get('todo'), get('d'), 3), dropLow(get('t'))),
        set('below', i64.sub(bit(get('c')), i64.const(1))),
        set('p', i32.load(at(get('idx'), get('d'), 2))),
        ...stepDown(f),
        i64.store(at(get('smask'), get('e'), 3), i64.or(i64.load(at(get('smask'), get('d'), 3)), bit(get('c')))),
        // Ψ(A) = Σ_{i∈A} λ_i Ψ(A∖i) / (μ(A) − r(A))
        set('sum', f64.mul(f64.load(at(get('rate'), get('c'), 3)), psiAt(get('p')))),
        set('j', i32.const(0)),
        block('done',
          loop('members',
            brIf('done', i32.ge_s(get('j'), get('d'))),
            set('sum', f64.add(get('sum'), f64.mul(
              f64.load(at(get('rate'), i32.load(at(get('elem'), i32.add(get('j'), i32.const(1)), 2)), 3)),
              psiAt(i32.load(at(get('nxt'), get('j'), 2))),
            ))),
            set('j', i32.add(get('j'), i32.const(1))),
            br('members'),
          ),
        ),
        set('re', f64.load(at(get('r'), get('e'), 3))),
        set('den', f64.sub(f64.load(at(get('mu'), get('s'), 3)), get('re'))),
        when(i32.eqz(f64.gt(get('den'), get('tol'))), [
          i64.store(i32.const(H.sat), i64.load(at(get('smask'), get('e'), 3))),
          ret(i32.const(-1)),
        ]),
        set('ps', f64.div(get('sum'), get('den'))),
        f64.store(at(get('psi'), get('s'), 3), get('ps')),
        when(get('moment'), [
          // Ψ1(A) = [Σ_{i∈A} λ_i (Ψ1(A∖i) + Ψ(A∖i)) + r(A) Ψ(A)] / (μ(A) − r(A))
          set('m1', f64.mul(f64.load(at(get('rate'), get('c'), 3)), f64.add(psi1At(get('p')), psiAt(get('p'))))),
          set('j', i32.const(0)),
          block('done',
            loop('members',
              brIf('done', i32.ge_s(get('j'), get('d'))),
              set('q', i32.load(at(get('nxt'), get('j'), 2))),
              set('w', f64.load(at(get('rate'), i32.load(at(get('elem'), i32.add(get('j'), i32.const(1)), 2)), 3))),
              set('m1', f64.add(get('m1'), f64.mul(get('w'), f64.add(psi1At(get('q')), psiAt(get('q')))))),
              set('j', i32.add(get('j'), i32.const(1))),
              br('members'),
            ),
          ),
          f64.store(at(get('psi1'), get('s'), 3), f64.div(f64.add(get('m1'), f64.mul(get('re'), get('ps'))), get('den'))),
        ]),
        set('d', get('e')),
        set('steps', i32.sub(get('steps'), i32.const(1))),
        br('walk'),
      ),
    ),
    i32.store(i32.const(H.depth), get('d')),
    ret(i32.ge_s(get('d'), i32.const(0))),
  );
}

/**
 * tail(steps): T and the per-class sums in decreasing mask order (component.ts tailPass): a
 * post-order walk with children in descending c; each finished set B pushes λ_k T(B)/μ(B) to the
 * pending sum of B ∖ {k} (kept in tail[]), adds Ψ(B∖k)·f and Ψ(B)·f (k ∉ S) to L_k, and Ψ(B∖k)·f
 * to the (unscaled) flow into k from every class of N(k) that only k covers. Ends with T(∅) = 1 + Σ.
 */
function tailKernel(): Fn {
  const f = new Fn('tail', { steps: 'i32' }, 'i32').locals({
    ...WALK_LOCALS,
    tail: 'i32', nmask: 'i32', omask: 'i32', nb: 'i32', backlog: 'i32', flow: 'i32', a: 'i32',
    nbc: 'i64', nd: 'i64', o: 'i64', z: 'i64',
    T: 'f64', m: 'f64', gs: 'f64', ps: 'f64', fk: 'f64', v: 'f64',
  });
  const { get, set } = f;
  const f64At = (base: string, index: Code): Code => at(get(base), index, 3);
  return f.define(
    ...loadWalk(f),
    set('tail', hdr(H.tail)),
    set('nmask', hdr(H.nmask)),
    set('omask', hdr(H.omask)),
    set('nb', hdr(H.nb)),
    set('backlog', hdr(H.backlog)),
    set('flow', hdr(H.flow)),
    block('exit',
      loop('walk',
        brIf('exit', i32.lt_s(get('d'), i32.const(0))),
        brIf('exit', i32.eqz(get('steps'))),
        set('t', i64.load(at(get('todo'), get('d'), 3))),
        when(i64.ne(get('t'), i64.const(0)), [
          // go down to A_d ∪ {c}, c the highest child left
          set('c', i32.sub(i32.const(63), i32.wrap(i64.clz(get('t'))))),
          i64.store(at(get('todo'), get('d'), 3), i64.xor(get('t'), bit(get('c')))),
          set('below', i64.sub(bit(get('c')), i64.const(1))),
          set('p', i32.load(at(get('idx'), get('d'), 2))),
          ...stepDown(f),
          set('nbc', i64.load(at(get('nb'), get('c'), 3))),
          set('nd', i64.load(at(get('nmask'), get('d'), 3))),
          i64.store(at(get('nmask'), get('e'), 3), i64.or(get('nd'), get('nbc'))),
          // N1(A ∪ c) = (N1(A) ∖ N(c)) ∪ (N(c) ∖ N(A))
          i64.store(at(get('omask'), get('e'), 3), i64.or(
            i64.and(i64.load(at(get('omask'), get('d'), 3)), i64.xor(get('nbc'), i64.const(-1))),
            i64.and(get('nbc'), i64.xor(get('nd'), i64.const(-1))),
          )),
          set('d', get('e')),
          br('walk'),
        ]),
        // all supersets done: finish A_d
        set('s', i32.load(at(get('idx'), get('d'), 2))),
        when(i32.eqz(get('d')), [
          f64.store(f64At('tail', get('s')), f64.add(f64.const(1), f64.load(f64At('tail', get('s'))))),
          set('d', i32.const(-1)),
          br('exit'),
        ]),
        set('m', f64.load(f64At('mu', get('s')))),
        set('T', f64.div(
          f64.add(f64.const(1), f64.load(f64At('tail', get('s')))),
          f64.sub(f64.const(1), f64.div(f64.load(f64At('r', get('d'))), get('m'))),
        )),
        f64.store(f64At('tail', get('s')), get('T')),
        set('gs', f64.div(get('T'), get('m'))),
        set('ps', f64.load(f64At('psi', get('s')))),
        set('o', i64.load(at(get('omask'), get('d'), 3))),
        set('base', at(get('rem'), i32.mul(get('d'), get('n')), 2)),
        set('j', i32.const(0)),
        block('done',
          loop('members',
            brIf('done', i32.ge_s(get('j'), get('d'))),
            set('k', i32.load(at(get('elem'), i32.add(get('j'), i32.const(1)), 2))),
            set('q', i32.load(at(get('base'), get('j'), 2))),
            set('fk', f64.mul(f64.load(f64At('rate', get('k'))), get('gs'))),
            set('a', f64At('tail', get('q'))),
            f64.store(get('a'), f64.add(f64.load(get('a')), get('fk'))),
            set('v', f64.mul(f64.load(f64At('psi', get('q'))), get('fk'))),
            set('a', f64At('backlog', get('k'))),
            f64.store(get('a'), f64.add(f64.load(get('a')), f64.add(get('v'), f64.mul(get('ps'), f64.mul(get('gs'), f64.load(f64At('rnl', get('k')))))))),
            set('z', i64.and(i64.load(at(get('nb'), get('k'), 3)), get('o'))),
            block('none',
              loop('receivers',
                brIf('none', i64.eqz(get('z'))),
                set('a', f64At('flow', i32.add(i32.mul(low(get('z')), get('n')), get('k')))),
                f64.store(get('a'), f64.add(f64.load(get('a')), get('v'))),
                set('z', dropLow(get('z'))),
                br('receivers'),
              ),
            ),
            set('j', i32.add(get('j'), i32.const(1))),
            br('members'),
          ),
        ),
        set('d', i32.sub(get('d'), i32.const(1))),
        set('steps', i32.sub(get('steps'), i32.const(1))),
        br('walk'),
      ),
    ),
    i32.store(i32.const(H.depth), get('d')),
    ret(i32.ge_s(get('d'), i32.const(0))),
  );
}

let compiled: WebAssembly.Module | undefined;

/** The kernels' module, assembled and compiled once per process. */
export function kernelModule(): WebAssembly.Module {
  compiled ??= new WebAssembly.Module(module([buildKernel(), prefixKernel(), tailKernel()]));
  return compiled;
}

export interface Kernels {
  build(steps: number): number;
  prefix(steps: number): number;
  tail(steps: number): number;
}

const instances = new WeakMap<WebAssembly.Memory, Kernels>();

/** The kernels working on `memory` (one instance per memory). */
export function kernels(memory: WebAssembly.Memory): Kernels {
  let k = instances.get(memory);
  if (!k) {
    k = new WebAssembly.Instance(kernelModule(), { env: { memory } }).exports as unknown as Kernels;
    instances.set(memory, k);
  }
  return k;
}
