import { UsageError } from '../../errors.js';
import { fitLog } from '../../intake/fit-log.js';
import { fitRecord } from '../../intake/fit-record.js';
import { fitScenario } from '../../intake/fit-scenario.js';
import { fitText } from '../../output/text/intake.js';
import { execute } from '../command.js';
import { wholeNumber } from '../options.js';
import type { CommandIO } from '../io.js';
import { readInputFile } from '../load.js';
import { prepareOutput, writeFileAtomic } from '../write.js';

export interface FitCommandOptions {
  readonly file: string;
  readonly time: string;
  readonly class: string;
  readonly outcome?: string;
  readonly wait?: string;
  readonly timeUnit?: string;
  readonly bands?: number | string;
  readonly bandHours?: string;
  readonly from?: string;
  readonly to?: string;
  readonly compatibilities?: string;
  readonly json?: boolean;
  readonly output?: string;
}

/** `edgewise fit LOG.csv --time COL --class COL …`: rates with exact intervals, patience, dispersion. */
export function fitCommand(opts: FitCommandOptions, io: CommandIO): Promise<number> {
  let wrote: string | null = null;
  return execute(
    {
      load: (io) => {
        if (opts.compatibilities !== undefined && opts.output === undefined) throw new UsageError('--compatibilities builds a scenario file: give it a name with -o, e.g. -o scenario.json');
        const inputs = [opts.file, ...(opts.compatibilities ? [opts.compatibilities] : [])];
        const target = opts.output === undefined ? undefined : prepareOutput(opts.output, io.cwd, inputs);
        const bands = opts.bands === undefined ? undefined : wholeNumber(opts.bands, '--bands', 1, 1, 1000);
        return { target, log: readInputFile(opts.file, io.cwd), bands };
      },
      run: async ({ target, log, bands }, io) => {
        const result = fitLog(log, opts.file, {
          time: opts.time,
          class: opts.class,
          ...(opts.outcome === undefined ? {} : { outcome: opts.outcome }),
          ...(opts.wait === undefined ? {} : { wait: opts.wait }),
          ...(opts.timeUnit === undefined ? {} : { timeUnit: opts.timeUnit }),
          ...(bands === undefined ? {} : { bands }),
          ...(opts.bandHours === undefined ? {} : { bandHours: opts.bandHours }),
          ...(opts.from === undefined ? {} : { from: opts.from }),
          ...(opts.to === undefined ? {} : { to: opts.to }),
        });
        const record = fitRecord(result);
        if (target !== undefined) {
          const warnings: string[] = [];
          const compatibilities = opts.compatibilities === undefined ? undefined : { text: readInputFile(opts.compatibilities, io.cwd), file: opts.compatibilities };
          const { document } = fitScenario(result, compatibilities ? { compatibilities } : {}, warnings);
          writeFileAtomic(target, `${JSON.stringify(document, null, 2)}\n`);
          wrote = `wrote ${opts.output}: ${compatibilities ? `a scenario with the compatibilities of ${opts.compatibilities}` : 'a scenario fragment (classes only: add compatibilities with --compatibilities FILE)'}`;
          return { ...record, warnings: [...record.warnings, ...warnings] };
        }
        return record;
      },
      text: (r) => fitText(r, wrote),
      after: (_r, _i, io) => {
        if (opts.json && wrote) io.err(`${wrote}\n`);
      },
    },
    opts,
    io,
  );
}
