import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { compareCommand } from '../../src/cli/commands/compare.js';
import { evaluateCommand } from '../../src/cli/commands/evaluate.js';
import { recommendCommand } from '../../src/cli/commands/recommend.js';
import { reportCommand } from '../../src/cli/commands/report.js';
import { sensitivityCommand } from '../../src/cli/commands/sensitivity.js';
import { sweepCommand } from '../../src/cli/commands/sweep.js';
import { runCommand, writeScenario } from '../helpers/cli.js';
import { pitCrews } from '../helpers/k4-minus-edge.js';
import { randomScenario } from '../helpers/random-scenario.js';

// Issue 9: "Patience never silent". evaluate, recommend and report (--json) carry a top-level
// `warnings` array of strings; when any class has a patience one of them says "patience"; without
// patience none does. The warnings are also printed on standard error. Scenarios invented here.

const dir = mkdtempSync(join(tmpdir(), 'edgewise-warnings-'));
// K4 minus a ↔ b (tests/helpers/k4-minus-edge.ts): today 7/3 items waiting, with a ↔ b 11/6
const base = pitCrews();
writeScenario(dir, 'patient.json', base);
writeScenario(dir, 'impatient.json', { ...base, classes: base.classes.map((c) => (c.id === 'c' ? { ...c, patience: 4 } : c)) });
const random = randomScenario(5, { groups: 4, perGroup: 4, candidates: 5, patience: true, budgetShare: 0.5 });
writeScenario(dir, 'random16.json', random.doc);

const patienceIn = (ws: string[]): string[] => ws.filter((w) => /patience/.test(w));
const flat = (s: string): string => s.replace(/\s+/g, ' ');

const commands = {
  evaluate: (file: string) => runCommand(evaluateCommand, { file, json: true }, dir),
  recommend: (file: string) => runCommand(recommendCommand, { file, json: true }, dir),
  report: (file: string) => runCommand(reportCommand, { file, json: true, output: `${file}.html` }, dir),
  sensitivity: (file: string) => runCommand(sensitivityCommand, { file, json: true }, dir),
  sweep: (file: string) => runCommand(sweepCommand, { file, json: true, grow: 'c', steps: 2 }, dir),
};

describe.each(Object.keys(commands) as Array<keyof typeof commands>)('%s --json', (name) => {
  it('without patience: a warnings array, none about patience', async () => {
    const r = await commands[name]('patient.json');
    expect(r.code, r.err).toBe(0);
    const j = JSON.parse(r.out);
    expect(Array.isArray(j.warnings)).toBe(true);
    expect(j.warnings.every((w: unknown) => typeof w === 'string')).toBe(true);
    expect(patienceIn(j.warnings)).toEqual([]);
    expect(r.err).not.toMatch(/patience/);
  });

  it('with a patience on class c: one warning says "patience" and names c, on stdout (JSON) and stderr', async () => {
    const r = await commands[name]('impatient.json');
    expect(r.code, r.err).toBe(0);
    const j = JSON.parse(r.out);
    const p = patienceIn(j.warnings);
    expect(p.length).toBeGreaterThanOrEqual(1);
    expect(p.some((w) => /\bc\b/.test(w))).toBe(true);
    for (const w of j.warnings) expect(flat(r.err)).toContain(flat(w));
  });
});

describe('patience on a seeded 16-class scenario', () => {
  it('evaluate, recommend and report all say so', async () => {
    for (const name of ['evaluate', 'recommend', 'report'] as const) {
      const j = JSON.parse((await commands[name]('random16.json')).out);
      expect(patienceIn(j.warnings).length, name).toBeGreaterThanOrEqual(1);
    }
  });
});

describe('the report with patience', () => {
  it('shows simulated figures with abandonment beside the exact ones; under auto every figure is simulated with giving up, and says so', async () => {
    const r = await commands.report('impatient.json');
    expect(r.code).toBe(0);
    const page = readFileSync(join(dir, 'impatient.json.html'), 'utf8');
    expect(page).toMatch(/With patience: simulated figures/);
    expect(page).toMatch(/simulated with giving up too/);
    expect(page).not.toMatch(/exact figures above (ignore patience|assume everyone waits)/);
    expect(JSON.parse(r.out).warnings.some((w: string) => /simulated with the patience in the file/.test(w))).toBe(true);
    const plain = readFileSync(join(dir, 'patient.json.html'), 'utf8');
    expect(plain).not.toMatch(/With patience: simulated figures/);
  });

  it('with --score exact, says the exact figures ignore patience', async () => {
    const r = await runCommand(reportCommand, { file: 'impatient.json', json: true, output: 'impatient-exact.html', score: 'exact' } as never, dir);
    expect(r.code, r.err).toBe(0);
    const page = readFileSync(join(dir, 'impatient-exact.html'), 'utf8');
    expect(page).toMatch(/With patience: simulated figures/);
    expect(page).toMatch(/exact figures above (ignore patience|assume everyone waits)/);
    expect(JSON.parse(r.out).warnings.some((w: string) => /exact figures ignore patience/.test(w))).toBe(true);
  });
});

describe('compare', () => {
  it('carries the patience warning of each column', async () => {
    const r = await runCommand(compareCommand, { files: ['patient.json', 'impatient.json'], json: true }, dir);
    const j = JSON.parse(r.out);
    expect(patienceIn(j.warnings)).toHaveLength(1);
    expect(patienceIn(j.columns[0].warnings)).toEqual([]);
    expect(patienceIn(j.columns[1].warnings)).toHaveLength(1);
  });
});
