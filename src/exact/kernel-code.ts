import { block, br, brIf, f64, Fn, i32, i64, loop, module, ret, when, type Code } from '../wasm/assemble.js';
import { A } from './kernel-layout.js';

/**
 * The exact evaluator's inner loops as WebAssembly (assembled by src/wasm/assemble.ts), on the
 * memory laid out by kernel-layout.ts. Each is the loop of the JavaScript it replaced, with 64-bit
 * masks and native popcnt/ctz; the recursions are stated in component.ts (prefixSums, tailPass) and
 * trie.ts (buildTrie). Each kernel works in chunks of at most `steps` sets and keeps its state in
 * the header, returning 1 while work is left, 0 when done (-1: see each kernel): V8 compiles a
 * WebAssembly function with its optimising tier only between calls, so one long call would stay on
 * the baseline code.
 *
 * Arrays sized by the classes sit at fixed addresses (constant offsets in the instructions); the
 * four sized by the sets are reached from a base held in a local.
 */

const shl = (x: Code, s: number): Code => (s === 0 ? x : i32.shl(x, i32.const(s)));
/** Element `index` of a fixed-address array (`at` = its address, 2^shift bytes per element). */
const ld32 = (at: number, index: Code): Code => i32.load(shl(index, 2), at);
const st32 = (at: number, index: Code, v: Code): Code => i32.store(shl(index, 2), v, at);
const ld64 = (at: number, index: Code): Code => i64.load(shl(index, 3), at);
const st64 = (at: number, index: Code, v: Code): Code => i64.store(shl(index, 3), v, at);
const ldf = (at: number, index: Code): Code => f64.load(shl(index, 3), at);
const stf = (at: number, index: Code, v: Code): Code => f64.store(shl(index, 3), v, at);
/** Address of element `index` of an f64/i64 array whose base is the value `base`. */
const el8 = (base: Code, index: Code): Code => i32.add(base, shl(index, 3));
/** rem[64 d + j] */
const remAt = (d: Code, j: Code): Code => i32.add(shl(d, 8), shl(j, 2));
/** The header scalar at `at`. */
const hdr = (at: number): Code => i32.load(i32.const(at));
/** i64 mask with bit c (an i32) set. */
const bit = (c: Code): Code => i64.shl(i64.const(1), i64.extend_u(c));
/** x & (x − 1): x without its lowest bit. */
const dropLow = (x: Code): Code => i64.and(x, i64.sub(x, i64.const(1)));
/** Lowest set bit index of a non-zero i64, as i32. */
const low = (x: Code): Code => i32.wrap(i64.ctz(x));
const inc = (f: Fn, name: string, by = 1): Code => f.set(name, i32.add(f.get(name), i32.const(by)));
const dec = (f: Fn, name: string): Code => f.set(name, i32.sub(f.get(name), i32.const(1)));

