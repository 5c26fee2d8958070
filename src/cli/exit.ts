import { EdgewiseError } from '../errors.js';
import type { CommandIO } from './io.js';

/**
 * The one place that turns errors into exit codes and messages. Typed errors print their message
 * (no stack trace); anything else is a bug: exit 1 with the stack.
 */
export async function runWithExitCode(io: CommandIO, body: () => Promise<number>): Promise<number> {
  try {
    return await body();
  } catch (e) {
    if (e instanceof EdgewiseError) {
      io.err(`edgewise: ${e.message}\n`);
      return e.exitCode;
    }
    io.err(`edgewise: internal error (please report): ${(e as Error)?.stack ?? String(e)}\n`);
    return 1;
  }
}
