import { UsageError } from '../errors.js';

/** Checks a `--max-sets` value (absent is fine: the command's default applies). */
export function checkMaxSets(value: number | undefined): void {
  if (value !== undefined && !(Number.isSafeInteger(value) && value > 0)) {
    throw new UsageError(`--max-sets must be a positive integer, got ${value}`);
  }
}