/** λ of a mask: eight byte-table lookups (masks.ts maskRate). */
function maskRate(mask: Code): Code {
  let sum: Code | undefined;
  for (let b = 0; b < 8; b++) {
    const byte = i32.wrap(i64.and(b === 0 ? mask : i64.shr_u(mask, i64.const(8 * b)), i64.const(255)));
    const term = ldf(A.bytes + 2048 * b, byte);
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
    count: 'i32', node: 'i32', mu: 'i32', masks: 'i32', s: 'i32', size: 'i32', c: 'i32', r: 'i32',
    A: 'i64', B: 'i64', N: 'i64', x: 'i64', cand: 'i64', all: 'i64',
  });
  const { get, set } = f;
  return f.define(
    set('count', hdr(A.count)),
    set('node', hdr(A.node)),
    set('mu', hdr(A.mu)),
    set('masks', hdr(A.tail)),
    set('all', i64.load(i32.const(A.all))),
    set('s', hdr(A.buildS)),
    set('size', hdr(A.buildSize)),
    block('exit',
      loop('sets',
        brIf('exit', i32.ge_s(get('s'), get('size'))),
        brIf('exit', i32.eqz(get('steps'))),
        set('A', i64.load(el8(get('masks'), get('s')))),
        // B = classes blocked by A, N = N(A)
        set('B', i64.const(0)),
        set('N', i64.const(0)),
        set('x', get('A')),
        block('done',
          loop('members',
            brIf('done', i64.eqz(get('x'))),
            set('c', low(get('x'))),
            set('B', i64.or(get('B'), ld64(A.con, get('c')))),
            set('N', i64.or(get('N'), ld64(A.nb, get('c')))),
            set('x', dropLow(get('x'))),
            br('members'),
          ),
        ),
        // candidates: addable and below min(A) (every class for ∅)
        set('cand', i64.and(
          i64.and(get('all'), i64.xor(get('B'), i64.const(-1))),
          i64.sub(i64.and(get('A'), i64.sub(i64.const(0), get('A'))), i64.const(1)),
        )),
        set('r', i32.add(get('node'), i32.mul(get('s'), i32.const(12)))),
        i32.store(get('r'), get('size')),
        i32.store(get('r'), i32.wrap(get('cand')), 4),
        i32.store(get('r'), i32.wrap(i64.shr_u(get('cand'), i64.const(32))), 8),
        set('x', get('cand')),
        block('done',
          loop('children',
            brIf('done', i64.eqz(get('x'))),
            when(i32.ge_s(get('size'), get('count')), [ret(i32.const(-1))]),
            set('c', low(get('x'))),
            i64.store(el8(get('masks'), get('size')), i64.or(get('A'), bit(get('c')))),
            f64.store(el8(get('mu'), get('size')), maskRate(i64.or(get('N'), ld64(A.nb, get('c'))))),
            inc(f, 'size'),
            set('x', dropLow(get('x'))),
            br('children'),
          ),
        ),
        inc(f, 's'),
        dec(f, 'steps'),
        br('sets'),
      ),
    ),
    i32.store(i32.const(A.buildS), get('s')),
    i32.store(i32.const(A.buildSize), get('size')),
    ret(i32.ne(get('s'), get('size'))),
  );
}

/** Locals shared by the two walks. */
const WALK_LOCALS = {
  node: 'i32', mu: 'i32', psi: 'i32', d: 'i32', e: 'i32', c: 'i32', p: 'i32', s: 'i32', j: 'i32', k: 'i32', q: 'i32', tr: 'i32',
  t: 'i64', below: 'i64',
} as const;

function loadWalk(f: Fn): Code[] {
  const { set } = f;
  return [set('node', hdr(A.node)), set('mu', hdr(A.mu)), set('psi', hdr(A.psi)), set('d', hdr(A.depth))];
}

/**
 * One step of a depth-first walk in the lowest-child order, inside block 'exit' / loop 'walk': stop
 * at the end of the walk or of the step budget, climb when depth d has no child left, otherwise
 * take the lowest child c left at d (dropped from todo), with below = the bits under c and p the
 * set at depth d.
 */
function lowestChild(f: Fn): Code[] {
  const { get, set } = f;
  return [
    brIf('exit', i32.lt_s(get('d'), i32.const(0))),
    brIf('exit', i32.eqz(get('steps'))),
    set('t', ld64(A.todo, get('d'))),
    when(i64.eqz(get('t')), [dec(f, 'd'), br('walk')]),
    set('c', low(get('t'))),
    st64(A.todo, get('d'), dropLow(get('t'))),
    set('below', i64.sub(bit(get('c')), i64.const(1))),
    set('p', ld32(A.idx, get('d'))),
  ];
}

/** child(s, c) of trie.ts with below = the bits under c: first[s] + popcount(cand(s) & below). */
function child(f: Fn, s: Code): Code {
  const { get, set } = f;
  return [
    set('tr', i32.add(get('node'), i32.mul(s, i32.const(12)))),
    i32.add(i32.load(get('tr')), i32.wrap(i64.popcnt(i64.and(i64.load(get('tr'), 4), get('below'))))),
  ];
}

