/**
 * The flexibility penalty: a design must not pay for a harmful compatibility. A compatibility the
 * design pays for (an added candidate with cost > 0, or a kept removable compatibility whose drop
 * would save > 0) is harmful when dropping it alone leaves a stable design with a lower objective
 * (total backlog by default). Such a design is refused: it spends money to make things worse.
 */
import { designKey, type DesignProblem } from './problem.js';
import { lower } from './objective.js';
import type { DesignRecord, Origin } from '../scoring/evaluator.js';

/** What the penalty needs to know about a scored design. */
export interface PenaltyView {
  readonly stable: boolean;
  readonly objective: number;
}

/** Toggles the design pays for (on, with price > 0). */
export function paidToggles(problem: DesignProblem, design: ArrayLike<number>): number[] {
  const out: number[] = [];
  for (let j = 0; j < problem.toggles.length; j++) if (design[j] && problem.toggles[j]!.price > 0) out.push(j);
  return out;
}

/** The design with toggle j switched off. */
export function without(design: ArrayLike<number>, j: number): Uint8Array {
  const d = Uint8Array.from(design);
  d[j] = 0;
  return d;
}

/** The designs whose scores the verdict needs: one per paid toggle, with that toggle off. */
export function penaltyNeighbours(problem: DesignProblem, design: ArrayLike<number>): Uint8Array[] {
  return paidToggles(problem, design).map((j) => without(design, j));
}

/**
 * The penalty neighbours of scored designs, each with its origin (the design it drops a toggle of),
 * so that the evaluator may score them by reuse.
 */
export function penaltyBatch(problem: DesignProblem, records: readonly DesignRecord[]): { designs: Uint8Array[]; origins: Origin[] } {
  const designs: Uint8Array[] = [];
  const origins: Origin[] = [];
  for (const from of records) {
    for (const j of paidToggles(problem, from.design)) {
      designs.push(without(from.design, j));
      origins.push({ from, toggle: j });
    }
  }
  return { designs, origins };
}

export interface PenaltyVerdict {
  /** False while some needed neighbour has not been scored. */
  readonly known: boolean;
  /** Harmful paid toggles (empty: the design passes). */
  readonly harmful: number[];
}

/** The penalty verdict of a scored design, reading neighbours through `lookup` (by design key). */
export function penaltyVerdict(
  problem: DesignProblem,
  design: ArrayLike<number>,
  objective: number,
  lookup: (key: string) => PenaltyView | undefined,
): PenaltyVerdict {
  const harmful: number[] = [];
  let known = true;
  for (const j of paidToggles(problem, design)) {
    const r = lookup(designKey(without(design, j)));
    if (!r) {
      known = false;
      continue;
    }
    if (r.stable && lower(r.objective, objective)) harmful.push(j);
  }
  return { known, harmful };
}
