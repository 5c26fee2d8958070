import { writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { UsageError } from '../../errors.js';
import { gatherReport } from '../../report/gather-report.js';
import { renderReport } from '../../html/report-html.js';
import type { CommandIO } from '../io.js';
import { loadScenario } from '../load.js';

export interface ReportOptions {
  readonly file: string;
  readonly output: string;
  readonly budget?: number;
  readonly jobs?: number;
}

/** `edgewise report FILE -o report.html`: one self-contained HTML file. */
export async function reportCommand(opts: ReportOptions, io: CommandIO): Promise<number> {
  if (opts.budget !== undefined && !(Number.isFinite(opts.budget) && opts.budget >= 0)) {
    throw new UsageError(`--budget must be a number >= 0, got ${opts.budget}`);
  }
  const jobs = opts.jobs ?? 1;
  if (!Number.isInteger(jobs) || jobs < 1) throw new UsageError(`--jobs must be a whole number >= 1, got ${opts.jobs}`);
  if (!opts.output || opts.output.trim() === '') throw new UsageError('-o/--output needs a file name, e.g. -o report.html');
  const scenario = loadScenario(opts.file, io.cwd);
  const data = await gatherReport(scenario, {
    source: opts.file,
    ...(opts.budget === undefined ? {} : { budget: opts.budget }),
    recommend: jobs > 1 ? { jobs, workerUrl: undefined } : { jobs: 1, workerUrl: null },
    ...(io.isTTY ? { onPhase: (p: string) => io.err(`edgewise report: ${p}…\n`) } : {}),
  });
  const page = renderReport(data, { generator: 'edgewise 0.1.0' });
  const target = resolve(io.cwd, opts.output);
  try {
    writeFileSync(target, page, 'utf8');
  } catch (e) {
    throw new UsageError(`cannot write ${opts.output}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
  }
  const kb = Math.max(1, Math.round(Buffer.byteLength(page) / 1024));
  io.out(`wrote ${opts.output} (${kb} KB): ${data.verdicts[0] ?? ''}\n`);
  return 0;
}
