/**
 * Reusable per-model work arrays, so that work on one component or one set costs time in its own
 * size, not in the number of classes of the whole model (allocating and scanning an n-array per
 * component made `check` quadratic on designs of many small components).
 *
 * Contract: a borrower leaves the arrays as it found them (marks 0, local indices −1), resetting
 * only the entries it touched. The core is single-threaded and no borrower calls another while it
 * holds the same array.
 */
import type { CompiledModel } from '../model/compile.js';

export interface Scratch {
  /** Marks of classes (0 when free). */
  readonly markA: Uint8Array;
  readonly markB: Uint8Array;
  /** Local index of a class in the component being worked on (−1 when free). */
  readonly local: Int32Array;
  /** Sides of a two-colouring (any value: bipartition resets its members first). */
  readonly side: Int8Array;
}

const cache = new WeakMap<CompiledModel, Scratch>();

export function scratchOf(model: CompiledModel): Scratch {
  let s = cache.get(model);
  if (!s) {
    s = { markA: new Uint8Array(model.n), markB: new Uint8Array(model.n), local: new Int32Array(model.n).fill(-1), side: new Int8Array(model.n) };
    cache.set(model, s);
  }
  return s;
}