/**
 * The step down from A_d to A_d ∪ {c} shared by both walks (c, below = bits under c, p = idx[d]
 * set): s = child(p, c); the indices of (A_d ∖ x) ∪ {c} for every member x; r(A_d ∪ c); its
 * children to visit.
 */
function stepDown(f: Fn): Code[] {
  const { get, set } = f;
  return [
    set('e', i32.add(get('d'), i32.const(1))),
    set('s', child(f, get('p'))),
    st32(A.idx, get('e'), get('s')),
    st32(A.elem, get('e'), get('c')),
    set('j', i32.const(0)),
    block('done',
      loop('members',
        brIf('done', i32.ge_s(get('j'), get('d'))),
        i32.store(remAt(get('e'), get('j')), child(f, i32.load(remAt(get('d'), get('j')), A.rem)), A.rem),
        inc(f, 'j'),
        br('members'),
      ),
    ),
    i32.store(remAt(get('e'), get('d')), get('p'), A.rem),
    stf(A.r, get('e'), f64.add(ldf(A.r, get('d')), ldf(A.rnl, get('c')))),
    st64(A.todo, get('e'), i64.load(i32.add(get('node'), i32.mul(get('s'), i32.const(12))), 4)),
  ];
}

/**
 * prefix(steps): Ψ in increasing mask order (component.ts prefixSums), and Ψ1 in the tail slot when
 * the header's moment is 1. Returns -1 when some set has μ(A) − r(A) <= tol (its mask in sat).
 */
function prefixKernel(): Fn {
  const f = new Fn('prefix', { steps: 'i32' }, 'i32').locals({
    ...WALK_LOCALS,
    psi1: 'i32', moment: 'i32',
    sum: 'f64', den: 'f64', ps: 'f64', m1: 'f64', re: 'f64', tol: 'f64', w: 'f64',
  });
  const { get, set } = f;
  const psiAt = (s: Code): Code => f64.load(el8(get('psi'), s));
  const psi1At = (s: Code): Code => f64.load(el8(get('psi1'), s));
  /** λ of the member removed in rem entry j, i.e. of elem[j+1] */
  const memberRate = (j: Code): Code => ldf(A.rate, i32.load(shl(j, 2), A.elem + 4));
  return f.define(
    ...loadWalk(f),
    set('psi1', hdr(A.tail)),
    set('moment', hdr(A.moment)),
    set('tol', f64.load(i32.const(A.tol))),
    block('exit',
      loop('walk',
        ...lowestChild(f),
        ...stepDown(f),
        st64(A.smask, get('e'), i64.or(ld64(A.smask, get('d')), bit(get('c')))),
        // Ψ(A) = Σ_{i∈A} λ_i Ψ(A∖i) / (μ(A) − r(A))
        set('sum', f64.mul(ldf(A.rate, get('c')), psiAt(get('p')))),
        set('j', i32.const(0)),
        block('done',
          loop('members',
            brIf('done', i32.ge_s(get('j'), get('d'))),
            set('sum', f64.add(get('sum'), f64.mul(memberRate(get('j')), psiAt(i32.load(remAt(get('e'), get('j')), A.rem))))),
            inc(f, 'j'),
            br('members'),
          ),
        ),
        set('re', ldf(A.r, get('e'))),
        set('den', f64.sub(f64.load(el8(get('mu'), get('s'))), get('re'))),
        when(i32.eqz(f64.gt(get('den'), get('tol'))), [
          i64.store(i32.const(A.sat), ld64(A.smask, get('e'))),
          ret(i32.const(-1)),
        ]),
        set('ps', f64.div(get('sum'), get('den'))),
        f64.store(el8(get('psi'), get('s')), get('ps')),
        when(get('moment'), [
          // Ψ1(A) = [Σ_{i∈A} λ_i (Ψ1(A∖i) + Ψ(A∖i)) + r(A) Ψ(A)] / (μ(A) − r(A))
          set('m1', f64.mul(ldf(A.rate, get('c')), f64.add(psi1At(get('p')), psiAt(get('p'))))),
          set('j', i32.const(0)),
          block('done',
            loop('members',
              brIf('done', i32.ge_s(get('j'), get('d'))),
              set('q', i32.load(remAt(get('e'), get('j')), A.rem)),
              set('w', memberRate(get('j'))),
              set('m1', f64.add(get('m1'), f64.mul(get('w'), f64.add(psi1At(get('q')), psiAt(get('q')))))),
              inc(f, 'j'),
              br('members'),
            ),
          ),
          f64.store(el8(get('psi1'), get('s')), f64.div(f64.add(get('m1'), f64.mul(get('re'), get('ps'))), get('den'))),
        ]),
        set('d', get('e')),
        dec(f, 'steps'),
        br('walk'),
      ),
    ),
    i32.store(i32.const(A.depth), get('d')),
    ret(i32.ge_s(get('d'), i32.const(0))),
  );
}

