import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { sensitivityCommand } from '../../src/cli/commands/sensitivity.js';
import { UnstableDesignError } from '../../src/errors.js';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { pairKey } from '../../src/model/scenario.js';
import { parseScenario } from '../../src/model/validate.js';
import { renderJson } from '../../src/output/machine.js';
import { scenarioContext } from '../../src/usecases/context.js';
import { sensitivityUseCase, type ChangeRecord, type SensitivityRecord } from '../../src/usecases/sensitivity.js';
import { bruteStability } from '../helpers/brute-stability.js';
import { runCommand, writeScenario } from '../helpers/cli.js';
import { expectRounded } from '../helpers/machine.js';
import { randomScenario } from '../helpers/random-scenario.js';
import { scenarioDesign, type Pair } from '../helpers/scenario-design.js';

// Issue 9's sensitivity contract: every change is marked with whether the scenario's rules allow
// it and, if not, which rule forbids it; allowed changes come first; what a rule costs is listed
// apart; every figure is a fresh exact evaluation of the changed design. The rules are derived
// here from the scenario file alone (docs/scenario-format.md, "Recommender fields"); the figures are
// checked against evaluateExact (itself checked against the permutation-sum oracle in tests/exact/),
// stability of small changed designs by brute force over independent sets ("Stability of the
// stochastic matching model", J. Appl. Probab. 2016).

const RULES = ['forbidden', 'fixed', 'must-keep', 'limit'];
const dir = mkdtempSync(join(tmpdir(), 'edgewise-sens-rules-'));

interface Doc {
  classes: Array<{ id: string; rate: number; maxCompatibilities?: number }>;
  compatibilities: Array<[string, string] | { pair: [string, string]; removable?: boolean; saving?: number }>;
  candidates: Array<{ pair: [string, string]; cost: number }>;
  mustKeep?: Array<[string, string] | { pair: [string, string] }>;
  forbidden?: Array<[string, string] | { pair: [string, string] }>;
}

const pairOf = (e: [string, string] | { pair: [string, string] }): [string, string] => (Array.isArray(e) ? e : e.pair);

/** The rule that forbids each single change of today's design, by the documented rules. */
function expectedRules(doc: Doc): Map<string, string | null> {
  const keyOf = (change: string, p: Pair): string => `${change}:${pairKey(p[0], p[1])}`;
  const forbidden = new Set((doc.forbidden ?? []).map(pairOf).map((p) => pairKey(p[0], p[1])));
  const mustKeep = new Set((doc.mustKeep ?? []).map(pairOf).map((p) => pairKey(p[0], p[1])));
  const degree = new Map<string, number>();
  for (const c of doc.compatibilities) {
    const [a, b] = pairOf(c);
    degree.set(a, (degree.get(a) ?? 0) + 1);
    if (b !== a) degree.set(b, (degree.get(b) ?? 0) + 1);
  }
  const max = new Map(doc.classes.map((c) => [c.id, c.maxCompatibilities ?? Infinity] as const));
  const full = (id: string): boolean => (degree.get(id) ?? 0) + 1 > max.get(id)!;
  const out = new Map<string, string | null>();
  for (const c of doc.candidates) {
    const k = pairKey(c.pair[0], c.pair[1]);
    out.set(keyOf('add', c.pair), forbidden.has(k) ? 'forbidden' : full(c.pair[0]) || full(c.pair[1]) ? 'limit' : null);
  }
  for (const c of doc.compatibilities) {
    const p = pairOf(c);
    const removable = !Array.isArray(c) && c.removable === true;
    out.set(keyOf('remove', p), !removable ? 'fixed' : mustKeep.has(pairKey(p[0], p[1])) ? 'must-keep' : null);
  }
  return out;
}

/** Today's design with one change, built from the file (no product code). */
function changed(doc: Doc, e: { pair: Pair; change: string }): ReturnType<typeof scenarioDesign> {
  const s = parseScenario(JSON.stringify(doc));
  return e.change === 'add' ? scenarioDesign(s, [e.pair], []) : scenarioDesign(s, [], [e.pair]);
}

