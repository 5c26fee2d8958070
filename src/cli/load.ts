import { readFileSync, statSync } from 'node:fs';
import { resolve } from 'node:path';
import { InvalidScenarioError, ScenarioFileError } from '../errors.js';
import { LIMITS } from '../model/limits.js';
import { parseScenario } from '../model/validate.js';
import type { Scenario } from '../model/scenario.js';

/** Reads and validates a scenario file (paths relative to cwd). */
export function loadScenario(path: string, cwd: string): Scenario {
  const full = resolve(cwd, path);
  let text: string;
  try {
    // refused before reading: a file past the size limit is never loaded into memory
    const size = statSync(full).size;
    if (size > LIMITS.fileChars) {
      throw new InvalidScenarioError([{ path: '', message: `the file has ${size.toLocaleString('en-US')} bytes, more than the limit of ${LIMITS.fileChars.toLocaleString('en-US')} (16 MiB)` }], path);
    }
    text = readFileSync(full, 'utf8');
  } catch (e) {
    if (e instanceof InvalidScenarioError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    throw new ScenarioFileError(path, code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a directory' : (e as Error).message);
  }
  return parseScenario(text, path);
}
