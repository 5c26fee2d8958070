import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCommand } from '../../src/cli/commands/evaluate.js';
import { fitCommand } from '../../src/cli/commands/fit.js';
import { loadScenario } from '../../src/cli/load.js';
import { runCommand } from '../helpers/cli.js';

const dir = mkdtempSync(join(tmpdir(), 'edgewise-fit-'));
// An invented repair-café log: items brought in for a fixer, by kind; times in hours since opening.
const log = `# repair café, one evening (invented)
hours,kind,outcome,waited
0.1,lamp,matched,0.2
0.4,bike,matched,0.1
0.9,lamp,abandoned,0.6
1.3,toaster,matched,0
1.8,bike,waiting,0.4
2.2,lamp,matched,0.3
3.0,bike,matched,0
3.5,toaster,abandoned,0.9
`;
writeFileSync(join(dir, 'log.csv'), log);
writeFileSync(join(dir, 'compat.csv'), 'a,b\nlamp,lamp\nlamp,bike\nbike,toaster\ntoaster,toaster\n');

const base = { file: 'log.csv', time: 'hours', class: 'kind' };

describe('edgewise fit', () => {
  it('--json prints {classes: [{id, rate, ci95, count}], timeUnit}, rates over the estimated window', async () => {
    const r = await runCommand(fitCommand, { ...base, json: true }, dir);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.timeUnit).toBe('hour');
    // 8 arrivals from 0.1 to 3.5: mean gap 3.4/7, window length 3.4 · 9/7 (derived by hand)
    const T = (3.4 * 9) / 7;
    expect(j.window.length).toBeCloseTo(T, 8);
    expect(j.classes.map((c: { id: string; count: number }) => [c.id, c.count])).toEqual([['lamp', 3], ['bike', 3], ['toaster', 2]]);
    for (const c of j.classes) {
      expect(Object.keys(c)).toEqual(expect.arrayContaining(['id', 'rate', 'ci95', 'count']));
      expect(c.rate).toBeCloseTo(c.count / T, 8);
      expect(c.ci95[0]).toBeLessThan(c.rate);
      expect(c.ci95[1]).toBeGreaterThan(c.rate);
    }
  });

  it('a class with no arrival in the window gets [0, −ln(0.025)/T] (derived by hand: e^{−μ} = 0.025)', async () => {
    const r = await runCommand(fitCommand, { ...base, json: true, from: '0', to: '3.2' }, dir);
    const j = JSON.parse(r.out);
    const toaster = j.classes.find((c: { id: string }) => c.id === 'toaster');
    expect(toaster.count).toBe(1);
    writeFileSync(join(dir, 'late.csv'), 't,k\n0.5,a\n1,a\n9,b\n');
    const late = JSON.parse((await runCommand(fitCommand, { file: 'late.csv', time: 't', class: 'k', json: true, from: '0', to: '4' }, dir)).out);
    const b = late.classes.find((c: { id: string }) => c.id === 'b');
    expect(b.count).toBe(0);
    expect(b.ci95[0]).toBe(0);
    expect(b.ci95[1]).toBeCloseTo(-Math.log(0.025) / 4, 8);
    expect(late.warnings).toEqual(['b: no arrival inside the window', '1 arrival outside the window (--from/--to) left out']);
  });

  it('says how times were read, and shows patience where the log has outcomes', async () => {
    const r = await runCommand(fitCommand, { ...base, outcome: 'outcome', wait: 'waited' }, dir);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/times: numbers, read as hours \(--time-unit\)/i);
    expect(r.out).toMatch(/mean patience \(hour\)/);
    expect(r.out).toMatch(/^lamp .*\s1 of 3$/m);
  });

  it('-o writes a scenario fragment that validates; with --compatibilities a full scenario that evaluates', async () => {
    const f = await runCommand(fitCommand, { ...base, outcome: 'outcome', wait: 'waited', output: 'fragment.json' }, dir);
    expect(f.code).toBe(0);
    expect(f.out).toMatch(/wrote fragment\.json: a scenario fragment/);
    const frag = loadScenario('fragment.json', dir);
    expect(frag.compatibilities).toEqual([]);
    const lamp = frag.classes[0]!;
    expect(lamp.rateCi95).toHaveLength(2);
    // lamp: one abandonment over 0.2 + 0.6 + 0.3 = 1.1 hours at risk → mean patience 1.1 (derived by hand)
    expect(lamp.patience).toBeCloseTo(1.1, 6);
    const full = await runCommand(fitCommand, { ...base, compatibilities: 'compat.csv', output: 'full.json', json: true }, dir);
    expect(full.code).toBe(0);
    expect(JSON.parse(full.out).classes).toHaveLength(3);
    expect(full.err).toMatch(/wrote full\.json: a scenario with the compatibilities of compat\.csv/);
    expect(loadScenario('full.json', dir).compatibilities).toHaveLength(4);
    const e = await runCommand(evaluateCommand, { file: 'full.json', json: true }, dir);
    expect(e.code).toBe(0);
    expect(JSON.parse(e.out).stable).toBe(true);
  });

  it('refuses to write over the log, and --compatibilities without -o', async () => {
    const r = await runCommand(fitCommand, { ...base, output: 'log.csv' }, dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/it is an input file/);
    expect(readFileSync(join(dir, 'log.csv'), 'utf8')).toBe(log);
    const c = await runCommand(fitCommand, { ...base, compatibilities: 'compat.csv' }, dir);
    expect(c.code).toBe(2);
  });

  it('reports unknown classes of the compatibilities file at their row', async () => {
    writeFileSync(join(dir, 'compat-bad.csv'), 'a,b\nlamp,kettle\n');
    const r = await runCommand(fitCommand, { ...base, compatibilities: 'compat-bad.csv', output: 'x.json' }, dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/compat-bad\.csv: 1 problem\n {2}- row 2: unknown class "kettle"/);
  });
});
