import { renderJson } from '../../output/machine.js';
import { renderReport } from '../../html/report-html.js';
import { decisionRecord, reportUseCase } from '../../usecases/report.js';
import { verdicts, namerOf } from '../../html/verdicts.js';
import { para, title } from '../../output/text/doc.js';
import { execute, type OutputOptions } from '../command.js';
import type { CommandIO } from '../io.js';
import { loadContext, type ContextFlags } from '../load.js';
import { scoringOptions, wholeNumber, type ScoringFlags } from '../options.js';
import { prepareOutput, writeFileAtomic } from '../write.js';

export interface ReportOptions extends ContextFlags, OutputOptions, ScoringFlags {
  readonly output?: string;
  readonly maxDesigns?: number | string;
}

/**
 * `edgewise report FILE -o report.html`: one self-contained HTML file. The target is checked before
 * any work (never an input, never a directory) and written atomically. With --json, the decision
 * record is printed on standard output.
 */
export function reportCommand(opts: ReportOptions, io: CommandIO): Promise<number> {
  let target = '';
  let size = 0;
  return execute(
    {
      load: (io) => {
        target = prepareOutput(opts.output ?? '', io.cwd, [opts.file, ...(opts.design ? [opts.design] : [])], '-o');
        const scoring = scoringOptions(opts);
        const maxDesigns = opts.maxDesigns === undefined ? undefined : wholeNumber(opts.maxDesigns, '--max-designs', 1, 1);
        return { ctx: loadContext(opts, io.cwd), scoring: { ...scoring, ...(maxDesigns === undefined ? {} : { maxDesigns }) } };
      },
      run: async ({ ctx, scoring }, io) => {
        const r = await reportUseCase(ctx, {
          ...scoring,
          ...(io.isTTY ? { onPhase: (p: string) => io.err(`edgewise report: ${p}…\n`) } : {}),
          ...(io.signal ? { signal: io.signal } : {}),
        });
        const page = renderReport(r, { generator: 'edgewise 0.2.0' });
        writeFileAtomic(target, page);
        size = Buffer.byteLength(page);
        return r;
      },
      json: (r) => renderJson(decisionRecord(r)),
      exitCode: (r) => (r.partial ? 130 : 0),
      text: (r) => [
        title(`wrote ${opts.output ?? ''} (${Math.max(1, Math.round(size / 1024))} KB)${r.partial ? ' — interrupted: what was computed so far' : ''}`),
        para(verdicts(r, namerOf(r))[0] ?? ''),
      ],
    },
    opts,
    io,
  );
}
