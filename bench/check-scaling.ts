/**
 * How `check` scales with the number of classes (issue: it was quadratic): the whole path of the
 * command — parse and validate the file text, compile, stability verdict with headroom and tight
 * sets — on designs of N classes, and the ratio of the 20 000-class time to the 5 000-class time
 * (near-linear work gives about 4). Figures are printed, never asserted.
 *   npx tsx bench/check-scaling.ts
 */
import { compileModel } from '../src/model/compile.js';
import { parseScenario } from '../src/model/validate.js';
import { seededRandom } from '../src/random.js';
import { checkStability } from '../src/stability/check.js';

type Shape = 'isolated self-matching' | 'pairs a–b with self-loops' | 'short paths with a self-loop';

/** The text of a scenario file of n classes. */
function scenarioText(n: number, shape: Shape, seed: number): string {
  const random = seededRandom(seed);
  const classes = Array.from({ length: n }, (_, k) => ({ id: `class-${k}`, rate: Number((0.5 + random() * 3).toFixed(3)) }));
  const compatibilities: Array<[string, string]> = [];
  for (let k = 0; k < n; k++) {
    const id = `class-${k}`;
    if (shape === 'isolated self-matching') compatibilities.push([id, id]);
    else if (shape === 'pairs a–b with self-loops') {
      compatibilities.push([id, id]);
      if (k % 2 === 1) compatibilities.push([`class-${k - 1}`, id]);
    } else {
      // paths of 5 classes, the first self-looped: stable when the path's rates allow it
      if (k % 5 === 0) compatibilities.push([id, id]);
      else compatibilities.push([`class-${k - 1}`, id]);
    }
  }
  if (shape === 'short paths with a self-loop') classes.forEach((c, k) => (c.rate = [10, 3, 2.5, 3, 1][k % 5]!));
  return JSON.stringify({ name: `${n} classes`, timeUnit: 'hour', classes, compatibilities });
}

function timeCheck(text: string): { ms: number; stable: boolean } {
  const t0 = performance.now();
  const model = compileModel(parseScenario(text));
  const report = checkStability(model);
  return { ms: performance.now() - t0, stable: report.stable };
}

console.log('check (parse + validate + compile + stability with headroom): best of 3 runs');
console.log('shape                          classes     ms  verdict');
for (const shape of ['isolated self-matching', 'pairs a–b with self-loops', 'short paths with a self-loop'] as const) {
  const times = new Map<number, number>();
  for (const n of [5000, 10000, 20000]) {
    const text = scenarioText(n, shape, n);
    let best = Infinity;
    let stable = false;
    for (let r = 0; r < 3; r++) {
      const t = timeCheck(text);
      best = Math.min(best, t.ms);
      stable = t.stable;
    }
    times.set(n, best);
    console.log(`${shape.padEnd(30)} ${String(n).padStart(7)} ${best.toFixed(0).padStart(6)}  ${stable ? 'stable' : 'unstable'}`);
  }
  console.log(`${shape.padEnd(30)} ratio 20 000 / 5 000: ${(times.get(20000)! / times.get(5000)!).toFixed(2)}`);
}
