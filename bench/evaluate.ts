/**
 * Benchmark of the exact evaluator (figures printed, never asserted).
 *   npx tsx bench/evaluate.ts            all cases: in-process phases, then `edgewise evaluate --json`
 *                                        (built CLI) against the plain C reference bench/c/exact.c
 *   npx tsx bench/evaluate.ts <case>     one case in this process, prints one JSON line
 * EDGEWISE_BENCH_LARGE=1 adds a 38-class case (15 M sets; the C reference takes half a minute).
 */
import { spawnSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { prefixSums, tailPass } from '../src/exact/component.js';
import { evaluateExact } from '../src/exact/evaluate.js';
import { prepareComponents } from '../src/exact/prepare.js';
import { buildTrie } from '../src/exact/trie.js';
import { compileGraph, type CompiledModel } from '../src/model/compile.js';
import { cyclePairs, randomRegularPairs } from '../src/model/generators.js';
import { MACHINE_DIGITS } from '../src/output/format.js';
import { seededRandom } from '../src/random.js';
import { permutationOracle } from '../tests/helpers/permutation-oracle.js';
import { buildC, builtCli, load, median, scratchDir, timeProcess } from './_processes.js';

const ids = (n: number): string[] => Array.from({ length: n }, (_, i) => `c${i}`);

interface Case {
  readonly rates: number[];
  readonly pairs: Array<[number, number]>;
}

function design(name: string): Case {
  if (name === 'odd-cycle-25') return { rates: new Array(25).fill(1), pairs: cyclePairs(25) };
  const m = /^regular3-(\d+)$/.exec(name);
  if (m) {
    const n = Number(m[1]);
    const random = seededRandom(2026);
    const pairs = randomRegularPairs(n, 3, random);
    return { rates: Array.from({ length: n }, () => 1 + random()), pairs };
  }
  throw new Error(`unknown case ${name}`);
}

const toModel = (c: Case): CompiledModel => compileGraph(ids(c.rates.length), c.rates, c.pairs);

export const CASES = ['odd-cycle-25', 'regular3-32', 'regular3-36', ...(process.env.EDGEWISE_BENCH_LARGE ? ['regular3-38'] : [])];

/** One case in this process: the whole evaluation, then each phase of the recursion on its own. */
function runOne(name: string): void {
  const model = toModel(design(name));
  const t0 = performance.now();
  const r = evaluateExact(model, { maxSets: 50_000_000 });
  const seconds = (performance.now() - t0) / 1000;
  const phase = { count: 0, trie: 0, prefix: 0, tail: 0 };
  let t = performance.now();
  const lap = (k: keyof typeof phase): void => {
    const u = performance.now();
    phase[k] += (u - t) / 1000;
    t = u;
  };
  const { parts } = prepareComponents(model, 50_000_000);
  lap('count');
  for (const { g, count } of parts) {
    const trie = buildTrie(g, count);
    lap('trie');
    const psi = new Float64Array(count);
    prefixSums(g, trie, psi, 1e-12 * model.totalRate);
    lap('prefix');
    tailPass(g, trie, psi, new Float64Array(count));
    lap('tail');
  }
  const peakMiB = process.resourceUsage().maxRSS / 1024;
  console.log(JSON.stringify({ name, classes: model.n, independentSets: r.independentSets, seconds, peakMiB, phase, backlog: r.backlogTotal }));
}

/** The JSON's figures carry MACHINE_DIGITS (9) significant digits: a relative error up to 5e-9 is rounding. */
const JSON_AGREEMENT = 0.5 * 10 ** (1 - MACHINE_DIGITS);

interface CRun {
  readonly backlog: number[];
  readonly backlogTotal: number;
}

/** `edgewise evaluate --json` (built CLI) against the C reference on the same design, interleaved. */
function againstC(cases: readonly string[], rounds: number): void {
  console.log(`\nagainst the plain C reference (bench/c/exact.c, gcc -O2: sets as 64-bit masks, sorted, hash-table look-ups), whole processes, median of ${rounds} interleaved runs`);
  const dir = scratchDir('edgewise-bench-');
  const c = buildC('exact', dir);
  const cli = builtCli();
  if ('skip' in c || 'skip' in cli) {
    console.log(`  skipped: ${'skip' in c ? c.skip : (cli as { skip: string }).skip}`);
    return;
  }
  console.log('case            sets        edgewise s (CPU)   C s (CPU)        edgewise/C wall (CPU)  peak MiB edgewise / C  backlog agrees  load');
  for (const name of cases) {
    const d = design(name);
    const n = d.rates.length;
    const scenario = join(dir, `${name}.json`);
    const text = join(dir, `${name}.txt`);
    writeFileSync(
      scenario,
      JSON.stringify({ name, timeUnit: 'minute', classes: d.rates.map((rate, k) => ({ id: `c${k}`, rate })), compatibilities: d.pairs.map(([a, b]) => [`c${a}`, `c${b}`]) }),
    );
    writeFileSync(text, `${n} ${d.pairs.length}\n${d.rates.join(' ')}\n${d.pairs.map((p) => p.join(' ')).join('\n')}\n`);
    const ew: ReturnType<typeof timeProcess>[] = [];
    const cr: ReturnType<typeof timeProcess>[] = [];
    for (let r = 0; r < rounds; r++) {
      cr.push(timeProcess(c.path, [text]));
      ew.push(timeProcess(process.execPath, [cli.path, 'evaluate', '--json', scenario]));
    }
    const record = JSON.parse(ew[0]!.stdout) as { independentSets: number; backlog: { total: number; byClass: Record<string, number> } };
    const ref = JSON.parse(cr[0]!.stdout) as CRun;
    let worst = Math.abs(record.backlog.total - ref.backlogTotal) / ref.backlogTotal;
    for (let k = 0; k < n; k++) worst = Math.max(worst, Math.abs(record.backlog.byClass[`c${k}`]! - ref.backlog[k]!) / ref.backlog[k]!);
    const wall = [median(ew.map((x) => x.wall)), median(cr.map((x) => x.wall))];
    const cpu = ew[0]!.cpu === undefined ? undefined : [median(ew.map((x) => x.cpu!)), median(cr.map((x) => x.cpu!))];
    const fmt = (i: number): string => `${wall[i]!.toFixed(2)} (${cpu ? cpu[i]!.toFixed(2) : '?'})`.padEnd(17);
    const peak = ew[0]!.peakKiB === undefined ? '?' : `${(Math.max(...ew.map((x) => x.peakKiB!)) / 1024).toFixed(0)} / ${(Math.max(...cr.map((x) => x.peakKiB!)) / 1024).toFixed(0)}`;
    console.log(
      `${name.padEnd(16)}${String(record.independentSets).padEnd(12)}${fmt(0)}  ${fmt(1)}  ${(wall[0]! / wall[1]!).toFixed(2)} (${cpu ? (cpu[0]! / cpu[1]!).toFixed(2) : '?'})`.padEnd(93) +
        `${peak.padEnd(24)}${worst <= JSON_AGREEMENT ? 'yes' : 'NO'} (${worst.toExponential(0)})`.padEnd(17) +
        `  ${load()}`,
    );
  }
  console.log('goal: edgewise/C at most 1.0 from 1 M sets on, peak under 2048 MiB; the backlog agrees when within the JSON\'s rounding (9 significant digits); the CLI figures include Node start-up, reading, the stability check and JSON output');
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

const arg = process.argv[2];
if (arg) runOne(arg);
else {
  console.log('exact evaluation (evaluate) in process: time, peak memory and the share of each phase, one fresh process per case');
  console.log('case            classes  sets        seconds  peak MiB  count / trie / prefix / tail (s)');
  for (const name of CASES) {
    const p = spawnSync(process.execPath, ['--import', 'tsx', fileURLToPath(import.meta.url), name], { encoding: 'utf8' });
    if (p.status !== 0) {
      console.log(`${name}: failed\n${p.stderr}`);
      continue;
    }
    const r = JSON.parse(p.stdout.trim().split('\n').pop()!);
    const ph = r.phase as Record<string, number>;
    console.log(
      `${r.name.padEnd(16)}${String(r.classes).padStart(7)}  ${String(r.independentSets).padStart(10)}  ${r.seconds.toFixed(2).padStart(7)}  ${r.peakMiB.toFixed(0).padStart(8)}  ` +
        ['count', 'trie', 'prefix', 'tail'].map((k) => ph[k]!.toFixed(2)).join(' / '),
    );
  }
  againstC(CASES, 3);
  oracleRatio();
}
