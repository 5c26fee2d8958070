/**
 * Benchmark of the recommender (figures printed, never asserted). Run alone:
 *   npx tsx bench/recommend.ts            all cases (a few minutes on a 2-core machine)
 *   npx tsx bench/recommend.ts <case>     one case
 *
 * Cases (invented, seeded): a ring of classes as today's design, random candidate pairs (self-pairs
 * included) with integer costs 2–25, rates uniform in [0.5, 2], budget a fifth to a quarter of the
 * candidates' total cost. CPU time in one thread, split into the MILP stage (until the search
 * starts) and the rest, exact evaluations to the front, how many of the MILP stage's designs are on
 * the final front, and a fingerprint of the front (cost and objective to 10 digits) to compare
 * runs; evaluations as a share of the 2^k designs; on a 14-candidate case, the ratio to an actual
 * exhaustive enumeration. When the build exists (npm run build), the 20 × 40 case is also run from
 * dist with --jobs 2 on worker threads.
 *
 * Case `contract`: seeded scenario files with 12 or 13 candidates (tests/helpers/random-scenario.ts),
 * `recommend --json` against `recommend --exhaustive --json` as whole processes of the built CLI:
 * the time ratio (wall and CPU) and whether the fronts are the same.
 *
 * Case `penalty-reuse`: the penalty check of two larger designs (24 and 30 classes: a ring with a
 * self-pair, a few fixed chords and 8 paid chords, rates from positive flows), i.e. the 8 designs
 * "minus one paid chord", scored afresh and by reuse of the single-change evaluator
 * (src/design/score-flips.ts), with per-class figures (weighted / max-wait objectives, wait targets)
 * and with the total backlog alone; CPU time, best of a few. Where the recommender reuses is decided
 * in src/design/reuse.ts from the figures of bench/_incremental-crossover.ts.
 */
import { existsSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { loadavg } from 'node:os';
import type { DesignProblem, Toggle } from '../src/design/space/problem.js';
import { recommend, type Recommendation, type RecommendOptions } from '../src/design/search/recommend.js';
import { reuses } from '../src/design/scoring/reuse.js';
import { flipped, scoreFlips } from '../src/design/scoring/score-flips.js';
import { scoreDesign, sharedTrieSets } from '../src/design/scoring/score.js';
import { seededRandom } from '../src/random.js';
import { ringWithChords } from './_ring-with-chords.js';
import { builtCli, scratchDir, timeProcess } from './_processes.js';
import { randomScenario } from '../tests/helpers/random-scenario.js';

function benchProblem(n: number, candidates: number, seed: number, budgetShare: number): DesignProblem {
  const random = seededRandom(seed);
  const int = (lo: number, hi: number): number => lo + Math.floor(random() * (hi - lo + 1));
  const fixed: Array<[number, number]> = [];
  const used = new Set<number>();
  const id = (a: number, b: number): number => Math.min(a, b) * n + Math.max(a, b);
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n;
    fixed.push([Math.min(i, j), Math.max(i, j)]);
    used.add(id(i, j));
  }
  const toggles: Toggle[] = [];
  while (toggles.length < candidates) {
    const a = int(0, n - 1);
    const b = random() < 0.1 ? a : int(0, n - 1);
    if (used.has(id(a, b))) continue;
    used.add(id(a, b));
    toggles.push({ a: Math.min(a, b), b: Math.max(a, b), kind: 'candidate', price: int(2, 25), source: toggles.length, value: 0 });
  }
  const fixedDegree = new Int32Array(n);
  for (const [a, b] of fixed) {
    fixedDegree[a]++;
    if (a !== b) fixedDegree[b]++;
  }
  const total = toggles.reduce((s, t) => s + t.price, 0);
  return {
    n,
    ids: Array.from({ length: n }, (_, k) => `z${k}`),
    rates: Float64Array.from({ length: n }, () => 0.5 + 1.5 * random()),
    timeUnit: 'minute',
    fixed,
    toggles,
    forcedOut: [],
    costOffset: 0,
    budget: Math.round(total * budgetShare),
    maxDegree: new Float64Array(n).fill(Infinity),
    fixedDegree,
    waitTarget: new Float64Array(n).fill(Infinity),
    weight: new Float64Array(n).fill(1),
    today: new Uint8Array(toggles.length),
    fixedValue: new Float64Array(fixed.length),
    waitingCost: 0,
    hasValues: false,
  };
}

const CASES: Record<string, () => DesignProblem> = {
  'countable-9x14': () => benchProblem(9, 14, 7, 0.3),
  '12-classes-30-candidates': () => benchProblem(12, 30, 2026, 0.25),
  '15-classes-20-candidates': () => benchProblem(15, 20, 2026, 0.25),
  '20-classes-40-candidates': () => benchProblem(20, 40, 2026, 0.2),
  '25-classes-40-candidates': () => benchProblem(25, 40, 2026, 0.2),
};

type Recommend = (p: DesignProblem, o: RecommendOptions) => Promise<Recommendation>;

/** CPU milliseconds of this process (the machine is shared: wall time is noisier). */
const cpuMs = (): number => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};

