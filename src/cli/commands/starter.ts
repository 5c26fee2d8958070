import { existsSync, mkdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { UsageError } from '../../errors.js';
import { starterFiles, type StarterFile } from '../../intake/starter.js';
import type { CommandIO } from '../io.js';
import { wrap } from '../../output/text/wrap.js';
import { checkWritableFolder, writeFileAtomic } from '../write.js';

export interface StarterOptions {
  readonly dir: string;
}

/** What is printed after writing. */
export function renderStarter(dir: string, files: readonly StarterFile[]): string {
  return `wrote ${files.map((f) => join(dir, f.name)).join(', ')}\nnext: read ${join(dir, 'README.txt')}, then edgewise check ${join(dir, 'scenario.json')}\n`;
}

/** `edgewise starter DIR`: an example set of CSV files, a README and the scenario built from them. */
export async function starterCommand(opts: StarterOptions, io: CommandIO): Promise<number> {
  if (!opts.dir || opts.dir.trim() === '') throw new UsageError('starter needs a folder, e.g. edgewise starter my-scenario');
  const dir = resolve(io.cwd, opts.dir);
  const files = starterFiles();
  const taken = files.filter((f) => existsSync(join(dir, f.name)));
  if (taken.length > 0) throw new UsageError(`refusing to overwrite ${taken.map((f) => join(opts.dir, f.name)).join(', ')}: choose an empty folder`);
  try {
    mkdirSync(dir, { recursive: true });
  } catch (e) {
    throw new UsageError(`cannot create folder ${opts.dir}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
  }
  checkWritableFolder(dir, opts.dir);
  for (const f of files) writeFileAtomic(join(dir, f.name), f.text, false);
  io.out(`${renderStarter(opts.dir, files).trimEnd().split('\n').flatMap((line) => wrap(line, io.columns, '  ')).join('\n')}\n`);
  return 0;
}
