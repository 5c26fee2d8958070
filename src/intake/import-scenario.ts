/**
 * `import`: classes, compatibilities and candidates tables (CSV text) → a validated scenario.
 * Every problem of every file is reported at once (InvalidTableError).
 */
import type { TableProblem } from '../errors.js';
import { assembleScenario, type Assembled } from './assemble.js';
import { candidateEntries, classEntries, compatibilityEntries, type TableText } from './tables.js';

export interface ImportInput {
  readonly classes: TableText;
  readonly compatibilities?: TableText;
  readonly candidates?: TableText;
  /** Scenario name (default "imported scenario"). */
  readonly name?: string;
  /** Time unit of rates, waits and patience (default "hour"). */
  readonly timeUnit?: string;
  readonly budget?: number;
}

export const DEFAULT_IMPORT_NAME = 'imported scenario';
export const DEFAULT_TIME_UNIT = 'hour';

export function importScenario(input: ImportInput): Assembled {
  const problems: TableProblem[] = [];
  const classes = classEntries(input.classes, problems);
  const compatibilities = input.compatibilities ? compatibilityEntries(input.compatibilities, problems) : [];
  const candidates = input.candidates ? candidateEntries(input.candidates, problems) : [];
  if (classes.length === 0 && !problems.some((p) => p.file === input.classes.file)) {
    problems.push({ file: input.classes.file, message: 'no class rows: list one class per row below the header (id, rate, …)' });
  }
  return assembleScenario(
    {
      name: input.name ?? DEFAULT_IMPORT_NAME,
      timeUnit: input.timeUnit ?? DEFAULT_TIME_UNIT,
      ...(input.budget === undefined ? {} : { budget: input.budget }),
      classes,
      compatibilities,
      candidates,
    },
    problems,
    input.classes.file,
  );
}