function checkContract(doc: Doc, j: SensitivityRecord, record: SensitivityRecord, fresh: 'all' | number): void {
  const want = expectedRules(doc);
  const today = evaluateExact(scenarioDesign(parseScenario(JSON.stringify(doc)), [], [])).backlogTotal;
  for (const list of [j.additions, j.removals]) {
    // 1. allowed (boolean), and a rule exactly when not allowed
    for (const e of list) {
      expect(typeof e.allowed).toBe('boolean');
      if (e.allowed) expect(e.rule).toBeUndefined();
      else expect(RULES).toContain(e.rule);
      const k = `${e.change}:${pairKey(e.pair[0], e.pair[1])}`;
      expect(want.has(k), k).toBe(true);
      expect(e.allowed ? null : e.rule, k).toBe(want.get(k));
    }
    // 2. allowed changes first
    const firstRuled = list.findIndex((e) => !e.allowed);
    if (firstRuled >= 0) expect(list.slice(firstRuled).every((e) => !e.allowed)).toBe(true);
  }
  // every change of the file is listed once
  expect(j.additions.length + j.removals.length).toBe(want.size);
  // 3. what the rules cost: the ruled changes that would lower the backlog, largest saving first
  const ruledDown = [...j.additions, ...j.removals].filter((e) => !e.allowed && e.delta !== null && e.delta < 0);
  expect(j.ruleCosts.map((c) => `${c.change}:${pairKey(c.pair[0], c.pair[1])}`).sort()).toEqual(ruledDown.map((e) => `${e.change}:${pairKey(e.pair[0], e.pair[1])}`).sort());
  for (let i = 1; i < j.ruleCosts.length; i++) expect(j.ruleCosts[i]!.backlogSaved).toBeLessThanOrEqual(j.ruleCosts[i - 1]!.backlogSaved);
  for (const c of record.ruleCosts) {
    const e = [...record.additions, ...record.removals].find((x) => x.change === c.change && pairKey(x.pair[0], x.pair[1]) === pairKey(c.pair[0], c.pair[1]))!;
    expect(c.backlogSaved).toBe(-e.delta!);
    expect(c.rule).toBe(e.rule);
  }
  // 4. every figure: a fresh exact evaluation of the changed design (record to 1e-9, JSON to its digits)
  const all: ChangeRecord[] = [...record.additions, ...record.removals];
  const sample = fresh === 'all' ? all : all.filter((_, i) => i % Math.ceil(all.length / fresh) === 0);
  for (const e of sample) {
    const m = changed(doc, e);
    if (m.n <= 20) expect(e.stable, `${e.change} ${e.pair}`).toBe(bruteStability(m).stable);
    let ref: number;
    try {
      ref = evaluateExact(m).backlogTotal;
    } catch (err) {
      if (!(err instanceof UnstableDesignError)) throw err;
      expect(e.stable).toBe(false);
      expect(e.backlog).toBeNull();
      continue;
    }
    expect(e.stable).toBe(true);
    expect(Math.abs(e.backlog! - ref)).toBeLessThanOrEqual(1e-9 * ref);
    expect(Math.abs(e.delta! - (ref - today))).toBeLessThanOrEqual(1e-9 * ref);
    const je = [...j.additions, ...j.removals].find((x) => x.change === e.change && pairKey(x.pair[0], x.pair[1]) === pairKey(e.pair[0], e.pair[1]))!;
    expectRounded(je.backlog!, ref, j.precision ?? 9, `${e.change} ${e.pair}`);
  }
}

/**
 * `sensitivity --json` (the command, or for large files what it prints: the rounded record) and the
 * use case's unrounded record.
 */
async function both(name: string, doc: Doc, viaCommand = true): Promise<{ j: SensitivityRecord; record: SensitivityRecord; code: number }> {
  writeScenario(dir, name, doc);
  const record = await sensitivityUseCase(scenarioContext(parseScenario(JSON.stringify(doc), name), { source: name }));
  if (!viaCommand) return { j: JSON.parse(renderJson(record)), record, code: record.base.stable ? 0 : 3 };
  const r = await runCommand(sensitivityCommand, { file: name, json: true }, dir);
  return { j: JSON.parse(r.out), record, code: r.code };
}

