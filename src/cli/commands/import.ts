import { UsageError } from '../../errors.js';
import { importScenario } from '../../intake/import-scenario.js';
import type { Scenario } from '../../model/scenario.js';
import type { CommandIO } from '../io.js';
import { execute } from '../command.js';
import { finiteNumber } from '../options.js';
import { importText } from '../../output/text/intake.js';
import { renderJson } from '../../output/machine.js';
import { readInputFile } from '../load.js';
import { prepareOutput, writeFileAtomic } from '../write.js';

export interface ImportOptions {
  readonly classes: string;
  readonly compatibilities?: string;
  readonly candidates?: string;
  readonly name?: string;
  readonly timeUnit?: string;
  readonly budget?: number | string;
  readonly json?: boolean;
  readonly output: string;
}

/** `edgewise import --classes classes.csv [--compatibilities …] [--candidates …] -o scenario.json`. */
export function importCommand(opts: ImportOptions, io: CommandIO): Promise<number> {
  return execute(
    {
      load: (io) => {
        const budget = finiteNumber(opts.budget, '--budget', 0);
        if (opts.timeUnit !== undefined && opts.timeUnit.trim() === '') throw new UsageError('--time-unit needs a name, e.g. --time-unit hour');
        const inputs = [opts.classes, opts.compatibilities, opts.candidates].filter((f): f is string => f !== undefined);
        const target = prepareOutput(opts.output ?? '', io.cwd, inputs);
        const table = (file: string | undefined) => (file === undefined ? undefined : { text: readInputFile(file, io.cwd), file });
        return { target, budget, classes: table(opts.classes)!, compatibilities: table(opts.compatibilities), candidates: table(opts.candidates) };
      },
      run: async ({ target, budget, classes, compatibilities, candidates }) => {
        const { document, scenario } = importScenario({
          classes,
          ...(compatibilities ? { compatibilities } : {}),
          ...(candidates ? { candidates } : {}),
          ...(opts.name === undefined ? {} : { name: opts.name }),
          ...(opts.timeUnit === undefined ? {} : { timeUnit: opts.timeUnit }),
          ...(budget === undefined ? {} : { budget }),
        });
        writeFileAtomic(target, `${JSON.stringify(document, null, 2)}\n`);
        return { warnings: [] as string[], output: opts.output, scenario: scenario as Scenario };
      },
      text: (r) => importText(r.output, r.scenario),
      json: (r) => renderJson({ output: r.output, classes: r.scenario.classes.length, compatibilities: r.scenario.compatibilities.length, candidates: r.scenario.candidates.length, warnings: r.warnings }),
    },
    opts,
    io,
  );
}
