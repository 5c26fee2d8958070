import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { sensitivityCommand } from '../../src/cli/commands/sensitivity.js';
import { writeScenario } from '../helpers/cli.js';
import { columns, tooWide } from '../helpers/columns.js';
import { namesOf, otherPairSpellings } from '../helpers/pair-notation.js';
import { randomScenario, type RandomScenarioOptions } from '../helpers/random-scenario.js';
import { compareRun, runAt, textRuns, type Kind, type Run } from '../helpers/text-runs.js';

// Issue 9's width contract on seeded scenarios of our own at 16–40 classes, with long labels,
// rules, demand variants, patience and ids holding ',', '~', '%', '-', spaces, accents and wide
// characters: with a width of 120 (what COLUMNS=120 or a pipe gives) no line of any command's
// text is wider than 120 terminal columns (tests/helpers/columns.ts), pairs are written "a ↔ b",
// and --wide gives one table with every column.

const dir = mkdtempSync(join(tmpdir(), 'edgewise-width-own-'));
const ALL: readonly Kind[] = ['check', 'evaluate', 'simulate', 'sensitivity', 'sweep', 'recommend', 'report'];
const base = { rules: true, labels: true, budgetShare: 0.5, demand: true } as const;
const cases: Array<{ name: string; options: RandomScenarioOptions; seed: number }> = [
  { name: 'sixteen.json', seed: 16, options: { ...base, groups: 4, perGroup: 4, candidates: 6, removableShare: 0.1, patience: true } },
  { name: 'hostile.json', seed: 17, options: { ...base, groups: 4, perGroup: 4, candidates: 6, removableShare: 0.2, ids: 'hostile', patience: true } },
  { name: 'twenty-four.json', seed: 24, options: { ...base, groups: 4, perGroup: 6, candidates: 6, removableShare: 0.1 } },
  { name: 'forty.json', seed: 40, options: { ...base, groups: 5, perGroup: 8, candidates: 6, removableShare: 0.02 } },
];
const docs = new Map<string, Record<string, unknown>>();
const runs = new Map<string, Run[]>();

beforeAll(async () => {
  for (const c of cases) {
    const s = randomScenario(c.seed, c.options);
    docs.set(c.name, s.doc);
    writeScenario(dir, c.name, s.doc);
    runs.set(c.name, await textRuns(c.name, dir, ALL, { outDir: dir }));
  }
  runs.get('sixteen.json')!.push(await compareRun(['sixteen.json', 'twenty-four.json'], dir, 120, { budgets: '0,20,40' }));
}, 600_000);

describe.each(cases.map((c) => c.name))('%s', (name) => {
  it('every command finishes (exit 0)', () => {
    for (const r of runs.get(name)!) expect(r.code, `${r.label}: ${r.err}`).toBe(0);
  });

  it('no line of stdout or of the warnings on stderr is wider than 120 columns', () => {
    for (const r of runs.get(name)!) {
      expect(tooWide(r.out, 120), `${r.label} stdout`).toEqual([]);
      expect(tooWide(r.err, 120), `${r.label} stderr`).toEqual([]);
    }
  });

  it('text writes pairs only as a ↔ b', () => {
    const names = namesOf(docs.get(name) as never);
    for (const r of runs.get(name)!) expect(otherPairSpellings(r.out + r.err, names), r.label).toEqual([]);
  });
});

describe('wide characters count two columns', () => {
  it('the table with the hostile ids lines up: every row of a table has the width of its rule', () => {
    const check = runs.get('hostile.json')!.find((r) => r.label.startsWith('check'))!;
    const lines = check.out.split('\n');
    const rule = lines.findIndex((l) => /^─+(  ─+)+$/.test(l));
    expect(rule).toBeGreaterThan(0);
    expect(check.out).toContain('中文');
    // right-aligned last column: each row ends where the rule ends
    for (let i = rule + 1; i < lines.length && lines[i] !== ''; i++) expect(columns(lines[i]!), lines[i]).toBe(columns(lines[rule]!));
  });
});

describe('--wide', () => {
  it('gives one table with every column, whatever the width', async () => {
    const narrow = await runAt('sensitivity', sensitivityCommand, { file: 'forty.json' }, dir, 120);
    const wide = await runAt('sensitivity --wide', sensitivityCommand, { file: 'forty.json', wide: true }, dir, 120);
    expect(wide.code).toBe(0);
    const headers = ['add', 'cost', 'backlog', 'Δ backlog', 'Δ per cost', 'exact verdict', 'near-saturation condition', 'largest wait change'];
    const headerLine = wide.out.split('\n').find((l) => l.startsWith('add '))!;
    let at = 0;
    for (const h of headers) {
      const i = headerLine.indexOf(h, at);
      expect(i, h).toBeGreaterThanOrEqual(at);
      at = i + h.length;
    }
    expect(wide.out).not.toMatch(/folded below/);
    expect(tooWide(wide.out, 120).length).toBeGreaterThan(0); // wider than the terminal, as asked
    // the same cells, only laid out differently: every word of the narrow output is in the wide one
    const words = (s: string): Set<string> => new Set(s.split(/\s+/).filter((w) => w !== '' && !/^─+$/.test(w)));
    const w = words(wide.out);
    const missing = [...words(narrow.out)].filter((x) => !w.has(x) && !/^\(?\d+$|^columns?$|^folded$|^below$|^fit$|^--wide$|^shows$|^one$|^table\)$/.test(x));
    expect(missing).toEqual([]);
  });
});
