import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCommand } from '../../src/cli/commands/evaluate.js';
import { compileGraph } from '../../src/model/compile.js';
import { permutationOracle } from '../helpers/permutation-oracle.js';
import { isIndependent, neighbourhood, rateOf, toBitGraph } from '../helpers/bitgraph.js';
import { runCommand, writeScenario } from '../helpers/cli.js';
import { expectRounded } from '../helpers/machine.js';

const dir = mkdtempSync(join(tmpdir(), 'edgewise-evaluate-'));
function scenarioFile(name: string, doc: unknown): string {
  return writeScenario(dir, name, doc);
}
async function run(opts: Parameters<typeof evaluateCommand>[0]) {
  return runCommand(evaluateCommand, opts, dir);
}

// An invented late-night food-delivery batching hub: four pick-up zones, one of which batches with itself.
const hub = {
  name: 'delivery batching',
  timeUnit: 'hour',
  classes: [
    { id: 'docks', rate: 3 },
    { id: 'campus', rate: 2 },
    { id: 'mall', rate: 2.5 },
    { id: 'suburb', rate: 1.5 },
  ],
  compatibilities: [
    ['docks', 'campus'],
    ['docks', 'mall'],
    ['campus', 'mall'],
    ['mall', 'suburb'],
    ['suburb', 'suburb'],
  ],
};

describe('evaluate --json', () => {
  it('prints the documented shape with values equal to the permutation-sum closed form', async () => {
    const r = await run({ file: scenarioFile('hub.json', hub), json: true });
    expect(r.code).toBe(0);
    expect(r.err).toBe('');
    const j = JSON.parse(r.out);
    expect(Object.keys(j)).toEqual(expect.arrayContaining(['command', 'warnings', 'reference', 'stable', 'timeUnit', 'independentSets', 'backlog', 'wait', 'matchedAtOnce', 'emptyProbability', 'matchRates', 'bottleneck']));
    expect(j.warnings).toEqual([]);
    expect(j.stable).toBe(true);
    expect(j.timeUnit).toBe('hour');
    // Reference: permutation-sum closed form from the product form ("A product form for the general
    // stochastic matching model", J. Appl. Probab. 2021), tests/helpers/permutation-oracle.ts.
    const ids = hub.classes.map((c) => c.id);
    const idx = new Map(ids.map((id, k) => [id, k]));
    const model = compileGraph(ids, hub.classes.map((c) => c.rate), hub.compatibilities.map(([a, b]) => [idx.get(a)!, idx.get(b)!] as [number, number]));
    const o = permutationOracle(model);
    // Machine output is rounded to the digits the computation supports (`precision`): each figure is
    // the oracle's value rounded to that many significant digits.
    const digits = j.precision;
    expect(digits).toBe(9); // far from the stability boundary: the default nine digits
    expectRounded(j.backlog.total, o.backlogTotal, digits, 'backlog.total');
    ids.forEach((id, k) => {
      expectRounded(j.backlog.byClass[id], o.backlog[k]!, digits, `backlog ${id}`);
      expectRounded(j.wait.byClass[id], o.wait[k]!, digits, `wait ${id}`);
      expectRounded(j.matchedAtOnce.byClass[id], o.immediateMatch[k]!, digits, `matchedAtOnce ${id}`);
    });
    expectRounded(j.emptyProbability, o.emptyProbability, digits, 'emptyProbability');
    expect(j.matchRates).toHaveLength(hub.compatibilities.length);
    j.matchRates.forEach((e: { pair: [string, string]; rate: number }, i: number) => {
      expect(e.pair).toEqual(hub.compatibilities[i]);
      expectRounded(e.rate, o.matchRates[i]!, digits, `match rate ${i}`);
    });
    // Bottleneck: the smallest slack λ(N(I)) − λ(I) over independent self-loop-free sets, by brute force.
    const g = toBitGraph(model);
    let best = Infinity;
    for (let mask = 1; mask < 1 << g.n; mask++) {
      if (!isIndependent(g, mask) || mask & g.loopMask) continue;
      best = Math.min(best, rateOf(g, neighbourhood(g, mask)) - rateOf(g, mask));
    }
    expect(j.bottleneck.spareCapacity).toBeCloseTo(best, 9);
    expect(j.bottleneck.set).toEqual(['docks']); // derived by hand: {docks} has slack 4.5 − 3 = 1.5, the smallest
    expect(j.independentSets).toBe(o.independentSets);
  });

  it('unstable design: exit 3, certificate and message in the JSON', async () => {
    const doc = { ...hub, classes: hub.classes.map((c) => (c.id === 'docks' ? { ...c, rate: 9 } : c)) };
    const r = await run({ file: scenarioFile('unstable.json', doc), json: true });
    expect(r.code).toBe(3);
    const j = JSON.parse(r.out);
    expect(j.stable).toBe(false);
    // {docks} alone: demand 9 ≥ capacity λ(campus) + λ(mall) = 4.5 (derived by hand)
    const c = j.instability.certificate;
    expect(c.demand).toBeGreaterThanOrEqual(c.capacity);
    expect(c.set).toContain('docks');
    expect(j.instability.message).toMatch(/can only be matched with/);
    expect(j.backlog).toBeUndefined();
    expect(j.repairs).toEqual([]); // no candidates in the file
  });
});

