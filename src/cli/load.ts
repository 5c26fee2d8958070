/**
 * Reading the files a command is given — the scenario, a design file — and turning the shared
 * options (--budget, --design, --demand) into the use cases' context. Every file is validated
 * whole, once, here; nothing downstream refuses a scenario.
 */
import { readFileSync, statSync } from 'node:fs';
import { resolve } from 'node:path';
import { InvalidScenarioError, ScenarioFileError } from '../errors.js';
import { LIMITS } from '../model/limits.js';
import { finiteNumber } from './options.js';
import { parseDesignFile, type DesignFile } from '../model/design-file.js';
import { parseScenario } from '../model/validate.js';
import type { Scenario } from '../model/scenario.js';
import { scenarioContext, type ScenarioContext } from '../usecases/context.js';

/**
 * Reads a text file given on the command line (paths relative to cwd). A file past the size limit
 * (src/model/limits.ts) is refused before it is read, so it is never loaded into memory.
 */
export function readInput(path: string, cwd: string, what = 'scenario file'): string {
  const full = resolve(cwd, path);
  try {
    const st = statSync(full);
    if (st.isDirectory()) throw new ScenarioFileError(path, 'it is a directory');
    if (st.size > LIMITS.fileChars) {
      throw new InvalidScenarioError([{ path: '', message: `the file has ${st.size.toLocaleString('en-US')} bytes, more than the limit of ${LIMITS.fileChars.toLocaleString('en-US')} (16 MiB)` }], path);
    }
    return readFileSync(full, 'utf8');
  } catch (e) {
    if (e instanceof ScenarioFileError || e instanceof InvalidScenarioError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    throw new ScenarioFileError(path, code === 'ENOENT' ? `no such ${what}` : code === 'EACCES' ? 'permission denied' : (e as Error).message);
  }
}

/** Reads and validates a scenario file (paths relative to cwd). */
export function loadScenario(path: string, cwd: string): Scenario {
  return parseScenario(readInput(path, cwd), path);
}

/** Reads and checks a design file. */
export function loadDesign(path: string, cwd: string): DesignFile {
  return parseDesignFile(readInput(path, cwd, 'design file'), path);
}

/** The options that choose what a command looks at. */
export interface ContextFlags {
  readonly file: string;
  readonly budget?: number | string;
  /** A design file (JSON {added, removed}, or the file `recommend --save` writes). */
  readonly design?: string;
  /** A demand variant of the scenario. */
  readonly demand?: string;
  /** Add the fitted-interval variants (low and high ends of every class's rateCi95). */
  readonly rateIntervals?: boolean;
}

/** Scenario, design and demand → the context every use case starts from. */
export function loadContext(flags: ContextFlags, cwd: string): ScenarioContext {
  const budget = finiteNumber(flags.budget, '--budget', 0);
  const scenario = loadScenario(flags.file, cwd);
  const design = flags.design === undefined ? undefined : { ...loadDesign(flags.design, cwd), from: flags.design };
  return scenarioContext(scenario, {
    source: flags.file,
    ...(budget === undefined ? {} : { budget }),
    ...(design ? { design } : {}),
    ...(flags.demand === undefined ? {} : { demand: flags.demand }),
    ...(flags.rateIntervals ? { rateIntervals: true } : {}),
  });
}

/** Reads an input file other than a scenario (a CSV table, a log) as text; ScenarioFileError (exit 2) if it cannot. */
export function readInputFile(path: string, cwd: string): string {
  return readInput(path, cwd, 'file');
}
