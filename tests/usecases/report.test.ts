import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { pairKey, type Scenario } from '../../src/model/scenario.js';
import { parseScenario } from '../../src/model/validate.js';
import { scenarioContext } from '../../src/usecases/context.js';
import { decisionRecord, reportUseCase, type ReportRecord } from '../../src/usecases/report.js';
import { curveWords, namerOf, verdicts } from '../../src/html/verdicts.js';
import { k4, k4MinusEdge, K4_IDS, K4_MINUS_AB_PAIRS } from '../helpers/k4-minus-edge.js';
import { permutationOracle } from '../helpers/permutation-oracle.js';
import { scenarioDesign, type Pair } from '../helpers/scenario-design.js';

// The report's record (src/usecases/report.ts): the decision's verdicts, the load sweep and the
// instability of today's design. References: the permutation-sum closed form of the product form
// ("A product form for the general stochastic matching model", J. Appl. Probab. 2021;
// tests/helpers/permutation-oracle.ts); the K4-minus-one-edge closed forms derived by hand in
// tests/helpers/k4-minus-edge.ts; and the near-saturation result ("Flexibility can hurt dynamic
// matching system performance", SIGMETRICS Perform. Eval. Rev. 2022, from memory): an edge joining
// two neighbours of the saturating set hurts near saturation.

const root = join(import.meta.dirname, '..', '..');
const load = (f: string): Scenario => parseScenario(readFileSync(join(root, 'scenarios', f), 'utf8'), f);
const reportOf = (s: Scenario): Promise<ReportRecord> => reportUseCase(scenarioContext(s, { source: 'test' }), { jobs: 1, seed: 1 });

const memo = new Map<string, number>();

/** Backlog of today's design plus `added` minus `removed`, by the permutation oracle (memoised). */
function oracle(s: Scenario, added: readonly Pair[], removed: readonly Pair[]): number {
  const key = JSON.stringify([s.name, added.map((p) => pairKey(p[0], p[1])).sort(), removed.map((p) => pairKey(p[0], p[1])).sort()]);
  if (!memo.has(key)) memo.set(key, oracleOnce(s, added, removed));
  return memo.get(key)!;
}

function oracleOnce(s: Scenario, added: readonly Pair[], removed: readonly Pair[]): number {
  return permutationOracle(scenarioDesign(s, added, removed)).backlogTotal;
}

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.max(1e-300, Math.abs(b));

describe('report record of ride-pooling-hub.json', () => {
  it('every verdict is the exact change of the objective against the design it names (permutation sums, 1e-9)', async () => {
    const s = load('ride-pooling-hub.json');
    const r = await reportOf(s);
    const d = r.decision!;
    const refs = { recommended: d.recommended, today: d.today };
    const keyed = (ps: ReadonlyArray<readonly [string, string]>) => new Set(ps.map((p) => pairKey(p[0], p[1])));
    let checked = 0;
    for (const v of d.verdicts) {
      const ref = refs[v.against];
      const added = keyed(ref.added);
      const removed = keyed(ref.removed);
      const k = pairKey(v.pair[0], v.pair[1]);
      // the change flips one pair of the reference design: in it → dropped, out of it → added
      const inRef = s.compatibilities.some((c) => pairKey(c.pair[0], c.pair[1]) === k) ? !removed.has(k) : added.has(k);
      expect(v.change).toBe(inRef ? 'remove' : 'add');
      const nextAdded = v.change === 'add' ? (removed.has(k) ? [...ref.added] : [...ref.added, v.pair]) : ref.added.filter((p) => pairKey(p[0], p[1]) !== k);
      const nextRemoved = v.change === 'add' ? ref.removed.filter((p) => pairKey(p[0], p[1]) !== k) : added.has(k) ? [...ref.removed] : [...ref.removed, v.pair];
      if (!v.stable) continue;
      const want = oracle(s, nextAdded, nextRemoved) - oracle(s, ref.added, ref.removed);
      expect(Math.abs(v.delta! - want)).toBeLessThanOrEqual(1e-9 * Math.max(1, ref.backlog!));
      checked++;
    }
    expect(checked).toBeGreaterThan(5);
    // the decision record of `report --json` carries the same decision
    const j = decisionRecord(r);
    expect(j.recommended).toBe(d.recommended);
    expect(j.verdicts).toBe(d.verdicts);
  }, 60_000);
});

