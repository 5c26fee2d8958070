import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { sensitivityCommand } from '../../src/cli/commands/sensitivity.js';
import { k4, k4MinusEdge, K4_IDS, K4_MINUS_AB_PAIRS } from '../helpers/k4-minus-edge.js';
import { runCommand, writeScenario } from '../helpers/cli.js';
import { expectRounded } from '../helpers/machine.js';
import { num } from '../../src/output/format.js';

const dir = mkdtempSync(join(tmpdir(), 'edgewise-sensitivity-'));
const repo = new URL('../../', import.meta.url).pathname;

function scenarioFile(name: string, doc: unknown): string {
  return writeScenario(dir, name, doc);
}

async function run(opts: Parameters<typeof sensitivityCommand>[0], cwd = dir) {
  return runCommand(sensitivityCommand, opts, cwd);
}

// The hand-derived family (tests/helpers/k4-minus-edge.ts), dressed as an invented shift-swap board:
// four shift types, every pair can swap except the two night types a and b.
const family = (rates: readonly number[]) => ({
  name: 'shift swaps',
  timeUnit: 'day',
  classes: K4_IDS.map((id, k) => ({ id, rate: rates[k] })),
  compatibilities: K4_MINUS_AB_PAIRS.map(([x, y]) => ({ pair: [K4_IDS[x], K4_IDS[y]], removable: true, saving: 2 })),
  candidates: [{ pair: ['a', 'b'], cost: 5 }],
});

describe('edgewise sensitivity', () => {
  it('--json has the shape of the issue and the hand-derived figures (7/3 → 131/56, harmful, predicted)', async () => {
    const rates = [0.1, 0.1, 0.4, 0.4];
    const { code, out } = await run({ file: scenarioFile('k4a.json', family(rates)), json: true });
    expect(code).toBe(0);
    const doc = JSON.parse(out);
    // JSON figures are rounded to the record's precision (significant digits)
    const digits = doc.precision;
    expectRounded(doc.base.backlog, 7 / 3, digits, 'base backlog');
    expect(doc.additions).toHaveLength(1);
    const add = doc.additions[0];
    expect(add.pair).toEqual(['a', 'b']);
    expect(add.change).toBe('add');
    expect(add.allowed).toBe(true);
    expect(add.rule).toBeUndefined();
    expect(add.price).toBe(5);
    expect(add.stable).toBe(true);
    expectRounded(add.backlog, 131 / 56, digits, 'backlog with a–b');
    expectRounded(add.delta, 131 / 56 - 7 / 3, digits, 'delta');
    expect(add.verdict).toBe('harmful');
    expect(add.predicted).toBe(true);
    expect(typeof add.explanation).toBe('string');
    // waitDelta: per class, K4 wait minus K4-minus-edge wait (closed forms, Little's law)
    const before = k4MinusEdge(rates).backlog;
    const after = k4(rates).backlog;
    for (let k = 0; k < 4; k++) expectRounded(add.waitDelta[K4_IDS[k]!], (after[k]! - before[k]!) / rates[k]!, digits, `wait change ${K4_IDS[k]}`);
    // every removal here breaks stability (e.g. without c–d, {c, d} demands 0.8 against a + b = 0.2)
    expect(doc.removals).toHaveLength(5);
    for (const rem of doc.removals) {
      expect(rem.change).toBe('remove');
      expect(rem.allowed).toBe(true);
      expect(rem.price).toBe(2);
      expect(rem.stable).toBe(false);
      expect(rem.backlog).toBeUndefined();
      expect(rem.verdict).toBe('breaks stability');
      expect(rem.certificate.demand).toBeGreaterThanOrEqual(rem.certificate.capacity - 1e-12);
      expect(rem.explanation).toMatch(/breaks stability/);
    }
    expect(doc.ruleCosts).toEqual([]);
  });

  it('the helpful case: 7/3 → 11/6, not harmful, not predicted; tables for people', async () => {
    const file = scenarioFile('k4b.json', family([0.2, 0.2, 0.4, 0.2]));
    const json = JSON.parse((await run({ file, json: true })).out);
    expectRounded(json.additions[0].backlog, 11 / 6, json.precision, 'backlog with a–b');
    expect(json.additions[0].verdict).toBe('helps');
    expect(json.additions[0].predicted).toBe(false);
    const { code, out } = await run({ file });
    expect(code).toBe(0);
    expect(out).toMatch(/Additions the rules allow/);
    const line = out.split('\n').find((l) => l.startsWith('a ↔ b'))!;
    expect(line).toMatch(/helps/);
    expect(line).toContain(num(11 / 6)); // the text's four significant digits
    expect(out).toMatch(/^a ↔ c\s+2\s+unstable\s+unbounded/m);
  });

  it('the shipped harmful-candidate scenario: healer ↔ tank flagged harmful with the harm predicted', async () => {
    const { code, out } = await run({ file: 'scenarios/harmful-candidate.json' }, repo);
    expect(code).toBe(0);
    const line = out.split('\n').find((l) => l.includes('healer ↔ tank'))!;
    expect(line).toMatch(/ harmful /);
    expect(line).toMatch(/harm predicted/);
    const doc = JSON.parse((await run({ file: 'scenarios/harmful-candidate.json', json: true }, repo)).out);
    expect(doc.base.bottlenecks[0].set.sort()).toEqual(['archer', 'mage']);
    expect(doc.additions[0].pair).toEqual(['archer', 'mage']); // the best backlog saving per unit of cost
  });

  it('--all-pairs adds every absent pair, self-pairs included, with null cost when not a candidate', async () => {
    const doc = JSON.parse((await run({ file: scenarioFile('k4c.json', family([0.2, 0.2, 0.4, 0.2])), json: true, allPairs: true })).out);
    // 4 classes: 6 pairs + 4 self-pairs = 10, minus the 5 present compatibilities = 5 absent
    expect(doc.additions).toHaveLength(5);
    const selfPairs = doc.additions.filter((e: { pair: string[] }) => e.pair[0] === e.pair[1]);
    expect(selfPairs).toHaveLength(4);
    expect(selfPairs.every((e: { price: number | null; listed: boolean; allowed: boolean }) => e.price === undefined && e.listed === false && e.allowed)).toBe(true);
  });

  it('exit codes: unstable base 3, too many sets 4, bad option or missing file 2', async () => {
    const unstable = await run({ file: 'scenarios/unstable-example.json' }, repo);
    expect(unstable.code).toBe(3);
    expect(unstable.out).toMatch(/Unstable: items from east-village and west-village/);
    expect(unstable.out).toMatch(/Ways out, cheapest first/);
    // --score exact keeps the refusal; the default (auto) simulates past the guard instead
    const tooMany = await run({ file: scenarioFile('k4d.json', family([0.2, 0.2, 0.4, 0.2])), maxSets: 3, score: 'exact' });
    expect(tooMany.code).toBe(4);
    const auto = await run({ file: scenarioFile('k4d.json', family([0.2, 0.2, 0.4, 0.2])), maxSets: 3, json: true });
    expect(auto.code).toBe(0);
    expect(JSON.parse(auto.out).method).toBe('simulation');
    expect((await run({ file: scenarioFile('k4e.json', family([0.2, 0.2, 0.4, 0.2])), maxSets: 0 })).code).toBe(2);
    expect((await run({ file: join(dir, 'nope.json') })).code).toBe(2);
  });
});
