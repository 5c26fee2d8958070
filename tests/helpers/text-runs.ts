import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { runWithExitCode } from '../../src/cli/exit.js';
import { memoryIO, type CommandIO } from '../../src/cli/io.js';
import { checkCommand } from '../../src/cli/commands/check.js';
import { compareCommand } from '../../src/cli/commands/compare.js';
import { evaluateCommand } from '../../src/cli/commands/evaluate.js';
import { recommendCommand } from '../../src/cli/commands/recommend.js';
import { reportCommand } from '../../src/cli/commands/report.js';
import { sensitivityCommand } from '../../src/cli/commands/sensitivity.js';
import { simulateCommand } from '../../src/cli/commands/simulate.js';
import { sweepCommand } from '../../src/cli/commands/sweep.js';
import { asciiId, asciiPair } from '../../src/output/ascii-pairs.js';

/** One command's output, as a person (text) or a program (JSON, CSV) would get it. */
export interface Run {
  readonly label: string;
  readonly code: number;
  readonly out: string;
  readonly err: string;
}

/** Runs a command function in-process as the CLI does, with a text width. */
export async function runAt<O>(label: string, command: (opts: O, io: CommandIO) => Promise<number>, opts: O, cwd: string, width: number): Promise<Run> {
  const io = memoryIO(cwd, width);
  const code = await runWithExitCode(io, () => command(opts, io));
  return { label, code, out: io.stdout(), err: io.stderr() };
}

export type Kind = 'check' | 'evaluate' | 'simulate' | 'sensitivity' | 'sweep' | 'recommend' | 'report';

export interface TextRunOptions {
  readonly width?: number;
  /** Options given to every command (e.g. `wide`). */
  readonly extra?: Record<string, unknown>;
  /** Where `report` writes its page (never next to the scenario). */
  readonly outDir: string;
}

/** Every scenario command's text output on one file (in `dir`), at `width` columns (default 120). */
export async function textRuns(file: string, dir: string, kinds: readonly Kind[], options: TextRunOptions): Promise<Run[]> {
  const width = options.width ?? 120;
  const extra = options.extra ?? {};
  const doc = JSON.parse(readFileSync(join(dir, file), 'utf8')) as { classes: Array<{ id: string }>; candidates?: Array<{ pair: [string, string] }> };
  const first = doc.classes[0]!.id;
  const cand = doc.candidates?.[0]?.pair;
  const out: Run[] = [];
  const at = `${file} at ${width}`;
  for (const kind of kinds) {
    const label = `${kind} ${at}`;
    const o = { file, ...extra };
    if (kind === 'check') out.push(await runAt(label, checkCommand, o, dir, width));
    if (kind === 'evaluate') out.push(await runAt(label, evaluateCommand, o, dir, width));
    if (kind === 'simulate') out.push(await runAt(label, simulateCommand, { ...o, arrivals: 2000, replications: 2, jobs: 1, seed: 3 }, dir, width));
    if (kind === 'sensitivity') out.push(await runAt(label, sensitivityCommand, o, dir, width));
    if (kind === 'sweep') out.push(await runAt(label, sweepCommand, { ...o, grow: asciiId(first), steps: 3, ...(cand ? { with: [asciiPair(cand)] } : {}) }, dir, width));
    if (kind === 'recommend') out.push(await runAt(label, recommendCommand, o, dir, width));
    if (kind === 'report') out.push(await runAt(label, reportCommand, { ...o, output: join(options.outDir, `${file}.${width}.html`) }, dir, width));
  }
  return out;
}

/** `compare` of some files (text). */
export function compareRun(files: readonly string[], dir: string, width = 120, extra: Record<string, unknown> = {}): Promise<Run> {
  return runAt(`compare ${files.join(' ')} at ${width}`, compareCommand, { files, ...extra }, dir, width);
}
