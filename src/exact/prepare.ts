import { TooLargeError } from '../errors.js';
import type { CompiledModel } from '../model/compile.js';
import { components, subModel } from '../model/components.js';
import { countIndependentSets } from './count.js';
import { maskGraph, MAX_COMPONENT_CLASSES, type MaskGraph } from './masks.js';

/** One connected component, ready for a recursion over its independent sets. */
export interface PreparedComponent {
  /** Class indices of the component in the whole model, ascending. */
  readonly members: Int32Array;
  /** The component as a model of its own (local indices). */
  readonly sub: CompiledModel;
  /** Edge index in the whole model of each edge of `sub`. */
  readonly edgeMap: Int32Array;
  readonly g: MaskGraph;
  /** Number of independent sets of the component, ∅ included. */
  readonly count: number;
}

/**
 * Splits a design into connected components (independent subsystems) and counts each one's
 * independent sets, refusing with TooLargeError as soon as the total passes `maxSets` or a
 * component has more than 64 classes. `guard` names the memory guard in the message; `advise`
 * ends it with the advice to simulate instead. `of[k]` is the index in `parts` of class k's
 * component.
 */
export function prepareComponents(
  model: CompiledModel,
  maxSets: number,
  guard = 'the exact evaluation’s memory guard; about 40 bytes each',
  advise = true,
): { parts: PreparedComponent[]; total: number; of: Int32Array } {
  const parts: PreparedComponent[] = [];
  let total = 0;
  const comps = components(model);
  for (const members of comps.members) {
    if (members.length > MAX_COMPONENT_CLASSES) {
      throw new TooLargeError(
        `a connected group of ${members.length} classes is beyond exact evaluation (at most ${MAX_COMPONENT_CLASSES} per group)` +
          (advise ? '; estimate it with `edgewise simulate`' : ''),
        Infinity,
        maxSets,
      );
    }
    // one component holding every class: the model is its own sub-model (the same arrays subModel
    // would rebuild, edges in the same order)
    const { sub, edgeMap } = members.length === model.n ? { sub: model, edgeMap: identity(model.m) } : subModel(model, members);
    const g = maskGraph(sub);
    const count = countIndependentSets(g, maxSets - total);
    total += count;
    if (total > maxSets) throw tooManySets(total, maxSets, guard, advise);
    parts.push({ members, sub, edgeMap, g, count });
  }
  return { parts, total, of: comps.of };
}

function identity(m: number): Int32Array {
  const out = new Int32Array(m);
  for (let e = 0; e < m; e++) out[e] = e;
  return out;
}

/** The refusal used whenever a count passes a memory guard (`advise`: and the advice to simulate instead). */
export function tooManySets(count: number, limit: number, guard: string, advise = true): TooLargeError {
  return new TooLargeError(
    `the design has more than ${limit.toLocaleString('en-US')} independent sets (${guard}); ` +
      `raise --max-sets if memory allows${advise ? ', or estimate with `edgewise simulate`' : ''}`,
    count,
    limit,
  );
}
