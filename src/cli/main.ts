#!/usr/bin/env node
/**
 * The edgewise command line. This file only declares commands and flags; each command's work lives
 * in src/cli/commands/<name>.ts, imported lazily (a command loads only what it uses), and
 * src/cli/exit.ts turns errors into exit codes.
 *
 * Interrupts: the first SIGINT or SIGTERM aborts the run's signal — `recommend`, `simulate` and
 * `report` stop their workers and print (or write) what they found so far, marked partial, then exit
 * 130; other commands
 * exit 130 at once. A second signal exits at once. Every exit path gives the terminal back (cursor
 * shown, line wrap on).
 */
import { Command, CommanderError, Option } from 'commander';
import { runWithExitCode } from './exit.js';
import { textWidth, type CommandIO } from './io.js';
import { restoreTerminal } from './progress.js';

const controller = new AbortController();
/** Commands that stop gracefully on the first signal (they give partial results). */
const GRACEFUL = new Set(['recommend', 'simulate', 'report']);
let running = '';
let signals = 0;
const onSignal = (): void => {
  signals++;
  restoreTerminal((s) => process.stderr.write(s));
  if (signals === 1 && GRACEFUL.has(running)) {
    process.stderr.write('\nedgewise: interrupted; finishing with what was found so far (press Ctrl-C again to stop at once)\n');
    controller.abort();
    return;
  }
  process.exit(130);
};
process.on('SIGINT', onSignal);
process.on('SIGTERM', onSignal);
process.on('exit', () => restoreTerminal((s) => process.stderr.write(s)));

const io: CommandIO = {
  cwd: process.cwd(),
  out: (t) => void process.stdout.write(t),
  err: (t) => void process.stderr.write(t),
  isTTY: Boolean(process.stderr.isTTY),
  columns: textWidth(process.stdout.isTTY ? process.stdout.columns : undefined, process.env),
  signal: controller.signal,
};

/** Runs a command module's function and sets the exit code. */
function action<O>(name: string, load: () => Promise<(opts: O, io: CommandIO) => Promise<number>>) {
  return async (opts: O): Promise<void> => {
    running = name;
    const code = await runWithExitCode(io, async () => (await load())(opts, io));
    process.exitCode = code;
  };
}

const collect = (v: string, prev: string[] = []): string[] => [...prev, v];

/** The flags every command that looks at one scenario shares. */
function scenarioFlags(c: Command, { budget = false, design = true, csv = false } = {}): Command {
  c.argument('<file>', 'scenario file (JSON)');
  if (design) {
    c.option('--design <file>', 'use this design instead of today\'s: a JSON {"added": [...], "removed": [...]} or the file `recommend --save` writes');
    c.option('--demand <name>', "evaluate under this demand variant of the scenario instead of the classes' rates");
  }
  if (budget) c.option('--budget <b>', "most a design may cost (default: the scenario's budget, else unlimited)");
  c.option('--json', 'machine-readable output (JSON)');
  if (csv) c.option('--csv', 'machine-readable output (CSV)');
  c.option('--wide', 'text: one table with every column, whatever the terminal width');
  return c;
}

/** --score, --seed, --max-sets (and --jobs) of the commands that score designs (src/usecases/scoring.ts). */
function scoringFlags(c: Command, jobs: string | null): Command {
  c.option('--score <method>', 'exact | simulation | auto (default): exact where feasible and no patience, else simulated with 95 % intervals');
  c.option('--seed <s>', 'seed of the simulation streams when figures are simulated (default 1)');
  c.addOption(new Option('--max-sets <n>', 'memory guard of the exact evaluation (independent sets per design)').argParser(Number));
  if (jobs !== null) c.option('--jobs <j>', jobs);
  return c;
}

const program = new Command();
program
  .name('edgewise')
  .description('Exact evaluation and budgeted design of compatibility graphs for dynamic matching systems.')
  .version('0.2.0')
  .showHelpAfterError()
  .exitOverride();

