/**
 * `edgewise simulate FILE`: replications of the matching system under a policy, with 95 %
 * intervals, wait percentiles, abandonment, and the exact FCFM value beside each estimate when the
 * exact evaluator can handle the design.
 */
import { availableParallelism } from 'node:os';
import cliProgress from 'cli-progress';
import { describeCertificate, EdgewiseError, UsageError, type InstabilityCertificate } from '../../errors.js';
import { evaluateExact } from '../../exact/evaluate.js';
import type { ExactResult } from '../../exact/result.js';
import { compileModel, type CompiledModel } from '../../model/compile.js';
import type { Scenario } from '../../model/scenario.js';
import { isPolicyName, POLICIES, type PolicyName } from '../../sim/policy.js';
import { simulate, type SimulationResult } from '../../sim/simulate.js';
import type { Estimate, WaitEstimate } from '../../sim/summary.js';
import { certificateWithIds } from '../../stability/certificate.js';
import { checkStability } from '../../stability/check.js';
import { num, pct, round, table } from '../format.js';
import type { CommandIO } from '../io.js';
import { checkMaxSets } from '../options.js';
import { loadScenario } from '../load.js';

export interface SimulateOptions {
  readonly file: string;
  readonly policy?: string;
  readonly priority?: string;
  readonly arrivals?: number;
  readonly replications?: number;
  readonly warmup?: number;
  readonly seed?: number;
  readonly jobs?: number;
  readonly maxWaiting?: number;
  readonly maxSets?: number;
  readonly timed?: boolean;
  readonly json?: boolean;
}

/**
 * Default memory guard of the exact column: the simulator is also meant for designs too large for
 * exact evaluation, so it gives up early (about 40 MB) unless --max-sets asks for more.
 */
export const EXACT_COLUMN_MAX_SETS = 1_000_000;

interface StabilityNote {
  readonly stable: boolean | null;
  readonly certificate?: InstabilityCertificate;
  readonly message?: string;
}

function stabilityOf(model: CompiledModel, scenario: Scenario, impatient: boolean): StabilityNote {
  try {
    const report = checkStability(model);
    if (report.stable) return { stable: true };
    const certificate = certificateWithIds(model, report.certificate!);
    const tail = impatient
      ? ' — abandonment may still keep the queues bounded'
      : ' — the queues grow without bound, so the figures describe a transient and grow with --arrivals';
    return { stable: false, certificate, message: describeCertificate(certificate, scenario.timeUnit) + tail };
  } catch (e) {
    if (e instanceof EdgewiseError) return { stable: null, message: `stability could not be decided: ${e.message}` };
    throw e;
  }
}

/** The exact FCFM values, or why they are not shown. */
function exactOf(model: CompiledModel, opts: SimulateOptions, policy: PolicyName, impatient: boolean, stable: boolean | null, timeUnit: string): { exact?: ExactResult; reason?: string } {
  if (policy !== 'fcfm') return { reason: 'exact values exist for FCFM only' };
  if (impatient) return { reason: 'exact values assume patient items' };
  if (stable === false) return { reason: 'the design is unstable' };
  try {
    return { exact: evaluateExact(model, { maxSets: opts.maxSets ?? EXACT_COLUMN_MAX_SETS, timeUnit }) };
  } catch (e) {
    if (e instanceof EdgewiseError) return { reason: e.message };
    throw e;
  }
}

