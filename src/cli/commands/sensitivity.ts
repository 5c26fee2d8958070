import { sensitivityUseCase } from '../../usecases/sensitivity.js';
import { sensitivityCsv } from '../../output/csv.js';
import { execute, type OutputOptions } from '../command.js';
import type { CommandIO } from '../io.js';
import { loadContext, type ContextFlags } from '../load.js';
import { scoringOptions, type ScoringFlags } from '../options.js';

export interface SensitivityCommandOptions extends ContextFlags, OutputOptions, ScoringFlags {
  readonly allPairs?: boolean;
}

/** `edgewise sensitivity FILE`: the effect of every single change (exact, or simulated with intervals), with the rules that allow it. */
export function sensitivityCommand(opts: SensitivityCommandOptions, io: CommandIO): Promise<number> {
  return execute(
    {
      load: (io) => {
        const scoring = scoringOptions(opts);
        return { ctx: loadContext(opts, io.cwd), scoring };
      },
      run: ({ ctx, scoring }) => sensitivityUseCase(ctx, { allPairs: opts.allPairs === true, ...scoring }),
      text: async (r) => (await import('../../output/text/sensitivity.js')).sensitivityText(r),
      csv: (r) => sensitivityCsv(r),
      exitCode: (r) => (r.base.stable ? 0 : 3),
    },
    opts,
    io,
  );
}
