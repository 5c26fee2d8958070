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
program
  .command('sensitivity')
  .description('exact effect of every single change: each candidate added, each compatibility removed, flagged and explained')
  .argument('<file>', 'scenario file (JSON)')
  .option('--all-pairs', 'try every absent pair (self-pairs included), not only the candidates')
  .option('--json', 'machine-readable output')
  .addOption(new Option('--max-sets <n>', 'memory guard: refuse above this many independent sets (about 200 bytes each)').argParser(Number))
  .action((file: string, opts: Record<string, unknown>) =>
    action(async () => (await import('./commands/sensitivity.js')).sensitivityCommand)({ ...opts, file }));

program
  .command('sweep')
  .description('heavy-traffic view: grow some classes to the stability limit, exact backlog of today and of variants, crossovers')
  .argument('<file>', 'scenario file (JSON)')
  .requiredOption('--grow <classes>', 'comma-separated class ids whose rates grow together')
  .option('--with <pairs>', 'a variant adding compatibilities, e.g. a-b or a-b,c-d (repeatable: one variant each)', (v: string, prev: string[] = []) => [...prev, v])
  .option('--without <pairs>', 'a variant removing compatibilities (repeatable: one variant each)', (v: string, prev: string[] = []) => [...prev, v])
  .addOption(new Option('--steps <n>', 'steps after today (default 10)').argParser(Number))
  .option('--json', 'machine-readable output (the curves)')
  .option('--csv', 'one CSV row per step and design')
  .action((file: string, opts: Record<string, unknown>) =>
    action(async () => (await import('./commands/sweep.js')).sweepCommand)({ ...opts, file }));

program
  .command('recommend')
  .description('budgeted design: the cost/backlog Pareto set of stable designs, with baselines')
  .argument('<file>', 'scenario file (JSON)')
  .addOption(new Option('--budget <b>', "most a design may cost (default: the scenario's budget, else unlimited)").argParser(Number))
  .addOption(new Option('--objective <name>', 'total | weighted | max-wait').default('total'))
  .addOption(new Option('--jobs <j>', 'worker threads scoring designs (default 1); the output does not depend on it').argParser(Number))
  .option('--exhaustive', 'enumerate every design (at most 20 removable compatibilities and candidates)')
  .addOption(new Option('--seed <s>', 'seed of the local search (default 1)').argParser(Number))
  .addOption(new Option('--max-sets <n>', 'memory guard of the exact evaluation (independent sets per design)').argParser(Number))
  .option('--json', 'machine-readable output')
  .option('--csv', 'one CSV row per design and baseline')
  .action((file: string, opts: Record<string, unknown>) =>
    action(async () => (await import('./commands/recommend.js')).recommendCommand)({ ...opts, file }));

program
  .command('compare')
  .description('side by side: one column per scenario (or per budget): stability, bottleneck, backlog, worst wait, best design within budget')
  .argument('<files...>', 'scenario files (JSON)')
  .option('--budgets <list>', 'budgets to compare, e.g. 50,100,200 (one column per scenario and budget)')
  .option('--json', 'machine-readable output')
  .option('--csv', 'one CSV line per column')
  .addOption(new Option('--jobs <n>', 'columns evaluated at once').argParser(Number))
  .action((files: string[], opts: Record<string, unknown>) =>
    action(async () => (await import('./commands/compare.js')).compareCommand)({ ...opts, files }));

program
  .command('report')
  .description('one self-contained HTML report: graph, cost against waiting, waits per class, load sweep, single changes, demand futures')
  .argument('<file>', 'scenario file (JSON)')
  .requiredOption('-o, --output <file>', 'HTML file to write, e.g. report.html')
  .addOption(new Option('--budget <b>', 'budget of the recommendation (default: the scenario\'s)').argParser(Number))
  .addOption(new Option('--jobs <n>', 'worker threads of the recommender').argParser(Number))
  .action((file: string, opts: { output: string } & Record<string, unknown>) =>
    action(async () => (await import('./commands/report.js')).reportCommand)({ ...opts, file }));


