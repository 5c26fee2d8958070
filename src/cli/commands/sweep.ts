import { UsageError } from '../../errors.js';
import { compileModel, type CompiledModel } from '../../model/compile.js';
import { sweep, type SweepResult, type SweepVariantSpec } from '../../design/sweep/sweep.js';
import { GROWTH_LIMIT_METHOD } from '../../design/sweep/growth-limit.js';
import { CROSSOVER_METHOD, sweepCsv, sweepRecord } from '../../report/sweep-record.js';
import { num, pct, table } from '../format.js';
import type { CommandIO } from '../io.js';
import { loadScenario } from '../load.js';
import { parseClassList, parsePairList } from '../pair-args.js';

export interface SweepCommandOptions {
  readonly file: string;
  readonly grow?: string;
  /** Each occurrence is one variant; `a-b,c-d` adds both in the same variant. */
  readonly with?: readonly string[];
  readonly without?: readonly string[];
  readonly steps?: number;
  readonly json?: boolean;
  readonly csv?: boolean;
}

/** `edgewise sweep FILE --grow a,b`: exact backlog from today's rates to the stability limit. */
export async function sweepCommand(opts: SweepCommandOptions, io: CommandIO): Promise<number> {
  if (opts.grow === undefined) throw new UsageError('--grow CLASS[,CLASS…] is required: which classes grow?');
  const steps = opts.steps ?? 10;
  if (!(Number.isInteger(steps) && steps >= 1 && steps <= 1000)) throw new UsageError(`--steps must be a whole number from 1 to 1000, got ${opts.steps}`);
  if (opts.json && opts.csv) throw new UsageError('choose one of --json and --csv');
  const scenario = loadScenario(opts.file, io.cwd);
  const model = compileModel(scenario);
  const grow = parseClassList(model, opts.grow, '--grow');
  const label = (pairs: Array<[number, number]>): string => pairs.map(([a, b]) => `${model.ids[a]}-${model.ids[b]}`).join(', ');
  const variants: SweepVariantSpec[] = [
    ...(opts.with ?? []).map((text) => {
      const add = parsePairList(model, text, '--with');
      return { name: `with ${label(add)}`, add, remove: [] };
    }),
    ...(opts.without ?? []).map((text) => {
      const remove = parsePairList(model, text, '--without');
      return { name: `without ${label(remove)}`, add: [], remove };
    }),
  ];
  const result = sweep(model, { grow, variants, steps, timeUnit: scenario.timeUnit });
  if (opts.json) {
    io.out(`${JSON.stringify(sweepRecord(model, result, { scenario: scenario.name, timeUnit: scenario.timeUnit }), null, 2)}\n`);
    return 0;
  }
  if (opts.csv) {
    io.out(sweepCsv(model, result));
    return 0;
  }
  io.out(renderSweep(model, result, scenario.name, scenario.timeUnit));
  return 0;
}

/** Table for people: one row per step, backlog and bottleneck slack of every design. */
export function renderSweep(model: CompiledModel, r: SweepResult, name: string, timeUnit: string): string {
  const u = timeUnit;
  const grown = Array.from(r.grow, (k) => model.ids[k]!).join(', ');
  const curves = [r.base, ...r.variants];
  const t = table(
    ['load factor', 'headroom used', ...curves.flatMap((c) => [`${c.name === 'base' ? "today's design" : c.name}: backlog`, `slack /${u}`])],
    ['right', 'right', ...curves.flatMap(() => ['right', 'right'] as const)],
  );
  r.factors.forEach((s, i) => {
    t.push([
      `×${num(s)}`,
      Number.isFinite(r.limit) ? pct(r.headroomUsed[i]!) : '—',
      ...curves.flatMap((c) => (Number.isFinite(c.backlog[i]!) ? [num(c.backlog[i]!), num(c.slack[i]!)] : ['unstable', '—'])),
    ]);
  });
  const limit = Number.isFinite(r.limit)
    ? `Stability limit: the rates of ${grown} can grow up to ×${num(r.limit, 6)} (${GROWTH_LIMIT_METHOD}); the sweep stops at ${pct(r.headroomUsed[r.headroomUsed.length - 1]!, 0)} of that headroom.`
    : `Nothing limits the growth of ${grown} (the LP is unbounded); the sweep stops at ×${num(r.factors[r.factors.length - 1]!)}.`;
  const lines: string[] = [];
  for (const v of r.variants) {
    const own = r.crossovers.filter((c) => c.variant === v.name);
    const first = Number.isFinite(v.backlog[0]!) ? v.backlog[0]! - r.base.backlog[0]! : Infinity;
    const today = !Number.isFinite(first) ? 'unstable today' : first < 0 ? 'helps today' : first > 0 ? 'hurts today' : 'same as today';
    const cross =
      own.length === 0
        ? 'no crossover within the sweep'
        : own.map((c) => `${c.direction === 'starts-to-hurt' ? 'starts to hurt' : 'starts to help'} at ×${num(c.factor)}${Number.isFinite(r.limit) ? ` (${pct((c.factor - 1) / (r.limit - 1))} of the headroom)` : ''}`).join(', then ');
    const ownLimit = Number.isFinite(v.limit) ? `its own limit ×${num(v.limit, 6)}` : Number.isNaN(v.limit) ? 'no limit (unstable)' : 'no limit';
    lines.push(`  - ${v.name}: ${today}; ${cross}; ${ownLimit}`);
  }
  const parts = [
    `${name} — load sweep: ${grown} grow together (exact FCFM backlog; slack = spare capacity of the bottleneck)`,
    t.toString(),
    limit,
  ];
  if (lines.length > 0) parts.push(`Variants against today's design:\n${lines.join('\n')}\nCrossovers: ${CROSSOVER_METHOD}.`);
  return `${parts.join('\n\n')}\n`;
}
