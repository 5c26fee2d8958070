/**
 * One trie for many designs: the exact figures of any design that contains a base graph (the total
 * backlog alone, or everything evaluateExact gives), by walks over the base graph's trie, without
 * counting the design's independent sets or building its trie.
 *
 * Why it is the same evaluation. A design whose compatibilities include all of the base's (same
 * classes, same rates) has fewer independent sets: each of its sets is independent in the base, and
 * the family is closed under subsets. The base trie's children of a set A are A ∪ {c} for the classes
 * c below min(A) addable in the base; the design's are those of them with c not in conflict with A
 * in the design, so the design's trie is the base trie with whole subtrees cut off, and the walk of
 * the `over` kernel (kernel-code.ts) visits exactly the design's sets in the order of the prefix walk
 * on its own trie, computing μ, r, Ψ and Ψ1 by the same operations on the same numbers; `overTail`
 * likewise visits them in the order of the tail walk, so every push of T, backlog and flow happens
 * in the same order as on the design's own trie (indices differ, values do not). Breadth-first
 * order restricted to a subtree-closed part of a tree is that part's own breadth-first order (by
 * induction on the depth: a node's rank is its parent's, then its class), so Σ Ψ and Σ Ψ1 over the
 * base's indices, with 0 at the sets the walk did not reach (x + 0 = x), add the same terms in the same
 * order as evaluateBacklog does over the design's own trie: the figures are the same to the last bit,
 * and so are the set count and the refusals (the first saturated set in the same walk order).
 *
 * The memory guard cannot bind: the design has at most the base's count of sets, and a shared trie is
 * only made when that count is within the guard. Designs of several connected components are
 * evaluated component by component by evaluateBacklog (other sums); `backlogOverShared` leaves them
 * to it (undefined), as it does designs that do not contain the base.
 */
import type { CompiledModel } from '../model/compile.js';
import { scaledModel } from '../model/rate-scale.js';
import { SaturatedSet, tailPass } from './component.js';
import { countIndependentSets } from './count.js';
import { DEFAULT_MAX_SETS, type BacklogOnly, type ExactOptions } from './evaluate.js';
import type { ExactResult } from './result.js';
import { A, setMask64 } from './kernel-layout.js';
import { maskGraph, MAX_COMPONENT_CLASSES, type MaskGraph } from './masks.js';
import { certificateOfSet } from './saturated.js';
import { positiveClasses, SATURATION, saturationError } from './scaled.js';
import { buildTrie, KERNEL_CHUNK, type SetTrie } from './trie.js';

/** The trie of a base graph kept for the designs that contain it. */
export interface SharedTrie {
  readonly n: number;
  /** Independent sets of the base graph, ∅ included. */
  readonly count: number;
  /** The base's rates as given (a design must have the same). */
  readonly rates: Float64Array;
  /** N(k) ∪ {k} in the base, without self-loops (two words per class). */
  readonly conLo: Int32Array;
  readonly conHi: Int32Array;
  /** The base's mask graph on the scaled rates (its n and rates are the designs' too). */
  readonly g: MaskGraph;
  /** The power of two the rates were divided by (scaledModel). */
  readonly scale: number;
  readonly trie: SetTrie;
  /** The saturation threshold of the recursions (SATURATION times the scaled total rate). */
  readonly tol: number;
  readonly members: Int32Array;
}

/**
 * The shared trie of `base`, or undefined when it cannot serve: more than `maxSets` independent
 * sets (counted up to that limit only), more than 64 classes, or a class of rate 0.
 */
export function sharedTrie(base: CompiledModel, maxSets: number): SharedTrie | undefined {
  if (base.n > MAX_COMPONENT_CLASSES || base.n === 0 || positiveClasses(base)) return undefined;
  const { working, scale } = scaledModel(base);
  const g = maskGraph(working);
  const count = countIndependentSets(g, maxSets);
  if (count > maxSets) return undefined;
  // a memory of its own, with a bitmap of the sets (zero: the walks start with it clear)
  const trie = buildTrie(g, count, true);
  return {
    n: base.n,
    count,
    rates: Float64Array.from(base.rates),
    conLo: g.conLo,
    conHi: g.conHi,
    g,
    scale,
    trie,
    tol: SATURATION * working.totalRate,
    members: Int32Array.from({ length: base.n }, (_, k) => k),
  };
}

/**
 * Writes the design's per-class arrays (as maskGraph and kernelMemory make them: N(k), conflicts,
 * λ outside S, partners) into the shared trie's memory; false when the model is not one connected
 * component of the base's classes with the base's rates and every compatibility of the base, or when
 * the base has more sets than the guard of `options` (then nothing is written that matters).
 */
function prepareDesign(t: SharedTrie, model: CompiledModel, options: ExactOptions): boolean {
  const n = t.n;
  if (model.n !== n || t.count > (options.maxSets ?? DEFAULT_MAX_SETS)) return false;
  for (let k = 0; k < n; k++) if (model.rates[k] !== t.rates[k]) return false;
  if (!connected(model)) return false;
  const { i32, f64 } = t.trie.kernel.memory;
  let partners = 0;
  for (let k = 0; k < n; k++) {
    let lo = 0;
    let hi = 0;
    for (let p = model.adjStart[k]!; p < model.adjStart[k + 1]!; p++) {
      const j = model.adj[p]!;
      if (j < 32) lo |= 1 << j;
      else hi |= 1 << (j - 32);
    }
    const conLo = k < 32 ? lo | (1 << k) : lo;
    const conHi = k < 32 ? hi : hi | (1 << (k - 32));
    if ((t.conLo[k]! & ~conLo) !== 0 || (t.conHi[k]! & ~conHi) !== 0) return false;
    const loop = model.selfLoop[k]!;
    if (loop) {
      if (k < 32) lo |= 1 << k;
      else hi |= 1 << (k - 32);
    }
    i32[(A.nb >> 2) + 2 * k] = lo;
    i32[(A.nb >> 2) + 2 * k + 1] = hi;
    i32[(A.con >> 2) + 2 * k] = conLo;
    i32[(A.con >> 2) + 2 * k + 1] = conHi;
    f64[(A.rnl >> 3) + k] = loop ? 0 : f64[(A.rate >> 3) + k]!;
    i32[(A.pstart >> 2) + k] = partners;
    for (let i = 0; i < n; i++) if (i < 32 ? (lo >>> i) & 1 : (hi >>> (i - 32)) & 1) i32[(A.pclass >> 2) + partners++] = i;
  }
  i32[(A.pstart >> 2) + n] = partners;
  return true;
}

