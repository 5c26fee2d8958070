import { UsageError } from '../../errors.js';
import { importScenario } from '../../intake/import-scenario.js';
import type { Scenario } from '../../model/scenario.js';
import type { CommandIO } from '../io.js';
import { wrap } from '../../output/text/wrap.js';
import { readInputFile } from '../load.js';
import { prepareOutput, writeFileAtomic } from '../write.js';

export interface ImportOptions {
  readonly classes: string;
  readonly compatibilities?: string;
  readonly candidates?: string;
  readonly name?: string;
  readonly timeUnit?: string;
  readonly budget?: number;
  readonly output: string;
}

const count = (n: number, one: string, many: string): string => `${n} ${n === 1 ? one : many}`;

/** The one line printed after writing. */
export function renderImport(output: string, s: Scenario): string {
  const removable = s.compatibilities.filter((c) => c.removable).length;
  const budget = s.budget === undefined ? '' : `, budget ${s.budget}`;
  return (
    `wrote ${output}: ${count(s.classes.length, 'class', 'classes')}, ${count(s.compatibilities.length, 'compatibility', 'compatibilities')}` +
    ` (${removable} removable), ${count(s.candidates.length, 'candidate', 'candidates')}${budget} · next: edgewise check ${output}\n`
  );
}

/** `edgewise import --classes classes.csv [--compatibilities …] [--candidates …] -o scenario.json`. */
export async function importCommand(opts: ImportOptions, io: CommandIO): Promise<number> {
  if (opts.budget !== undefined && !(Number.isFinite(opts.budget) && opts.budget >= 0)) throw new UsageError(`--budget must be a number >= 0, got ${opts.budget}`);
  if (opts.timeUnit !== undefined && opts.timeUnit.trim() === '') throw new UsageError('--time-unit needs a name, e.g. --time-unit hour');
  const inputs = [opts.classes, opts.compatibilities, opts.candidates].filter((f): f is string => f !== undefined);
  const target = prepareOutput(opts.output ?? '', io.cwd, inputs);
  const table = (file: string | undefined) => (file === undefined ? undefined : { text: readInputFile(file, io.cwd), file });
  const compatibilities = table(opts.compatibilities);
  const candidates = table(opts.candidates);
  const { document, scenario } = importScenario({
    classes: table(opts.classes)!,
    ...(compatibilities ? { compatibilities } : {}),
    ...(candidates ? { candidates } : {}),
    ...(opts.name === undefined ? {} : { name: opts.name }),
    ...(opts.timeUnit === undefined ? {} : { timeUnit: opts.timeUnit }),
    ...(opts.budget === undefined ? {} : { budget: opts.budget }),
  });
  writeFileAtomic(target, `${JSON.stringify(document, null, 2)}\n`);
  io.out(`${wrap(renderImport(opts.output, scenario).trimEnd(), io.columns, '  ').join('\n')}\n`);
  return 0;
}
