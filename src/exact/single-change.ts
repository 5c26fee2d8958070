import { TooLargeError, type InstabilityCertificate } from '../errors.js';
import { compileGraph, edgePairs, findEdge, type CompiledModel } from '../model/compile.js';
import { subModel } from '../model/components.js';
import { prepareComponents, tooManySets } from './prepare.js';
import { SaturatedSet } from './component.js';
import { countIndependentSets } from './count.js';
import { forwardSums, type ForwardSums } from './forward.js';
import { maskGraph, MAX_COMPONENT_CLASSES, type MaskGraph } from './masks.js';
import { certificateOfSet, maskMembers } from './saturated.js';
import { setIndex, type SetIndex } from './set-index.js';
import { buildTrie } from './trie.js';
import { VariantScratch } from './touched-record.js';
import { variantSums } from './variant.js';
import { positiveClasses, SATURATION, saturationError, scaledModel } from './scaled.js';

/**
 * Default memory guard of the single-change evaluator. It keeps, for every independent set, the packed
 * trie (16 bytes), Ψ and the per-member values Ψ_k of the base (8 + 8·|A|), the changed values and
 * their adjoints (32), and a record of the touched sets (up to about 40 + 24·|A|): roughly
 * 150–300 bytes per set, hence a lower default than evaluateExact's.
 */
export const DEFAULT_CHANGE_MAX_SETS = 4_000_000;

/** Exact figures of a design obtained from the base by one change. */
export interface ChangeResult {
  readonly stable: boolean;
  /** Mean total backlog (Infinity when unstable). */
  readonly backlogTotal: number;
  /** Mean backlog per class (Infinity for every class when unstable). */
  readonly backlog: Float64Array;
  /** Mean wait per class (Little's law), Infinity when unstable. */
  readonly wait: Float64Array;
  /** P(no item waits); 0 when unstable. */
  readonly emptyProbability: number;
  /** When unstable: the certificate read from the saturated set the recursion met. */
  readonly certificate?: InstabilityCertificate;
  /**
   * 'incremental': only the sets holding an endpoint were recomputed; 'fresh': the changed component
   * was rebuilt (an added compatibility joining two components); 'base': the unchanged design.
   */
  readonly method: 'base' | 'incremental' | 'fresh';
  /** Independent sets whose values were (re)computed. */
  readonly computedSets: number;
}

export interface SingleChangeEvaluator {
  readonly model: CompiledModel;
  /** Independent sets of the base design (all components). */
  readonly independentSets: number;
  /** The base design itself (per-class figures from the same forward recursion). */
  readonly base: ChangeResult;
  /** The design with {a, b} added when absent, removed when present (a = b: a self-loop). */
  toggle(a: number, b: number): ChangeResult;
}

export interface SingleChangeOptions {
  /** Refuse (TooLargeError) above this many independent sets; default DEFAULT_CHANGE_MAX_SETS. */
  readonly maxSets?: number;
  /** For error messages. */
  readonly timeUnit?: string;
}

const GUARD = 'the memory guard of single-change evaluation, about 200 bytes per set';

interface Part {
  readonly members: Int32Array;
  readonly sub: CompiledModel;
  readonly g: MaskGraph;
  readonly index: SetIndex;
  readonly sums: ForwardSums;
  readonly scratch: VariantScratch;
}

/**
 * Prepares the base design once (per component: the trie of independent sets and every forward value),
 * then evaluates single changes exactly, recomputing only what they touch (src/exact/variant.ts).
 * Throws UnstableDesignError when the base is unstable and TooLargeError beyond the memory guard.
 * Rates are divided by a power of two near their mean (scaled.ts) and waits and certificates
 * brought back, so the figures depend on the ratios of the rates only. Every rate must be positive.
 */
export function singleChangeEvaluator(model: CompiledModel, options: SingleChangeOptions = {}): SingleChangeEvaluator {
  if (positiveClasses(model)) throw new RangeError('single-change evaluation needs every rate > 0 (take classes of rate 0 out first)');
  const { working, scale } = scaledModel(model);
  const inner = scaledEvaluator(working, model, options);
  if (scale === 1) return inner;
  const back = (r: ChangeResult): ChangeResult => ({
    ...r,
    wait: r.wait.map((w) => w / scale),
    ...(r.certificate ? { certificate: { ...r.certificate, demand: r.certificate.demand * scale, capacity: r.certificate.capacity * scale } } : {}),
  });
  return { model, independentSets: inner.independentSets, base: back(inner.base), toggle: (a, b) => back(inner.toggle(a, b)) };
}

