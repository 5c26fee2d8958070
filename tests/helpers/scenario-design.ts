import { compileGraph, type CompiledModel } from '../../src/model/compile.js';
import { pairKey, type Scenario } from '../../src/model/scenario.js';

/** A pair of class ids. */
export type Pair = readonly [string, string];

/**
 * A scenario's design given as changes, built here from the file's own lists (no code of src/design/
 * or src/usecases/): today's compatibilities minus `removed`, plus `added`, under the classes' rates
 * (or `rates`, in class order).
 */
export function scenarioDesign(s: Scenario, added: readonly Pair[], removed: readonly Pair[], rates?: ArrayLike<number>): CompiledModel {
  const ids = s.classes.map((c) => c.id);
  const at = new Map(ids.map((id, k) => [id, k] as const));
  const drop = new Set(removed.map((p) => pairKey(p[0], p[1])));
  const pairs = [...s.compatibilities.map((c) => c.pair).filter((p) => !drop.has(pairKey(p[0], p[1]))), ...added].map((p) => [at.get(p[0])!, at.get(p[1])!] as [number, number]);
  return compileGraph(ids, rates ?? s.classes.map((c) => c.rate), pairs);
}
