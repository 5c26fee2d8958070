/**
 * Simulator speed: arrivals per second on one thread (FCFM on a 25-class odd cycle and on a
 * 10-class dense design, the targets; other policies and the timed engine for reference),
 * end-to-end `simulate()` throughput, and the scaling of parallel replications over worker threads.
 *
 * Run alone: npx tsx bench/simulate.ts   (about a minute on an idle 2-core machine)
 * Figures are printed, never asserted.
 */
import { availableParallelism } from 'node:os';
import { existsSync } from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { compileGraph, type CompiledModel } from '../src/model/compile.js';
import { ChainEngine } from '../src/sim/chain-engine.js';
import type { PolicyName } from '../src/sim/policy.js';
import { seedState } from '../src/sim/random.js';
import { simulate } from '../src/sim/simulate.js';
import { buildSimModel } from '../src/sim/sim-model.js';
import { TimedEngine } from '../src/sim/timed-engine.js';

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

const fmtRate = (perSecond: number): string => `${(perSecond / 1e6).toFixed(1)} M arrivals/s`;
const priorityOf = (m: CompiledModel): number[] => Array.from({ length: m.n }, (_, k) => m.n - 1 - k);

/** Hot loop only (counters included, no summary): best of `rounds` runs of `arrivals`. */
function engineRate(model: CompiledModel, policy: PolicyName, arrivals: number, rounds: number): number {
  const sim = buildSimModel(model, { policy, priority: priorityOf(model) });
  const engine = new ChainEngine(sim, seedState(1), 50_000_000);
  engine.run(2_000_000); // JIT warm-up and a steady state
  let best = 0;
  for (let r = 0; r < rounds; r++) {
    const t0 = performance.now();
    engine.run(arrivals);
    best = Math.max(best, arrivals / ((performance.now() - t0) / 1000));
  }
  return best;
}

function timedRate(model: CompiledModel, arrivals: number): number {
  const sim = buildSimModel(model, { patience: Array.from({ length: model.n }, () => 5) });
  const engine = new TimedEngine(sim, seedState(1), 50_000_000);
  engine.run(500_000);
  const t0 = performance.now();
  engine.run(arrivals);
  return arrivals / ((performance.now() - t0) / 1000);
}

export async function runSimulateBench(log: (line: string) => void = (l) => console.log(l)): Promise<void> {
  const cores = availableParallelism();
  const cycle = oddCycle(25);
  const dense = dense10();
  log(`simulate bench — node ${process.version}, ${cores} core${cores === 1 ? '' : 's'}`);
  log('');
  log('one thread, FCFM, patient engine (hot loop, best of 3 × 20,000,000 arrivals); goal ≥ 20 M arrivals/s');
  log(`  25-class odd cycle     ${fmtRate(engineRate(cycle, 'fcfm', 20_000_000, 3))}`);
  log(`  10-class dense design  ${fmtRate(engineRate(dense, 'fcfm', 20_000_000, 3))}`);
  log('');
  log('one thread, other policies (1 × 10,000,000 arrivals)');
  for (const policy of ['most-waiting', 'ranked', 'random-class'] as const) {
    log(`  ${policy.padEnd(9)} cycle ${fmtRate(engineRate(cycle, policy, 10_000_000, 1))}, dense ${fmtRate(engineRate(dense, policy, 10_000_000, 1))}`);
  }
  log('');
  log('one thread, timed engine with impatience (every class patience 5; 1 × 5,000,000 arrivals)');
  log(`  25-class odd cycle     ${fmtRate(timedRate(cycle, 5_000_000))}`);
  log(`  10-class dense design  ${fmtRate(timedRate(dense, 5_000_000))}`);
  log('');

  // Prefer the compiled worker (npm install builds dist/); fall back to the TypeScript sources via tsx.
  const compiled = new URL('../dist/workers/worker.js', import.meta.url);
  const fromDist = existsSync(fileURLToPath(compiled));
  const workerUrl = fromDist ? compiled : new URL('./sim-worker.mjs', import.meta.url);
  const reps = Math.max(4, 2 * cores);
  const arrivals = 16_000_000;
  const total = reps * (arrivals + arrivals / 10);
  log(`simulate() end to end, FCFM on the odd cycle: ${reps} replications × ${arrivals.toLocaleString('en-US')} arrivals (+10 % warm-up), statistics included`);
  const seconds: number[] = [];
  for (const jobs of [...new Set([1, 2, cores])]) {
    const t0 = performance.now();
    await simulate(cycle, { arrivals, replications: reps, seed: 1, jobs, workerUrl });
    const s = (performance.now() - t0) / 1000;
    seconds.push(s);
    const speedup = seconds[0]! / s;
    log(`  jobs ${String(jobs).padEnd(3)} ${s.toFixed(2)} s  ${fmtRate(total / s)}  speed-up ×${speedup.toFixed(2)}`);
  }
  log(`  (workers run ${fromDist ? 'the compiled dist/workers/worker.js' : 'the TypeScript sources under tsx'}; their start-up is included; other load on the machine lowers the figures)`);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  await runSimulateBench();
}
