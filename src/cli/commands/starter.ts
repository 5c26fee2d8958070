import { existsSync, mkdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { UsageError } from '../../errors.js';
import { starterFiles } from '../../intake/starter.js';
import { starterText } from '../../output/text/intake.js';
import { execute } from '../command.js';
import type { CommandIO } from '../io.js';
import { checkWritableFolder, writeFileAtomic } from '../write.js';

export interface StarterOptions {
  readonly dir: string;
}

/** `edgewise starter DIR`: an example set of CSV files, a README and the scenario built from them. */
export function starterCommand(opts: StarterOptions, io: CommandIO): Promise<number> {
  return execute(
    {
      load: (io) => {
        if (!opts.dir || opts.dir.trim() === '') throw new UsageError('starter needs a folder, e.g. edgewise starter my-scenario');
        const dir = resolve(io.cwd, opts.dir);
        const files = starterFiles();
        const taken = files.filter((f) => existsSync(join(dir, f.name)));
        if (taken.length > 0) throw new UsageError(`refusing to overwrite ${taken.map((f) => join(opts.dir, f.name)).join(', ')}: choose an empty folder`);
        return { dir, files };
      },
      run: async ({ dir, files }) => {
        try {
          mkdirSync(dir, { recursive: true });
        } catch (e) {
          throw new UsageError(`cannot create folder ${opts.dir}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
        }
        checkWritableFolder(dir, opts.dir);
        for (const f of files) writeFileAtomic(join(dir, f.name), f.text, false);
        return { warnings: [] as string[], written: files.map((f) => join(opts.dir, f.name)) };
      },
      text: (r) => starterText(r.written, join(opts.dir, 'README.txt'), join(opts.dir, 'scenario.json')),
    },
    {},
    io,
  );
}
