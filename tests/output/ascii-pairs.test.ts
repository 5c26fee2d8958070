import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { simulateCommand } from '../../src/cli/commands/simulate.js';
import { sweepCommand } from '../../src/cli/commands/sweep.js';
import { asciiId, asciiIds, asciiPair, asciiPairs, NotationError, readAsciiId, readAsciiIds, readAsciiPair, readAsciiPairs } from '../../src/output/ascii-pairs.js';
import { runCommand, writeScenario } from '../helpers/cli.js';
import { Rng } from '../helpers/random.js';

// The one ASCII notation of pairs and class lists (docs/glossary.md, "Notation"): "a~b", lists
// joined by ',', '%', ',' and '~' inside ids percent-escaped. The escapes are checked by hand;
// the round trip on seeded random ids holding every character that has a meaning here, spaces
// (also at either end), '-', accents, wide characters, emoji and control characters.

const ALPHABET = ['a', 'b', 'Z', '0', '-', '_', ' ', ',', '~', '%', '%2C', 'é', '中', '😀', '\t', '\n', '\u0000', '\u001f', '\u007f', '\u00a0', '\u2003', '"', "'", '↔'];

function randomId(rng: Rng): string {
  for (;;) {
    const id = Array.from({ length: rng.int(1, 8) }, () => ALPHABET[rng.int(0, ALPHABET.length - 1)]).join('');
    if (id !== '') return id;
  }
}

describe('escapes, by hand', () => {
  it("writes '%', ',', '~' and control characters as %XX, spaces at either end as %20, the rest as it is", () => {
    expect(asciiId('old-town')).toBe('old-town');
    expect(asciiId('a,b')).toBe('a%2Cb');
    expect(asciiId('x~y')).toBe('x%7Ey');
    expect(asciiId('50%')).toBe('50%25');
    expect(asciiId('tab\there')).toBe('tab%09here');
    expect(asciiId(' lead and trail  ')).toBe('%20lead and trail%20%20');
    expect(asciiId('中文')).toBe('中文');
    expect(asciiPair(['a,b', 'x~y'])).toBe('a%2Cb~x%7Ey');
    expect(asciiPairs([['a', 'b'], ['c', 'c']])).toBe('a~b,c~c');
    expect(asciiIds(['a,b', 'c'])).toBe('a%2Cb,c');
  });

  it('reads lists with spaces around items, and refuses what is not a pair', () => {
    expect(readAsciiPairs(' a~b , c~d ')).toEqual([['a', 'b'], ['c', 'd']]);
    expect(readAsciiIds('a, b%2Cc,,')).toEqual(['a', 'b,c']);
    expect(() => readAsciiPair('a-b')).toThrow(NotationError);
    expect(() => readAsciiPair('a~b~c')).toThrow(/more than one '~'/);
    expect(() => readAsciiPair('~b')).toThrow(NotationError);
    expect(() => readAsciiId('50%')).toThrow(/percent escape/);
    expect(() => readAsciiId('%zz')).toThrow(/percent escape/);
  });
});

describe('round trip (seeded random ids)', () => {
  it('read(write(x)) = x for ids, pairs, lists of pairs and lists of ids', () => {
    const rng = new Rng(8086);
    for (let t = 0; t < 2000; t++) {
      const a = randomId(rng);
      const b = rng.chance(0.2) ? a : randomId(rng);
      const written = asciiId(a);
      expect(readAsciiId(written), JSON.stringify(a)).toBe(a);
      // what is written has no separator, no control character and no space at an end
      expect(written).not.toMatch(/[,~\u0000-\u001f\u007f]|^ | $/);
      expect(readAsciiPair(asciiPair([a, b]))).toEqual([a, b]);
      const list = Array.from({ length: rng.int(1, 4) }, () => [randomId(rng), randomId(rng)] as [string, string]);
      expect(readAsciiPairs(asciiPairs(list))).toEqual(list);
      const ids = Array.from({ length: rng.int(1, 5) }, () => randomId(rng));
      expect(readAsciiIds(asciiIds(ids))).toEqual(ids);
    }
  });
});

describe('on the command line', () => {
  const dir = mkdtempSync(join(tmpdir(), 'edgewise-notation-'));
  // invented: four ride-pooling zones with awkward ids; a triangle with a self-pair, and a candidate
  const ids = ['old-town', 'a,b', 'x~y', ' 50% '];
  writeScenario(dir, 'zones.json', {
    name: 'zones',
    timeUnit: 'hour',
    classes: ids.map((id, k) => ({ id, rate: [2, 1.5, 1.2, 1][k] })),
    compatibilities: [['old-town', 'old-town'], ['old-town', 'a,b'], ['a,b', 'x~y'], ['old-town', 'x~y'], ['x~y', ' 50% ']],
    candidates: [{ pair: ['a,b', ' 50% '], cost: 3 }],
  });

  it('sweep --with a~b and --grow name ids holding "-", ",", "~", "%" and spaces (escaped)', async () => {
    const r = await runCommand(sweepCommand, { file: 'zones.json', grow: `${asciiId('a,b')},${asciiId(' 50% ')}`, with: [asciiPair(['a,b', ' 50% '])], without: [asciiPair(['old-town', 'x~y'])], steps: 2, json: true }, dir);
    expect(r.code, r.err).toBe(0);
    const doc = JSON.parse(r.out);
    expect(doc.grow).toEqual(['a,b', ' 50% ']);
    expect(doc.curves[1].add).toEqual([['a,b', ' 50% ']]);
    expect(doc.curves[2].remove).toEqual([['old-town', 'x~y']]);
    // the CSV names the designs in the same notation, readable back
    const csv = await runCommand(sweepCommand, { file: 'zones.json', grow: 'old-town', with: [asciiPair(['a,b', ' 50% '])], steps: 1, csv: true }, dir);
    expect(csv.code).toBe(0);
    const designs = new Set(csv.out.trim().split('\n').slice(1).map((l) => l.split(',')[3]));
    expect(designs).toEqual(new Set(['reference', `with ${asciiPair(['a,b', ' 50% '])}`]));
    expect(readAsciiPair(`with ${asciiPair(['a,b', ' 50% '])}`.slice(5))).toEqual(['a,b', ' 50% ']);
  });

  it('simulate --rank reads the escaped list', async () => {
    const r = await runCommand(simulateCommand, { file: 'zones.json', policy: 'ranked', rank: asciiIds(['x~y', 'a,b']), arrivals: 500, replications: 1, jobs: 1, json: true }, dir);
    expect(r.code, r.err).toBe(0);
    expect(JSON.parse(r.out).ranking).toEqual(['x~y', 'a,b']);
  });

  it('an unescaped id that looks like two says why (exit 2)', async () => {
    const r = await runCommand(sweepCommand, { file: 'zones.json', grow: 'old-town', with: ['a,b~ 50% '] }, dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/--with/);
  });
});
