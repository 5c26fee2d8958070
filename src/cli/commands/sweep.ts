import { UsageError } from '../../errors.js';
import { NotationError, readAsciiIds, readAsciiPairs } from '../../output/ascii-pairs.js';
import { sweepCsv } from '../../output/csv.js';
import { sweepUseCase } from '../../usecases/sweep.js';
import { execute, type OutputOptions } from '../command.js';
import type { CommandIO } from '../io.js';
import { loadContext, type ContextFlags } from '../load.js';
import { scoringOptions, wholeNumber, type ScoringFlags } from '../options.js';

export interface SweepCommandOptions extends ContextFlags, OutputOptions, ScoringFlags {
  readonly grow?: string;
  /** Each occurrence is one variant; `a~b,c~d` adds both in the same variant. */
  readonly with?: readonly string[];
  readonly without?: readonly string[];
  readonly steps?: number | string;
}

function notation<T>(flag: string, read: () => T): T {
  try {
    return read();
  } catch (e) {
    if (e instanceof NotationError) throw new UsageError(`${flag}: ${e.message}`);
    throw e;
  }
}

/** `edgewise sweep FILE --grow a,b`: backlog (exact, or simulated with intervals) from today's rates to the stability limit. */
export function sweepCommand(opts: SweepCommandOptions, io: CommandIO): Promise<number> {
  return execute(
    {
      load: (io) => {
        if (opts.grow === undefined) throw new UsageError('--grow CLASS[,CLASS…] is required: which classes grow?');
        const grow = notation('--grow', () => readAsciiIds(opts.grow!));
        if (grow.length === 0) throw new UsageError('--grow: name at least one class');
        const steps = wholeNumber(opts.steps, '--steps', 1, 10, 1000);
        const pairs = (flag: string, text: string) => {
          const p = notation(flag, () => readAsciiPairs(text));
          if (p.length === 0) throw new UsageError(`${flag}: name at least one pair, like a~b`);
          return p;
        };
        const variants = [
          ...(opts.with ?? []).map((t) => ({ add: pairs('--with', t), remove: [] })),
          ...(opts.without ?? []).map((t) => ({ add: [], remove: pairs('--without', t) })),
        ];
        const scoring = scoringOptions(opts);
        return { ctx: loadContext(opts, io.cwd), input: { grow, variants, steps, ...scoring } };
      },
      run: ({ ctx, input }) => sweepUseCase(ctx, input),
      text: async (r) => (await import('../../output/text/sweep.js')).sweepText(r),
      csv: (r) => sweepCsv(r),
    },
    opts,
    io,
  );
}
