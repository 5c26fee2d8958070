import { describe, expect, it } from 'vitest';
import { pad, width, wrap } from '../../src/output/text/wrap.js';
import { columns } from '../helpers/columns.js';
import { Rng } from '../helpers/random.js';

// Word wrapping for terminals (src/output/text/wrap.ts). Expected lines are written by hand; the
// property checks count columns with tests/helpers/columns.ts (terminal rules, no width library).

describe('width and pad', () => {
  it('counts terminal columns: the pair arrow one, wide characters two, combining marks none', () => {
    expect(width('a ↔ b')).toBe(5);
    expect(width('中文')).toBe(4);
    expect(width('e\u0301')).toBe(1); // e + combining acute
    expect(width('ünïcode')).toBe(7);
  });

  it('pads to a width, on the left or on the right', () => {
    expect(pad('ab', 5, 'left')).toBe('ab   ');
    expect(pad('ab', 5, 'right')).toBe('   ab');
    expect(pad('中', 4, 'right')).toBe('  中');
    expect(pad('toolong', 3, 'left')).toBe('toolong'); // never cut
  });
});

describe('wrap', () => {
  it('breaks at spaces, keeps explicit newlines and empty lines', () => {
    expect(wrap('aaa bbb ccc', 7)).toEqual(['aaa bbb', 'ccc']);
    expect(wrap('aaa bbb ccc', 11)).toEqual(['aaa bbb ccc']);
    expect(wrap('one\n\ntwo three', 5)).toEqual(['one', '', 'two', 'three']);
  });

  it('indents every line after the first (hanging indent)', () => {
    expect(wrap('- alpha beta gamma delta', 12, '  ')).toEqual(['- alpha beta', '  gamma', '  delta']);
  });

  it('breaks a word wider than the line where it must, and nothing is lost', () => {
    expect(wrap('abcdefghij', 4)).toEqual(['abcd', 'efgh', 'ij']);
    expect(wrap('xx abcdefghij', 5)).toEqual(['xx', 'abcde', 'fghij']);
  });

  it('never ends a line inside a pair "a ↔ b" that fits on a line', () => {
    // by hand: "fund north ↔ south" is 18 columns; at 14 the pair "north ↔ south" (13) moves down whole
    expect(wrap('fund north ↔ south now', 14)).toEqual(['fund', 'north ↔ south', 'now']);
    // "add a ↔ b, c ↔ d" at 9: "add a ↔ b," would be 10, so the pair starts the next line
    expect(wrap('add a ↔ b, c ↔ d', 9)).toEqual(['add', 'a ↔ b,', 'c ↔ d']);
    // a pair wider than the line is broken at its spaces
    expect(wrap('longname ↔ othername', 10)).toEqual(['longname ↔', 'othername']);
  });

  it('a pair wider than the line breaks after its arrow: "↔" never starts a line', () => {
    for (const w of [11, 12, 14, 20]) {
      const lines = wrap('surg-night ↔ surg-night and + icu-night ↔ ed-night', w);
      for (const l of lines) expect(l.startsWith('↔'), `${w}: ${JSON.stringify(lines)}`).toBe(false);
      // nothing lost, in order (a name may be broken where even "name ↔" is wider than the line)
      expect(lines.join('').replace(/\s/g, '')).toBe('surg-night↔surg-nightand+icu-night↔ed-night');
      for (const l of lines) expect(columns(l)).toBeLessThanOrEqual(w);
      for (const l of lines) expect(/[+−]$/.test(l), JSON.stringify(lines)).toBe(false);
    }
    expect(wrap('surg-night ↔ surg-night', 13)).toEqual(['surg-night ↔', 'surg-night']);
  });

  it('property: lines fit, and the words come back in order (seeded random texts)', () => {
    const rng = new Rng(2024);
    const alphabet = 'abcdefghijklmnopqrstuvwxyzé中-,~%';
    for (let t = 0; t < 300; t++) {
      const w = rng.int(16, 60); // wider than any word (7 letters, two columns each at most)
      const words = Array.from({ length: rng.int(1, 40) }, () => (rng.chance(0.1) ? '↔' : Array.from({ length: rng.int(1, 7) }, () => alphabet[rng.int(0, alphabet.length - 1)]).join('')));
      const text = words.join(' ');
      const indent = rng.chance(0.3) ? '  ' : '';
      const lines = wrap(text, w, indent);
      for (const l of lines) expect(columns(l), JSON.stringify(l)).toBeLessThanOrEqual(w);
      const back = lines.map((l, i) => (i === 0 ? l : l.slice(indent.length))).join(' ').split(' ').filter((x) => x !== '');
      expect(back).toEqual(words);
    }
  });
});

describe('a number keeps its percent sign', () => {
  it('never starts a line with "%", whatever the width', () => {
    const text = 'with 3.768 per hour (73.82 % to spare) and 12 % giving up, 5 %.';
    for (let w = 8; w <= 60; w++) {
      const lines = wrap(text, w);
      for (const l of lines) expect(l.trimStart().startsWith('%'), `width ${w}: ${JSON.stringify(lines)}`).toBe(false);
      expect(lines.join(' ').replace(/\s+/g, ' ')).toBe(text);
    }
  });
});

describe('a change marker keeps its pair', () => {
  it('never ends a line with "+" or "−" before the pair it marks', () => {
    const text = '− g0-1 ↔ g0-3, − g1-1 ↔ g1-3, + g2-2 ↔ g4-4, − g5-1 ↔ g5-2 and + a ↔ b';
    for (let w = 14; w <= 60; w++) {
      const lines = wrap(text, w);
      for (const l of lines) expect(/[+−]$/.test(l.trimEnd()), `width ${w}: ${JSON.stringify(lines)}`).toBe(false);
      expect(lines.join(' ').replace(/\s+/g, ' ')).toBe(text);
    }
  });
});
