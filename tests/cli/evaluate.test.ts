import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCommand } from '../../src/cli/commands/evaluate.js';
import { compileGraph } from '../../src/model/compile.js';
import { permutationOracle } from '../helpers/permutation-oracle.js';
import { isIndependent, neighbourhood, rateOf, toBitGraph } from '../helpers/bitgraph.js';
import { runCommand, writeScenario } from '../helpers/cli.js';

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
    expect(Object.keys(j)).toEqual(expect.arrayContaining(['stable', 'timeUnit', 'independentSets', 'backlog', 'wait', 'immediateMatch', 'emptyProbability', 'matchRates', 'bottleneck']));
    expect(j.stable).toBe(true);
    expect(j.timeUnit).toBe('hour');
    // Reference: permutation-sum closed form from the product form ("A product form for the general
    // stochastic matching model", J. Appl. Probab. 2021), tests/helpers/permutation-oracle.ts.
    const ids = hub.classes.map((c) => c.id);
    const idx = new Map(ids.map((id, k) => [id, k]));
    const model = compileGraph(ids, hub.classes.map((c) => c.rate), hub.compatibilities.map(([a, b]) => [idx.get(a)!, idx.get(b)!] as [number, number]));
    const o = permutationOracle(model);
    expect(j.backlog.total).toBeCloseTo(o.backlogTotal, 9);
    ids.forEach((id, k) => {
      expect(j.backlog.byClass[id]).toBeCloseTo(o.backlog[k]!, 9);
      expect(j.wait.byClass[id]).toBeCloseTo(o.wait[k]!, 9);
      expect(j.immediateMatch.byClass[id]).toBeCloseTo(o.immediateMatch[k]!, 9);
    });
    expect(j.emptyProbability).toBeCloseTo(o.emptyProbability, 9);
    expect(j.matchRates).toHaveLength(hub.compatibilities.length);
    j.matchRates.forEach((e: { pair: [string, string]; rate: number }, i: number) => {
      expect(e.pair).toEqual(hub.compatibilities[i]);
      expect(e.rate).toBeCloseTo(o.matchRates[i]!, 9);
    });
    // Bottleneck: the smallest slack λ(N(I)) − λ(I) over independent self-loop-free sets, by brute force.
    const g = toBitGraph(model);
    let best = Infinity;
    for (let mask = 1; mask < 1 << g.n; mask++) {
      if (!isIndependent(g, mask) || mask & g.loopMask) continue;
      best = Math.min(best, rateOf(g, neighbourhood(g, mask)) - rateOf(g, mask));
    }
    expect(j.bottleneck.slack).toBeCloseTo(best, 9);
    expect(j.bottleneck.set).toEqual(['docks']); // derived by hand: {docks} has slack 4.5 − 3 = 1.5, the smallest
    expect(j.independentSets).toBe(o.independentSets);
  });

  it('unstable design: exit 3, certificate on stdout, sentence on stderr', async () => {
    const doc = { ...hub, classes: hub.classes.map((c) => (c.id === 'docks' ? { ...c, rate: 9 } : c)) };
    const r = await run({ file: scenarioFile('unstable.json', doc), json: true });
    expect(r.code).toBe(3);
    const j = JSON.parse(r.out);
    expect(j.stable).toBe(false);
    // {docks} alone: demand 9 ≥ capacity λ(campus) + λ(mall) = 4.5 (derived by hand)
    expect(j.certificate.demand).toBeGreaterThanOrEqual(j.certificate.capacity);
    expect(j.certificate.set).toContain('docks');
    expect(r.err).toMatch(/can only be matched with/);
  });
});

describe('evaluate (tables and errors)', () => {
  it('prints the class table, the compatibility table and a verdict line', async () => {
    const r = await run({ file: scenarioFile('hub2.json', hub) });
    expect(r.code).toBe(0);
    for (const id of ['docks', 'campus', 'mall', 'suburb']) expect(r.out).toContain(id);
    expect(r.out).toMatch(/mean wait \(hour\)/);
    expect(r.out).toMatch(/suburb ↔ suburb \(same class\)/);
    expect(r.out).toMatch(/^stable · total backlog [0-9.]+ .* independent sets$/m);
  });

  it('refuses with exit 4 when the independent sets exceed --max-sets', async () => {
    const r = await run({ file: scenarioFile('hub3.json', hub), maxSets: 3 });
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