interface Timed {
  readonly rec: Recommendation;
  readonly seconds: number;
  /** CPU seconds of the MILP stage (until the search starts) and of the rest. */
  readonly milpSeconds: number;
  readonly restSeconds: number;
}

async function timed(run: Recommend, p: DesignProblem, o: RecommendOptions): Promise<Timed> {
  const c0 = cpuMs();
  let milpEnd = NaN;
  const rec = await run(p, {
    ...o,
    onProgress: (x) => {
      if (x.phase !== 'milp' && Number.isNaN(milpEnd)) milpEnd = cpuMs();
    },
  });
  const c1 = cpuMs();
  return { rec, seconds: (c1 - c0) / 1000, milpSeconds: (milpEnd - c0) / 1000, restSeconds: (c1 - milpEnd) / 1000 };
}

/** The distinct designs of the MILP stage (cheapest and ladder) and how many of them are on the final front. */
function milpOnFront(rec: Recommendation): { designs: number; onFront: number } {
  const keys = new Set<string>();
  const key = (d: Uint8Array): string => d.join('');
  keys.add(key(rec.milp.cheapest.design));
  for (const l of rec.milp.ladder) if (l.design) keys.add(key(l.design.design));
  const front = new Set(rec.pareto.map((d) => key(d.design)));
  return { designs: keys.size, onFront: [...keys].filter((k) => front.has(k)).length };
}

const frontText = (r: Recommendation): string => r.pareto.map((d) => `${d.cost}:${d.objective.toPrecision(10)}`).join(' ');

/** A short fingerprint of a front (cost:objective to 10 digits), to compare runs by eye. */
function frontHash(r: Recommendation): string {
  let h = 2166136261;
  for (const ch of frontText(r)) h = Math.imul(h ^ ch.charCodeAt(0), 16777619) >>> 0;
  return h.toString(16).padStart(8, '0');
}

async function runCase(name: string): Promise<void> {
  const p = CASES[name]!();
  const k = p.toggles.length;
  const { rec, seconds, milpSeconds, restSeconds } = await timed(recommend, p, { workerUrl: null });
  const share = rec.evaluations / rec.designSpace;
  const m = milpOnFront(rec);
  console.log(
    `${name.padEnd(26)} classes ${String(p.n).padStart(2)}  candidates ${k}  budget ${p.budget}  front ${String(rec.pareto.length).padStart(3)}  ` +
      `evaluations ${String(rec.evaluations).padStart(6)}  share of 2^${k} ${share.toExponential(2)}  ` +
      `CPU ${seconds.toFixed(1)} s in one thread: MILP stage ${milpSeconds.toFixed(1)} s (${((100 * milpSeconds) / seconds).toFixed(0)} %), ` +
      `search and details ${restSeconds.toFixed(1)} s; MILP designs on the front ${m.onFront} of ${m.designs}; front ${frontHash(rec)}`,
  );
  if (name === 'countable-9x14') {
    const ex = await timed(recommend, p, { workerUrl: null, exhaustive: true });
    console.log(
      `${''.padEnd(26)} --exhaustive: ${ex.rec.evaluations} evaluations in ${ex.seconds.toFixed(1)} s; search/exhaustive = ` +
        `${(rec.evaluations / ex.rec.evaluations).toFixed(3)}; same front: ${frontText(ex.rec) === frontText(rec) ? 'yes' : 'NO'}`,
    );
  }
  const dist = join(import.meta.dirname, '..', 'dist', 'design', 'search', 'recommend.js');
  if (name === '20-classes-40-candidates' && existsSync(dist)) {
    const built = (await import(pathToFileURL(dist).href)) as { recommend: Recommend };
    const par = await timed(built.recommend, p, { jobs: 2 });
    console.log(
      `${''.padEnd(26)} from dist, --jobs 2 (${par.rec.scoring}): ${par.seconds.toFixed(1)} s; same front and count: ` +
        `${frontText(par.rec) === frontText(rec) && par.rec.evaluations === rec.evaluations ? 'yes' : 'NO'}`,
    );
  }
}


/**
 * Contract-like problems: seeded scenario files of 12–16 classes with 12 or 13 candidates (one with a
 * few removable compatibilities too), run as `recommend --json` and `recommend --exhaustive --json`
 * from dist (whole processes, wall time, best of two runs interleaved): the time ratio and whether the
 * two fronts (cost and objective of every design) are the same.
 */
const CONTRACT: ReadonlyArray<{ seed: number; groups: number; perGroup: number; candidates: number; removableShare: number; budgetShare: number }> = [
  { seed: 1, groups: 4, perGroup: 4, candidates: 12, removableShare: 0, budgetShare: 0.4 },
  { seed: 2, groups: 3, perGroup: 5, candidates: 13, removableShare: 0, budgetShare: 0.5 },
  { seed: 3, groups: 4, perGroup: 3, candidates: 12, removableShare: 0.1, budgetShare: 0.3 },
  { seed: 4, groups: 5, perGroup: 3, candidates: 13, removableShare: 0, budgetShare: 0.6 },
  { seed: 5, groups: 4, perGroup: 4, candidates: 13, removableShare: 0.05, budgetShare: 1 },
];