describe('the load sweep of the report (K4 minus a ↔ b, rates 0.2, 0.2, 0.45, 0.2)', () => {
  // By hand: {c} demands 0.45 against N(c) = {a, b, d} = 0.6 (spare 0.15); {a, b} demands 0.4 against
  // {c, d} = 0.65 (spare 0.25); {a}, {b}, {d} have more. So the bottleneck is {c}, and growing c the
  // design saturates at s = 0.6/0.45 = 4/3 (K4 too: λ_c s < Λ − λ_c s ⇔ 0.45 s < 0.6). With these rates
  // K4 has the smaller backlog (closed forms), so the recommended design adds a ↔ b; a ↔ b joins two
  // neighbours of {c}, so near saturation it hurts: the curves cross.
  const rates = [0.2, 0.2, 0.45, 0.2];
  const scenario = parseScenario(
    JSON.stringify({
      name: 'pit crews',
      timeUnit: 'minute',
      classes: K4_IDS.map((id, k) => ({ id, rate: rates[k] })),
      compatibilities: K4_MINUS_AB_PAIRS.map(([x, y]) => [K4_IDS[x], K4_IDS[y]]),
      candidates: [{ pair: ['a', 'b'], cost: 5 }],
      budget: 10,
    }),
  );

  it('grows the bottleneck {c} to its limit 4/3; every point equals the closed forms', async () => {
    expect(k4(rates).total).toBeLessThan(k4MinusEdge(rates).total);
    const r = await reportOf(scenario);
    expect(r.decision!.recommended.added).toEqual([['a', 'b']]);
    const s = r.sweep!;
    expect(s.grow).toEqual(['c']);
    expect(s.limit.factor!).toBeCloseTo(4 / 3, 7);
    expect(s.curves).toHaveLength(2);
    for (const [c, form] of [[s.curves[0]!, k4MinusEdge], [s.curves[1]!, k4]] as const) {
      for (const p of c.points) {
        const want = form(rates.map((x, k) => (k === 2 ? x * p.factor : x))).total;
        expect(rel(p.backlog!, want)).toBeLessThan(1e-9);
      }
    }
    expect(s.crossovers).toHaveLength(1);
    const x = s.crossovers[0]!;
    expect(x.direction).toBe('starts-to-hurt');
    expect(x.factor).toBeGreaterThan(1);
    expect(x.factor).toBeLessThan(4 / 3);
    // the closed forms change sign around the crossover
    const diff = (f: number): number => k4(rates.map((v, k) => (k === 2 ? v * f : v))).total - k4MinusEdge(rates.map((v, k) => (k === 2 ? v * f : v))).total;
    expect(diff(x.between[0])).toBeLessThan(0);
    expect(diff(x.between[1]!)).toBeGreaterThan(0);
    const name = namerOf(r);
    expect(curveWords(r, s.curves[1]!.name, name)).toBe('the recommended design');
    expect(verdicts(r, name).at(-1)).toMatch(/^Today's design stays stable until the demand of c reaches ×1\.33 of today's; the recommended design starts to hurt at ×1\.\d+\.$/);
  });
});

describe('report record of an unstable design', () => {
  it('has no load sweep, says why, and lists the repairs of today', async () => {
    const r = await reportOf(load('unstable-example.json'));
    expect(r.todayStable).toBe(false);
    expect(r.sweep).toBeNull();
    expect(r.notes).toContain("No load sweep: today's design is unstable.");
    expect(r.todayInstability!.repairs.length).toBeGreaterThan(0);
    const j = decisionRecord(r);
    expect(j.repairs).toEqual(r.todayInstability!.repairs);
    expect(j.instability).toBe(r.todayInstability);
  });
});
