/**
 * Benchmark of the repairs of an unstable design (src/design/repair/): time to the 5 cheapest
 * repairs, figures printed, never asserted. Run alone:
 *   npx tsx bench/repair.ts
 *
 * Cases (invented, seeded): 40 classes, an unstable design today (see todayDesign), 60 random
 * candidate pairs (a tenth of them self-pairs) with integer costs 2–25. Variants: maxCompatibilities
 * of 4 on every class; every candidate at the same cost (many ties); a tree whose repair needs a
 * dozen pairs (the hardest MILPs here).
 */
import type { DesignProblem, Toggle } from '../src/design/space/problem.js';
import { repairs, type RepairResult } from '../src/design/repair/index.js';
import { seededRandom } from '../src/random.js';
import { loadHighs } from '../src/solvers/highs.js';

type Today = 'tree' | 'two-sided' | 'thin-ring';

interface CaseOptions {
  readonly today: Today;
  readonly n: number;
  readonly candidates: number;
  readonly seed: number;
  readonly limit?: number;
  readonly flatCost?: number;
}

/**
 * Today's design and its rates:
 * - tree: a random tree, rates uniform in [0.5, 2] (leaves often outweigh their parent);
 * - two-sided: a random connected bipartite design between two halves (degree about 3), rates from
 *   positive flows on its pairs (both sides weigh the same, so it is unstable until an odd cycle);
 * - thin-ring: a ring with a self-pair and a few chords, rates from positive flows, then three
 *   classes made 15 % heavier than all their partners together (each overloads its neighbourhood).
 */
function todayDesign(o: CaseOptions, random: () => number): { fixed: Array<[number, number]>; rates: Float64Array } {
  const { n } = o;
  const int = (lo: number, hi: number): number => lo + Math.floor(random() * (hi - lo + 1));
  const fixed: Array<[number, number]> = [];
  const seen = new Set<number>();
  const add = (a: number, b: number): void => {
    const key = Math.min(a, b) * n + Math.max(a, b);
    if (seen.has(key)) return;
    seen.add(key);
    fixed.push([Math.min(a, b), Math.max(a, b)]);
  };
  const flowRates = (): Float64Array => {
    const r = new Float64Array(n);
    for (const [a, b] of fixed) {
      const mu = 0.2 + random();
      r[a] += a === b ? 2 * mu : mu;
      if (a !== b) r[b] += mu;
    }
    return r;
  };
  if (o.today === 'tree') {
    for (let v = 1; v < n; v++) add(int(0, v - 1), v);
    return { fixed, rates: Float64Array.from({ length: n }, () => 0.5 + 1.5 * random()) };
  }
  if (o.today === 'two-sided') {
    const half = n / 2;
    for (let v = 1; v < n; v++) {
      // left side 0..half-1, right side half..n-1; each new class joins one of the other side already placed
      const other = v < half ? int(half, n - 1) : int(0, half - 1);
      add(v, other);
    }
    add(0, half);
    while (fixed.length < (3 * n) / 2) add(int(0, half - 1), int(half, n - 1));
    return { fixed, rates: flowRates() };
  }
  add(0, 0);
  for (let i = 0; i < n; i++) add(i, (i + 1) % n);
  for (let c = 0; c < n / 4; c++) add(int(0, n - 1), int(0, n - 1));
  const rates = flowRates();
  for (let h = 0; h < 3; h++) {
    const k = int(1, n - 1);
    let around = 0;
    for (const [a, b] of fixed) if (a !== b && (a === k || b === k)) around += rates[a === k ? b : a]!;
    rates[k] = 1.15 * around;
  }
  return { fixed, rates };
}

