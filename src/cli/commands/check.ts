import { checkUseCase } from '../../usecases/check.js';
import { execute, type OutputOptions } from '../command.js';
import type { CommandIO } from '../io.js';
import { loadContext, type ContextFlags } from '../load.js';

export interface CheckOptions extends ContextFlags, OutputOptions {}

/** `edgewise check FILE`: is the design stable, how much room is left, and the ways out when it is not. */
export function checkCommand(opts: CheckOptions, io: CommandIO): Promise<number> {
  return execute(
    {
      load: (io) => loadContext(opts, io.cwd),
      run: (ctx) => checkUseCase(ctx),
      text: async (r, ctx) => (await import('../../output/text/check.js')).checkText(r, ctx.costUnit),
      exitCode: (r) => (r.stable ? 0 : 3),
    },
    opts,
    io,
  );
}
