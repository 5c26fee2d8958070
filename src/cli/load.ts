import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { ScenarioFileError, UsageError } from '../errors.js';
import { parseScenario } from '../model/validate.js';
import type { Scenario } from '../model/scenario.js';

/** Why a file could not be read, in words. */
function readFailure(e: unknown): string {
  const code = (e as NodeJS.ErrnoException).code;
  return code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a directory' : (e as Error).message;
}

/** Reads and validates a scenario file (paths relative to cwd). */
export function loadScenario(path: string, cwd: string): Scenario {
  let text: string;
  try {
    text = readFileSync(resolve(cwd, path), 'utf8');
  } catch (e) {
    throw new ScenarioFileError(path, readFailure(e));
  }
  return parseScenario(text, path);
}

/** Reads an input file other than a scenario (a CSV table, a log) as text; UsageError if it cannot. */
export function readInputFile(path: string, cwd: string): string {
  try {
    return readFileSync(resolve(cwd, path), 'utf8');
  } catch (e) {
    throw new UsageError(`cannot read ${path}: ${readFailure(e)}`);
  }
}
