/**
 * Benchmark of the exact evaluator (figures printed, never asserted).
 *   npx tsx bench/evaluate.ts            all cases, each in a fresh process (clean peak memory)
 *   npx tsx bench/evaluate.ts <case>     one case, prints one JSON line
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { compileGraph, type CompiledModel } from '../src/model/compile.js';
import { cyclePairs, randomRegularPairs } from '../src/model/generators.js';
import { evaluateExact } from '../src/exact/evaluate.js';
import { seededRandom } from '../src/random.js';
import { permutationOracle } from '../tests/helpers/permutation-oracle.js';

const ids = (n: number): string[] => Array.from({ length: n }, (_, i) => `c${i}`);

function design(name: string): CompiledModel {
  if (name === 'odd-cycle-25') return compileGraph(ids(25), new Array(25).fill(1), cyclePairs(25));
  if (name === 'regular3-36') {
    const random = seededRandom(2026);
    const pairs = randomRegularPairs(36, 3, random);
    const rates = Array.from({ length: 36 }, () => 1 + random());
    return compileGraph(ids(36), rates, pairs);
  }
  throw new Error(`unknown case ${name}`);
}

export const CASES = ['odd-cycle-25', 'regular3-36'];

function runOne(name: string): void {
  const model = design(name);
  const t0 = performance.now();
  const r = evaluateExact(model, { maxSets: 50_000_000 });
  const seconds = (performance.now() - t0) / 1000;
  const peakMiB = process.resourceUsage().maxRSS / 1024;
  console.log(JSON.stringify({ name, classes: model.n, edges: model.m, independentSets: r.independentSets, seconds, peakMiB, backlog: r.backlogTotal }));
}

const arg = process.argv[2];
if (arg) runOne(arg);
else {
  console.log('exact evaluation (evaluate): time and peak memory, one fresh process per case');
  console.log('case            classes  sets        seconds  peak MiB');
  for (const name of CASES) {
    const p = spawnSync(process.execPath, ['--import', 'tsx', fileURLToPath(import.meta.url), name], { encoding: 'utf8' });
    if (p.status !== 0) {
      console.log(`${name}: failed\n${p.stderr}`);
      continue;
    }
    const r = JSON.parse(p.stdout.trim().split('\n').pop()!);
    console.log(
      `${r.name.padEnd(16)}${String(r.classes).padStart(7)}  ${String(r.independentSets).padStart(10)}  ${r.seconds.toFixed(2).padStart(7)}  ${r.peakMiB.toFixed(0).padStart(8)}`,
    );
  }
  console.log('targets: regular3-36 under 7 s and under 2048 MiB on the 2-core machine');
  oracleRatio();
}

/** Speed against the permutation-sum closed form (the test oracle) on 8–10 classes. */
function oracleRatio(): void {
  console.log('\nagainst the permutation-sum closed form (test oracle), random designs with edge probability 0.35');
  console.log('classes  sets   recursion ms  permutation-sum ms  ratio');
  const random = seededRandom(99);
  for (const n of [8, 9, 10]) {
    let model: CompiledModel | undefined;
    for (let tries = 0; tries < 1000 && !model; tries++) {
      const pairs: Array<[number, number]> = [];
      for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) if (random() < 0.35) pairs.push([i, j]);
      for (let i = 0; i < n; i++) if (random() < 0.15) pairs.push([i, i]);
      const candidate = compileGraph(ids(n), Array.from({ length: n }, () => 0.5 + random()), pairs);
      try {
        evaluateExact(candidate);
        model = candidate;
      } catch {
        /* unstable draw: try another */
      }
    }
    if (!model) continue;
    const reps = 200;
    let t0 = performance.now();
    let sets = 0;
    for (let r = 0; r < reps; r++) sets = evaluateExact(model).independentSets;
    const fast = (performance.now() - t0) / reps;
    t0 = performance.now();
    permutationOracle(model);
    const slow = performance.now() - t0;
    console.log(`${String(n).padStart(7)}  ${String(sets).padStart(4)}  ${fast.toFixed(3).padStart(12)}  ${slow.toFixed(1).padStart(18)}  ${(slow / fast).toFixed(0).padStart(5)}×`);
  }
}
