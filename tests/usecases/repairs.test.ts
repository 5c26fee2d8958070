import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkCommand } from '../../src/cli/commands/check.js';
import { evaluateCommand } from '../../src/cli/commands/evaluate.js';
import { recommendCommand } from '../../src/cli/commands/recommend.js';
import { reportCommand } from '../../src/cli/commands/report.js';
import { sensitivityCommand } from '../../src/cli/commands/sensitivity.js';
import { pairKey } from '../../src/model/scenario.js';
import { parseScenario } from '../../src/model/validate.js';
import { isIndependent, maskOf, neighbourhood, rateOf, toBitGraph } from '../helpers/bitgraph.js';
import { bruteStability } from '../helpers/brute-stability.js';
import { runCommand, writeScenario } from '../helpers/cli.js';
import { Rng } from '../helpers/random.js';
import { scenarioDesign, type Pair } from '../helpers/scenario-design.js';

// Issue 9's repair contract: `check --json` on an unstable design lists `repairs`, cheapest first,
// each {added, cost}; the first is the cheapest set of allowed candidates whose addition makes the
// design stable. Checked by brute force over every subset of the candidates, from the file alone
// (allowed: not forbidden, both classes below their maxCompatibilities today, the whole set within
// the limits; docs/repairs.md), each subset's stability by enumerating independent sets ("Stability of
// the stochastic matching model", J. Appl. Probab. 2016). sensitivity, recommend and report list the
// same repairs; with no way out, recommend exits 3 naming the group that stays overloaded.

const dir = mkdtempSync(join(tmpdir(), 'edgewise-repairs-'));

interface Doc {
  name: string;
  timeUnit: string;
  classes: Array<{ id: string; rate: number; maxCompatibilities?: number }>;
  compatibilities: Array<[string, string] | { pair: [string, string]; removable?: boolean; saving?: number }>;
  candidates: Array<{ pair: [string, string]; cost: number }>;
  forbidden?: Array<[string, string]>;
  budget?: number;
}

/** An unstable scenario: a few groups of classes; one class brings more than its neighbours can serve. */
function unstableDoc(seed: number): Doc {
  const rng = new Rng(seed);
  const n = rng.int(4, 8);
  const ids = Array.from({ length: n }, (_, k) => `s${k}`);
  const pairs: Array<[number, number]> = [];
  const has = (a: number, b: number): boolean => pairs.some(([x, y]) => (x === a && y === b) || (x === b && y === a));
  for (let v = 1; v < n; v++) pairs.push([rng.int(0, v - 1), v]);
  for (let e = 0; e < n - 2; e++) {
    const a = rng.int(0, n - 2);
    const b = rng.int(0, n - 2);
    if (!has(a, b)) pairs.push([a, b]);
  }
  const rates = ids.map(() => Number(rng.uniform(0.3, 1.5).toFixed(3)));
  // the last class: more than all its neighbours together (and no self-pair), so {last} is overloaded
  const around = pairs.filter(([a, b]) => a === n - 1 || b === n - 1).reduce((s, [a, b]) => s + rates[a === n - 1 ? b : a]!, 0);
  rates[n - 1] = Number((around * rng.uniform(1.05, 1.6)).toFixed(3));
  const absent: Array<[number, number]> = [];
  for (let a = 0; a < n; a++) for (let b = a; b < n; b++) if (!has(a, b)) absent.push([a, b]);
  const cands = rng.shuffled(absent).slice(0, rng.int(4, Math.min(9, absent.length)));
  const doc: Doc = {
    name: `unstable ${seed}`,
    timeUnit: 'hour',
    classes: ids.map((id, k) => ({ id, rate: rates[k]! })),
    compatibilities: pairs.map(([a, b]) => (rng.chance(0.3) ? { pair: [ids[a]!, ids[b]!], removable: true, saving: rng.int(1, 5) } : [ids[a]!, ids[b]!])),
    candidates: cands.map(([a, b]) => ({ pair: [ids[a]!, ids[b]!], cost: rng.int(1, 12) })),
    budget: 100,
  };
  if (rng.chance(0.4)) doc.forbidden = [doc.candidates[rng.int(0, doc.candidates.length - 1)]!.pair];
  if (rng.chance(0.4)) {
    const k = rng.int(0, n - 1);
    const deg = pairs.filter(([a, b]) => a === k || b === k).length;
    doc.classes[k]!.maxCompatibilities = deg + rng.int(0, 1);
  }
  return doc;
}

