import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { importCommand } from '../../src/cli/commands/import.js';
import { fitCommand } from '../../src/cli/commands/fit.js';
import { starterCommand } from '../../src/cli/commands/starter.js';
import { tooWide } from '../helpers/columns.js';
import { namesOf, otherPairSpellings } from '../helpers/pair-notation.js';
import { compareRun, runAt, textRuns, type Kind, type Run } from '../helpers/text-runs.js';

// Issue 9's width contract on the shipped demos: with COLUMNS=120, or standard output not a
// terminal, no line of any command's text output is wider than 120 terminal columns; and text
// writes a pair only as "a ↔ b". Widths are counted by tests/helpers/columns.ts (terminal rules,
// independent of the product's width library).

const root = join(import.meta.dirname, '..', '..');
const scenarios = join(root, 'scenarios');
const demos = readdirSync(scenarios).filter((f) => f.endsWith('.json')).sort();
const unstable = new Set(['unstable-example.json']);
const KINDS: readonly Kind[] = ['check', 'evaluate', 'simulate', 'sensitivity', 'sweep', 'recommend', 'report'];
const runs = new Map<string, Run[]>();
const work = mkdtempSync(join(tmpdir(), 'edgewise-width-'));

beforeAll(async () => {
  // the report writes its page into a temporary folder, never next to the demos
  for (const f of demos) runs.set(f, await textRuns(f, scenarios, KINDS, { outDir: work }));
}, 600_000);

describe.each(demos)('%s', (file) => {
  it('every command answers (exit 0, or 3 for the unstable demo where the design must be stable)', () => {
    for (const r of runs.get(file)!) {
      const may = unstable.has(file) && /^(check|evaluate|sensitivity|sweep) /.test(r.label) ? [3] : [0];
      expect(may, `${r.label}: ${r.err}`).toContain(r.code);
      if (r.code === 0 || !r.label.startsWith('sweep')) expect(r.out.length, r.label).toBeGreaterThan(0);
    }
  });

  it('no line of stdout, nor of the warnings on stderr, is wider than 120 columns', () => {
    for (const r of runs.get(file)!) {
      expect(tooWide(r.out, 120), `${r.label} stdout`).toEqual([]);
      // error messages (exit 2-5) are one sentence each, not wrapped; warnings of finished runs are
      if (r.code === 0) expect(tooWide(r.err, 120), `${r.label} stderr`).toEqual([]);
    }
  });

  it('text writes pairs only as a ↔ b', () => {
    const names = namesOf(JSON.parse(readFileSync(join(scenarios, file), 'utf8')));
    for (const r of runs.get(file)!) expect(otherPairSpellings(r.out + r.err, names), r.label).toEqual([]);
  });
});

describe('compare of the demos', () => {
  it('fits 120 columns, one column per scenario', async () => {
    const r = await compareRun(['harmful-candidate.json', 'ride-pooling-hub.json', 'shift-swap-marketplace.json'], scenarios);
    expect(r.code).toBe(0);
    expect(tooWide(r.out, 120)).toEqual([]);
    for (const f of ['harmful-candidate.json', 'ride-pooling-hub.json', 'shift-swap-marketplace.json']) {
      expect(otherPairSpellings(r.out, namesOf(JSON.parse(readFileSync(join(scenarios, f), 'utf8')))), f).toEqual([]);
    }
  });
});

describe('starter, import and fit', () => {
  it('fit 120 columns (even with long paths), and so does fit -o', async () => {
    const deep = join(work, 'a-rather-long-folder-name-for-the-starter-set', 'and-another-level-below-it-to-make-paths-long');
    const s = await runAt('starter', starterCommand, { dir: deep }, work, 120);
    expect(s.code).toBe(0);
    const i = await runAt('import', importCommand, { classes: join(deep, 'classes.csv'), compatibilities: join(deep, 'compatibilities.csv'), candidates: join(deep, 'candidates.csv'), output: join(deep, 'imported-scenario-with-a-long-name.json') }, work, 120);
    const f = await runAt('fit', fitCommand, { file: join(deep, 'arrivals.csv'), time: 'arrived', class: 'class', outcome: 'outcome', wait: 'waited', bands: 3 }, work, 120);
    const o = await runAt('fit -o', fitCommand, { file: join(deep, 'arrivals.csv'), time: 'arrived', class: 'class', compatibilities: join(deep, 'compatibilities.csv'), output: join(deep, 'fitted.json') }, work, 120);
    for (const r of [s, i, f, o]) {
      expect(r.code, `${r.label}: ${r.err}`).toBe(0);
      expect(tooWide(r.out, 120), r.label).toEqual([]);
      expect(tooWide(r.err, 120), r.label).toEqual([]);
      expect(r.out, r.label).not.toMatch(/ – |[│┌└]/);
    }
    expect(f.out).toMatch(/Per time band/);
  });
});

describe('the built CLI with standard output piped (not a terminal)', () => {
  // dist/ is built by tests/global-setup.ts
  const cli = (args: string[], env: NodeJS.ProcessEnv) => spawnSync(process.execPath, [join(root, 'dist', 'cli', 'main.js'), ...args], { cwd: scenarios, encoding: 'utf8', env });
  const noColumns = { ...process.env };
  delete noColumns['COLUMNS'];

  it('uses 120 columns without COLUMNS, and COLUMNS when set', () => {
    for (const args of [['sensitivity', 'regional-shift-swap.json'], ['check', 'game-matchmaking-ladder.json'], ['evaluate', 'shift-swap-marketplace.json']]) {
      const piped = cli(args, noColumns);
      expect(piped.status, piped.stderr).toBe(0);
      expect(tooWide(piped.stdout, 120), args.join(' ')).toEqual([]);
      expect(tooWide(piped.stderr, 120), args.join(' ')).toEqual([]);
      const narrow = cli(args, { ...noColumns, COLUMNS: '80' });
      expect(tooWide(narrow.stdout, 80), `${args.join(' ')} at 80`).toEqual([]);
    }
    // at 120 the widest sensitivity table needs the full width: some line is longer than 80
    expect(tooWide(cli(['sensitivity', 'regional-shift-swap.json'], noColumns).stdout, 80).length).toBeGreaterThan(0);
  });
});
