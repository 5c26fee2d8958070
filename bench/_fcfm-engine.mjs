// Helper of bench/simulate.ts, run with plain `node` (no tsx): the FCFM rate of the BUILT patient
// engine (dist/, what the CLI runs), so that the figure does not include what a TypeScript loader
// adds to the code (under tsx, calls of imported functions went through getters).
//
// Usage: node bench/_fcfm-engine.mjs DESIGN WARMUP ARRIVALS
//   DESIGN: the text format of bench/c/fcfm.c (n m, then n rates, then m pairs "a b").
// Prints one JSON line {arrivals, seconds, cpuSeconds} of the timed run only (after WARMUP
// arrivals of warm-up), as bench/c/fcfm.c times its loop only.
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const dist = join(dirname(fileURLToPath(import.meta.url)), '..', 'dist');
const load = (p) => import(pathToFileURL(join(dist, p)).href);
const { compileGraph } = await load('model/compile.js');
const { buildSimModel } = await load('sim/sim-model.js');
const { ChainEngine } = await load('sim/chain-engine.js');
const { seedState } = await load('sim/random.js');

const [file, warmupText, arrivalsText] = process.argv.slice(2);
const words = readFileSync(file, 'utf8').trim().split(/\s+/).map(Number);
const [n, m] = words;
const rates = words.slice(2, 2 + n);
const pairs = [];
for (let e = 0; e < m; e++) pairs.push([words[2 + n + 2 * e], words[3 + n + 2 * e]]);
const ids = Array.from({ length: n }, (_, k) => `c${k}`);
const engine = new ChainEngine(buildSimModel(compileGraph(ids, rates, pairs)), seedState(1), 50_000_000);
engine.run(Number(warmupText)); // JIT warm-up and a steady state
const arrivals = Number(arrivalsText);
const c0 = process.cpuUsage();
const t0 = performance.now();
engine.run(arrivals);
const seconds = (performance.now() - t0) / 1000;
const c = process.cpuUsage(c0);
console.log(JSON.stringify({ arrivals, seconds, cpuSeconds: (c.user + c.system) / 1e6 }));
