import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { sweepCommand } from '../../src/cli/commands/sweep.js';
import { k4, k4MinusEdge, K4_IDS, K4_MINUS_AB_PAIRS } from '../helpers/k4-minus-edge.js';
import { runCommand, writeScenario } from '../helpers/cli.js';
import { expectRounded } from '../helpers/machine.js';
import { MACHINE_DIGITS } from '../../src/output/format.js';

const dir = mkdtempSync(join(tmpdir(), 'edgewise-sweep-'));
const repo = new URL('../../', import.meta.url).pathname;

function scenarioFile(name: string, doc: unknown): string {
  return writeScenario(dir, name, doc);
}

async function run(opts: Parameters<typeof sweepCommand>[0], cwd = dir) {
  return runCommand(sweepCommand, opts, cwd);
}

// The hand-derived K4-minus-{a, b} family (tests/helpers/k4-minus-edge.ts) as an invented game
// matchmaking queue: four roles, every pair can be matched except the two rookie roles a and b.
const rates = [0.2, 0.2, 0.4, 0.2];
const k4file = scenarioFile('k4.json', {
  name: 'rookie matchmaking',
  timeUnit: 'minute',
  classes: K4_IDS.map((id, k) => ({ id, rate: rates[k] })),
  compatibilities: K4_MINUS_AB_PAIRS.map(([x, y]) => [K4_IDS[x], K4_IDS[y]]),
  candidates: [{ pair: ['a', 'b'], cost: 5 }],
});

describe('edgewise sweep', () => {
  it('--json: the limit, the curves (closed forms at every step) and the crossover where a ↔ b starts to hurt', async () => {
    const { code, out } = await run({ file: k4file, grow: 'c', with: ['a~b'], steps: 10, json: true });
    expect(code).toBe(0);
    const doc = JSON.parse(out);
    expect(doc.grow).toEqual(['c']);
    expect(doc.limit.factor).toBeCloseTo(1.5, 7); // by hand: {c} saturates at 0.4 s = 0.6
    expect(doc.limit.method).toMatch(/LP/);
    expect(doc.curves.map((c: { name: string }) => c.name)).toEqual(['reference', 'with a~b']);
    expect(doc.curves[1].add).toEqual([['a', 'b']]);
    for (const [c, form] of [
      [doc.curves[0], k4MinusEdge],
      [doc.curves[1], k4],
    ] as const) {
      expect(c.points).toHaveLength(11);
      for (const p of c.points) {
        const want = form(rates.map((x, k) => (k === 2 ? x * p.factor : x))).total;
        // JSON rounds to the record's significant digits (nine far from the boundary, fewer close to it)
        expectRounded(p.backlog, want, doc.precision ?? MACHINE_DIGITS, `backlog at ×${p.factor}`);
        expect(p.stable).toBe(true);
      }
    }
    expect(doc.crossovers).toHaveLength(1);
    const x = doc.crossovers[0];
    expect(x.variant).toBe('with a~b');
    expect(x.direction).toBe('starts-to-hurt');
    expect(x.factor).toBeGreaterThan(x.between[0]);
    expect(x.factor).toBeLessThan(x.between[1]);
    expect(x.headroomUsed).toBeCloseTo((x.factor - 1) / 0.5, 7); // both rounded to nine digits in JSON
    expect(typeof doc.crossoverMethod).toBe('string');
  });

  it('--csv: one row per step and design; the table for people names the crossover', async () => {
    const csv = (await run({ file: k4file, grow: 'c', with: ['a~b'], steps: 4, csv: true })).out.trim().split('\n');
    expect(csv[0]).toBe('step,factor,headroomUsed,design,stable,backlog,spareCapacity,bottleneck,method,backlogLow,backlogHigh');
    expect(csv).toHaveLength(1 + 2 * 5);
    const first = csv[1]!.split(',');
    expect(first[3]).toBe('reference');
    expectRounded(Number(first[5]), 7 / 3, MACHINE_DIGITS, 'backlog today');
    expect(csv[6]!.split(',')[3]).toBe('with a~b');
    const { code, out } = await run({ file: k4file, grow: 'c', with: ['a~b'], steps: 10 });
    expect(code).toBe(0);
    // text writes the pair as a ↔ b
    expect(out).toMatch(/with a ↔ b: helps today; starts to hurt at ×1\.1/);
    expect(out).toMatch(/with a ↔ b: backlog/);
    expect(out).not.toContain('a~b');
  });

  it('class ids with hyphens (the ride-pooling hub): a~b names the pair whatever the ids hold', async () => {
    const { code, out } = await run({ file: 'scenarios/ride-pooling-hub.json', grow: 'tech-park', with: ['airport~stadium'], without: ['old-town~market'], steps: 3, json: true }, repo);
    expect(code).toBe(0);
    const doc = JSON.parse(out);
    expect(doc.curves.map((c: { name: string }) => c.name)).toEqual(['reference', 'with airport~stadium', 'without old-town~market']);
    expect(doc.curves[2].remove).toEqual([['old-town', 'market']]);
  });

  it('usage errors exit 2', async () => {
    const cases: Array<Parameters<typeof sweepCommand>[0]> = [
      { file: k4file },
      { file: k4file, grow: 'zz' },
      { file: k4file, grow: 'c', with: ['c~d'] }, // already compatible
      { file: k4file, grow: 'c', without: ['a~b'] }, // not compatible today
      { file: k4file, grow: 'c', with: ['a+b'] },
      { file: k4file, grow: 'c', with: ['a-b'] }, // the old notation: not a pair
      { file: k4file, grow: 'c', with: ['a~b~c'] },
      { file: k4file, grow: 'c', with: ['a%zz~b'] }, // a bad escape
      { file: k4file, grow: 'c', steps: 0 },
      { file: k4file, grow: 'c', json: true, csv: true },
    ];
    for (const opts of cases) expect((await run(opts)).code, JSON.stringify(opts)).toBe(2);
    const ambiguous = scenarioFile('amb.json', {
      name: 'ambiguous ids',
      classes: ['x', 'x-y', 'y', 'y-z', 'z'].map((id) => ({ id, rate: 1 })),
      compatibilities: [['x', 'y'], ['y', 'z'], ['x', 'z'], ['x-y', 'x'], ['y-z', 'y'], ['x-y', 'y-z']],
    });
    // '-' is an ordinary character: x-y~z and x~y-z are two different pairs, neither ambiguous
    const r = await run({ file: ambiguous, grow: 'x', with: ['x-y-z'] });
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/is not a pair: write two class ids joined by '~'/);
    const a = JSON.parse((await run({ file: ambiguous, grow: 'x', with: ['x-y~z'], json: true })).out);
    expect(a.curves[1].add).toEqual([['x-y', 'z']]);
    const b = JSON.parse((await run({ file: ambiguous, grow: 'x', with: ['x~y-z'], json: true })).out);
    expect(b.curves[1].add).toEqual([['x', 'y-z']]);
  });

  it('an unstable design exits 3', async () => {
    const first = JSON.parse(readFileSync(join(repo, 'scenarios/unstable-example.json'), 'utf8')).classes[0].id as string;
    const r = await run({ file: 'scenarios/unstable-example.json', grow: first }, repo);
    expect(r.code).toBe(3);
  });
});
