/**
 * When every allowed candidate together restores stability but no set within the maxCompatibilities
 * of every class does: the cheapest repair with the limits lifted, and the classes it takes over.
 */
import { degrees, type DesignProblem } from '../space/problem.js';
import { cheapestSets } from './enumerate.js';
import { repairOf } from './repair-of.js';
import type { RepairSpace } from './space.js';
import type { LimitBound, LimitExcess } from './types.js';

export async function limitBound(problem: DesignProblem, unlimited: RepairSpace): Promise<LimitBound> {
  const [first] = await cheapestSets(unlimited.sub, 1);
  if (!first) return { status: 'limits', overLimit: [] };
  const repair = repairOf(problem, unlimited, first);
  const design = new Uint8Array(unlimited.sub.toggles.length);
  for (const j of first.set) design[j] = 1;
  const degree = degrees(unlimited.sub, design); // the sub-problem's fixed part is today's design
  const overLimit: LimitExcess[] = [];
  for (let k = 0; k < problem.n; k++) if (degree[k]! > problem.maxDegree[k]!) overLimit.push({ class: k, degree: degree[k]!, max: problem.maxDegree[k]! });
  return { status: 'limits', withoutLimits: repair, overLimit };
}