function benchProblem(o: CaseOptions): DesignProblem {
  const { n, seed } = o;
  const random = seededRandom(seed);
  const int = (lo: number, hi: number): number => lo + Math.floor(random() * (hi - lo + 1));
  const { fixed, rates } = todayDesign(o, random);
  const id = (a: number, b: number): number => Math.min(a, b) * n + Math.max(a, b);
  const used = new Set<number>(fixed.map(([a, b]) => id(a, b)));
  const toggles: Toggle[] = [];
  while (toggles.length < o.candidates) {
    const a = int(0, n - 1);
    const b = random() < 0.1 ? a : int(0, n - 1);
    if (used.has(id(a, b))) continue;
    used.add(id(a, b));
    toggles.push({ a: Math.min(a, b), b: Math.max(a, b), kind: 'candidate', price: o.flatCost ?? int(2, 25), source: toggles.length, value: 0 });
  }
  const fixedDegree = new Int32Array(n);
  for (const [a, b] of fixed) {
    fixedDegree[a]++;
    if (a !== b) fixedDegree[b]++;
  }
  return {
    n,
    ids: Array.from({ length: n }, (_, k) => `z${k}`),
    rates,
    timeUnit: 'minute',
    fixed,
    toggles,
    forcedOut: [],
    costOffset: 0,
    budget: Infinity,
    maxDegree: Float64Array.from(fixedDegree, (d) => (o.limit === undefined ? Infinity : Math.max(d, o.limit))),
    fixedDegree,
    waitTarget: new Float64Array(n).fill(Infinity),
    weight: new Float64Array(n).fill(1),
    today: new Uint8Array(toggles.length),
    fixedValue: new Float64Array(fixed.length),
    waitingCost: 0,
    hasValues: false,
  };
}

const CASES: Record<string, CaseOptions> = {
  'two-sided-40x60': { today: 'two-sided', n: 40, candidates: 60, seed: 40 },
  'thin-ring-40x60': { today: 'thin-ring', n: 40, candidates: 60, seed: 41 },
  'thin-ring-40x60-b': { today: 'thin-ring', n: 40, candidates: 60, seed: 42 },
  'thin-ring-limit4': { today: 'thin-ring', n: 40, candidates: 60, seed: 41, limit: 4 },
  'thin-ring-flat-cost': { today: 'thin-ring', n: 40, candidates: 60, seed: 41, flatCost: 10 },
  'tree-40x60': { today: 'tree', n: 40, candidates: 60, seed: 40 },
  'tree-flat-cost': { today: 'tree', n: 40, candidates: 60, seed: 44, flatCost: 10 },
};

function summary(r: RepairResult): string {
  switch (r.status) {
    case 'stable-today':
      return 'stable today';
    case 'repairs':
      return `${r.repairs.length} repairs, costs ${r.repairs.map((x) => `${x.cost} (${x.added.length} pairs)`).join(', ')}${r.complete ? '' : ' (incomplete)'}`;
    case 'overloaded':
      return `no repair: a set of ${r.overload.set.length} classes stays overloaded (deficit ${r.overload.deficit.toFixed(3)})`;
    case 'limits':
      return `no repair within the limits; without them ${r.withoutLimits?.cost ?? '-'}, ${r.overLimit.length} classes over`;
  }
}

const only = process.argv[2];
console.log('repair: time to the 5 cheapest repairs of an unstable design (HiGHS MILP + checkStability, in-thread; CPU time too, as other load on the machine inflates the wall time)');
const t0 = performance.now();
await loadHighs();
console.log(`loading HiGHS (once per process, not counted below): ${((performance.now() - t0) / 1000).toFixed(2)} s`);
for (const [name, o] of Object.entries(CASES)) {
  if (only && only !== name) continue;
  const p = benchProblem(o);
  const start = performance.now();
  const cpu0 = process.cpuUsage();
  const r = await repairs(p, { count: 5 });
  const seconds = (performance.now() - start) / 1000;
  const cpu = process.cpuUsage(cpu0);
  console.log(
    `${name.padEnd(19)} classes ${p.n}  candidates ${p.toggles.length}  time ${seconds.toFixed(2)} s (CPU ${((cpu.user + cpu.system) / 1e6).toFixed(2)} s)  ${summary(r)}`,
  );
}
