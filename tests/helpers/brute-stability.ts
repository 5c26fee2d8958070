import type { CompiledModel } from '../../src/model/compile.js';
import { isIndependent, neighbourhood, rateOf, toBitGraph, type BitGraph } from './bitgraph.js';

/**
 * Stability by brute force, straight from the definition ("Stability of the stochastic matching
 * model", J. Appl. Probab. 2016, with the self-loop extension of 2021, venue from memory): the design
 * is stable iff every non-empty independent set I (of the graph without self-loops) that contains no
 * self-looped class satisfies λ(I) < λ(N(I)). All 2^n subsets are visited, so keep n <= ~20.
 */
export interface BruteStability {
  readonly stable: boolean;
  /** Smallest relative slack (λ(N(I)) − λ(I)) / λ(N(I)) over the constrained sets (−Infinity if some N(I) is empty). */
  readonly minSlack: number;
  /** Every violating set (bitmask), in increasing mask order. */
  readonly violating: readonly number[];
  /** Number of independent sets of the graph without self-loops, the empty set included. */
  readonly independentSets: number;
}

export function bruteStability(model: CompiledModel): BruteStability {
  const g = toBitGraph(model);
  if (g.n > 22) throw new RangeError('brute force is for small graphs');
  let minSlack = Infinity;
  const violating: number[] = [];
  let independentSets = 0;
  for (let mask = 0; mask < 1 << g.n; mask++) {
    if (!isIndependent(g, mask)) continue;
    independentSets++;
    if (mask === 0 || mask & g.loopMask) continue;
    const demand = rateOf(g, mask);
    const capacity = rateOf(g, neighbourhood(g, mask));
    const slack = capacity > 0 ? (capacity - demand) / capacity : -Infinity;
    minSlack = Math.min(minSlack, slack);
    if (!(demand < capacity)) violating.push(mask);
  }
  return { stable: violating.length === 0, minSlack, violating, independentSets };
}

/** Why a claimed certificate is not a violating set, or undefined when it is one. */
export function certificateProblem(
  g: BitGraph,
  set: number,
  claimed: { neighbours: number; demand: number; capacity: number },
): string | undefined {
  if (set === 0) return 'empty set';
  if (!isIndependent(g, set)) return 'not independent';
  if (set & g.loopMask) return 'contains a self-looped class';
  const demand = rateOf(g, set);
  const nb = neighbourhood(g, set);
  const capacity = rateOf(g, nb);
  if (claimed.neighbours !== nb) return 'neighbour list is not N(I)';
  const close = (a: number, b: number): boolean => Math.abs(a - b) <= 1e-12 * Math.max(1, Math.abs(a), Math.abs(b));
  if (!close(claimed.demand, demand)) return `demand ${claimed.demand} is not λ(I) = ${demand}`;
  if (!close(claimed.capacity, capacity)) return `capacity ${claimed.capacity} is not λ(N(I)) = ${capacity}`;
  // A tie λ(I) = λ(N(I)) violates the condition; exact ties (e.g. the two sides of a bipartite component
  // whose rates come from edge weights) may come out one rounding step apart depending on summation order.
  if (demand < capacity * (1 - 1e-12)) return 'λ(I) < λ(N(I)): the set does not violate the condition';
  return undefined;
}
