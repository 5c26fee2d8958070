/**
 * The entry-point wrapping of the exact layer: rates divided by a power of two near their mean
 * (model/rate-scale.ts) so that any finite positive rates give the same figures, classes of rate 0
 * taken out (no item of theirs ever arrives, so the others behave as without them), and the
 * saturation test of the recursions told apart from rounding by the exact slack of the set.
 */
import { PrecisionError, UnstableDesignError } from '../errors.js';
import type { CompiledModel } from '../model/compile.js';
import { bipartition, components, subModel } from '../model/components.js';
import { exactSlack } from '../model/exact-slack.js';
import { scaledModel } from '../model/rate-scale.js';

export { scaledModel };
import { SaturatedSet } from './component.js';
import { maskMembers } from './saturated.js';

/**
 * Saturation threshold of the recursions, relative to the total (scaled) rate: a denominator
 * λ(N(A)) − λ(A ∖ S) at or below it is refused. Rounding in those sums is below about n · 2^-53 of
 * the total rate, so 2^-46 (1.4e-14) stays above it for up to 64 classes per component, far below
 * the slack of any design the stability verdict calls stable with a usable figure (1e-12 and up).
 */
export const SATURATION = 2 ** -46;

/** Indices of the classes with a positive rate, or undefined when all are positive. */
export function positiveClasses(model: CompiledModel): number[] | undefined {
  let all = true;
  for (let k = 0; k < model.n && all; k++) if (!(model.rates[k]! > 0)) all = false;
  if (all) return undefined;
  const out: number[] = [];
  for (let k = 0; k < model.n; k++) if (model.rates[k]! > 0) out.push(k);
  return out;
}

/** The sub-model of the positive-rate classes and how to put per-class / per-edge arrays back. */
export function withoutZeroRates(model: CompiledModel, positive: number[]) {
  const { sub, edgeMap } = subModel(model, positive);
  const perClass = (a: Float64Array): Float64Array => {
    const out = new Float64Array(model.n);
    positive.forEach((k, i) => (out[k] = a[i]!));
    return out;
  };
  const perEdge = (a: Float64Array): Float64Array => {
    const out = new Float64Array(model.m);
    for (let e = 0; e < sub.m; e++) out[edgeMap[e]!] = a[e]!;
    return out;
  };
  return { sub, perClass, perEdge };
}

/**
 * What a SaturatedSet met by a recursion on the scaled rates (in a component `members`) means: a
 * certificate of instability when λ(N(A)) ≤ λ(A ∖ S) exactly (original rates), else a design too
 * close to the boundary for double precision.
 */
export function saturationError(original: CompiledModel, members: ArrayLike<number>, e: SaturatedSet, certificate: (m: CompiledModel, set: Int32Array) => UnstableDesignError['certificate'], timeUnit?: string): Error {
  const set = maskMembers(members, e.lo, e.hi);
  const loopFree = Array.from(set).filter((k) => !original.selfLoop[k]);
  const mark = new Set<number>();
  for (const k of set) {
    if (original.selfLoop[k]) mark.add(k);
    for (let p = original.adjStart[k]!; p < original.adjStart[k + 1]!; p++) mark.add(original.adj[p]!);
  }
  const slack = exactSlack(original.rates, loopFree, [...mark]);
  if (slack.sign <= 0) return new UnstableDesignError(certificate(original, set), timeUnit);
  // A is not overloaded: a bipartite component is unstable all the same (its heavier side)
  const comps = components(original);
  const comp = comps.members[comps.of[set[0]!]!]!;
  const two = bipartition(original, comp);
  if (two) {
    const sides: [number[], number[]] = [[], []];
    for (const k of comp) sides[two.side[k]!]!.push(k);
    const heavier = exactSlack(original.rates, sides[0], sides[1]).sign <= 0 ? sides[0] : sides[1];
    return new UnstableDesignError({ ...certificate(original, Int32Array.from(heavier)), reason: 'bipartite' }, timeUnit);
  }
  return new PrecisionError(
    `the design is stable but within ${slack.value / (original.totalRate || 1)} (relative) of the stability boundary: ` +
      'double precision cannot give its exact figures; estimate them with `edgewise simulate`',
  );
}
