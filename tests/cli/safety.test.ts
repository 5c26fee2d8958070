import { mkdirSync, mkdtempSync, readdirSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { importCommand } from '../../src/cli/commands/import.js';
import { recommendCommand } from '../../src/cli/commands/recommend.js';
import { reportCommand } from '../../src/cli/commands/report.js';
import { writeFileAtomic } from '../../src/cli/write.js';
import { runCommand, writeScenario } from '../helpers/cli.js';
import { pitCrews } from '../helpers/k4-minus-edge.js';

// Never lose the user's work: no output over an input, a folder refused before any work, every file
// written atomically. "Before any work" is shown without timing: the refusal comes even when the
// scenario (or design file) is broken, so the check ran before anything was read.

const dir = mkdtempSync(join(tmpdir(), 'edgewise-safety-'));
// K4 minus a ↔ b (tests/helpers/k4-minus-edge.ts): today 7/3 items waiting, with a ↔ b 11/6
const scenario = pitCrews();
writeScenario(dir, 'f.json', scenario);
const original = readFileSync(join(dir, 'f.json'));
writeFileSync(join(dir, 'broken.json'), '{ "classes": [ ');
writeFileSync(join(dir, 'bad-design.json'), '{"addd": []}');
symlinkSync(join(dir, 'f.json'), join(dir, 'link.json'));
mkdirSync(join(dir, 'a-folder'));

const unchanged = (): void => expect(readFileSync(join(dir, 'f.json')).equals(original)).toBe(true);

describe('report F -o F', () => {
  it.each(['f.json', './f.json', join(dir, 'f.json'), 'link.json'])('-o %s exits 2 and leaves F byte for byte', async (target) => {
    const r = await runCommand(reportCommand, { file: 'f.json', output: target }, dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/refusing to write .*it is an input file/);
    expect(r.out).toBe('');
    unchanged();
  });

  it('-o the --design file is refused too', async () => {
    writeFileSync(join(dir, 'd.json'), '{"added": [["a", "b"]]}');
    const before = readFileSync(join(dir, 'd.json'));
    const r = await runCommand(reportCommand, { file: 'f.json', design: 'd.json', output: 'd.json' }, dir);
    expect(r.code).toBe(2);
    expect(readFileSync(join(dir, 'd.json')).equals(before)).toBe(true);
  });
});

describe('recommend --save F with F an input', () => {
  it('exits 2 before any work: even a broken --design file is not read first', async () => {
    const r = await runCommand(recommendCommand, { file: 'f.json', design: 'bad-design.json', save: 'f.json' }, dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/refusing to write f\.json: it is an input file/);
    expect(r.err).not.toMatch(/addd/);
    expect(r.out).toBe('');
    unchanged();
    const same = await runCommand(recommendCommand, { file: 'f.json', save: 'bad-design.json', design: 'bad-design.json' }, dir);
    expect(same.code).toBe(2);
    expect(readFileSync(join(dir, 'bad-design.json'), 'utf8')).toBe('{"addd": []}');
  });
});

describe('a folder as -o', () => {
  it('exits 2 before reading the scenario (a broken scenario is not even looked at)', async () => {
    const r = await runCommand(reportCommand, { file: 'broken.json', output: 'a-folder' }, dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/cannot write a-folder: it is a folder/);
    expect(r.err).not.toMatch(/malformed/);
    const save = await runCommand(recommendCommand, { file: 'broken.json', save: 'a-folder' }, dir);
    expect(save.code).toBe(2);
    expect(save.err).toMatch(/it is a folder/);
    const missing = await runCommand(reportCommand, { file: 'broken.json', output: join('no-such-folder', 'r.html') }, dir);
    expect(missing.code).toBe(2);
    expect(missing.err).toMatch(/folder .*no-such-folder does not exist/);
  });

  it('import -o an input table is refused', async () => {
    writeFileSync(join(dir, 'classes.csv'), 'id,rate\na,1\nb,2\n');
    const r = await runCommand(importCommand, { classes: 'classes.csv', output: 'classes.csv' }, dir);
    expect(r.code).toBe(2);
    expect(readFileSync(join(dir, 'classes.csv'), 'utf8')).toBe('id,rate\na,1\nb,2\n');
  });
});

describe('atomic writes', () => {
  it('a finished report leaves exactly its file (no temporary file behind)', async () => {
    const out = join(dir, 'clean');
    mkdirSync(out);
    const r = await runCommand(reportCommand, { file: 'f.json', output: join(out, 'r.html') }, dir);
    expect(r.code).toBe(0);
    expect(readdirSync(out)).toEqual(['r.html']);
    expect(readFileSync(join(out, 'r.html'), 'utf8')).toMatch(/^<!doctype html>/);
  });

  it('writing with replace=false never replaces an existing file', () => {
    const p = join(dir, 'kept.txt');
    writeFileSync(p, 'mine');
    expect(() => writeFileAtomic(p, 'theirs', false)).toThrow(/refusing to overwrite/);
    expect(readFileSync(p, 'utf8')).toBe('mine');
    expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });
});
