import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { runWithExitCode } from '../../src/cli/exit.js';
import { memoryIO, type CommandIO } from '../../src/cli/io.js';

/** Runs a command function as the CLI does (errors → exit codes) and captures its output. */
export async function runCommand<O>(
  command: (opts: O, io: CommandIO) => Promise<number>,
  opts: O,
  cwd: string,
): Promise<{ code: number; out: string; err: string }> {
  const io = memoryIO(cwd);
  const code = await runWithExitCode(io, () => command(opts, io));
  return { code, out: io.stdout(), err: io.stderr() };
}

/** Writes a scenario into `dir` (a string as given, anything else as JSON) and returns its path. */
export function writeScenario(dir: string, name: string, doc: unknown): string {
  const p = join(dir, name);
  writeFileSync(p, typeof doc === 'string' ? doc : JSON.stringify(doc, null, 2));
  return p;
}
