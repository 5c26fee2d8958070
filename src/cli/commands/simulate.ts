/**
 * `edgewise simulate FILE`: replications of the matching system under a policy, with 95 % intervals,
 * wait percentiles, abandonment, and the exact FCFM value beside each estimate when the exact
 * evaluator can handle the design. On SIGINT it prints what the finished replications give.
 */
import { availableParallelism } from 'node:os';
import { UsageError } from '../../errors.js';
import { readAsciiIds } from '../../output/ascii-pairs.js';
import { isPolicyName, POLICIES } from '../../sim/policy.js';
import { simulateUseCase } from '../../usecases/simulate.js';
import { execute, type OutputOptions } from '../command.js';
import type { CommandIO } from '../io.js';
import { loadContext, type ContextFlags } from '../load.js';
import { checkMaxSets, checkWaitUnit, wholeNumber } from '../options.js';
import { progressBar } from '../progress.js';

export interface SimulateOptions extends ContextFlags, OutputOptions {
  readonly policy?: string;
  /** Class ids, first = most preferred partner (with --policy ranked). */
  readonly rank?: string;
  readonly arrivals?: number | string;
  readonly replications?: number | string;
  readonly warmup?: number | string;
  readonly seed?: number | string;
  readonly jobs?: number | string;
  readonly maxWaiting?: number | string;
  readonly maxSets?: number;
  readonly timed?: boolean;
  readonly waitUnit?: string;
}

/**
 * Default memory guard of the exact column: the simulator is also meant for designs too large for
 * exact evaluation, so it gives up early (about 40 MB) unless --max-sets asks for more.
 */
export const EXACT_COLUMN_MAX_SETS = 1_000_000;

export function simulateCommand(opts: SimulateOptions, io: CommandIO): Promise<number> {
  let simulateText: typeof import('../../output/text/simulate.js').simulateText | undefined;
  const bar = progressBar(io, 'simulating [{bar}] {percentage}% | {value}/{total} arrivals | eta {eta_formatted}');
  return execute(
    {
      load: (io) => {
        const policy = opts.policy ?? 'fcfm';
        if (!isPolicyName(policy)) throw new UsageError(`--policy must be one of ${POLICIES.join(', ')}, got "${policy}"`);
        if (opts.rank !== undefined && policy !== 'ranked') throw new UsageError('--rank only applies with --policy ranked');
        if (policy === 'ranked' && opts.rank === undefined) throw new UsageError('--policy ranked needs --rank a,b,c (first = most preferred partner class)');
        checkMaxSets(opts.maxSets);
        checkWaitUnit(opts.waitUnit);
        const input = {
          policy,
          ...(opts.rank === undefined ? {} : { ranking: readAsciiIds(opts.rank) }),
          ...(opts.arrivals === undefined ? {} : { arrivals: wholeNumber(opts.arrivals, '--arrivals', 1, 0) }),
          ...(opts.replications === undefined ? {} : { replications: wholeNumber(opts.replications, '--replications', 1, 0) }),
          ...(opts.warmup === undefined ? {} : { warmup: wholeNumber(opts.warmup, '--warmup', 0, 0) }),
          ...(opts.seed === undefined ? {} : { seed: wholeNumber(opts.seed, '--seed', 0, 0) }),
          ...(opts.maxWaiting === undefined ? {} : { maxWaiting: wholeNumber(opts.maxWaiting, '--max-waiting', 1, 0) }),
          jobs: wholeNumber(opts.jobs, '--jobs', 1, availableParallelism(), 256),
          timed: opts.timed === true,
          exactMaxSets: opts.maxSets ?? EXACT_COLUMN_MAX_SETS,
          ...(io.isTTY && !opts.json ? { onProgress: (done: number, total: number) => bar.update(done, total) } : {}),
          ...(io.signal ? { signal: io.signal } : {}),
        };
        return { ctx: loadContext(opts, io.cwd), input };
      },
      run: async ({ ctx, input }) => {
        // the text renderer loads while the replications run (see src/cli/command.ts)
        const renderer = opts.json ? undefined : import('../../output/text/simulate.js');
        void renderer?.catch(() => undefined);
        try {
          const record = await simulateUseCase(ctx, input);
          if (renderer) simulateText = (await renderer).simulateText;
          return record;
        } finally {
          bar.stop();
        }
      },
      text: (r) => simulateText!(r, opts.waitUnit ? { waitUnit: opts.waitUnit } : {}),
      exitCode: (r) => (r.partial ? 130 : 0),
    },
    opts,
    io,
  );
}