program
  .command('simulate')
  .description('simulate a matching policy: backlog, waits and percentiles, abandonment, with 95 % intervals')
  .argument('<file>', 'scenario file (JSON)')
  .addOption(new Option('--policy <name>', 'fcfm | longest | priority | random').default('fcfm'))
  .option('--priority <list>', 'comma-separated class ids, first = most preferred partner (with --policy priority)')
  .addOption(new Option('--arrivals <n>', 'measured arrivals per replication (default 2000000)').argParser(Number))
  .addOption(new Option('--replications <r>', 'independent replications (default 8)').argParser(Number))
  .addOption(new Option('--warmup <w>', 'arrivals discarded first in each replication (default arrivals/10)').argParser(Number))
  .addOption(new Option('--seed <s>', 'random seed (default 1); the same seed gives the same output whatever --jobs').argParser(Number))
  .addOption(new Option('--jobs <j>', 'worker threads (default: the number of cores)').argParser(Number))
  .addOption(new Option('--max-waiting <n>', 'stop when more items wait at once (default 5000000)').argParser(Number))
  .addOption(new Option('--max-sets <n>', 'memory guard of the exact FCFM column, in independent sets (default 1000000)').argParser(Number))
  .option('--timed', 'simulate the Poisson clock explicitly (slower; automatic when classes have patience)')
  .option('--json', 'machine-readable output')
  .action((file: string, opts: Record<string, unknown>) =>
    action(async () => (await import('./commands/simulate.js')).simulateCommand)({ ...opts, file }));

program
  .command('import')
  .description('build a scenario file from spreadsheet tables (CSV): classes, compatibilities, candidates')
  .requiredOption('--classes <file>', 'classes table: id, rate, and optional label, group, note, patience, weight, waitTarget, maxCompatibilities, maxAbandonment')
  .option('--compatibilities <file>', 'compatibilities table: a, b, and optional removable, saving, value, note')
  .option('--candidates <file>', 'candidates table: a, b, cost, and optional value, note')
  .option('--name <name>', 'scenario name (default "imported scenario")')
  .option('--time-unit <unit>', 'time unit of rates, waits and patience (default hour)')
  .addOption(new Option('--budget <b>', 'what a recommended design may spend').argParser(Number))
  .requiredOption('-o, --output <file>', 'scenario file to write, e.g. scenario.json')
  .action((opts: { classes: string; output: string } & Record<string, unknown>) =>
    action(async () => (await import('./commands/import.js')).importCommand)(opts));

program
  .command('starter')
  .description('write a small commented example set of CSV files, a README and the scenario built from them')
  .argument('<dir>', 'folder to write into (created if missing; existing files are never overwritten)')
  .action((dir: string) => action(async () => (await import('./commands/starter.js')).starterCommand)({ dir }));

program
  .command('fit')
  .description('arrival rates per class from an event log (CSV, one row per arrival), with exact 95 % intervals, patience and a Poisson check')
  .argument('<log>', 'arrival log (CSV)')
  .requiredOption('--time <column>', 'column with the arrival times: numbers in the time unit, or ISO 8601 timestamps')
  .requiredOption('--class <column>', 'column with the class of each arrival')
  .option('--outcome <column>', 'column with matched / abandoned / waiting (for patience; needs --wait)')
  .option('--wait <column>', 'column with the time each item waited, in the time unit')
  .option('--time-unit <unit>', 'unit of numeric times and of every rate (second, minute, hour, day, week; default hour)')
  .addOption(new Option('--bands <n>', 'rates in N equal parts of the window').argParser(Number).conflicts('bandHours'))
  .option('--band-hours <list>', 'rates per hours of the day, e.g. 0-7,7-10,10-16,16-19,19-24')
  .option('--from <time>', 'start of the observation window (default: estimated from the log)')
  .option('--to <time>', 'end of the observation window (default: estimated from the log)')
  .option('--compatibilities <file>', 'compatibilities table (CSV, as for import): -o then writes a full scenario')
  .option('--json', 'machine-readable output')
  .option('-o, --output <file>', 'write the fitted classes as a scenario file (a fragment, or full with --compatibilities)')
  .action((file: string, opts: { time: string; class: string } & Record<string, unknown>) =>
    action(async () => (await import('./commands/fit.js')).fitCommand)({ ...opts, file }));

try {
  await program.parseAsync(process.argv);
} catch (e) {
  if (e instanceof CommanderError) {
    process.exitCode = e.exitCode === 0 ? 0 : 2;
  } else throw e;
}
