/**
 * Writing output files so that they can never hurt an input or leave a half-written file: the
 * target is checked before any work (not an input, not a directory, its folder writable), the text
 * goes to a temporary file in the same folder, which is then renamed over the target (atomic on one
 * file system).
 */
import { accessSync, constants, existsSync, realpathSync, renameSync, statSync, unlinkSync, writeFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { UsageError } from '../errors.js';

/** The real path of a file, or of its folder joined with its name when it does not exist yet. */
function realTarget(full: string): string {
  if (existsSync(full)) return realpathSync(full);
  const dir = dirname(full);
  return join(existsSync(dir) ? realpathSync(dir) : dir, basename(full));
}

/**
 * Checks an output path before the work: it must not be one of `inputs` (paths as given, resolved
 * against cwd), not a directory, and its folder must exist and be writable. Returns the full path.
 */
export function checkOutputPath(path: string, cwd: string, inputs: readonly string[], flag = '-o'): string {
  if (path.trim() === '') throw new UsageError(`${flag} needs a file name`);
  const full = resolve(cwd, path);
  const target = realTarget(full);
  for (const input of inputs) {
    const inFull = resolve(cwd, input);
    if (existsSync(inFull) && realpathSync(inFull) === target) throw new UsageError(`${flag} ${path} is an input of this command; choose another output file`);
  }
  if (existsSync(full) && statSync(full).isDirectory()) throw new UsageError(`${flag} ${path} is a directory; give a file name`);
  const dir = dirname(full);
  if (!existsSync(dir)) throw new UsageError(`${flag} ${path}: the folder ${dir} does not exist`);
  try {
    accessSync(dir, constants.W_OK);
  } catch {
    throw new UsageError(`${flag} ${path}: the folder ${dir} is not writable`);
  }
  return full;
}

/** Writes `text` to `full` atomically (temporary file in the same folder, then rename). */
export function writeAtomic(full: string, text: string): void {
  const tmp = join(dirname(full), `.${basename(full)}.${process.pid}.${Date.now()}.tmp`);
  try {
    writeFileSync(tmp, text, { encoding: 'utf8', flag: 'wx' });
    renameSync(tmp, full);
  } catch (e) {
    try {
      if (existsSync(tmp)) unlinkSync(tmp);
    } catch {
      // nothing more to clean
    }
    throw new UsageError(`cannot write ${full}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
  }
}
