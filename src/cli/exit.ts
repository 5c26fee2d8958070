import {
  EdgewiseError,
  InfeasibleDesignError,
  InvalidTableError,
  PrecisionError,
  InterruptedError,
  InvalidScenarioError,
  ScenarioFileError,
  SolverError,
  TooLargeError,
  UnstableDesignError,
  UsageError,
} from '../errors.js';
import type { CommandIO } from './io.js';

/**
 * Exit codes, by error class — the one place that decides them:
 * 0 done · 1 internal error (a bug) · 2 invalid input, file or option · 3 unstable design, or no
 * stable design within the budget · 4 too large for the exact evaluation, or a simulated queue past
 * --max-waiting · 5 an external solver failed · 130 interrupted.
 */
export function exitCodeOf(e: unknown): number {
  if (e instanceof InvalidScenarioError || e instanceof InvalidTableError || e instanceof ScenarioFileError || e instanceof UsageError) return 2;
  if (e instanceof UnstableDesignError || e instanceof InfeasibleDesignError) return 3;
  if (e instanceof TooLargeError || e instanceof PrecisionError) return 4;
  if (e instanceof SolverError) return 5;
  if (e instanceof InterruptedError) return 130;
  return 1;
}

/**
 * Runs a command body and turns what it throws into an exit code and a message. Typed errors print
 * their message (no stack trace); anything else is a bug: exit 1 with the stack.
 */
export async function runWithExitCode(io: CommandIO, body: () => Promise<number>): Promise<number> {
  try {
    return await body();
  } catch (e) {
    const code = exitCodeOf(e);
    if (e instanceof EdgewiseError && code !== 1) {
      io.err(`edgewise: ${e.message}\n`);
      return code;
    }
    io.err(`edgewise: internal error (please report): ${(e as Error)?.stack ?? String(e)}\n`);
    return 1;
  }
}