scenarioFlags(program.command('check').description('is the design stable, how much room is left, and the ways out when it is not?')).action(
  (file: string, opts: Record<string, unknown>) => action('check', async () => (await import('./commands/check.js')).checkCommand)({ ...opts, file }),
);

scenarioFlags(program.command('evaluate').description('exact steady state under FCFM: backlog, waits, matches at once, where matches happen'))
  .addOption(new Option('--max-sets <n>', 'refuse above this many independent sets (memory guard)').argParser(Number))
  .option('--wait-unit <unit>', 'show waits in this unit: second, minute, hour, day or week (default: automatic)')
  .option('--score <method>', 'exact | simulation | auto (default): exact where feasible and no patience, else simulated with 95 % intervals')
  .option('--seed <s>', 'seed of the simulation when the figures are simulated (default 1)')
  .option('--jobs <j>', 'threads of the simulation, this one included (default 1); the output does not depend on it')
  .action((file: string, opts: Record<string, unknown>) => action('evaluate', async () => (await import('./commands/evaluate.js')).evaluateCommand)({ ...opts, file }));

scenarioFlags(program.command('simulate').description('simulate a matching policy: backlog, waits and percentiles, abandonment, with 95 % intervals'))
  .addOption(new Option('--policy <name>', 'fcfm | most-waiting | ranked | random-class').default('fcfm'))
  .option('--rank <classes>', 'comma-separated class ids, first = most preferred partner (with --policy ranked)')
  .option('--arrivals <n>', 'measured arrivals per replication (default 2000000)')
  .option('--replications <r>', 'independent replications (default 8)')
  .option('--warmup <w>', 'arrivals discarded first in each replication (default arrivals/10)')
  .option('--seed <s>', 'random seed (default 1); the same seed gives the same output whatever --jobs')
  .option('--jobs <j>', 'threads that run replications, this one included (default: the number of cores)')
  .option('--max-waiting <n>', 'stop when more items wait at once (default 5000000)')
  .addOption(new Option('--max-sets <n>', 'memory guard of the exact FCFM column, in independent sets (default 1000000)').argParser(Number))
  .option('--timed', 'simulate the Poisson clock explicitly (slower; automatic when classes have patience)')
  .option('--wait-unit <unit>', 'show waits in this unit (default: automatic)')
  .action((file: string, opts: Record<string, unknown>) =>
    action('simulate', async () => {
      await (await import('./prestart.js')).prestartSimulation(opts); // workers boot while the command loads
      return (await import('./commands/simulate.js')).simulateCommand;
    })({ ...opts, file }),
  );

scoringFlags(scenarioFlags(program.command('sensitivity').description('effect of every single change (exact, or simulated with intervals), with the rules that allow it, flagged and explained'), { csv: true }), 'worker threads of the simulated scoring (default 1); the output does not depend on it')
  .option('--all-pairs', 'try every absent pair (self-pairs included), not only the candidates')
  .action((file: string, opts: Record<string, unknown>) => action('sensitivity', async () => (await import('./commands/sensitivity.js')).sensitivityCommand)({ ...opts, file }));

scoringFlags(scenarioFlags(program.command('sweep').description('grow some classes to the stability limit: backlog of the design and of variants (exact or simulated), crossovers'), { csv: true }), 'worker threads of the simulated scoring (default 1); the output does not depend on it')
  .requiredOption('--grow <classes>', 'comma-separated class ids whose rates grow together (a %2C inside an id)')
  .option('--with <pairs>', 'a variant adding compatibilities, e.g. a~b or a~b,c~d (repeatable: one variant each)', collect)
  .option('--without <pairs>', 'a variant removing compatibilities (repeatable: one variant each)', collect)
  .option('--steps <n>', 'steps after today (default 10)')
  .action((file: string, opts: Record<string, unknown>) => action('sweep', async () => (await import('./commands/sweep.js')).sweepCommand)({ ...opts, file }));

