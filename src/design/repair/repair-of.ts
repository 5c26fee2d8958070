/** A set found in a repair space, as a Repair of the original problem. */
import { roundCost, type DesignProblem } from '../space/problem.js';
import type { FoundSet } from './enumerate.js';
import type { RepairSpace } from './space.js';
import type { Repair } from './types.js';

export function repairOf(problem: DesignProblem, space: RepairSpace, found: FoundSet): Repair {
  return {
    added: found.set.map((j) => space.toggleOf[j]!),
    cost: found.cost,
    withinBudget: roundCost(problem.costOffset + found.cost) <= problem.budget + 1e-9,
  };
}
