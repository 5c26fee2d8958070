/**
 * Benchmark of the stability verdict (checkStability): time per design, with the share spent in the
 * edge-flow LP (javascript-lp-solver). Figures are printed, never asserted.
 *   npx tsx bench/stability.ts
 */
import { compileGraph, type CompiledModel } from '../src/model/compile.js';
import { seededRandom } from '../src/random.js';
import { solveWithJsLp } from '../src/solvers/jslp.js';
import { checkStability } from '../src/stability/check.js';
import { edgeFlowProgram } from '../src/stability/programs.js';

/** A random design of mean degree d (a cycle plus random chords and one self-loop); stable rates come from positive edge flows (λ_k = Σ_{e∋k} a_{k,e} μ_e). */
function design(n: number, d: number, stable: boolean, seed: number): CompiledModel {
  const random = seededRandom(seed);
  const pairs: Array<[number, number]> = [[0, 0]];
  const seen = new Set<number>();
  for (let i = 0; i < n; i++) {
    const a = Math.min(i, (i + 1) % n);
    const b = Math.max(i, (i + 1) % n);
    seen.add(a * n + b);
    pairs.push([a, b]);
  }
  while (pairs.length < (n * d) / 2) {
    const a = Math.floor(random() * n);
    const b = Math.floor(random() * n);
    const key = Math.min(a, b) * n + Math.max(a, b);
    if (a === b || seen.has(key)) continue;
    seen.add(key);
    pairs.push([a, b]);
  }
  const rates = new Array<number>(n).fill(0);
  if (stable) {
    for (const [a, b] of pairs) {
      const mu = 0.2 + random();
      rates[a]! += mu;
      rates[b]! += mu;
    }
  } else for (let k = 0; k < n; k++) rates[k] = 0.2 + 3 * random();
  return compileGraph(Array.from({ length: n }, (_, k) => `c${k}`), rates, pairs);
}

const median = (xs: number[]): number => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

console.log('stability verdict (checkStability): median of 3 runs, after one warm-up');
console.log('classes  degree  edges  rates     verdict    LP ms  total ms');
for (const [n, d] of [[50, 4], [100, 4], [300, 4], [300, 10], [300, 30], [500, 6]] as const) {
  for (const stable of [true, false]) {
    const model = design(n, d, stable, 1000 * n + d);
    const members = Int32Array.from({ length: n }, (_, k) => k);
    checkStability(model);
    const lp: number[] = [];
    const total: number[] = [];
    let verdict = '';
    for (let r = 0; r < 3; r++) {
      let t0 = performance.now();
      solveWithJsLp(edgeFlowProgram(model, members).lp);
      lp.push(performance.now() - t0);
      t0 = performance.now();
      verdict = checkStability(model).stable ? 'stable' : 'unstable';
      total.push(performance.now() - t0);
    }
    console.log(
      `${String(n).padStart(7)}  ${String(d).padStart(6)}  ${String(model.m).padStart(5)}  ${(stable ? 'flows' : 'uniform').padEnd(8)}  ${verdict.padEnd(9)}  ${median(lp).toFixed(0).padStart(5)}  ${median(total).toFixed(0).padStart(8)}`,
    );
  }
}