scenarioFlags(program.command('recommend').description('budgeted design: the Pareto set, the recommended design and every single-change verdict against it'), { budget: true, csv: true })
  .addOption(new Option('--objective <name>', 'total | weighted | max-wait | net-value (value of matches − waiting cost; needs values in the file) | abandonment (share of arrivals that give up; simulated, needs patience)').default('total'))
  .option('--jobs <j>', 'worker threads scoring designs (default 1); the output does not depend on it')
  .option('--exhaustive', 'enumerate every design (at most 20 removable compatibilities and candidates)')
  .option('--seed <s>', 'seed of the local search and of the simulation streams (default 1)')
  .option('--score <method>', 'exact | simulation | auto (default): exact where feasible and no patience, else simulated per design')
  .option('--max-designs <n>', 'designs a search may score (default: when simulated, 1500 at 100+ classes, up to 4500 on smaller ones; when exact, 1e9 over the set count of a design, at least 300)')
  .addOption(new Option('--max-sets <n>', 'memory guard of the exact evaluation (independent sets per design)').argParser(Number))
  .option('--wait-unit <unit>', 'show waits in this unit (default: automatic)')
  .option('--save <file>', 'write the recommended design (or --pick K) to a design file for --design')
  .option('--pick <k>', 'with --save: the K-th design of the Pareto set (cheapest first) instead of the recommended one')
  .action((file: string, opts: Record<string, unknown>) =>
    action('recommend', async () => {
      await (await import('./prestart.js')).prestartScoring(opts); // workers boot while the command loads
      return (await import('./commands/recommend.js')).recommendCommand;
    })({ ...opts, file }),
  );

scoringFlags(program
  .command('compare'), null)
  .description('side by side: one column per scenario (or per budget): stability, backlog, the recommended design, the robust choice')
  .argument('<files...>', 'scenario files (JSON)')
  .option('--budgets <list>', 'budgets to compare, e.g. 50,100,200 (one column per scenario and budget)')
  .option('--design <file>', 'a design file applied to every column instead of today\'s')
  .option('--demand <name>', 'use this demand variant as the rates of every column')
  .option('--rate-intervals', 'add the demand variants "fitted low" and "fitted high" from the classes\' fitted rate intervals (rateCi95)')
  .option('--json', 'machine-readable output (JSON)')
  .option('--csv', 'one CSV line per column')
  .option('--wide', 'text: one table with every column, whatever the terminal width')
  .option('--jobs <n>', 'columns evaluated at once (default 2)')
  .option('--max-designs <n>', 'designs the recommender of each column may score (as recommend)')
  .action((files: string[], opts: Record<string, unknown>) => action('compare', async () => (await import('./commands/compare.js')).compareCommand)({ ...opts, files }));

scoringFlags(scenarioFlags(program.command('report').description('one self-contained HTML report: the decision, the graph, cost against waiting, waits, load sweep, single changes, demand futures, inputs'), { budget: true }), null)
  .requiredOption('-o, --output <file>', 'HTML file to write, e.g. report.html')
  .option('--rate-intervals', 'add the demand variants "fitted low" and "fitted high" from the classes\' fitted rate intervals (rateCi95)')
  .option('--jobs <n>', 'worker threads of the recommender and of the simulated scoring (default 1)')
  .option('--max-designs <n>', 'designs the recommender may score (default 600 when designs are simulated)')
  .action((file: string, opts: Record<string, unknown>) => action('report', async () => (await import('./commands/report.js')).reportCommand)({ ...opts, file }));

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
    action('import', async () => (await import('./commands/import.js')).importCommand)(opts));

program
  .command('starter')
  .description('write a small commented example set of CSV files, a README and the scenario built from them')
  .argument('<dir>', 'folder to write into (created if missing; existing files are never overwritten)')
  .action((dir: string) => action('starter', async () => (await import('./commands/starter.js')).starterCommand)({ dir }));

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
    action('fit', async () => (await import('./commands/fit.js')).fitCommand)({ ...opts, file }));

try {
  await program.parseAsync(process.argv);
} catch (e) {
  if (e instanceof CommanderError) {
    process.exitCode = e.exitCode === 0 ? 0 : 2;
  } else throw e;
}
