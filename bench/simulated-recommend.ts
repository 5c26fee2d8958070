/**
 * Benchmark of the simulation-scored recommender (figures printed, never asserted). Run alone:
 *   npx tsx bench/simulated-recommend.ts                 accuracy on 20 classes, then 60 and 100 classes
 *   npx tsx bench/simulated-recommend.ts accuracy|scale  one part
 *
 * Scenarios: tests/helpers/random-scenario.ts (seeded; cliques of 5 classes chained by random links,
 * rates from positive flows, removable share 0.2, budget 60 % of the candidates' cost).
 * - accuracy: `recommend --score simulation --seed 1` against `recommend --score exact` on the same
 *   file: share of the returned designs whose 95 % interval covers their exact backlog
 *   (evaluateExact), and the largest relative distance of their exact backlog above the exact front
 *   at the same cost (the exact search's front: the reference is the exact search, not every design).
 * - scale: 60, 100 and 200 classes × 50 candidates, `--score simulation --jobs 2` from dist/ (worker
 *   threads): wall time, designs scored, size of the front, replications the re-score added.
 * - contract80: 80 classes × 50 candidates, `recommend --json` under the default `--score auto`
 *   (--jobs 2): wall time, and every returned design checked by code that shares nothing with src/
 *   (bench/_independent-check.ts): stable by the edge-flow LP solved by HiGHS directly, and its
 *   reported backlog against a plain FCFM simulator (10 × 200 000 arrivals): do the two 95 %
 *   intervals overlap.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { evaluateExact } from '../src/exact/evaluate.js';
import { parseScenario } from '../src/model/validate.js';
import { randomScenario } from '../tests/helpers/random-scenario.js';
import { scenarioDesign, type Pair } from '../tests/helpers/scenario-design.js';
import { naiveFcfm, plainDesign, stableByLp } from './_independent-check.js';

const cli = join(import.meta.dirname, '..', 'dist', 'cli', 'main.js');
const dir = mkdtempSync(join(tmpdir(), 'edgewise-simrec-'));
const parts = process.argv.slice(2);
const want = (p: string): boolean => parts.length === 0 || parts.includes(p);

interface Entry {
  cost: number;
  backlog: number;
  backlogCi95?: [number, number];
  method?: string;
  stable?: boolean;
  added: Pair[];
  removed: Pair[];
}

function run(file: string, args: string[]): { rec: { pareto: Entry[]; search: { scored: number; designLimit: number | null; allocation?: { openAtStart: number; initialReplications: number; extended: number; extraReplications: number; unresolved: number } } }; seconds: number } {
  const t0 = performance.now();
  const p = spawnSync(process.execPath, [cli, 'recommend', file, '--json', ...args], { encoding: 'utf8', maxBuffer: 1 << 28 });
  if (p.status !== 0) throw new Error(`recommend ${args.join(' ')} exited ${p.status}: ${p.stderr}`);
  return { rec: JSON.parse(p.stdout), seconds: (performance.now() - t0) / 1000 };
}

if (!existsSync(cli)) {
  console.log('dist/ is missing: run npm run build first (this benchmark runs the built CLI)');
  process.exit(0);
}
console.log(`load average ${loadavg().map((x) => x.toFixed(2)).join(' ')}`);

if (want('accuracy')) {
  console.log('accuracy, 20 classes × 12 candidates (--score simulation vs the exact search):');
  let covered = 0;
  let total = 0;
  for (const seed of [1, 2, 3]) {
    const { doc } = randomScenario(seed, { groups: 4, perGroup: 5, candidates: 12, removableShare: 0.2, budgetShare: 0.6 });
    const file = join(dir, `acc${seed}.json`);
    writeFileSync(file, JSON.stringify(doc));
    const scenario = parseScenario(JSON.stringify(doc), file);
    const sim = run(file, ['--score', 'simulation', '--seed', '1', '--jobs', '2']);
    const ex = run(file, ['--score', 'exact', '--jobs', '2']);
    const frontAt = (c: number): number => Math.min(...ex.rec.pareto.filter((f) => f.cost <= c + 1e-9).map((f) => f.backlog));
    let cov = 0;
    let worst = -Infinity;
    for (const p of sim.rec.pareto) {
      const exact = evaluateExact(scenarioDesign(scenario, p.added, p.removed)).backlogTotal;
      if (p.backlogCi95 && p.backlogCi95[0] <= exact && exact <= p.backlogCi95[1]) cov++;
      worst = Math.max(worst, exact / frontAt(p.cost) - 1);
    }
    covered += cov;
    total += sim.rec.pareto.length;
    console.log(
      `  seed ${seed}: ${sim.rec.pareto.length} designs, coverage ${cov}/${sim.rec.pareto.length}, ` +
        `worst exact distance above the exact front ${(worst * 100).toFixed(2)} % · simulated ${sim.seconds.toFixed(1)} s ` +
        `(${sim.rec.search.scored} designs scored), exact ${ex.seconds.toFixed(1)} s`,
    );
  }
  console.log(`  coverage over all: ${((100 * covered) / Math.max(1, total)).toFixed(1)} % of ${total} intervals`);
}

if (want('scale')) {
  console.log('scale, --score simulation --jobs 2:');
  for (const groups of [12, 20, 40]) {
    const n = groups * 5;
    const { doc } = randomScenario(5, { groups, perGroup: 5, candidates: 50, removableShare: 0.2, budgetShare: 0.6 });
    const file = join(dir, `scale${n}.json`);
    writeFileSync(file, JSON.stringify(doc));
    const r = run(file, ['--score', 'simulation', '--seed', '1', '--jobs', '2']);
    const a = r.rec.search.allocation;
    const more = a ? `; re-score: ${a.openAtStart} comparisons open after ${a.initialReplications} replications, ${a.extended} designs given ${a.extraReplications} more, ${a.unresolved} still open` : '';
    console.log(`  ${n} classes × 50 candidates: ${r.seconds.toFixed(0)} s, ${r.rec.search.scored} designs scored, front of ${r.rec.pareto.length}${more}`);
  }
}

if (want('contract80')) {
  console.log('contract, 80 classes × 50 candidates, recommend --json (auto) --jobs 2, each design checked independently:');
  const { doc } = randomScenario(80, { groups: 16, perGroup: 5, candidates: 50, removableShare: 0.2, budgetShare: 0.6 });
  const file = join(dir, 'contract80.json');
  writeFileSync(file, JSON.stringify(doc));
  const r = run(file, ['--jobs', '2']);
  let stable = 0;
  let overlap = 0;
  let worst = 0;
  for (const p of r.rec.pareto) {
    const d = plainDesign(doc as never, p.added, p.removed);
    if (await stableByLp(d)) stable++;
    const naive = naiveFcfm(d, 200_000, 10, 80);
    const ci = p.backlogCi95 ?? [p.backlog, p.backlog];
    if (ci[0] <= naive.ci95[1] && naive.ci95[0] <= ci[1]) overlap++;
    worst = Math.max(worst, Math.abs(p.backlog / naive.mean - 1));
  }
  const k = r.rec.pareto.length;
  console.log(
    `  ${r.seconds.toFixed(0)} s, ${r.rec.search.scored} designs scored (limit ${r.rec.search.designLimit ?? 'not reached'}), ` +
      `front of ${k} (${r.rec.pareto.filter((p) => p.method === 'simulation').length} simulated)`,
  );
  console.log(`  stable by the independent LP: ${stable}/${k}; intervals overlapping the plain simulator's: ${overlap}/${k}; largest relative gap of the means ${(worst * 100).toFixed(2)} %`);
}
