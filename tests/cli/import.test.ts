import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCommand } from '../../src/cli/commands/evaluate.js';
import { fitCommand } from '../../src/cli/commands/fit.js';
import { importCommand } from '../../src/cli/commands/import.js';
import { starterCommand } from '../../src/cli/commands/starter.js';
import { loadScenario } from '../../src/cli/load.js';
import { runCommand, writeScenario } from '../helpers/cli.js';

const dir = mkdtempSync(join(tmpdir(), 'edgewise-import-'));

// An invented night-bus seat-swap exchange: riders holding a seat on one line offer it for one on another.
const files = {
  'classes.csv': `# night-bus seat swaps (invented)
id,rate,label,patience
n1,3,Line N1,0.5
n2,2,Line N2,
n3,2.5,,
n4,1.5,Line N4,
`,
  'compat.csv': `a,b,removable,saving
n1,n2,,
n1,n3,true,3
n2,n3,,
n3,n4,,
n4,n4,,
`,
  'cand.csv': `a,b,cost
n1,n4,5
n2,n2,2
`,
};
for (const [f, text] of Object.entries(files)) writeFileSync(join(dir, f), text);

const handWritten = {
  name: 'seat swaps',
  timeUnit: 'hour',
  classes: [
    { id: 'n1', rate: 3, label: 'Line N1', patience: 0.5 },
    { id: 'n2', rate: 2, label: 'Line N2' },
    { id: 'n3', rate: 2.5 },
    { id: 'n4', rate: 1.5, label: 'Line N4' },
  ],
  compatibilities: [['n1', 'n2'], { pair: ['n1', 'n3'], removable: true, saving: 3 }, ['n2', 'n3'], ['n3', 'n4'], ['n4', 'n4']],
  candidates: [
    { pair: ['n1', 'n4'], cost: 5 },
    { pair: ['n2', 'n2'], cost: 2 },
  ],
  budget: 4,
};

const importOpts = { classes: 'classes.csv', compatibilities: 'compat.csv', candidates: 'cand.csv', name: 'seat swaps', timeUnit: 'hour', budget: 4 };

describe('edgewise import', () => {
  it('writes a scenario equal, after validation, to the hand-written JSON, and evaluate --json gives the same figures', async () => {
    const r = await runCommand(importCommand, { ...importOpts, output: 'imported.json' }, dir);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^wrote imported\.json: 4 classes, 5 compatibilities \(1 removable\), 2 candidates, budget 4/);
    const hand = writeScenario(dir, 'hand.json', handWritten);
    expect(loadScenario('imported.json', dir)).toEqual(loadScenario(hand, dir));
    const a = await runCommand(evaluateCommand, { file: 'imported.json', json: true }, dir);
    const b = await runCommand(evaluateCommand, { file: hand, json: true }, dir);
    expect(a.code).toBe(0);
    expect(JSON.parse(a.out)).toEqual(JSON.parse(b.out));
    expect(JSON.parse(a.out).backlog.total).toBeGreaterThan(0);
  });

  it('exits 2 listing the problems of every file, and writes nothing', async () => {
    writeFileSync(join(dir, 'bad-classes.csv'), 'id,rate,colour\nn1,x,\n');
    writeFileSync(join(dir, 'bad-compat.csv'), 'a,b\nn1,n9\n');
    const r = await runCommand(importCommand, { classes: 'bad-classes.csv', compatibilities: 'bad-compat.csv', output: 'never.json' }, dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/bad-classes\.csv: 2 problems\n {2}- row 1, column colour: unknown column "colour"/);
    expect(r.err).toMatch(/row 2, column rate: must be a number, found "x"/);
    expect(r.err).toMatch(/bad-compat\.csv: 1 problem\n {2}- row 2: unknown class "n9"/);
    expect(existsSync(join(dir, 'never.json'))).toBe(false);
  });

  it('refuses to write over an input file (also through another path) or into a missing folder, before reading anything', async () => {
    const before = readFileSync(join(dir, 'compat.csv'), 'utf8');
    const r = await runCommand(importCommand, { ...importOpts, output: './sub/../compat.csv' }, dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/refusing to write .*it is an input file/);
    expect(readFileSync(join(dir, 'compat.csv'), 'utf8')).toBe(before);
    symlinkSync(join(dir, 'compat.csv'), join(dir, 'link.json'));
    const l = await runCommand(importCommand, { ...importOpts, output: 'link.json' }, dir);
    expect(l.code).toBe(2);
    expect(l.err).toMatch(/it is an input file/);
    expect(readFileSync(join(dir, 'compat.csv'), 'utf8')).toBe(before);
    const m = await runCommand(importCommand, { ...importOpts, classes: 'missing.csv', output: 'nowhere/x.json' }, dir);
    expect(m.code).toBe(2);
    expect(m.err).toMatch(/folder .*nowhere does not exist/);
    const b = await runCommand(importCommand, { ...importOpts, budget: -1, output: 'x.json' }, dir);
    expect(b.code).toBe(2);
  });

  it('leaves no temporary file behind', async () => {
    const out = join(dir, 'clean');
    mkdirSync(out);
    const r = await runCommand(importCommand, { ...importOpts, output: 'clean/s.json' }, dir);
    expect(r.code).toBe(0);
    expect(readdirSync(out)).toEqual(['s.json']);
  });
});

describe('edgewise starter', () => {
  it('writes the CSV files, a README and the scenario that import builds from them; never overwrites', async () => {
    const r = await runCommand(starterCommand, { dir: 'start' }, dir);
    expect(r.code).toBe(0);
    const at = join(dir, 'start');
    expect(readdirSync(at).sort()).toEqual(['README.txt', 'arrivals.csv', 'candidates.csv', 'classes.csv', 'compatibilities.csv', 'scenario.json']);
    expect(readFileSync(join(at, 'README.txt'), 'utf8')).toMatch(/edgewise import --classes classes\.csv --compatibilities compatibilities\.csv/);
    expect(readFileSync(join(at, 'classes.csv'), 'utf8')).toMatch(/^# /);
    // the README's command, run on the written files, rebuilds the same scenario
    const i = await runCommand(
      importCommand,
      { classes: 'classes.csv', compatibilities: 'compatibilities.csv', candidates: 'candidates.csv', name: 'Peer study partners (tutoring marketplace, weekday evening)', timeUnit: 'hour', budget: 8, output: 'again.json' },
      at,
    );
    expect(i.code).toBe(0);
    expect(readFileSync(join(at, 'again.json'), 'utf8')).toBe(readFileSync(join(at, 'scenario.json'), 'utf8'));
    const e = await runCommand(evaluateCommand, { file: 'scenario.json', json: true }, at);
    expect(e.code).toBe(0);
    expect(JSON.parse(e.out).stable).toBe(true);
    // the README's fit command runs on the example log and writes a scenario with the same classes
    expect(readFileSync(join(at, 'README.txt'), 'utf8')).toMatch(/edgewise fit arrivals\.csv --time arrived --class class --outcome outcome --wait waited/);
    const f = await runCommand(fitCommand, { file: 'arrivals.csv', time: 'arrived', class: 'class', outcome: 'outcome', wait: 'waited', compatibilities: 'compatibilities.csv', output: 'fitted.json' }, at);
    expect(f.code).toBe(0);
    expect(loadScenario('fitted.json', at).classes.map((c) => c.id).sort()).toEqual(loadScenario('scenario.json', at).classes.map((c) => c.id).sort());
    const again = await runCommand(starterCommand, { dir: 'start' }, dir);
    expect(again.code).toBe(2);
    expect(again.err).toMatch(/refusing to overwrite/);
  });
});
