import type { DesignProblem, Toggle } from '/work/wt-speed13/src/design/space/problem.ts';
import { seededRandom } from '/work/wt-speed13/src/random.ts';
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
    toggles.push({ a: Math.min(a, b), b: Math.max(a, b), kind: 'candidate', price: int(2, 25), source: toggles.length });
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
  };
}

export const CASES: Record<string, () => DesignProblem> = {
  'countable-9x14': () => benchProblem(9, 14, 7, 0.3),
  '12-classes-30-candidates': () => benchProblem(12, 30, 2026, 0.25),
  '15-classes-20-candidates': () => benchProblem(15, 20, 2026, 0.25),
  '20-classes-40-candidates': () => benchProblem(20, 40, 2026, 0.2),
  '25-classes-40-candidates': () => benchProblem(25, 40, 2026, 0.2),
};

