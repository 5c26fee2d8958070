import { UsageError } from '../../errors.js';
import { OBJECTIVES, type ObjectiveName } from '../../design/space/objective.js';
import { recommendCsv } from '../../output/csv.js';
import { renderJson } from '../../output/machine.js';
import { recommendUseCase, type RecommendRecord } from '../../usecases/recommend.js';
import { savedDesign } from '../../usecases/saved-design.js';
import { execute, type OutputOptions } from '../command.js';
import type { CommandIO } from '../io.js';
import { loadContext, type ContextFlags } from '../load.js';
import { checkMaxSets, checkWaitUnit, scoreMethod, wholeNumber } from '../options.js';
import { progressBar } from '../progress.js';
import { prepareOutput, writeFileAtomic } from '../write.js';

export interface RecommendCommandOptions extends ContextFlags, OutputOptions {
  readonly objective?: string;
  readonly jobs?: number | string;
  readonly exhaustive?: boolean;
  readonly seed?: number | string;
  readonly maxSets?: number;
  readonly maxDesigns?: number | string;
  readonly waitUnit?: string;
  readonly score?: string;
  /** Write the chosen design (the recommended one, or Pareto entry --pick K) to this file. */
  readonly save?: string;
  readonly pick?: number | string;
}

/** `edgewise recommend FILE`: the Pareto set within the budget, the recommended design and every verdict against it. */
export function recommendCommand(opts: RecommendCommandOptions, io: CommandIO): Promise<number> {
  const bar = progressBar(io, 'recommend [{bar}] {phase} · {evaluations} evaluations');
  let savePath: string | undefined;
  return execute(
    {
      load: (io) => {
        const objective = (opts.objective ?? 'total') as ObjectiveName;
        if (!OBJECTIVES.includes(objective)) throw new UsageError(`--objective must be one of ${OBJECTIVES.join(', ')}, got ${JSON.stringify(opts.objective)}`);
        checkMaxSets(opts.maxSets);
        checkWaitUnit(opts.waitUnit);
        if (opts.pick !== undefined && opts.save === undefined) throw new UsageError('--pick chooses the Pareto entry --save writes; give --save FILE too');
        const pick = opts.pick === undefined ? undefined : wholeNumber(opts.pick, '--pick', 1, 1);
        if (opts.save !== undefined) savePath = prepareOutput(opts.save, io.cwd, [opts.file, ...(opts.design ? [opts.design] : [])], '--save');
        const score = scoreMethod(opts.score);
        const ctx = loadContext(opts, io.cwd);
        let total = 1;
        const input = {
          objective,
          score,
          ...(score !== 'exact' && ctx.patience ? { patience: ctx.scenario.classes.map((c) => c.patience ?? 0) } : {}),
          jobs: wholeNumber(opts.jobs, '--jobs', 1, 1, 256),
          exhaustive: opts.exhaustive === true,
          seed: wholeNumber(opts.seed, '--seed', 0, 1),
          ...(opts.maxDesigns === undefined ? {} : { maxDesigns: wholeNumber(opts.maxDesigns, '--max-designs', 1, 1) }),
          ...(opts.maxSets === undefined ? {} : { maxSets: opts.maxSets }),
          ...(io.signal ? { signal: io.signal } : {}),
          ...(io.isTTY
            ? {
                onProgress: (p: { phase: string; scored: number; evaluations: number }) => {
                  total = Math.max(total, p.scored + 1, Math.ceil(p.scored * 1.25));
                  bar.update(p.scored, total, { phase: p.phase, evaluations: p.evaluations });
                },
              }
            : {}),
        };
        return { ctx, input, pick };
      },
      run: async ({ ctx, input }) => {
        try {
          return await recommendUseCase(ctx, input);
        } finally {
          bar.stop();
        }
      },
      text: async (r) => (await import('../../output/text/recommend.js')).recommendText(r, opts.waitUnit ? { waitUnit: opts.waitUnit } : {}),
      csv: (r) => recommendCsv(r),
      after: (r: RecommendRecord, { ctx, pick }, io) => {
        if (!savePath) return;
        if (pick !== undefined && pick > r.pareto.length) throw new UsageError(`--pick ${pick}: the Pareto set has ${r.pareto.length} design${r.pareto.length === 1 ? '' : 's'}`);
        writeFileAtomic(savePath, renderJson(savedDesign(ctx, r, pick)));
        io.err(`saved ${pick === undefined ? 'the recommended design' : `Pareto design ${pick}`} to ${opts.save}\n`);
      },
      exitCode: (r) => (r.partial ? 130 : 0),
    },
    opts,
    io,
  );
}
