/**
 * Puts located entries together into a scenario document and validates it with the project's
 * scenario validator (and the checkers of the recommender fields and demand variants), reporting each problem at the CSV row
 * and column the entry came from. Throws InvalidTableError listing every problem of every file.
 */
import { InvalidScenarioError, InvalidTableError, type ScenarioProblem, type TableProblem } from '../errors.js';
import { demandVariants } from '../model/demand.js';
import { readDesignFields } from '../model/design-fields.js';
import type { Scenario } from '../model/scenario.js';
import { validateScenario } from '../model/validate.js';
import type { Located } from './tables.js';

export interface ScenarioParts {
  readonly name: string;
  readonly timeUnit: string;
  readonly budget?: number;
  readonly classes: readonly Located[];
  readonly compatibilities?: readonly Located[];
  readonly candidates?: readonly Located[];
  /** Further top-level fields (e.g. `demand`, `data`), written after the others. */
  readonly extra?: Readonly<Record<string, unknown>>;
}

export interface Assembled {
  /** The scenario file's content (plain JSON). */
  readonly document: Record<string, unknown>;
  /** The same, validated. */
  readonly scenario: Scenario;
}

const PATH = /^(classes|compatibilities|candidates)\[(\d+)\](?:\.(\w+))?/;

/** The CSV location of a validator problem (JSON path) — or the path itself for the rest. */
function locate(p: ScenarioProblem, parts: ScenarioParts, fallback: string): TableProblem {
  const m = PATH.exec(p.path);
  const list = m ? parts[m[1] as 'classes' | 'compatibilities' | 'candidates'] : undefined;
  const at = m && list ? list[Number(m[2])] : undefined;
  if (!m || !at) return { file: fallback, message: p.path === '' ? p.message : `${p.path}: ${p.message}` };
  const field = m[3];
  const column = field === undefined || field === 'pair' ? undefined : (at.origin.columnOf?.get(field) ?? field);
  return { file: at.origin.file, ...(at.origin.row === undefined ? {} : { row: at.origin.row }), ...(column === undefined ? {} : { column }), message: p.message };
}

/**
 * Builds and validates the scenario. `problems` holds what reading the tables found already; the
 * validator's findings are added (skipping any at a place already reported) and, if there are any
 * problems at all, InvalidTableError is thrown.
 */
export function assembleScenario(parts: ScenarioParts, problems: readonly TableProblem[], fallback = 'scenario'): Assembled {
  const document: Record<string, unknown> = {
    name: parts.name,
    timeUnit: parts.timeUnit,
    ...(parts.budget === undefined ? {} : { budget: parts.budget }),
    classes: parts.classes.map((c) => c.entry),
    compatibilities: (parts.compatibilities ?? []).map((c) => c.entry),
    candidates: (parts.candidates ?? []).map((c) => c.entry),
    ...parts.extra,
  };
  // no class could be read: the tables' problems say why; the validator would only add "empty model"
  if (parts.classes.length === 0 && problems.length > 0) throw new InvalidTableError(problems);
  const all = [...problems];
  const seen = new Set(all.map((p) => `${p.file}\u0000${p.row}\u0000${p.column}`));
  const add = (found: readonly ScenarioProblem[]): void => {
    for (const p of found) {
      const t = locate(p, parts, fallback);
      const key = `${t.file}\u0000${t.row}\u0000${t.column}`;
      if (!seen.has(key)) all.push(t);
      seen.add(key);
    }
  };
  let scenario: Scenario | undefined;
  try {
    scenario = validateScenario(document, fallback);
    readDesignFields(scenario, fallback);
    demandVariants(scenario, fallback);
  } catch (e) {
    if (!(e instanceof InvalidScenarioError)) throw e;
    add(e.problems);
  }
  if (all.length > 0 || scenario === undefined) throw new InvalidTableError(all);
  return { document, scenario };
}
