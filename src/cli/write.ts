/**
 * Writing output files safely: never over an input (resolved real paths compared), the target
 * folder checked writable before the work starts, and every file written to a temporary file in the
 * same folder first and then renamed into place (or hard-linked, when it must not replace a file),
 * so that a reader never sees half a file.
 */
import { accessSync, constants, linkSync, realpathSync, renameSync, statSync, unlinkSync, writeFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { UsageError } from '../errors.js';

/** The real path of `p`, or of its folder joined with its name when `p` does not exist yet. */
function realTarget(p: string): string {
  try {
    return realpathSync(p);
  } catch {
    try {
      return join(realpathSync(dirname(p)), basename(p));
    } catch {
      return p;
    }
  }
}

/**
 * Resolves `output` against `cwd` and checks, before any work is done, that it is not one of the
 * `inputs` (also resolved against `cwd`), not a folder, and that its folder exists and is writable.
 * Returns the absolute target path; throws UsageError otherwise.
 */
export function prepareOutput(output: string, cwd: string, inputs: readonly string[], option = '-o'): string {
  if (output.trim() === '') throw new UsageError(`${option} needs a file name`);
  const target = resolve(cwd, output);
  const real = realTarget(target);
  for (const input of inputs) {
    if (realTarget(resolve(cwd, input)) === real) throw new UsageError(`refusing to write ${output}: it is an input file (${input}); choose another name for ${option}`);
  }
  let isDir = false;
  try {
    isDir = statSync(target).isDirectory();
  } catch {
    // does not exist yet: fine
  }
  if (isDir) throw new UsageError(`cannot write ${output}: it is a folder; give a file name for ${option}`);
  checkWritableFolder(dirname(target), output);
  return target;
}

/** Throws UsageError unless `dir` is an existing, writable folder. */
export function checkWritableFolder(dir: string, shown = dir): void {
  try {
    if (!statSync(dir).isDirectory()) throw new UsageError(`cannot write ${shown}: ${dir} is not a folder`);
    accessSync(dir, constants.W_OK);
  } catch (e) {
    if (e instanceof UsageError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    throw new UsageError(`cannot write ${shown}: ${code === 'ENOENT' ? `folder ${dir} does not exist` : `folder ${dir} is not writable (${code ?? (e as Error).message})`}`);
  }
}

let counter = 0;

/**
 * Writes `text` to `target` atomically: a temporary file in the same folder, then a rename. With
 * `replace: false` an existing file is never replaced (the temporary file is hard-linked into place,
 * which fails if the name is taken).
 */
export function writeFileAtomic(target: string, text: string, replace = true): void {
  const tmp = join(dirname(target), `.${basename(target)}.${process.pid}.${++counter}.tmp`);
  try {
    writeFileSync(tmp, text, { encoding: 'utf8', flag: 'wx' });
    if (replace) renameSync(tmp, target);
    else {
      linkSync(tmp, target);
      unlinkSync(tmp);
    }
  } catch (e) {
    try {
      unlinkSync(tmp);
    } catch {
      // already gone
    }
    const code = (e as NodeJS.ErrnoException).code;
    throw new UsageError(code === 'EEXIST' ? `refusing to overwrite ${target}: it exists` : `cannot write ${target}: ${code ?? (e as Error).message}`);
  }
}
