/**
 * Simulator speed: arrivals per second on one thread (FCFM on a 25-class odd cycle and on a 10-class
 * dense design, against the plain C simulator bench/c/fcfm.c in the same run; other policies and
 * the timed engine with impatience), and the scaling of `edgewise simulate --jobs 1` against
 * `--jobs 2` (built CLI).
 *
 * Run alone: npx tsx bench/simulate.ts   (about two minutes on an idle 2-core machine)
 * EDGEWISE_BENCH_SCALING_ONLY=1 runs only the --jobs comparison; EDGEWISE_BENCH_FCFM_ONLY=1 only the FCFM
 * comparison with the C simulator.
 * Figures are printed, never asserted. Rates are arrivals per CPU second (of the hot loop or of the
 * whole process; wall-clock rates in brackets where printed): on a shared machine CPU time moves
 * less with the other load. The FCFM comparison with C runs the built code (dist/, with plain node,
 * what users run); the other policies and the timed engine run in this process, under tsx, whose
 * calls of imported functions cost more than the built code's (their figures are ratios within the
 * same loader).
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { compileGraph, type CompiledModel } from '../src/model/compile.js';
import { ChainEngine } from '../src/sim/chain-engine.js';
import type { PolicyName } from '../src/sim/policy.js';
import { seedState } from '../src/sim/random.js';
import { buildSimModel, type SimModel } from '../src/sim/sim-model.js';
import { TimedEngine } from '../src/sim/timed-engine.js';
import { buildC, builtCli, load, median, repoRoot, scratchDir, timeProcess } from './_processes.js';
import { jobsScaling, PROJECTION_NOTE } from './_scaling.js';

/** Odd cycle of n classes, equal rates (stable: every independent set has more neighbours than members). */
function oddCycle(n: number): CompiledModel {
  const ids = Array.from({ length: n }, (_, k) => `zone-${k}`);
  const pairs: Array<[number, number]> = ids.map((_, k) => [k, (k + 1) % n]);
  return compileGraph(ids, ids.map(() => 1), pairs);
}

/** Ten classes, 30 of the 45 pairs (those with i + j not a multiple of 3), rates 1.0 .. 1.9. */
function dense10(): CompiledModel {
  const ids = Array.from({ length: 10 }, (_, k) => `tier-${k}`);
  const pairs: Array<[number, number]> = [];
  for (let i = 0; i < 10; i++) for (let j = i + 1; j < 10; j++) if ((i + j) % 3 !== 0) pairs.push([i, j]);
  return compileGraph(ids, ids.map((_, k) => 1 + 0.1 * k), pairs);
}

interface Rate {
  /** Arrivals per CPU second and per wall-clock second. */
  readonly cpu: number;
  readonly wall: number;
}

const M = (x: number): string => (x / 1e6).toFixed(1);
const fmtRate = (r: Rate): string => `${M(r.cpu)} M arrivals/s (${M(r.wall)})`;
const priorityOf = (m: CompiledModel): number[] => Array.from({ length: m.n }, (_, k) => m.n - 1 - k);

/** One measured run of `arrivals`. */
function timed(engine: { run(n: number): void }, arrivals: number): Rate {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  engine.run(arrivals);
  const w = (performance.now() - t0) / 1000;
  const c = process.cpuUsage(c0);
  return { cpu: arrivals / ((c.user + c.system) / 1e6), wall: arrivals / w };
}

const best = (a: Rate, b: Rate): Rate => ({ cpu: Math.max(a.cpu, b.cpu), wall: Math.max(a.wall, b.wall) });

/** Best of `rounds` runs of `arrivals` after a warm-up, for an engine with run(n). */
function hotLoop(engine: { run(n: number): void }, warmup: number, arrivals: number, rounds: number): Rate {
  engine.run(warmup); // JIT warm-up and a steady state
  let r: Rate = { cpu: 0, wall: 0 };
  for (let i = 0; i < rounds; i++) r = best(r, timed(engine, arrivals));
  return r;
}

function engineRate(model: CompiledModel, policy: PolicyName, arrivals: number, rounds: number): Rate {
  const sim = buildSimModel(model, { policy, priority: priorityOf(model) });
  return hotLoop(new ChainEngine(sim, seedState(1), 50_000_000), 2_000_000, arrivals, rounds);
}

