import { evaluateUseCase } from '../../usecases/evaluate.js';
import { execute, type OutputOptions } from '../command.js';
import type { CommandIO } from '../io.js';
import { loadContext, type ContextFlags } from '../load.js';
import { checkMaxSets, checkWaitUnit, scoreMethod, wholeNumber } from '../options.js';

export interface EvaluateOptions extends ContextFlags, OutputOptions {
  readonly maxSets?: number;
  readonly waitUnit?: string;
  readonly score?: string;
  readonly seed?: number | string;
  readonly jobs?: number | string;
}

/** `edgewise evaluate FILE`: the exact steady state of a design under FCFM. */
export function evaluateCommand(opts: EvaluateOptions, io: CommandIO): Promise<number> {
  return execute(
    {
      load: (io) => {
        checkMaxSets(opts.maxSets);
        checkWaitUnit(opts.waitUnit);
        const score = scoreMethod(opts.score);
        const seed = wholeNumber(opts.seed, '--seed', 0, 1);
        const jobs = wholeNumber(opts.jobs, '--jobs', 1, 1, 256);
        return { ctx: loadContext(opts, io.cwd), score, seed, jobs };
      },
      run: ({ ctx, score, seed, jobs }) => evaluateUseCase(ctx, { score, seed, jobs, ...(opts.maxSets === undefined ? {} : { maxSets: opts.maxSets }) }),
      text: async (r, { ctx }) => (await import('../../output/text/evaluate.js')).evaluateText(r, { costUnit: ctx.costUnit, ...(opts.waitUnit ? { waitUnit: opts.waitUnit } : {}) }),
      exitCode: (r) => (r.stable ? 0 : 3),
    },
    opts,
    io,
  );
}