export async function simulateCommand(opts: SimulateOptions, io: CommandIO): Promise<number> {
  const policy = opts.policy ?? 'fcfm';
  if (!isPolicyName(policy)) throw new UsageError(`--policy must be one of ${POLICIES.join(', ')}, found "${policy}"`);
  if (opts.priority !== undefined && policy !== 'priority') throw new UsageError('--priority only applies with --policy priority');
  if (policy === 'priority' && opts.priority === undefined) throw new UsageError('--policy priority needs --priority a,b,c (first = most preferred partner class)');
  checkMaxSets(opts.maxSets);
  const priority = opts.priority?.split(',').map((s) => s.trim()).filter((s) => s !== '');

  const scenario = loadScenario(opts.file, io.cwd);
  const model = compileModel(scenario);
  const patience = scenario.classes.map((c) => c.patience ?? Infinity);
  const impatient = patience.some((p) => Number.isFinite(p));

  const stability = stabilityOf(model, scenario, impatient);
  if (!opts.json && stability.message) io.err(`warning: ${stability.message}\n`);
  const exact = exactOf(model, opts, policy, impatient, stability.stable, scenario.timeUnit);

  let bar: cliProgress.SingleBar | undefined;
  const jobs = opts.jobs ?? availableParallelism();
  const result = await (async () => {
    try {
      return await simulate(model, {
        policy,
        ...(priority ? { priority } : {}),
        patience,
        ...(opts.arrivals === undefined ? {} : { arrivals: opts.arrivals }),
        ...(opts.replications === undefined ? {} : { replications: opts.replications }),
        ...(opts.warmup === undefined ? {} : { warmup: opts.warmup }),
        ...(opts.seed === undefined ? {} : { seed: opts.seed }),
        ...(opts.maxWaiting === undefined ? {} : { maxWaiting: opts.maxWaiting }),
        jobs,
        timed: opts.timed === true,
        ...(io.isTTY && !opts.json
          ? {
              onProgress: (done: number, total: number) => {
                if (!bar) {
                  bar = new cliProgress.SingleBar(
                    { format: 'simulating [{bar}] {percentage}% | {value}/{total} arrivals | eta {eta_formatted}', stream: process.stderr, clearOnComplete: true, hideCursor: true },
                    cliProgress.Presets.shades_classic,
                  );
                  bar.start(total, 0);
                }
                bar.update(done);
              },
            }
          : {}),
      });
    } finally {
      bar?.stop();
    }
  })();

  if (opts.json) {
    io.out(`${JSON.stringify(toJson(scenario, model, result, priority, stability, exact), null, 2)}\n`);
  } else {
    io.out(toText(scenario, model, result, exact));
  }
  return 0;
}

// ---------------------------------------------------------------- JSON

const ci = (e: Estimate): [number | null, number | null] | null => (e.ci95 ? [round(e.ci95[0]), round(e.ci95[1])] : null);

function est(e: Estimate, exact?: number): Record<string, unknown> {
  return { mean: round(e.mean), ci95: ci(e), ...(exact === undefined ? {} : { exact: round(exact) }) };
}

function waitJson(w: WaitEstimate, exact?: number): Record<string, unknown> {
  const q = w.quantileCi95.map((c) => (c ? [round(c[0]), round(c[1])] : null));
  return { ...est(w, exact), p50: round(w.p50), p90: round(w.p90), p99: round(w.p99), p50ci95: q[0], p90ci95: q[1], p99ci95: q[2] };
}

function byClass<T>(ids: readonly string[], f: (k: number) => T): Record<string, T> {
  const out: Record<string, T> = {};
  ids.forEach((id, k) => (out[id] = f(k)));
  return out;
}

function toJson(
  scenario: Scenario,
  model: CompiledModel,
  r: SimulationResult,
  priority: string[] | undefined,
  stability: StabilityNote,
  exact: { exact?: ExactResult; reason?: string },
): Record<string, unknown> {
  const x = exact.exact;
  const ids = model.ids;
  let immediateExact: number | undefined;
  if (x) {
    let s = 0;
    for (let k = 0; k < model.n; k++) s += model.rates[k]! * x.immediateMatch[k]!;
    immediateExact = s / model.totalRate;
  }
  return {
    scenario: scenario.name,
    timeUnit: scenario.timeUnit,
    policy: r.policy,
    ...(priority ? { priority } : {}),
    replications: r.replications,
    arrivals: r.arrivals,
    warmup: r.warmup,
    seed: r.seed,
    maxWaiting: r.maxWaiting,
    engine: r.engine,
    stability: {
      stable: stability.stable,
      ...(stability.message ? { warning: stability.message } : {}),
      ...(stability.certificate ? { certificate: stability.certificate } : {}),
    },
    exact: x ? { available: true, independentSets: x.independentSets } : { available: false, reason: exact.reason },
    backlog: {
      total: est(r.backlog.total, x?.backlogTotal),
      byClass: byClass(ids, (k) => est(r.backlog.byClass[k]!, x?.backlog[k])),
    },
    wait: {
      total: waitJson(r.wait.total, x ? x.backlogTotal / model.totalRate : undefined),
      byClass: byClass(ids, (k) => waitJson(r.wait.byClass[k]!, x?.wait[k])),
    },
    immediateMatch: {
      total: est(r.immediateMatch.total, immediateExact),
      byClass: byClass(ids, (k) => est(r.immediateMatch.byClass[k]!, x?.immediateMatch[k])),
    },
    matchRates: r.matchRates.map((e, i) => ({ pair: [ids[model.edgeA[i]!]!, ids[model.edgeB[i]!]!], rate: est(e, x?.matchRates[i]) })),
    abandonment: {
      total: { rate: est(r.abandonRate.total), share: est(r.abandonShare.total) },
      byClass: byClass(ids, (k) => ({
        patience: round(r.patience[k]!),
        rate: est(r.abandonRate.byClass[k]!),
        share: est(r.abandonShare.byClass[k]!),
      })),
    },
    notes: [
      'ci95: 95 % Student t interval of the mean across replications',
      'wait percentiles pool the matched items of all replications (items matched on arrival count as 0, abandoned items are excluded); pXXci95 are intervals of the per-replication percentiles',
    ],
  };
}

