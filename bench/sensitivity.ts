/**
 * Benchmark of the sensitivity table (figures printed, never asserted):
 *   npx tsx bench/sensitivity.ts            every case
 *   npx tsx bench/sensitivity.ts <case>     one case
 *
 * For each design: the time of the whole table with --all-pairs (every absent pair added, every
 * compatibility removed, one at a time, exact) divided by (number of changes × the time of one full
 * evaluateExact of the base design). Target: at most 0.6 on designs of 20+ classes. Full evaluations
 * are interleaved with the table (every tenth of it) so that load from other processes hits both
 * alike; CPU time of the process is the main figure, wall-clock time is printed beside it.
 */
import { evaluateExact } from '../src/exact/evaluate.js';
import { changesOf } from '../src/usecases/sensitivity.js';
import { scenarioContext } from '../src/usecases/context.js';
const ctxOf = (scenario: Scenario) => scenarioContext(scenario, { source: 'bench' });
import { singleChangeEvaluator } from '../src/exact/single-change.js';
import { sensitivity } from '../src/design/sensitivity/sensitivity.js';
import { compileGraph, edgePairs, type CompiledModel } from '../src/model/compile.js';
import { cyclePairs, randomPairs, randomRegularPairs } from '../src/model/generators.js';
import { validateScenario } from '../src/model/validate.js';
import type { Scenario } from '../src/model/scenario.js';
import { seededRandom } from '../src/random.js';

const ids = (n: number): string[] => Array.from({ length: n }, (_, i) => `c${i}`);

/** Rates from positive edge flows (λ_k = Σ_{e∋k} a_{k,e} μ_e, μ_e > 0): stable for non-bipartite graphs. */
function withFlowRates(n: number, pairs: Array<[number, number]>, random: () => number): CompiledModel {
  const rates = new Array<number>(n).fill(0);
  for (const [a, b] of pairs) {
    const mu = 0.2 + random();
    rates[a]! += mu;
    rates[b]! += mu;
  }
  return compileGraph(ids(n), rates, pairs);
}

const CASES: Record<string, () => CompiledModel> = {
  // a ring road of 25 zones with two shortcuts and one self-compatible zone
  'cycle25-chords': () => {
    const pairs = cyclePairs(25);
    pairs.push([0, 12], [6, 19], [3, 3]);
    return withFlowRates(25, pairs, seededRandom(25));
  },
  'regular3-26': () => {
    const random = seededRandom(26);
    return withFlowRates(26, randomRegularPairs(26, 3, random), random);
  },
  'random-30': () => {
    const random = seededRandom(30);
    const pairs = randomPairs(30, 0.16, random, 0.05);
    // make sure every class has a partner
    for (let k = 0; k < 30; k++) if (!pairs.some(([a, b]) => a === k || b === k)) pairs.push([k, (k + 1) % 30]);
    return withFlowRates(30, pairs, random);
  },
};

function scenarioOf(model: CompiledModel): Scenario {
  return validateScenario({
    name: 'bench',
    classes: model.ids.map((id, k) => ({ id, rate: model.rates[k] })),
    compatibilities: edgePairs(model).map(([a, b]) => ({ pair: [model.ids[a], model.ids[b]], removable: true, saving: 1 })),
  });
}

/** CPU time of this process in ms (less sensitive than wall time to other processes on the machine). */
function cpu(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
}

interface Clock {
  wall: number;
  cpu: number;
}

function runCase(name: string): void {
  const model = CASES[name]!();
  const scenario = scenarioOf(model);
  evaluateExact(model); // warm up the full evaluation
  sensitivity(model, changesOf(ctxOf(scenario), false), {}); // and the table code (removals only)
  // The whole table as the command computes it (stability, bottleneck, every change, ranking), with a
  // full evaluateExact interleaved every few entries; its time is measured apart and taken out.
  const full: Clock = { wall: 0, cpu: 0 };
  let fullRuns = 0;
  const changes = (model.n * (model.n + 1)) / 2;
  const every = Math.max(1, Math.floor(changes / 10));
  const start: Clock = { wall: performance.now(), cpu: cpu() };
  const table = sensitivity(model, changesOf(ctxOf(scenario), true), {
    onProgress: (done) => {
      if (done % every !== 0) return;
      const w0 = performance.now();
      const c0 = cpu();
      evaluateExact(model);
      full.cpu += cpu() - c0;
      full.wall += performance.now() - w0;
      fullRuns++;
    },
  });
  const tableWall = performance.now() - start.wall - full.wall;
  const tableCpu = cpu() - start.cpu - full.cpu;
  if (table.additions.length + table.removals.length !== changes) throw new Error('every pair should be one change');
  // the exact part alone: the base pass and every toggle (CPU time)
  const c0 = cpu();
  const ev = singleChangeEvaluator(model);
  let computed = 0;
  for (let a = 0; a < model.n; a++) for (let b = a; b < model.n; b++) computed += ev.toggle(a, b).computedSets;
  const exactCpu = cpu() - c0;
  const fullCpu = full.cpu / fullRuns;
  const fullWall = full.wall / fullRuns;
  console.log(
    `${name.padEnd(16)}${String(model.n).padStart(8)}${String(ev.independentSets).padStart(10)}${String(changes).padStart(9)}` +
      `${fullCpu.toFixed(1).padStart(10)}${(tableCpu / changes).toFixed(2).padStart(12)}${(tableCpu / 1000).toFixed(2).padStart(9)}` +
      `${(tableCpu / (changes * fullCpu)).toFixed(3).padStart(8)}${(tableWall / (changes * fullWall)).toFixed(3).padStart(8)}` +
      `${(exactCpu / (changes * fullCpu)).toFixed(3).padStart(8)}${(computed / changes / ev.independentSets).toFixed(3).padStart(9)}`,
  );
}

const arg = process.argv[2];
console.log('sensitivity table (--all-pairs) against one full evaluateExact per change');
console.log('case             classes      sets  changes   full ms  table ms/ch  table s   ratio    wall   exact  touched');
for (const name of arg ? [arg] : Object.keys(CASES)) runCase(name);
console.log('ratio = table CPU time / (changes × CPU time of one full evaluateExact, interleaved with the table); wall = the same with');
console.log('wall-clock times; exact = base pass + toggles alone (CPU); touched = share of the sets recomputed per change');
console.log('target: ratio ≤ 0.6 on designs of 20+ classes');