describe('a hand-built scenario with every rule (K4 minus a ↔ b, rates 0.2, 0.2, 0.4, 0.2)', () => {
  // Closed forms by hand (tests/helpers/k4-minus-edge.ts): today 7/3; with a ↔ b (K4) 11/6.
  // Rules: a ↔ b forbidden (with a reason); c ↔ d fixed (not removable); a ↔ c must be kept;
  // d ↔ d is a candidate but d already has 3 compatibilities and maxCompatibilities 3 (limit).
  const doc: Doc = {
    classes: [{ id: 'a', rate: 0.2 }, { id: 'b', rate: 0.2 }, { id: 'c', rate: 0.4 }, { id: 'd', rate: 0.2, maxCompatibilities: 3 }],
    compatibilities: [
      { pair: ['a', 'c'], removable: true, saving: 1 },
      { pair: ['a', 'd'], removable: true, saving: 1 },
      { pair: ['b', 'c'], removable: true, saving: 1 },
      { pair: ['b', 'd'], removable: true, saving: 1 },
      ['c', 'd'],
    ],
    candidates: [{ pair: ['a', 'b'], cost: 5 }, { pair: ['d', 'd'], cost: 1 }, { pair: ['c', 'c'], cost: 2 }],
    mustKeep: [['a', 'c']],
    forbidden: [{ pair: ['a', 'b'], reason: 'rookies may not play each other' } as never],
  };

  it('marks every change with its rule and lists what the forbidden a ↔ b costs: 7/3 − 11/6 = 1/2', async () => {
    const { j, record, code } = await both('every-rule.json', doc);
    expect(code).toBe(0);
    checkContract(doc, j, record, 'all');
    const add = (x: string, y: string) => j.additions.find((e) => pairKey(e.pair[0], e.pair[1]) === pairKey(x, y))!;
    expect(add('a', 'b')).toMatchObject({ allowed: false, rule: 'forbidden', ruleReason: 'rookies may not play each other' });
    expect(add('d', 'd')).toMatchObject({ allowed: false, rule: 'limit' });
    expect(add('c', 'c').allowed).toBe(true);
    expect(j.additions[0]!.pair).toEqual(['c', 'c']); // the only allowed addition comes first
    const rem = (x: string, y: string) => j.removals.find((e) => pairKey(e.pair[0], e.pair[1]) === pairKey(x, y))!;
    expect(rem('c', 'd')).toMatchObject({ allowed: false, rule: 'fixed' });
    expect(rem('a', 'c')).toMatchObject({ allowed: false, rule: 'must-keep' });
    expect(j.ruleCosts[0]).toMatchObject({ pair: ['a', 'b'], change: 'add', rule: 'forbidden', ruleReason: 'rookies may not play each other' });
    expectRounded(j.ruleCosts[0]!.backlogSaved, 7 / 3 - 11 / 6, j.precision!, 'saving of a ↔ b');
  });

  it('the text ranks only allowed changes and shows the ruled ones apart, with their rule', async () => {
    writeScenario(dir, 'every-rule.json', doc);
    const r = await runCommand(sensitivityCommand, { file: 'every-rule.json' }, dir);
    const [allowedPart, ruledPart] = r.out.split("Not allowed by the scenario's rules");
    expect(allowedPart).toMatch(/^c ↔ c\s/m);
    expect(allowedPart).not.toMatch(/^a ↔ b\s/m);
    expect(ruledPart).toMatch(/^add a ↔ b\s+forbidden\s+−0\.5\s+rookies may not play each other$/m);
    expect(ruledPart).toMatch(/^add d ↔ d\s+over maxCompatibilities/m);
    expect(ruledPart).toMatch(/^remove c ↔ d\s+fixed \(not removable\)/m);
    expect(ruledPart).toMatch(/^remove a ↔ c\s+must keep/m);
  });
});

describe('seeded random scenarios with rules (4–40 classes)', () => {
  const cases = [
    ...[1, 2, 3, 4, 5, 6].map((seed) => ({ seed, groups: 2, perGroup: 2 + (seed % 3), candidates: 5 })),
    ...[7, 8, 9, 10].map((seed) => ({ seed, groups: 3, perGroup: 3 + (seed % 2), candidates: 7 })),
    { seed: 11, groups: 4, perGroup: 4, candidates: 8 },
    { seed: 12, groups: 3, perGroup: 5, candidates: 8 },
  ];
  it.each(cases)('seed $seed: $groups groups of $perGroup', async (c) => {
    const { doc } = randomScenario(c.seed, { groups: c.groups, perGroup: c.perGroup, candidates: c.candidates, removableShare: 0.5, rules: true });
    const { j, record, code } = await both(`random-${c.seed}.json`, doc as unknown as Doc);
    expect(code).toBe(0);
    checkContract(doc as unknown as Doc, j, record, 'all');
    expect(j.additions.some((e) => !e.allowed) || j.removals.some((e) => !e.allowed)).toBe(true);
  });

  it('40 classes: the rules everywhere, the figures on a sample', async () => {
    const { doc } = randomScenario(40, { groups: 5, perGroup: 8, candidates: 8, removableShare: 0.05, rules: true });
    const { j, record, code } = await both('random-40.json', doc as unknown as Doc, false);
    expect(code).toBe(0);
    expect((doc as unknown as Doc).classes).toHaveLength(40);
    checkContract(doc as unknown as Doc, j, record, 6);
  });
});