/**
 * The `over` walk of a prepared design: Ψ, Ψ1 and μ of its sets, Σ Ψ and Σ Ψ1 in the header's sums
 * (the bitmap cleared again), the set count; throws as evaluateBacklog does on a saturated set.
 */
function overWalk(t: SharedTrie, model: CompiledModel, options: ExactOptions): number {
  const m = t.trie.kernel.memory;
  const { i32, f64 } = m;
  const run = t.trie.kernel.run;
  // ∅ alone on the stack (as prefixSums starts), conflicts and neighbours of ∅ empty; its bit set
  i32[A.depth >> 2] = 0;
  i32[A.idx >> 2] = 0;
  i32[A.visits >> 2] = 0;
  f64[A.r >> 3] = 0;
  f64[A.tol >> 3] = t.tol;
  for (const at of [A.smask, A.nmask, A.omask]) setMask64(m, at, 0, 0);
  setMask64(m, A.todo, m.node[1]!, m.node[2]!);
  m.psi[0] = 1;
  m.tail[0] = 0;
  const bitmap = i32[A.bitmap >> 2]! >> 2;
  i32[bitmap] = i32[bitmap]! | 1;
  let status: number;
  while ((status = run.over(KERNEL_CHUNK)) === 1);
  // the sums also clear the bitmap for the next design (a refused one too)
  run.overSums((t.count + 31) >>> 5);
  if (status < 0) {
    const e = new SaturatedSet(i32[A.sat >> 2]! | 0, i32[(A.sat >> 2) + 1]! | 0);
    throw saturationError(model, t.members, e, certificateOfSet, options.timeUnit);
  }
  return i32[A.visits >> 2]! + 1;
}

/**
 * evaluateBacklog(model, options) through the shared trie (the same figures, count and errors; see
 * the file comment), or undefined when prepareDesign refuses the model.
 */
export function backlogOverShared(t: SharedTrie, model: CompiledModel, options: ExactOptions = {}): BacklogOnly | undefined {
  if (!prepareDesign(t, model, options)) return undefined;
  const count = overWalk(t, model, options);
  const f64 = t.trie.kernel.memory.f64;
  const z = f64[A.sums >> 3]!;
  const m1 = f64[(A.sums >> 3) + 1]!;
  return { independentSets: count, backlogTotal: m1 / z, emptyProbability: 1 / z };
}

/**
 * evaluateExact(model, options) through the shared trie: the `over` walk (Ψ and μ of the design's
 * sets), then the tail walk over the same trie (`overTail`, the children in conflict cut off as in
 * `over`): the same sets in the same orders as the prefix and tail walks on the design's own trie,
 * so the same figures to the last bit, count and refusals (see the file comment); undefined when
 * prepareDesign refuses the model. The figures are put together as evaluateExact does for a design
 * of one component.
 */
export function exactOverShared(t: SharedTrie, model: CompiledModel, options: ExactOptions = {}): ExactResult | undefined {
  if (!prepareDesign(t, model, options)) return undefined;
  const count = overWalk(t, model, options);
  const m = t.trie.kernel.memory;
  // Ψ in the memory's own array, T left there as well (the copies evaluateScaled makes are not needed)
  const cm = tailPass(t.g, t.trie, m.psi, m.tail, 'overTail');
  const n = t.n;
  const backlog = new Float64Array(n);
  const immediateMatch = new Float64Array(n);
  const matchRates = new Float64Array(model.m);
  for (let i = 0; i < n; i++) {
    backlog[i] = cm.backlog[i]!;
    immediateMatch[i] = cm.immediateMatch[i]!;
  }
  for (let e = 0; e < model.m; e++) {
    const a = model.edgeA[e]!;
    const b = model.edgeB[e]!;
    matchRates[e] = (a === b ? cm.flow[a * n + a]! : cm.flow[a * n + b]! + cm.flow[b * n + a]!) * t.scale;
  }
  let backlogTotal = 0;
  for (let i = 0; i < n; i++) backlogTotal += backlog[i]!;
  const wait = new Float64Array(n);
  for (let i = 0; i < n; i++) wait[i] = backlog[i]! / model.rates[i]!;
  return { independentSets: count, emptyProbability: 1 / cm.z, backlogTotal, backlog, wait, immediateMatch, matchRates };
}

/** True when the model's classes form one connected component (a depth-first walk; at most 64 classes). */
function connected(model: CompiledModel): boolean {
  const n = model.n;
  const stack = new Int32Array(n);
  const seen = new Uint8Array(n);
  let top = 0;
  let reached = 1;
  stack[top++] = 0;
  seen[0] = 1;
  while (top > 0) {
    const v = stack[--top]!;
    for (let p = model.adjStart[v]!; p < model.adjStart[v + 1]!; p++) {
      const w = model.adj[p]!;
      if (seen[w]) continue;
      seen[w] = 1;
      reached++;
      stack[top++] = w;
    }
  }
  return reached === n;
}
