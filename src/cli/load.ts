import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { ScenarioFileError } from '../errors.js';
import { parseScenario } from '../model/validate.js';
import type { Scenario } from '../model/scenario.js';

/** Reads and validates a scenario file (paths relative to cwd). */
export function loadScenario(path: string, cwd: string): Scenario {
  const full = resolve(cwd, path);
  let text: string;
  try {
    text = readFileSync(full, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new ScenarioFileError(path, code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a directory' : (e as Error).message);
  }
  return parseScenario(text, path);
}
