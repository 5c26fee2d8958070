#!/usr/bin/env node
/**
 * The edgewise command line. This file only declares commands and flags; each command's work lives
 * in src/cli/commands/<name>.ts, imported lazily, and src/cli/exit.ts turns errors into exit codes.
 */
import { Command, CommanderError, Option } from 'commander';
import { runWithExitCode } from './exit.js';
import type { CommandIO } from './io.js';

const io: CommandIO = {
  cwd: process.cwd(),
  out: (t) => void process.stdout.write(t),
  err: (t) => void process.stderr.write(t),
  isTTY: Boolean(process.stderr.isTTY),
};

/** Runs a command module's function and exits with its code. */
function action<O>(load: () => Promise<(opts: O, io: CommandIO) => Promise<number>>) {
  return async (opts: O): Promise<void> => {
    const code = await runWithExitCode(io, async () => (await load())(opts, io));
    process.exitCode = code;
  };
}

const program = new Command();
program
  .name('edgewise')
  .description('Exact evaluation and budgeted design of compatibility graphs for dynamic matching systems.')
  .version('0.1.0')
  .showHelpAfterError()
  .exitOverride();

program
  .command('check')
  .description('is the design stable, and how much room is left?')
  .argument('<file>', 'scenario file (JSON)')
  .option('--json', 'machine-readable output')
  .action((file: string, opts: Record<string, unknown>) =>
    action(async () => (await import('./commands/check.js')).checkCommand)({ ...opts, file }));

program
  .command('evaluate')
  .description('exact steady state under FCFM: backlog, waits, immediate matches, match rates')
  .argument('<file>', 'scenario file (JSON)')
  .option('--json', 'machine-readable output')
  .addOption(new Option('--max-sets <n>', 'refuse above this many independent sets (memory guard)').argParser(Number))
  .action((file: string, opts: Record<string, unknown>) =>
    action(async () => (await import('./commands/evaluate.js')).evaluateCommand)({ ...opts, file }));

// -- more commands are declared here (one block per command) --

try {
  await program.parseAsync(process.argv);
} catch (e) {
  if (e instanceof CommanderError) {
    process.exitCode = e.exitCode === 0 ? 0 : 2;
  } else throw e;
}
