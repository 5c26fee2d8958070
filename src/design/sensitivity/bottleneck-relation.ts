/**
 * Where a single change sits relative to the bottleneck of a design, and what the published
 * near-saturation result predicts from that ("Flexibility can hurt dynamic matching system
 * performance", SIGMETRICS Perform. Eval. Rev. 2022; stated here from memory): when the design
 * approaches saturation through its bottleneck independent set I (the set with the least slack
 * λ(N(I)) − λ(I)),
 *   - a compatibility joining two classes of N(I) (both neighbours of the bottleneck, a self-loop on
 *     one of them included) lets those neighbours match each other, spending the very capacity the
 *     bottleneck lives on: it raises the mean backlog near saturation (sufficient condition for harm);
 *   - a compatibility touching I itself gives the bottleneck more partners or leaves it alone: no
 *     harm near saturation.
 * The prediction is a heavy-traffic statement about the base design's bottleneck; the exact verdict
 * always comes from the exact evaluation and is reported beside it, never replaced.
 */
import type { CompiledModel } from '../../model/compile.js';
import type { StabilityReport } from '../../stability/report.js';

/** A bottleneck set of the base design (class indices). */
export interface Bottleneck {
  readonly set: Int32Array;
  readonly neighbours: Int32Array;
  /** λ(I). */
  readonly demand: number;
  /** λ(N(I)). */
  readonly capacity: number;
  /** λ(N(I)) − λ(I). */
  readonly slack: number;
}

/**
 * 'joins-neighbours': both endpoints are neighbours of some bottleneck and the change touches none;
 * 'touches': an endpoint lies in some bottleneck; 'elsewhere': neither.
 */
export type BottleneckRelation = 'joins-neighbours' | 'touches' | 'elsewhere';

/** Relative tolerance under which two slacks count as tied. */
const TIE = 1e-9;

/**
 * Every tight set of the stability report whose slack ties the least one (the report keeps the
 * tightest set through each class, so every class of some bottleneck is covered).
 */
export function bottlenecksOf(model: CompiledModel, report: StabilityReport): Bottleneck[] {
  if (!report.stable || report.tightSets.length === 0) return [];
  const least = report.tightSets[0]!.slack;
  const tie = TIE * Math.max(Math.abs(least), model.totalRate * 1e-3);
  return report.tightSets
    .filter((t) => t.slack <= least + tie)
    .map((t) => ({ set: t.set, neighbours: t.neighbours, demand: t.demand, capacity: t.capacity, slack: t.slack }));
}

const has = (list: Int32Array, k: number): boolean => list.includes(k);

/** How the compatibility {a, b} (a = b: a self-loop) relates to one bottleneck. */
export function relationToSet(b: Bottleneck, a: number, c: number): BottleneckRelation {
  if (has(b.set, a) || has(b.set, c)) return 'touches';
  if (has(b.neighbours, a) && has(b.neighbours, c)) return 'joins-neighbours';
  return 'elsewhere';
}

/** How {a, b} relates to the bottleneck(s): touching any wins, then joining neighbours of any. */
export function relationTo(bottlenecks: readonly Bottleneck[], a: number, c: number): BottleneckRelation {
  let joins = false;
  for (const b of bottlenecks) {
    const r = relationToSet(b, a, c);
    if (r === 'touches') return 'touches';
    if (r === 'joins-neighbours') joins = true;
  }
  return joins ? 'joins-neighbours' : 'elsewhere';
}

/**
 * The prediction reported next to the exact verdict: for an addition, "harm near saturation"; for a
 * removal, "benefit near saturation" (removing a compatibility between two neighbours of the
 * bottleneck undoes a harmful addition).
 */
export function predicted(relation: BottleneckRelation): boolean {
  return relation === 'joins-neighbours';
}
