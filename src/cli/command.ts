/**
 * How every command runs: load (options and files → typed input) → run (the use case → one record)
 * → render (text, JSON or CSV through the output layer) → exit code. Warnings in the record go to
 * standard error as well, so a figure that ignores something the file says is never silent.
 */
import { UsageError } from '../errors.js';
import type { Block } from '../output/text/doc.js';
import type { CommandIO } from './io.js';

/**
 * The output modules, imported when the command starts and awaited only after its work: their
 * loading is left to the event loop's first turn, so a command that starts worker threads
 * (`simulate`) loads them while the workers run instead of before it hands them their work. The
 * text modules (documents, wrapping: string-width, whose set-up alone costs about 10 ms) are loaded
 * only for text output, or for warnings.
 */
const jsonModule = () => import('../output/machine.js');
const textModules = () => Promise.all([import('../output/text/doc.js'), import('../output/text/wrap.js')]).then(([doc, wrap]) => ({ renderDoc: doc.renderDoc, wrap: wrap.wrap }));

/** The output switches every command shares. */
export interface OutputOptions {
  readonly json?: boolean;
  readonly csv?: boolean;
  /** Text: one table with every column, whatever the width. */
  readonly wide?: boolean;
}

export interface CommandSpec<I, R extends { readonly warnings: readonly string[] }> {
  /** Options and files → the use case's input (throws UsageError, InvalidScenarioError…). */
  load(io: CommandIO): Promise<I> | I;
  run(input: I, io: CommandIO): Promise<R>;
  /** The record for people (a command may import its text module here, when it is needed). */
  text(record: R, input: I): Block[] | Promise<Block[]>;
  /** The record as CSV, for commands that have a CSV form. */
  csv?(record: R, input: I): string;
  /** The record as JSON (default: the whole record, rounded). */
  json?(record: R, input: I): string;
  /** Exit code of a finished run (default 0), e.g. 3 for an unstable design. */
  exitCode?(record: R, input: I): number;
  /** Runs after the output is written (e.g. the report's file), before the exit code is returned. */
  after?(record: R, input: I, io: CommandIO): Promise<void> | void;
}

/** Runs a command; errors propagate to runWithExitCode (src/cli/exit.ts). */
export async function execute<I, R extends { readonly warnings: readonly string[] }>(spec: CommandSpec<I, R>, out: OutputOptions, io: CommandIO): Promise<number> {
  if (out.json && out.csv) throw new UsageError('choose one of --json and --csv');
  if (out.csv && !spec.csv) throw new UsageError('this command has no CSV output; use --json');
  const json = out.json && !spec.json ? jsonModule() : undefined;
  let text = !out.json && !out.csv ? textModules() : undefined;
  for (const p of [json, text]) void p?.catch(() => undefined); // awaited after the work
  const input = await spec.load(io);
  const record = await spec.run(input, io);
  if (out.json) io.out(spec.json ? spec.json(record, input) : (await json!).renderJson(record));
  else if (out.csv) io.out(spec.csv!(record, input));
  else io.out((await text!).renderDoc(await spec.text(record, input), { width: io.columns, wide: out.wide === true }));
  if (record.warnings.length > 0) {
    const { wrap } = await (text ??= textModules());
    for (const w of record.warnings) io.err(`${wrap(`warning: ${w}`, io.columns, '  ').join('\n')}\n`);
  }
  await spec.after?.(record, input, io);
  return spec.exitCode ? spec.exitCode(record, input) : 0;
}
