import { evaluateUseCase } from '../../usecases/evaluate.js';
import { evaluateText } from '../../output/text/evaluate.js';
import { execute, type OutputOptions } from '../command.js';
import type { CommandIO } from '../io.js';
import { loadContext, type ContextFlags } from '../load.js';
import { checkMaxSets, checkWaitUnit } from '../options.js';

export interface EvaluateOptions extends ContextFlags, OutputOptions {
  readonly maxSets?: number;
  readonly waitUnit?: string;
}

/** `edgewise evaluate FILE`: the exact steady state of a design under FCFM. */
export function evaluateCommand(opts: EvaluateOptions, io: CommandIO): Promise<number> {
  return execute(
    {
      load: (io) => {
        checkMaxSets(opts.maxSets);
        checkWaitUnit(opts.waitUnit);
        return loadContext(opts, io.cwd);
      },
      run: (ctx) => evaluateUseCase(ctx, opts.maxSets === undefined ? {} : { maxSets: opts.maxSets }),
      text: (r, ctx) => evaluateText(r, { costUnit: ctx.costUnit, ...(opts.waitUnit ? { waitUnit: opts.waitUnit } : {}) }),
      exitCode: (r) => (r.stable ? 0 : 3),
    },
    opts,
    io,
  );
}