// ---------------------------------------------------------------- text

function pm(e: Estimate, f: (x: number) => string = (v) => num(v)): string {
  if (!Number.isFinite(e.mean)) return '—';
  if (!e.ci95) return f(e.mean);
  return `${f(e.mean)} ± ${num((e.ci95[1] - e.ci95[0]) / 2, 2)}`;
}

const pmPct = (e: Estimate): string => (!Number.isFinite(e.mean) ? '—' : e.ci95 ? `${pct(e.mean)} ± ${pct((e.ci95[1] - e.ci95[0]) / 2)}` : pct(e.mean));


function toText(scenario: Scenario, model: CompiledModel, r: SimulationResult, exact: { exact?: ExactResult; reason?: string }): string {
  const x = exact.exact;
  const unit = scenario.timeUnit;
  const impatient = r.patience.some((p) => Number.isFinite(p));
  const lines: string[] = [];
  lines.push(`${scenario.name}: simulated under ${r.policy.toUpperCase() === 'FCFM' ? 'FCFM' : `the ${r.policy} policy`}`);
  lines.push(
    `${r.replications} replication${r.replications === 1 ? '' : 's'} × ${r.arrivals.toLocaleString('en-US')} arrivals (after ${r.warmup.toLocaleString('en-US')} warm-up), seed ${r.seed}`,
  );
  lines.push('');
  const head = ['class', 'backlog', ...(x ? ['exact'] : []), `mean wait (${unit})`, ...(x ? ['exact'] : []), 'p50', 'p90', 'p99', 'matched at once', ...(x ? ['exact'] : [])];
  if (impatient) head.push(`abandon /${unit}`, 'abandon share');
  const t = table(head);
  const row = (label: string, k: number | undefined): string[] => {
    const b = k === undefined ? r.backlog.total : r.backlog.byClass[k]!;
    const w = k === undefined ? r.wait.total : r.wait.byClass[k]!;
    const im = k === undefined ? r.immediateMatch.total : r.immediateMatch.byClass[k]!;
    const cells = [label, pm(b)];
    if (x) cells.push(num(k === undefined ? x.backlogTotal : x.backlog[k]!));
    cells.push(pm(w));
    if (x) cells.push(num(k === undefined ? x.backlogTotal / model.totalRate : x.wait[k]!));
    cells.push(num(w.p50), num(w.p90), num(w.p99), pmPct(im));
    if (x) {
      let tot = 0;
      for (let j = 0; j < model.n; j++) tot += model.rates[j]! * x.immediateMatch[j]!;
      cells.push(pct(k === undefined ? tot / model.totalRate : x.immediateMatch[k]!));
    }
    if (impatient) {
      cells.push(pm(k === undefined ? r.abandonRate.total : r.abandonRate.byClass[k]!));
      cells.push(pmPct(k === undefined ? r.abandonShare.total : r.abandonShare.byClass[k]!));
    }
    return cells;
  };
  model.ids.forEach((id, k) => t.push(row(id, k)));
  t.push(row('total', undefined));
  lines.push(t.toString());
  lines.push('');
  const mt = table(['compatibility', `matches /${unit}`, ...(x ? ['exact'] : [])]);
  for (let e = 0; e < model.m; e++) {
    const a = model.ids[model.edgeA[e]!]!;
    const b = model.ids[model.edgeB[e]!]!;
    mt.push([a === b ? `${a} (self)` : `${a} – ${b}`, pm(r.matchRates[e]!), ...(x ? [num(x.matchRates[e]!)] : [])]);
  }
  lines.push(mt.toString());
  lines.push('');
  const df = r.replications - 1;
  if (r.replications > 1) lines.push(`± : half-width of the 95 % interval across replications (Student t, ${df} degree${df === 1 ? '' : 's'} of freedom).`);
  else lines.push('One replication: no interval (use --replications 2 or more).');
  lines.push('Wait percentiles pool all replications; items matched on arrival wait 0, abandoned items are left out.');
  if (!x && exact.reason) lines.push(`No exact column: ${exact.reason}.`);
  return `${lines.join('\n')}\n`;
}