function timedRate(sim: SimModel, arrivals: number, rounds: number): Rate {
  return hotLoop(new TimedEngine(sim, seedState(1), 50_000_000), 500_000, arrivals, rounds);
}

const textOf = (m: CompiledModel): string => {
  const pairs: string[] = [];
  for (let e = 0; e < m.m; e++) pairs.push(`${m.edgeA[e]} ${m.edgeB[e]}`);
  return `${m.n} ${m.m}\n${Array.from(m.rates).join(' ')}\n${pairs.join('\n')}\n`;
};

/** The scenario file of a compiled design (for the built CLI). */
const scenarioOf = (m: CompiledModel, name: string): string =>
  JSON.stringify({
    name,
    timeUnit: 'minute',
    classes: m.ids.map((id, k) => ({ id, rate: m.rates[k] })),
    compatibilities: Array.from({ length: m.m }, (_, e) => [m.ids[m.edgeA[e]!], m.ids[m.edgeB[e]!]]),
  });

interface LoopTime {
  readonly arrivals: number;
  readonly seconds: number;
  readonly cpuSeconds: number;
}

const ROUNDS = 5;
const LOOP_ARRIVALS = 30_000_000;
const PROCESS_ARRIVALS = 60_000_000;
const engineScript = join(repoRoot, 'bench', '_fcfm-engine.mjs');
const range = (xs: readonly number[]): string => `${Math.min(...xs).toFixed(2)}–${Math.max(...xs).toFixed(2)}`;

/**
 * FCFM on the built code (what users run) against bench/c/fcfm.c, ROUNDS interleaved rounds, two
 * ways: (1) the hot loop: the built engine (dist/, plain node: bench/_fcfm-engine.mjs) after a
 * warm-up against the C program's loop, CPU seconds of the loop each; (2) whole processes: `node
 * dist/cli/main.js simulate --arrivals N --warmup 0 --replications 1 --jobs 1 --json` against the C
 * program on the same N arrivals, user + system CPU of each process (GNU time): Node start-up,
 * module loading, the exact FCFM column and the statistics included. Medians and ranges of the
 * per-round ratios.
 */
function againstC(dir: string, designs: Array<[string, CompiledModel]>): void {
  const c = buildC('fcfm', dir);
  const cli = builtCli();
  log(
    `one thread, FCFM on the built code against the plain C simulator (bench/c/fcfm.c, gcc -O2), ${ROUNDS} interleaved rounds, medians (range of the per-round ratios); goal ≥ 0.7\n` +
      `  loop: the built engine (node, dist/) after a warm-up, ${LOOP_ARRIVALS.toLocaleString('en-US')} arrivals, against C's loop, CPU seconds of the loops\n` +
      `  process: node dist/cli/main.js simulate --arrivals ${PROCESS_ARRIVALS.toLocaleString('en-US')} --warmup 0 --replications 1 --jobs 1 --json against C on as many arrivals, CPU of the whole processes`,
  );
  if ('skip' in c || 'skip' in cli) {
    log(`  skipped: ${[c, cli].flatMap((x) => ('skip' in x ? [x.skip] : [])).join('; ')}`);
    return;
  }
  for (const [name, m] of designs) {
    const text = join(dir, `${name}.txt`);
    const json = join(dir, `${name}.json`);
    writeFileSync(text, textOf(m));
    writeFileSync(json, scenarioOf(m, name));
    const loopOurs: number[] = [];
    const loopC: number[] = [];
    const procOurs: number[] = [];
    const procC: number[] = [];
    const fixed: number[] = [];
    const loads: string[] = [];
    for (let r = 0; r < ROUNDS; r++) {
      loads.push(load());
      const cl = JSON.parse(timeProcess(c.path, [text, String(LOOP_ARRIVALS), '1']).stdout) as LoopTime;
      const ol = JSON.parse(timeProcess(process.execPath, [engineScript, text, '4000000', String(LOOP_ARRIVALS)]).stdout) as LoopTime;
      loopC.push(cl.arrivals / cl.cpuSeconds);
      loopOurs.push(ol.arrivals / ol.cpuSeconds);
      const cp = timeProcess(c.path, [text, String(PROCESS_ARRIVALS), '1']);
      const cliArgs = (arrivals: number): string[] => [cli.path, 'simulate', json, '--arrivals', String(arrivals), '--warmup', '0', '--replications', '1', '--jobs', '1', '--json'];
      const op = timeProcess(process.execPath, cliArgs(PROCESS_ARRIVALS));
      const small = timeProcess(process.execPath, cliArgs(1000)); // what does not grow with the arrivals
      fixed.push(small.cpu ?? small.wall);
      if (cp.cpu === undefined || op.cpu === undefined) {
        procC.push(PROCESS_ARRIVALS / cp.wall);
        procOurs.push(PROCESS_ARRIVALS / op.wall);
      } else {
        procC.push(PROCESS_ARRIVALS / cp.cpu);
        procOurs.push(PROCESS_ARRIVALS / op.cpu);
      }
    }
    const loopRatio = loopOurs.map((x, i) => x / loopC[i]!);
    const procRatio = procOurs.map((x, i) => x / procC[i]!);
    log(
      `  ${name.padEnd(22)} loop: edgewise ${M(median(loopOurs))} M arrivals/CPU s, C ${M(median(loopC))} M: ×${median(loopRatio).toFixed(2)} (${range(loopRatio)}); ` +
        `process: edgewise ${M(median(procOurs))} M, C ${M(median(procC))} M: ×${median(procRatio).toFixed(2)} (${range(procRatio)}), ` +
        `of which ${median(fixed).toFixed(2)} s do not grow with the arrivals (the same command on 1,000)  load ${loads.join(', ')}`,
    );
  }
}

