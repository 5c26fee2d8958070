import { UsageError } from '../../errors.js';
import { compareCsv } from '../../output/csv.js';
import { compareUseCase } from '../../usecases/compare.js';
import { execute, type OutputOptions } from '../command.js';
import type { CommandIO } from '../io.js';
import { loadContext } from '../load.js';
import { scoringOptions, wholeNumber, type ScoringFlags } from '../options.js';

export interface CompareOptions extends OutputOptions, Omit<ScoringFlags, 'jobs'> {
  readonly files: readonly string[];
  /** "50,100,200" */
  readonly budgets?: string;
  readonly design?: string;
  readonly demand?: string;
  readonly rateIntervals?: boolean;
  /** Columns evaluated at once. */
  readonly jobs?: number | string;
  /** Designs the recommender of each column may score. */
  readonly maxDesigns?: number | string;
}

/** Parses "50,100,200" into distinct budgets (each a finite number >= 0). */
export function parseBudgets(text: string): number[] {
  const out: number[] = [];
  for (const p of text.split(',').map((s) => s.trim())) {
    const v = p === '' ? NaN : Number(p);
    if (!Number.isFinite(v) || v < 0) throw new UsageError(`--budgets takes numbers >= 0 separated by commas, e.g. 50,100,200; "${p}" is not one`);
    if (out.includes(v)) throw new UsageError(`--budgets names ${p} twice`);
    out.push(v);
  }
  return out;
}

/** `edgewise compare FILE… [--budgets 50,100,200] [--json|--csv]`. */
export function compareCommand(opts: CompareOptions, io: CommandIO): Promise<number> {
  return execute(
    {
      load: (io) => {
        if (opts.files.length === 0) throw new UsageError('compare needs at least one scenario file');
        const concurrency = wholeNumber(opts.jobs, '--jobs', 1, 2, 64);
        // --jobs here is the number of columns at once: each column scores in its own thread
        const { jobs: _, ...scoring } = scoringOptions({ ...opts, jobs: undefined });
        const maxDesigns = opts.maxDesigns === undefined ? undefined : wholeNumber(opts.maxDesigns, '--max-designs', 1, 1);
        const budgets = opts.budgets === undefined ? undefined : parseBudgets(opts.budgets);
        const flags = { ...(opts.design ? { design: opts.design } : {}), ...(opts.demand ? { demand: opts.demand } : {}), ...(opts.rateIntervals ? { rateIntervals: true } : {}) };
        const columns = opts.files.flatMap((file) =>
          budgets ? budgets.map((budget) => ({ ctx: loadContext({ file, budget, ...flags }, io.cwd), budget })) : [{ ctx: loadContext({ file, ...flags }, io.cwd) }],
        );
        if (io.isTTY && !opts.json && !opts.csv) io.err(`edgewise compare: ${columns.length} column${columns.length === 1 ? '' : 's'}, ${concurrency} at a time…\n`);
        return { columns, recommend: maxDesigns === undefined ? {} : { maxDesigns }, scoring, concurrency };
      },
      run: (input) => compareUseCase(input),
      text: async (r) => (await import('../../output/text/compare.js')).compareText(r),
      csv: (r) => compareCsv(r),
    },
    opts,
    io,
  );
}
