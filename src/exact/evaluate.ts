import type { CompiledModel } from '../model/compile.js';
import { prepareComponents } from './prepare.js';
import { certificateOfSet } from './saturated.js';
import type { ExactResult } from './result.js';
import { buildTrie } from './trie.js';
import { prefixSums, SaturatedSet, tailPass } from './component.js';
import { positiveClasses, SATURATION, saturationError, scaledModel, withoutZeroRates } from './scaled.js';

export interface ExactOptions {
  /** Refuse (TooLargeError) when the independent sets of all components add up to more. */
  readonly maxSets?: number;
  /** Time unit used in the messages of errors. */
  readonly timeUnit?: string;
  /**
   * Refusals for size end with the advice to estimate by simulation (default true; false where a
   * simulation is what runs, as beside `simulate`'s estimates: exact/column.ts).
   */
  readonly adviseSimulation?: boolean;
}

/**
 * Default memory guard: about 40 bytes per independent set (trie node, μ, Ψ, T, and the masks
 * while the trie is built), so 25 million sets stay near 1 GiB.
 */
export const DEFAULT_MAX_SETS = 25_000_000;

/**
 * Exact stationary metrics of a design under FCFM, from the product form by recursion over
 * independent sets: O(n·|I|) time and O(|I|) memory per connected component (components are
 * independent subsystems and are evaluated one by one).
 *
 * Scale-free: rates are divided by a power of two near their mean first, so rates times any
 * factor give the same backlogs, probabilities and shares, waits divided and match rates times the
 * factor. A class of rate 0 has backlog, wait, immediate-match share and match rates 0 (no item of
 * it ever arrives); the others are those of the design without it.
 *
 * Throws UnstableDesignError (with a certificate found by the recursion itself) when some
 * independent set A has λ(N(A)) <= λ(A ∖ S) (decided exactly from the rates as decimals),
 * PrecisionError when the design is stable but within about 1e-14 of the boundary, and
 * TooLargeError when the count exceeds maxSets or a component has more than 64 classes.
 */
export function evaluateExact(model: CompiledModel, options: ExactOptions = {}): ExactResult {
  const positive = positiveClasses(model);
  if (positive) {
    const z = withoutZeroRates(model, positive);
    const r = evaluateExact(z.sub, options);
    const backlog = z.perClass(r.backlog);
    return { ...r, backlog, wait: z.perClass(r.wait), immediateMatch: z.perClass(r.immediateMatch), matchRates: z.perEdge(r.matchRates) };
  }
  const { working, scale } = scaledModel(model);
  const r = evaluateScaled(working, model, options);
  const wait = new Float64Array(model.n);
  for (let i = 0; i < model.n; i++) wait[i] = r.backlog[i]! / model.rates[i]!;
  return { ...r, wait, matchRates: r.matchRates.map((x) => x * scale) };
}

function evaluateScaled(model: CompiledModel, original: CompiledModel, options: ExactOptions): Omit<ExactResult, 'wait'> {
  const maxSets = options.maxSets ?? DEFAULT_MAX_SETS;
  const { parts, total } = prepareComponents(model, maxSets, undefined, options.adviseSimulation);

  const n = model.n;
  const backlog = new Float64Array(n);
  const immediateMatch = new Float64Array(n);
  const matchRates = new Float64Array(model.m);
  let empty = 1;
  const tol = SATURATION * model.totalRate;
  for (const { members, sub, edgeMap, g, count } of parts) {
    const table = buildTrie(g, count);
    const psi = new Float64Array(count);
    try {
      prefixSums(g, table, psi, tol);
    } catch (e) {
      if (e instanceof SaturatedSet) throw saturationError(original, members, e, certificateOfSet, options.timeUnit);
      throw e;
    }
    const tail = new Float64Array(count);
    const cm = tailPass(g, table, psi, tail);
    empty /= cm.z;
    const k = members.length;
    for (let i = 0; i < k; i++) {
      backlog[members[i]!] = cm.backlog[i]!;
      immediateMatch[members[i]!] = cm.immediateMatch[i]!;
    }
    for (let e = 0; e < sub.m; e++) {
      const a = sub.edgeA[e]!;
      const b = sub.edgeB[e]!;
      matchRates[edgeMap[e]!] = a === b ? cm.flow[a * k + a]! : cm.flow[a * k + b]! + cm.flow[b * k + a]!;
    }
  }
  let backlogTotal = 0;
  for (let i = 0; i < n; i++) backlogTotal += backlog[i]!;
  return { independentSets: total, emptyProbability: empty, backlogTotal, backlog, immediateMatch, matchRates };
}

/** Total backlog only (no per-class figures): one forward pass, about a third of evaluateExact. */
export interface BacklogOnly {
  readonly independentSets: number;
  readonly backlogTotal: number;
  readonly emptyProbability: number;
}

/**
 * Mean total backlog and P(empty) of a design under FCFM, from the prefix sums Ψ and their first
 * moment Ψ1 alone (see prefixSums). Same scaling, zero rates and errors as evaluateExact.
 */
export function evaluateBacklog(model: CompiledModel, options: ExactOptions = {}): BacklogOnly {
  const positive = positiveClasses(model);
  if (positive) return evaluateBacklog(withoutZeroRates(model, positive).sub, options);
  const original = model;
  model = scaledModel(model).working;
  const maxSets = options.maxSets ?? DEFAULT_MAX_SETS;
  const { parts, total } = prepareComponents(model, maxSets, undefined, options.adviseSimulation);
  let backlog = 0;
  let empty = 1;
  const tol = SATURATION * model.totalRate;
  for (const { members, g, count } of parts) {
    const trie = buildTrie(g, count);
    const psi = new Float64Array(count);
    const psi1 = new Float64Array(count);
    try {
      prefixSums(g, trie, psi, tol, psi1);
    } catch (e) {
      if (e instanceof SaturatedSet) throw saturationError(original, members, e, certificateOfSet, options.timeUnit);
      throw e;
    }
    let z = 0;
    let m1 = 0;
    for (let s = 0; s < count; s++) {
      z += psi[s]!;
      m1 += psi1[s]!;
    }
    backlog += m1 / z;
    empty /= z;
  }
  return { independentSets: total, backlogTotal: backlog, emptyProbability: empty };
}
