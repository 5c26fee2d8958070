/**
 * The design file `recommend --save` writes (read back by `--design FILE` on every command,
 * src/model/design-file.ts): the chosen design as changes to today's, with what it was chosen for.
 */
import type { ScenarioContext } from './context.js';
import type { RecommendRecord } from './recommend.js';

export interface SavedDesign {
  readonly kind: 'edgewise design';
  readonly scenario: string;
  /** "the recommended design" or "Pareto design K of N". */
  readonly chosen: string;
  readonly objective: string;
  readonly budget: number | null;
  readonly costUnit: string | null;
  readonly timeUnit: string;
  readonly cost: number;
  readonly method: string;
  readonly backlog: number | null;
  readonly objectiveValue: number | null;
  readonly added: Array<readonly [string, string]>;
  readonly removed: Array<readonly [string, string]>;
}

/** The recommended design, or the Pareto entry `pick` (1-based, cheapest first). */
export function savedDesign(ctx: ScenarioContext, r: RecommendRecord, pick?: number): SavedDesign {
  const d = pick === undefined ? r.recommended : r.pareto[pick - 1]!;
  // forced removals (forbidden pairs every design drops) are not choices: --design applies them anyway
  const forced = new Set(ctx.problem.forcedOut.map((f) => `${ctx.problem.ids[f.a]}\u0001${ctx.problem.ids[f.b]}`));
  return {
    kind: 'edgewise design',
    scenario: r.scenario,
    chosen: pick === undefined ? 'the recommended design' : `Pareto design ${pick} of ${r.pareto.length}`,
    objective: r.objective,
    budget: r.budget,
    costUnit: r.costUnit,
    timeUnit: r.timeUnit,
    cost: d.cost,
    method: d.method,
    backlog: d.backlog,
    objectiveValue: d.objective,
    added: d.added.map((p) => [p[0], p[1]] as const),
    removed: d.removed.filter((p) => !forced.has(`${p[0]}\u0001${p[1]}`)).map((p) => [p[0], p[1]] as const),
  };
}