function scaledEvaluator(model: CompiledModel, original: CompiledModel, options: SingleChangeOptions): SingleChangeEvaluator {
  const maxSets = options.maxSets ?? DEFAULT_CHANGE_MAX_SETS;
  const tol = SATURATION * model.totalRate;
  const parts: Part[] = [];
  const { parts: prepared, total, of: compOf } = prepareComponents(model, maxSets, GUARD);
  for (const { members, sub, g, count } of prepared) {
    const index = setIndex(buildTrie(g, count));
    if (!index) throw tooManySets(total, maxSets, GUARD);
    let sums: ForwardSums;
    try {
      sums = forwardSums(g, index, tol);
    } catch (e) {
      if (e instanceof SaturatedSet) throw saturationError(original, members, e, certificateOfSet, options.timeUnit);
      throw e;
    }
    parts.push({ members, sub, g, index, sums, scratch: new VariantScratch() });
  }

  const n = model.n;
  const baseBacklog = new Float64Array(n);
  let baseEmpty = 1;
  for (const p of parts) {
    for (let q = 0; q < p.members.length; q++) baseBacklog[p.members[q]!] = p.sums.classSums[q]! / p.sums.z;
    baseEmpty /= p.sums.z;
  }
  const base = result(model, baseBacklog, baseEmpty, 'base', total);

  const toggle = (a: number, b: number): ChangeResult => {
    const lo = Math.min(a, b);
    const hi = Math.max(a, b);
    if (!(lo >= 0 && hi < n)) throw new RangeError(`class index out of range: ${a}, ${b}`);
    const present = findEdge(model, lo, hi) >= 0;
    const ca = compOf[lo]!;
    const cb = compOf[hi]!;
    if (ca === cb) {
      const p = parts[ca]!;
      const li = localIndex(p.members, lo);
      const lj = localIndex(p.members, hi);
      const out = variantSums(p.g, p.index, p.sums, { i: li, j: lj, add: !present }, tol, p.scratch);
      if (!out.stable) return unstable(model, p.members, out.lo, out.hi, lo, hi, present, 'incremental');
      const backlog = Float64Array.from(baseBacklog);
      for (let q = 0; q < p.members.length; q++) backlog[p.members[q]!] = out.classSums[q]! / out.z;
      return result(model, backlog, (baseEmpty * p.sums.z) / out.z, 'incremental', out.touched);
    }
    // an added compatibility joins two components: evaluate the joined one afresh
    const pa = parts[ca]!;
    const pb = parts[cb]!;
    const members = Int32Array.from([...pa.members, ...pb.members]).sort();
    if (members.length > MAX_COMPONENT_CLASSES) {
      throw new TooLargeError(`joining ${model.ids[lo]} and ${model.ids[hi]} makes a connected group of ${members.length} classes (exact evaluation handles at most ${MAX_COMPONENT_CLASSES})`, Infinity, maxSets);
    }
    const changed = compileGraph(model.ids, model.rates, [...edgePairs(model), [lo, hi]]);
    const { sub } = subModel(changed, members);
    const g = maskGraph(sub);
    const count = countIndependentSets(g, maxSets);
    if (count > maxSets) throw tooManySets(count, maxSets, GUARD);
    const index = setIndex(buildTrie(g, count));
    if (!index) throw tooManySets(count, maxSets, GUARD);
    let sums: ForwardSums;
    try {
      sums = forwardSums(g, index, tol, false);
    } catch (e) {
      if (e instanceof SaturatedSet) return unstable(model, members, e.lo, e.hi, lo, hi, false, 'fresh');
      throw e;
    }
    const backlog = Float64Array.from(baseBacklog);
    for (let q = 0; q < members.length; q++) backlog[members[q]!] = sums.classSums[q]! / sums.z;
    return result(model, backlog, (baseEmpty * pa.sums.z * pb.sums.z) / sums.z, 'fresh', count);
  };

  return { model, independentSets: total, base, toggle };
}

function localIndex(members: Int32Array, k: number): number {
  let lo = 0;
  let hi = members.length - 1;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    const v = members[mid]!;
    if (v === k) return mid;
    if (v < k) lo = mid + 1;
    else hi = mid - 1;
  }
  throw new RangeError(`class ${k} is not in the component`);
}

function result(model: CompiledModel, backlog: Float64Array, empty: number, method: ChangeResult['method'], computedSets: number): ChangeResult {
  const wait = new Float64Array(model.n);
  let total = 0;
  for (let k = 0; k < model.n; k++) {
    total += backlog[k]!;
    wait[k] = backlog[k]! / model.rates[k]!;
  }
  return { stable: true, backlogTotal: total, backlog, wait, emptyProbability: empty, method, computedSets };
}

/** Result for an unstable change; the certificate is read in the changed design. */
function unstable(
  model: CompiledModel,
  members: Int32Array,
  mLo: number,
  mHi: number,
  a: number,
  b: number,
  present: boolean,
  method: ChangeResult['method'],
): ChangeResult {
  const pairs = edgePairs(model).filter(([x, y]) => !(present && x === a && y === b));
  if (!present) pairs.push([a, b]);
  const changed = compileGraph(model.ids, model.rates, pairs);
  const inf = new Float64Array(model.n).fill(Infinity);
  return {
    stable: false,
    backlogTotal: Infinity,
    backlog: inf,
    wait: Float64Array.from(inf),
    emptyProbability: 0,
    certificate: certificateOfSet(changed, maskMembers(members, mLo, mHi)),
    method,
    computedSets: 0,
  };
}