describe('evaluate (tables and errors)', () => {
  it('prints the class table, the compatibility table and a verdict line', async () => {
    const r = await run({ file: scenarioFile('hub2.json', hub) });
    expect(r.code).toBe(0);
    for (const id of ['docks', 'campus', 'mall', 'suburb']) expect(r.out).toContain(id);
    // Waits in a readable unit: the hub's waits are minutes (oracle: permutation sums, as above), printed
    // with four significant digits; the partner shares of a class's matches, a self-match counting two items.
    const ids = hub.classes.map((c) => c.id);
    const idx = new Map(ids.map((id, k) => [id, k]));
    const model = compileGraph(ids, hub.classes.map((c) => c.rate), hub.compatibilities.map(([a, b]) => [idx.get(a)!, idx.get(b)!] as [number, number]));
    const o = permutationOracle(model);
    const line = (id: string): string => r.out.split('\n').find((l) => l.startsWith(`${id} `))!;
    ids.forEach((id, k) => expect(line(id)).toContain(`${Number((o.wait[k]! * 60).toPrecision(4))} min`));
    const self = 2 * o.matchRates[4]!;
    const withMall = o.matchRates[3]!;
    expect(line('suburb')).toContain(`itself ${Math.round((100 * self) / (self + withMall))} %, mall ${Math.round((100 * withMall) / (self + withMall))} %`);
    expect(r.out).toMatch(/^rate \/hour|class\s+rate \/hour/m);
    expect(r.out).toContain(`bottleneck {docks} with 1.5/hour of`);
    expect(r.out.replace(/\n(?!\n)/g, ' ')).toMatch(/Stable · [0-9.]+ items wait on average .* 7 independent sets/);
  });

  it('refuses with exit 4 when the independent sets exceed --max-sets (--score exact)', async () => {
    const r = await run({ file: scenarioFile('hub3.json', hub), maxSets: 3, score: 'exact' });
    expect(r.code).toBe(4);
    expect(r.err).toMatch(/independent sets/);
    expect(r.err).toMatch(/simulate/);
  });

  it('invalid scenario: exit 2 and every problem listed, no stack trace', async () => {
    const bad = { classes: [{ id: 'a', rate: -1 }, { id: 'a', rate: 1 }], compatibilities: [['a', 'zzz']] };
    const r = await run({ file: scenarioFile('bad.json', bad) });
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/classes\[0\]\.rate/);
    expect(r.err).toMatch(/duplicate class id/);
    expect(r.err).toMatch(/unknown class "zzz"/);
    expect(r.err).not.toMatch(/at .*\.ts:\d+/);
  });

  it('missing file: exit 2 naming the path', async () => {
    const r = await run({ file: 'no-such-scenario.json' });
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/no-such-scenario\.json/);
  });

  it('malformed JSON: exit 2 with line and column', async () => {
    const r = await run({ file: scenarioFile('broken.json', '{\n  "classes": [\n    {"id": "a", "rate": 1,}\n  ]\n}') });
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/line 3, column 27/);
  });
});