const pairOf = (c: Doc['compatibilities'][number]): [string, string] => (Array.isArray(c) ? c : c.pair);

/** Every minimal repair by brute force from the file, cheapest first (cost, then fewer pairs). */
function bruteRepairs(doc: Doc): Array<{ added: Pair[]; cost: number }> {
  const s = parseScenario(JSON.stringify(doc));
  const forbidden = new Set((doc.forbidden ?? []).map((p) => pairKey(p[0], p[1])));
  const degree = new Map<string, number>();
  const bump = (d: Map<string, number>, [a, b]: Pair): void => {
    d.set(a, (d.get(a) ?? 0) + 1);
    if (b !== a) d.set(b, (d.get(b) ?? 0) + 1);
  };
  for (const c of doc.compatibilities) bump(degree, pairOf(c));
  const max = new Map(doc.classes.map((c) => [c.id, c.maxCompatibilities ?? Infinity] as const));
  const allowed = doc.candidates.filter((c) => !forbidden.has(pairKey(c.pair[0], c.pair[1])) && c.pair.every((id) => degree.get(id)! < max.get(id)!));
  const k = allowed.length;
  const stable = new Map<number, boolean>();
  for (let mask = 0; mask < 1 << k; mask++) stable.set(mask, bruteStability(scenarioDesign(s, allowed.filter((_, i) => (mask >> i) & 1).map((c) => c.pair), [])).stable);
  const out: Array<{ added: Pair[]; cost: number }> = [];
  for (let mask = 1; mask < 1 << k; mask++) {
    if (!stable.get(mask)) continue;
    let minimal = true;
    for (let i = 0; i < k; i++) if ((mask >> i) & 1 && stable.get(mask & ~(1 << i))) minimal = false;
    const set = allowed.filter((_, i) => (mask >> i) & 1);
    const d = new Map(degree);
    for (const c of set) bump(d, c.pair);
    if (!minimal || ![...d].every(([id, x]) => x <= max.get(id)!)) continue;
    out.push({ added: set.map((c) => c.pair), cost: set.reduce((t, c) => t + c.cost, 0) });
  }
  return out.sort((x, y) => x.cost - y.cost || x.added.length - y.added.length);
}

const setKey = (ps: readonly Pair[]): string => ps.map((p) => pairKey(p[0], p[1])).sort().join('|');

describe('check --json on seeded unstable scenarios: repairs against brute force over candidate subsets', () => {
  const seeds = Array.from({ length: 16 }, (_, i) => 500 + i);
  let repaired = 0;
  let none = 0;

  it.each(seeds)('seed %i', async (seed) => {
    const doc = unstableDoc(seed);
    const s = parseScenario(JSON.stringify(doc));
    expect(bruteStability(scenarioDesign(s, [], [])).stable).toBe(false);
    writeScenario(dir, `u${seed}.json`, doc);
    const r = await runCommand(checkCommand, { file: `u${seed}.json`, json: true }, dir);
    expect(r.code).toBe(3);
    const j = JSON.parse(r.out);
    expect(j.stable).toBe(false);
    const truth = bruteRepairs(doc);
    const known = new Set(truth.map((t) => setKey(t.added)));
    expect(j.repairs).toEqual(j.instability.repairs);
    if (truth.length === 0) {
      none++;
      expect(j.repairs).toEqual([]);
      expect(j.instability.noRepair).toBeDefined();
      return;
    }
    repaired++;
    expect(j.repairs.length).toBeGreaterThan(0);
    // the first is the cheapest repair
    expect(j.repairs[0].cost).toBeCloseTo(truth[0]!.cost, 9);
    for (let i = 0; i < j.repairs.length; i++) {
      const rep = j.repairs[i] as { added: Pair[]; cost: number };
      expect(Object.keys(rep).sort()).toEqual(['added', 'cost']);
      // each is a minimal repair the file allows, with the sum of its costs
      expect(known.has(setKey(rep.added)), JSON.stringify(rep.added)).toBe(true);
      expect(rep.cost).toBeCloseTo(truth.find((t) => setKey(t.added) === setKey(rep.added))!.cost, 9);
      if (i > 0) expect(rep.cost).toBeGreaterThanOrEqual(j.repairs[i - 1].cost - 1e-9);
    }
    // the cheapest repairs, as many as listed: their costs are the smallest of the brute-force list
    expect(j.repairs.map((x: { cost: number }) => x.cost)).toEqual(truth.slice(0, j.repairs.length).map((t) => t.cost));
  });

  it('some had repairs and some had none', () => {
    expect(repaired).toBeGreaterThanOrEqual(8);
    expect(repaired + none).toBe(16);
  });
});