/**
 * over(steps): the prefix walk with the first moment (prefix with moment 1) of a design whose
 * independent sets are a part of the trie's: the trie was built for a base graph whose edges the
 * design all has (shared-trie.ts), and the per-class arrays (nb, con, rnl) are the design's. A set
 * of the trie is the design's when none of its members conflict in the design, and then so are all
 * its subsets; so the walk takes, below each set A, only the children c with c ∉ B(A) = ∪_{a∈A}
 * con(a) (kept per depth in omask) and never enters the rest. μ(A) = λ(N(A)) is the design's, from
 * N(A) carried per depth in nmask (the same mask, so the same sum, as the trie build's). Every other
 * step, and the order of the sets, is prefix's on the design's own trie; the indices of A ∖ x, Ψ and
 * Ψ1 share one loop over the members (each sum takes its terms in prefix's order). Each set reached
 * gets its μ in the μ slot (for a tail walk after it) and its bit in the bitmap at the header's
 * `bitmap` (bit 0, ∅, set by the caller), and is counted in `visits`. Returns -1 as prefix does.
 */
function overKernel(): Fn {
  const f = new Fn('over', { steps: 'i32' }, 'i32').locals({
    ...WALK_LOCALS,
    psi1: 'i32', visits: 'i32', at: 'i32', bitmap: 'i32',
    sum: 'f64', den: 'f64', ps: 'f64', m1: 'f64', re: 'f64', tol: 'f64', w: 'f64', x: 'f64', mus: 'f64',
    nm: 'i64', bm: 'i64',
  });
  const { get, set } = f;
  const psiAt = (s: Code): Code => f64.load(el8(get('psi'), s));
  const psi1At = (s: Code): Code => f64.load(el8(get('psi1'), s));
  return f.define(
    ...loadWalk(f),
    set('psi1', hdr(A.tail)),
    set('visits', hdr(A.visits)),
    set('bitmap', hdr(A.bitmap)),
    set('tol', f64.load(i32.const(A.tol))),
    block('exit',
      loop('walk',
        ...lowestChild(f),
        set('e', i32.add(get('d'), i32.const(1))),
        set('s', child(f, get('p'))),
        st32(A.idx, get('e'), get('s')),
        st32(A.elem, get('e'), get('c')),
        set('w', ldf(A.rate, get('c'))),
        stf(A.erate, get('e'), get('w')),
        // Ψ(A) = Σ_{i∈A} λ_i Ψ(A∖i) / (μ(A) − r(A)), Ψ1(A) = [Σ_{i∈A} λ_i (Ψ1(A∖i) + Ψ(A∖i)) + r(A) Ψ(A)] / (μ(A) − r(A));
        // the term of c first, then the members in stack order (prefix's order)
        set('x', psiAt(get('p'))),
        set('sum', f64.mul(get('w'), get('x'))),
        set('m1', f64.mul(get('w'), f64.add(psi1At(get('p')), get('x')))),
        set('j', i32.const(0)),
        block('done',
          loop('members',
            brIf('done', i32.ge_s(get('j'), get('d'))),
            // (A_d ∖ elem[j+1]) ∪ {c}
            set('q', child(f, i32.load(remAt(get('d'), get('j')), A.rem))),
            i32.store(remAt(get('e'), get('j')), get('q'), A.rem),
            set('w', f64.load(shl(get('j'), 3), A.erate + 8)),
            set('x', psiAt(get('q'))),
            set('sum', f64.add(get('sum'), f64.mul(get('w'), get('x')))),
            set('m1', f64.add(get('m1'), f64.mul(get('w'), f64.add(psi1At(get('q')), get('x'))))),
            inc(f, 'j'),
            br('members'),
          ),
        ),
        i32.store(remAt(get('e'), get('d')), get('p'), A.rem),
        set('re', f64.add(ldf(A.r, get('d')), ldf(A.rnl, get('c')))),
        stf(A.r, get('e'), get('re')),
        st64(A.smask, get('e'), i64.or(ld64(A.smask, get('d')), bit(get('c')))),
        // the design's conflicts and neighbours of A ∪ c; its children: the trie's not in conflict
        set('bm', i64.or(ld64(A.omask, get('d')), ld64(A.con, get('c')))),
        st64(A.omask, get('e'), get('bm')),
        st64(A.todo, get('e'), i64.and(i64.load(i32.add(get('node'), i32.mul(get('s'), i32.const(12))), 4), i64.xor(get('bm'), i64.const(-1)))),
        set('nm', i64.or(ld64(A.nmask, get('d')), ld64(A.nb, get('c')))),
        st64(A.nmask, get('e'), get('nm')),
        set('mus', maskRate(get('nm'))),
        f64.store(el8(get('mu'), get('s')), get('mus')),
        set('den', f64.sub(get('mus'), get('re'))),
        when(i32.eqz(f64.gt(get('den'), get('tol'))), [
          i64.store(i32.const(A.sat), ld64(A.smask, get('e'))),
          i32.store(i32.const(A.visits), get('visits')),
          ret(i32.const(-1)),
        ]),
        set('ps', f64.div(get('sum'), get('den'))),
        f64.store(el8(get('psi'), get('s')), get('ps')),
        f64.store(el8(get('psi1'), get('s')), f64.div(f64.add(get('m1'), f64.mul(get('re'), get('ps'))), get('den'))),
        // bit s of the bitmap
        set('at', i32.add(get('bitmap'), shl(i32.shr_u(get('s'), i32.const(5)), 2))),
        i32.store(get('at'), i32.or(i32.load(get('at')), i32.shl(i32.const(1), get('s')))),
        inc(f, 'visits'),
        set('d', get('e')),
        dec(f, 'steps'),
        br('walk'),
      ),
    ),
    i32.store(i32.const(A.depth), get('d')),
    i32.store(i32.const(A.visits), get('visits')),
    ret(i32.ge_s(get('d'), i32.const(0))),
  );
}

