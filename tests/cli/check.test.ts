import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { checkCommand } from '../../src/cli/commands/check.js';
import { memoryIO } from '../../src/cli/io.js';
import { InvalidScenarioError, ScenarioFileError } from '../../src/errors.js';
import { enumerate, maskNeighbours, adjacencyMasks, maskRate, type SmallGraph } from '../stability/brute-force.js';
import { runCommand } from '../helpers/cli.js';

// Invented scenarios (game matchmaking, shift swaps, ride pooling), written into a temp dir.
const dir = mkdtempSync(join(tmpdir(), 'edgewise-check-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

interface Spec {
  readonly name: string;
  readonly classes: Array<[string, number]>;
  readonly pairs: Array<[string, string]>;
}

function write(file: string, s: Spec): string {
  const doc = { name: s.name, timeUnit: 'hour', classes: s.classes.map(([id, rate]) => ({ id, rate })), compatibilities: s.pairs };
  writeFileSync(join(dir, file), JSON.stringify(doc, null, 2));
  return file;
}

/** The brute-force view of a spec (definition of stability by enumeration, tests/stability/brute-force.ts). */
function brute(s: Spec): { g: SmallGraph; ids: string[] } {
  const ids = s.classes.map(([id]) => id);
  const at = new Map(ids.map((id, k) => [id, k]));
  return { ids, g: { n: ids.length, rates: s.classes.map(([, r]) => r), pairs: s.pairs.map(([a, b]) => [at.get(a)!, at.get(b)!] as [number, number]) } };
}

const maskOfIds = (ids: string[], names: string[]): number => names.reduce((m, x) => m | (1 << ids.indexOf(x)), 0);

async function run(file: string, json: boolean) {
  return runCommand(checkCommand, { file, json }, dir);
}

// A matchmaking ladder: a triangle of skill bands plus a solo queue that also plays against itself.
const stable: Spec = {
  name: 'Matchmaking ladder',
  classes: [['bronze', 6], ['silver', 5], ['gold', 4], ['solo', 3]],
  pairs: [['bronze', 'silver'], ['silver', 'gold'], ['bronze', 'gold'], ['gold', 'solo'], ['solo', 'solo']],
};
// Shift swaps: night and weekend shifts can only be swapped with the flexible pool, which also swaps among itself.
const unstable: Spec = {
  name: 'Shift swaps',
  classes: [['flexible', 7], ['night', 4.5], ['weekend', 3]],
  pairs: [['flexible', 'flexible'], ['flexible', 'night'], ['flexible', 'weekend']],
};
// Ride pooling between two districts only: bipartite.
const bipartite: Spec = {
  name: 'Two districts',
  classes: [['north', 5], ['south', 7]],
  pairs: [['north', 'south']],
};
// Two independent pools: a stable triangle and a self-matching class.
const disconnected: Spec = {
  name: 'Two pools',
  classes: [['a', 2], ['b', 3], ['c', 4], ['d', 1.5]],
  pairs: [['a', 'b'], ['b', 'c'], ['a', 'c'], ['d', 'd']],
};

describe('edgewise check', () => {
  it('stable design: exit 0, JSON headroom, bottleneck and tight sets agree with brute force', async () => {
    const { code, out } = await run(write('stable.json', stable), true);
    expect(code).toBe(0);
    const doc = JSON.parse(out);
    expect(Object.keys(doc).sort()).toEqual(['bottleneck', 'classes', 'command', 'components', 'headroom', 'reference', 'scenario', 'stable', 'tightSets', 'timeUnit', 'unboundedHeadroom', 'warnings']);
    expect(doc.command).toBe('check');
    expect(doc.reference.kind).toBe('today');
    expect(doc.instability).toBeUndefined();
    expect(doc.repairs).toBeUndefined();
    expect(doc.stable).toBe(true);
    expect(doc.components).toBe(1);
    const { g, ids } = brute(stable);
    const b = enumerate(g);
    expect(b.stable).toBe(true);
    // Reference: brute-force min slack over independent sets containing each class; self-looped solo: in no
    // independent set, so no headroom figure (∞): listed in unboundedHeadroom instead.
    expect(doc.unboundedHeadroom).toEqual(ids.filter((_, k) => !Number.isFinite(b.minSlackWith[k]!)));
    ids.forEach((id, k) => {
      if (id === 'solo') expect(doc.headroom[id]).toBeUndefined();
      else expect(doc.headroom[id]).toBeCloseTo(b.minSlackWith[k]!, 9);
    });
    expect(doc.bottleneck.spareCapacity).toBeCloseTo(b.minSlack, 9);
    const { nb } = adjacencyMasks(g);
    for (const t of doc.tightSets) {
      const mask = maskOfIds(ids, t.set);
      expect(maskOfIds(ids, t.neighbours)).toBe(maskNeighbours(nb, mask));
      expect(t.demand).toBeCloseTo(maskRate(g, mask), 9);
      expect(t.capacity).toBeCloseTo(maskRate(g, maskNeighbours(nb, mask)), 9);
      expect(t.spareCapacity).toBeCloseTo(t.capacity - t.demand, 9);
    }
    expect(doc.tightSets[0]).toEqual(doc.bottleneck);
  });

  it('stable design, human output: tables with the bottleneck marked, then a verdict line', async () => {
    const { code, out, err } = await run('stable.json', false);
    expect(code).toBe(0);
    expect(err).toBe('');
    // Derived by hand: solo is self-looped, so it is in no constraining set; bronze, silver and gold form a
    // triangle, so the independent sets are the singletons: {bronze} N = {silver, gold}: 9 − 6 = 3,
    // {silver}: 10 − 5 = 5, {gold} N = {bronze, silver, solo}: 14 − 4 = 10. Bottleneck {bronze}, slack 3 of 9 (33.3%).
    expect(out).toMatch(/^bottleneck\s+\{bronze\}\s+6\s+\{silver, gold\}\s+9\s+3$/m);
    expect(out).toMatch(/headroom % of rate/);
    expect(out.trim().split('\n').at(-1)).toBe('Stable · bottleneck {bronze}: 3/hour of spare capacity (33.3 % of its capacity 9/hour)');
  });

  it('unstable non-bipartite design: exit 3, certificate sentence in the text, JSON certificate, no repair without candidates', async () => {
    const file = write('unstable.json', unstable);
    const human = await run(file, false);
    expect(human.code).toBe(3);
    expect(human.err).toBe('');
    // Derived by hand: night + weekend = 7.5/hour can only be matched with flexible, 7/hour.
    expect(human.out).toContain('Unstable: items from night and weekend (7.5/hour) can only be matched with flexible (7.0/hour)');
    // no candidates at all: no repair, and the overloaded set is named with what would relieve it
    expect(human.out).toMatch(/No allowed set of candidates makes the design stable/);
    const { code, out } = await run(file, true);
    expect(code).toBe(3);
    const doc = JSON.parse(out);
    expect(doc.stable).toBe(false);
    expect(doc.instability.certificate).toEqual({ set: ['night', 'weekend'], demand: 7.5, capacity: 7, spareCapacity: -0.5, neighbours: ['flexible'], reason: 'overloaded' });
    expect(doc.repairs).toEqual([]);
    expect(doc.instability.noRepair.overloaded.set).toEqual(['night', 'weekend']);
    const { g, ids } = brute(unstable);
    expect(enumerate(g).stable).toBe(false);
    const mask = maskOfIds(ids, doc.instability.certificate.set);
    expect(maskRate(g, mask)).toBeGreaterThanOrEqual(maskRate(g, maskNeighbours(adjacencyMasks(g).nb, mask)));
  });

  it('bipartite design: exit 3, the heavier side is the certificate', async () => {
    const { code, out } = await run(write('bipartite.json', bipartite), true);
    expect(code).toBe(3);
    const doc = JSON.parse(out);
    // Derived by hand: N(south) = {north}, 7 ≥ 5.
    expect(doc.instability.certificate).toEqual({ set: ['south'], demand: 7, capacity: 5, spareCapacity: -2, neighbours: ['north'], reason: 'bipartite' });
    expect(doc.instability.message).toMatch(/bipartite/);
    expect(enumerate(brute(bipartite).g).stable).toBe(false);
  });

  it('disconnected design: each component judged on its own', async () => {
    const { code, out } = await run(write('disconnected.json', disconnected), true);
    expect(code).toBe(0);
    const doc = JSON.parse(out);
    expect(doc.components).toBe(2);
    const { g, ids } = brute(disconnected);
    const b = enumerate(g);
    expect(b.stable).toBe(true);
    ids.forEach((id, k) => (id === 'd' ? expect(doc.headroom.d).toBeUndefined() : expect(doc.headroom[id]).toBeCloseTo(b.minSlackWith[k]!, 9)));
    // Derived by hand: {a}: 7 − 2 = 5, {b}: 6 − 3 = 3, {c}: 5 − 4 = 1 → bottleneck {c}, spare capacity 1.
    expect(doc.bottleneck).toEqual({ set: ['c'], neighbours: ['a', 'b'], demand: 4, capacity: 5, spareCapacity: 1 });
    const human = await run('disconnected.json', false);
    expect(human.out).toMatch(/2 independent components/);
  });

  it('passes file and validation errors on (exit 2)', async () => {
    const io = memoryIO(dir);
    await expect(checkCommand({ file: 'missing.json' }, io)).rejects.toThrow(ScenarioFileError);
    writeFileSync(join(dir, 'bad.json'), '{"classes": [{"id": "a", "rate": -1}]}');
    await expect(checkCommand({ file: 'bad.json' }, io)).rejects.toThrow(InvalidScenarioError);
    expect((await run('bad.json', false)).code).toBe(2);
  });
});