function contract(): void {
  const cli = builtCli();
  if ('skip' in cli) {
    console.log(`${'contract'.padEnd(26)} skipped: ${cli.skip}`);
    return;
  }
  const dir = scratchDir('edgewise-bench-recommend-');
  const ratios: number[] = [];
  let same = 0;
  for (const c of CONTRACT) {
    const { doc } = randomScenario(c.seed, c);
    const file = join(dir, `contract-${c.seed}.json`);
    writeFileSync(file, JSON.stringify(doc));
    const run = (extra: string[]): { wall: number; cpu: number; front: string; toggles: number; evaluations: number } => {
      const t = timeProcess(process.execPath, [cli.path, 'recommend', file, '--json', ...extra]);
      const out = JSON.parse(t.stdout) as { pareto: Array<{ cost: number; objective: number }>; search: { toggles: number; evaluations: number } };
      return { wall: t.wall, cpu: t.cpu ?? NaN, front: out.pareto.map((d) => `${d.cost}:${d.objective}`).join(' '), toggles: out.search.toggles, evaluations: out.search.evaluations };
    };
    // best of two runs, the two ways interleaved
    const a = [run([]), run([])];
    const b = [run(['--exhaustive']), run(['--exhaustive'])];
    const best = (xs: ReadonlyArray<{ wall: number; cpu: number }>, f: 'wall' | 'cpu'): number => Math.min(...xs.map((x) => x[f]));
    const ratio = best(a, 'wall') / best(b, 'wall');
    ratios.push(ratio);
    const sameFront = a[0]!.front === b[0]!.front && a[1]!.front === b[0]!.front;
    if (sameFront) same++;
    console.log(
      `${`contract-${c.seed}`.padEnd(26)} classes ${c.groups * c.perGroup}  toggles ${a[0]!.toggles}  front ${a[0]!.front.split(' ').length}  ` +
        `recommend --json ${best(a, 'wall').toFixed(2)} s (CPU ${best(a, 'cpu').toFixed(2)} s, ${a[0]!.evaluations} evaluations), ` +
        `--exhaustive ${best(b, 'wall').toFixed(2)} s (CPU ${best(b, 'cpu').toFixed(2)} s, ${b[0]!.evaluations}): ratio ${ratio.toFixed(2)} ` +
        `(CPU ${(best(a, 'cpu') / best(b, 'cpu')).toFixed(2)}); same front: ${sameFront ? 'yes' : 'NO'}`,
    );
  }
  console.log(
    `${'contract'.padEnd(26)} ${CONTRACT.length} problems: largest ratio ${Math.max(...ratios).toFixed(2)}, same front on ${same} of ${CONTRACT.length} ` +
      `(wall time of whole processes, best of two; CPU by GNU time where present; load average ${loadavg()[0]!.toFixed(2)})`,
  );
}

function penaltyReuse(): void {
  const cpu = (): number => {
    const u = process.cpuUsage();
    return (u.user + u.system) / 1000;
  };
  const k = 8;
  // (classes, extra fixed chords, seed): the designs of bench/_incremental-crossover.ts "ring 24" and "meshed 30"
  for (const [n, extra, seed] of [
    [24, 0, 1024],
    [30, 10, 1030],
  ] as const) {
    for (const perClass of [true, false]) {
      const { spec, design } = ringWithChords(n, extra, k, seed, perClass);
      const flips = Array.from({ length: k }, (_, j) => j);
      const sets = scoreDesign(spec, design).independentSets;
      const stable = flips.filter((j) => scoreDesign(spec, flipped(design, j)).stable).length;
      // best of a few repetitions, the two ways interleaved
      let fresh = Infinity;
      let reuse = Infinity;
      for (let r = 0; r < (sets > 200_000 ? 3 : 5); r++) {
        let c0 = cpu();
        flips.map((j) => scoreDesign(spec, flipped(design, j)));
        fresh = Math.min(fresh, cpu() - c0);
        c0 = cpu();
        scoreFlips(spec, design, flips);
        reuse = Math.min(reuse, cpu() - c0);
      }
      console.log(
        `${'penalty-reuse'.padEnd(26)} ${n} classes, ${sets.toLocaleString('en-US')} sets, ${k} paid toggles (${stable} drops stable), ${perClass ? 'per-class figures' : 'total backlog only'}: ` +
          `penalty check ${fresh.toFixed(0)} ms afresh, ${reuse.toFixed(0)} ms by reuse (${(reuse / fresh).toFixed(2)}); ` +
          `the recommender ${reuses('auto', perClass, sets, k, sharedTrieSets(spec)) ? 'reuses' : 'scores afresh'} here`,
      );
    }
  }
}

const arg = process.argv[2];
console.log('recommend: time and exact evaluations to the Pareto front (objective: total backlog)');
if (!arg || arg === 'contract') contract();
for (const name of arg ? (arg in CASES ? [arg] : []) : Object.keys(CASES)) await runCase(name);
if (!arg || arg === 'penalty-reuse') penaltyReuse();