/**
 * overSums(words): Σ Ψ and Σ Ψ1 over the sets whose bit is set in the first `words` 32-bit words
 * of the bitmap (over), in increasing index, i.e. in the order of the design's own trie (see
 * shared-trie.ts); clears the bitmap on the way. The sums go to the header's `sums`.
 */
function overSumsKernel(): Fn {
  const f = new Fn('overSums', { words: 'i32' }, 'i32').locals({
    mu: 'i32', psi: 'i32', psi1: 'i32', i: 'i32', b: 'i32', s: 'i32', z: 'f64', m1: 'f64',
  });
  const { get, set } = f;
  return f.define(
    set('mu', hdr(A.bitmap)),
    set('psi', hdr(A.psi)),
    set('psi1', hdr(A.tail)),
    set('z', f64.const(0)),
    set('m1', f64.const(0)),
    set('i', i32.const(0)),
    block('exit',
      loop('words',
        brIf('exit', i32.ge_s(get('i'), get('words'))),
        set('b', i32.load(i32.add(get('mu'), shl(get('i'), 2)))),
        i32.store(i32.add(get('mu'), shl(get('i'), 2)), i32.const(0)),
        block('done',
          loop('bits',
            brIf('done', i32.eqz(get('b'))),
            set('s', i32.add(shl(get('i'), 5), i32.ctz(get('b')))),
            set('z', f64.add(get('z'), f64.load(el8(get('psi'), get('s'))))),
            set('m1', f64.add(get('m1'), f64.load(el8(get('psi1'), get('s'))))),
            set('b', i32.and(get('b'), i32.sub(get('b'), i32.const(1)))),
            br('bits'),
          ),
        ),
        inc(f, 'i'),
        br('words'),
      ),
    ),
    f64.store(i32.const(A.sums), get('z')),
    f64.store(i32.const(A.sums + 8), get('m1')),
    ret(i32.const(0)),
  );
}