/** `edgewise simulate --jobs 1` against `--jobs 2` (built CLI): see bench/_scaling.ts. */
async function scaling(dir: string, model: CompiledModel): Promise<void> {
  const cli = builtCli();
  const reps = 8;
  const arrivals = 8_000_000;
  const rounds = 3;
  log(`\nedgewise simulate (built CLI), FCFM on the odd cycle: ${reps} replications × ${arrivals.toLocaleString('en-US')} arrivals (+10 % warm-up), --jobs 1 against --jobs 2; goal ≥ 1.6 on a free 2-core machine`);
  if ('skip' in cli) {
    log(`  skipped: ${cli.skip}`);
    return;
  }
  const file = join(dir, 'cycle.json');
  writeFileSync(file, scenarioOf(model, 'odd cycle'));
  const args = (jobs: number): string[] => [cli.path, 'simulate', file, '--arrivals', String(arrivals), '--replications', String(reps), '--jobs', String(jobs), '--json'];
  await jobsScaling('simulate', args, rounds, log);
  log(`  (whole processes: Node start-up, worker start-up, the exact FCFM column and the statistics included; ${PROJECTION_NOTE})`);
}

const log = (line: string): void => console.log(line);

async function main(): Promise<void> {
  const cycle = oddCycle(25);
  const dense = dense10();
  const dir = scratchDir('edgewise-sim-bench-');
  log(`simulate bench — node ${process.version}`);
  if (process.env.EDGEWISE_BENCH_SCALING_ONLY) {
    await scaling(dir, cycle);
    return;
  }
  log('');
  againstC(dir, [
    ['25-class odd cycle', cycle],
    ['10-class dense design', dense],
  ]);
  if (process.env.EDGEWISE_BENCH_FCFM_ONLY) return;
  log('');
  log('one thread, other policies (1 × 10,000,000 arrivals)');
  for (const policy of ['most-waiting', 'ranked', 'random-class'] as const) {
    log(`  ${policy.padEnd(9)} cycle ${fmtRate(engineRate(cycle, policy, 10_000_000, 1))}, dense ${fmtRate(engineRate(dense, policy, 10_000_000, 1))}`);
  }
  log('');
  log('one thread, timed engine (best of 2 × 5,000,000 arrivals) against FCFM without impatience; goal ≥ 0.5 with impatience');
  for (const [name, m] of [['25-class odd cycle', cycle], ['10-class dense design', dense]] as const) {
    const patient = engineRate(m, 'fcfm', 10_000_000, 2);
    const impatient = timedRate(buildSimModel(m, { patience: Array.from({ length: m.n }, () => 5) }), 5_000_000, 2);
    const timedPatient = timedRate(buildSimModel(m), 5_000_000, 2);
    log(
      `  ${name.padEnd(22)} every class patience 5: ${fmtRate(impatient)}, ×${(impatient.cpu / patient.cpu).toFixed(2)} of FCFM (${M(patient.cpu)} M/s); ` +
        `timed without impatience ${fmtRate(timedPatient)}  load ${load()}`,
    );
  }
  await scaling(dir, cycle);
}

await main();