describe('every command on an unstable design lists the same repairs', () => {
  it('check, evaluate, sensitivity, recommend and report (--json)', async () => {
    const doc = unstableDoc(503);
    writeScenario(dir, 'same.json', doc);
    const truth = bruteRepairs(doc);
    expect(truth.length).toBeGreaterThan(0);
    const check = JSON.parse((await runCommand(checkCommand, { file: 'same.json', json: true }, dir)).out);
    const evaluate = await runCommand(evaluateCommand, { file: 'same.json', json: true }, dir);
    const sens = await runCommand(sensitivityCommand, { file: 'same.json', json: true }, dir);
    const rec = await runCommand(recommendCommand, { file: 'same.json', json: true }, dir);
    const rep = await runCommand(reportCommand, { file: 'same.json', json: true, output: 'same.html' }, dir);
    expect([evaluate.code, sens.code, rec.code, rep.code]).toEqual([3, 3, 0, 0]);
    for (const out of [evaluate.out, sens.out, rec.out, rep.out]) {
      const j = JSON.parse(out);
      expect(j.repairs).toEqual(check.repairs);
      expect(j.instability.repairs).toEqual(check.repairs);
    }
    // and the text of check says so, cheapest first
    const text = (await runCommand(checkCommand, { file: 'same.json' }, dir)).out;
    expect(text).toMatch(/Ways out, cheapest first/);
    expect(text).toMatch(new RegExp(`^1\\s+.*\\s${truth[0]!.cost}$`, 'm'));
  });
});

describe('no stable design at all', () => {
  // By hand: x and y (1.5/hour each) can only be matched with a (2/hour, matched with itself):
  // {x, y} brings 3 against 2. The only candidate joins a with d, which does not change N({x, y})
  // = {a}, so no design is stable and {x, y} stays overloaded.
  const doc: Doc = {
    name: 'no way out',
    timeUnit: 'hour',
    classes: [{ id: 'a', rate: 2 }, { id: 'x', rate: 1.5 }, { id: 'y', rate: 1.5 }, { id: 'd', rate: 1 }],
    compatibilities: [['a', 'a'], ['a', 'x'], ['a', 'y'], ['d', 'd']],
    candidates: [{ pair: ['a', 'd'], cost: 4 }],
    budget: 10,
  };

  it('check lists no repair and names the overloaded group; recommend exits 3 naming it', async () => {
    writeScenario(dir, 'none.json', doc);
    expect(bruteRepairs(doc)).toEqual([]);
    const g = toBitGraph(scenarioDesign(parseScenario(JSON.stringify(doc)), [['a', 'd']], []));
    const xy = maskOf([1, 2]);
    expect(isIndependent(g, xy)).toBe(true);
    expect(rateOf(g, xy)).toBeGreaterThanOrEqual(rateOf(g, neighbourhood(g, xy)));
    const check = JSON.parse((await runCommand(checkCommand, { file: 'none.json', json: true }, dir)).out);
    expect(check.repairs).toEqual([]);
    expect(check.instability.noRepair.overloaded.set).toEqual(['x', 'y']);
    expect(check.instability.noRepair.overloaded.neighbours).toEqual(['a']);
    expect(check.instability.noRepair.relief).toMatch(/\{x, y\}/);
    const rec = await runCommand(recommendCommand, { file: 'none.json' }, dir);
    expect(rec.code).toBe(3);
    expect(rec.err).toMatch(/no stable design exists: even with every allowed candidate, \{x, y\} brings 3\/hour and only \{a\} can serve it \(2\/hour\)/);
  });
});