/**
 * tail(steps): T and the per-class sums in decreasing mask order (component.ts tailPass): a
 * post-order walk with children in descending c; each finished set B pushes λ_k T(B)/μ(B) to the
 * pending sum of B ∖ {k} (kept in tail[]), adds Ψ(B∖k)·f and Ψ(B)·f (k ∉ S) to L_k, and Ψ(B∖k)·f
 * to the (unscaled) flow into k from every partner of k that only k covers (bit of N1(B), so no
 * branch per partner). Ends with T(∅) = 1 + Σ. As `overTail`, the same walk over a shared trie after
 * `over` (its μ in the μ slot): the children of each set are the trie's not in conflict with it in
 * the design (kept per depth in bmask), as in over, so it visits the design's sets in the order of
 * tail on the design's own trie.
 */
function tailKernel(name = 'tail', shared = false): Fn {
  const f = new Fn(name, { steps: 'i32' }, 'i32').locals({
    ...WALK_LOCALS,
    tail: 'i32', a: 'i32', pt: 'i32', pe: 'i32',
    nbc: 'i64', nd: 'i64', o: 'i64', bm: 'i64',
    T: 'f64', m: 'f64', gs: 'f64', psg: 'f64', fk: 'f64', v: 'f64',
  });
  const { get, set } = f;
  return f.define(
    ...loadWalk(f),
    set('tail', hdr(A.tail)),
    block('exit',
      loop('walk',
        brIf('exit', i32.lt_s(get('d'), i32.const(0))),
        brIf('exit', i32.eqz(get('steps'))),
        set('t', ld64(A.todo, get('d'))),
        when(i64.ne(get('t'), i64.const(0)), [
          // go down to A_d ∪ {c}, c the highest child left
          set('c', i32.sub(i32.const(63), i32.wrap(i64.clz(get('t'))))),
          st64(A.todo, get('d'), i64.xor(get('t'), bit(get('c')))),
          set('below', i64.sub(bit(get('c')), i64.const(1))),
          set('p', ld32(A.idx, get('d'))),
          ...stepDown(f),
          ...(shared
            ? [
                // over a shared trie: the children of A ∪ c not in conflict in the design (see over)
                set('bm', i64.or(ld64(A.bmask, get('d')), ld64(A.con, get('c')))),
                st64(A.bmask, get('e'), get('bm')),
                st64(A.todo, get('e'), i64.and(ld64(A.todo, get('e')), i64.xor(get('bm'), i64.const(-1)))),
              ]
            : []),
          set('nbc', ld64(A.nb, get('c'))),
          set('nd', ld64(A.nmask, get('d'))),
          st64(A.nmask, get('e'), i64.or(get('nd'), get('nbc'))),
          // N1(A ∪ c) = (N1(A) ∖ N(c)) ∪ (N(c) ∖ N(A))
          st64(A.omask, get('e'), i64.or(
            i64.and(ld64(A.omask, get('d')), i64.xor(get('nbc'), i64.const(-1))),
            i64.and(get('nbc'), i64.xor(get('nd'), i64.const(-1))),
          )),
          set('d', get('e')),
          br('walk'),
        ]),
        // all supersets done: finish A_d
        set('s', ld32(A.idx, get('d'))),
        when(i32.eqz(get('d')), [
          f64.store(el8(get('tail'), get('s')), f64.add(f64.const(1), f64.load(el8(get('tail'), get('s'))))),
          set('d', i32.const(-1)),
          br('exit'),
        ]),
        set('m', f64.load(el8(get('mu'), get('s')))),
        set('T', f64.div(
          f64.add(f64.const(1), f64.load(el8(get('tail'), get('s')))),
          f64.sub(f64.const(1), f64.div(ldf(A.r, get('d')), get('m'))),
        )),
        set('gs', f64.div(get('T'), get('m'))),
        // stored right away so that the division is not scheduled into the loop below
        f64.store(el8(get('tail'), get('s')), get('T')),
        stf(A.r, get('d'), get('gs')), // r(A_d) is not needed any more
        set('psg', f64.mul(f64.load(el8(get('psi'), get('s'))), get('gs'))),
        set('o', ld64(A.omask, get('d'))),
        set('j', i32.const(0)),
        block('done',
          loop('members',
            brIf('done', i32.ge_s(get('j'), get('d'))),
            set('k', i32.load(shl(get('j'), 2), A.elem + 4)),
            set('q', i32.load(remAt(get('d'), get('j')), A.rem)),
            set('fk', f64.mul(ldf(A.rate, get('k')), get('gs'))),
            set('a', el8(get('tail'), get('q'))),
            f64.store(get('a'), f64.add(f64.load(get('a')), get('fk'))),
            set('v', f64.mul(f64.load(el8(get('psi'), get('q'))), get('fk'))),
            stf(A.backlog, get('k'), f64.add(ldf(A.backlog, get('k')), f64.add(get('v'), f64.mul(get('psg'), ldf(A.rnl, get('k')))))),
            // each partner i of k receives v when only k covers it
            set('pt', ld32(A.pstart, get('k'))),
            set('pe', i32.load(shl(get('k'), 2), A.pstart + 4)),
            block('none',
              loop('partners',
                brIf('none', i32.ge_s(get('pt'), get('pe'))),
                stf(A.pflow, get('pt'), f64.add(ldf(A.pflow, get('pt')), f64.mul(get('v'), f64.convert_i32_u(
                  i32.wrap(i64.and(i64.shr_u(get('o'), i64.extend_u(ld32(A.pclass, get('pt')))), i64.const(1))),
                )))),
                inc(f, 'pt'),
                br('partners'),
              ),
            ),
            inc(f, 'j'),
            br('members'),
          ),
        ),
        dec(f, 'd'),
        dec(f, 'steps'),
        br('walk'),
      ),
    ),
    i32.store(i32.const(A.depth), get('d')),
    ret(i32.ge_s(get('d'), i32.const(0))),
  );
}

let compiled: WebAssembly.Module | undefined;

/** The kernels' module, assembled and compiled once per process. */
export function kernelModule(): WebAssembly.Module {
  compiled ??= new WebAssembly.Module(module([buildKernel(), prefixKernel(), tailKernel(), overKernel(), overSumsKernel(), tailKernel('overTail', true)]));
  return compiled;
}

export interface Kernels {
  build(steps: number): number;
  prefix(steps: number): number;
  tail(steps: number): number;
  over(steps: number): number;
  overSums(words: number): number;
  overTail(steps: number): number;
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
