import { sensitivityUseCase } from '../../usecases/sensitivity.js';
import { sensitivityText } from '../../output/text/sensitivity.js';
import { sensitivityCsv } from '../../output/csv.js';
import { execute, type OutputOptions } from '../command.js';
import type { CommandIO } from '../io.js';
import { loadContext, type ContextFlags } from '../load.js';
import { checkMaxSets } from '../options.js';

export interface SensitivityCommandOptions extends ContextFlags, OutputOptions {
  readonly allPairs?: boolean;
  readonly maxSets?: number;
}

/** `edgewise sensitivity FILE`: the exact effect of every single change, with the rules that allow it. */
export function sensitivityCommand(opts: SensitivityCommandOptions, io: CommandIO): Promise<number> {
  return execute(
    {
      load: (io) => {
        checkMaxSets(opts.maxSets);
        return loadContext(opts, io.cwd);
      },
      run: (ctx) => sensitivityUseCase(ctx, { allPairs: opts.allPairs === true, ...(opts.maxSets === undefined ? {} : { maxSets: opts.maxSets }) }),
      text: (r) => sensitivityText(r),
      csv: (r) => sensitivityCsv(r),
      exitCode: (r) => (r.base.stable ? 0 : 3),
    },
    opts,
    io,
  );
}
