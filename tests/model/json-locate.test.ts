import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { uniformInt } from 'pure-rand/distribution/uniformInt';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { describe, expect, it } from 'vitest';
import { locateJsonError } from '../../src/model/json-locate.js';

const CARET = '‸';

/**
 * Takes a text with one caret marking where the error is (the caret is not part of the text) and
 * returns the text plus the 1-based line and column of the caret, counted by hand: line = 1 + number
 * of '\n' before it, column = 1 + number of characters since the last '\n'.
 */
function marked(withCaret: string): { text: string; line: number; column: number } {
  const at = withCaret.indexOf(CARET);
  if (at < 0 || withCaret.indexOf(CARET, at + 1) >= 0) throw new Error('exactly one caret expected');
  const before = withCaret.slice(0, at);
  const lines = before.split('\n');
  return { text: before + withCaret.slice(at + 1), line: lines.length, column: lines[lines.length - 1]!.length + 1 };
}

/** Line and column of a 0-based offset (same counting rule as `marked`). */
function lineColumnOf(text: string, offset: number): { line: number; column: number } {
  const lines = text.slice(0, offset).split('\n');
  return { line: lines.length, column: lines[lines.length - 1]!.length + 1 };
}

describe('locateJsonError', () => {
  it('returns undefined for valid JSON (JSON.parse accepts every one of these: reference = the JS engine)', () => {
    const valid = [
      '{}',
      '[]',
      ' \r\n\t{ "a" : [ 1 , -0.5e+3 , 2E-2 , true , false , null , "x\\"\\\\\\/\\b\\f\\n\\r\\t\\u00e9" ] } \n',
      '0',
      '"only a string"',
      '{"$schema": "x", "classes": [{"id": "north", "rate": 12.5}]}',
      '[1e999]',
    ];
    for (const t of valid) {
      expect(() => JSON.parse(t)).not.toThrow();
      expect(locateJsonError(t)).toBeUndefined();
    }
  });

  it('accepts every shipped scenario file', () => {
    const dir = join(import.meta.dirname, '..', '..', 'scenarios');
    for (const f of readdirSync(dir).filter((x) => x.endsWith('.json'))) {
      expect(locateJsonError(readFileSync(join(dir, f), 'utf8')), f).toBeUndefined();
    }
  });

  // Each case puts the error where the caret is; the expected line/column come from the caret
  // (counted by hand in `marked`), not from the scanner.
  const cases: Array<[string, string, RegExp]> = [
    ['missing value', '{\n  "name": ‸}\n', /expected a value|unexpected character/],
    ['trailing comma in an object', '{\n  "a": 1,\n  ‸}', /quoted key/],
    ['trailing comma in an array', '{"classes": [\n  {"id": "a", "rate": 1},\n‸]}', /unexpected character ']'/],
    ['missing colon', '{\n  "classes" ‸[]\n}', /expected ':'/],
    ['missing comma between entries', '{\n  "a": 1\n  ‸"b": 2\n}', /expected ',' or '}'/],
    ['missing comma in an array', '[\n  1\n  ‸2\n]', /expected ',' or ']'/],
    ['unterminated string at the end', '{"name": "ride pool‸', /unterminated string/],
    ['unclosed object at the end', '{"a": [1, 2]‸', /end of input/],
    ['unclosed array at the end', '{"a": [1, 2‸', /end of input/],
    ['leading zero', '{"rate": 0‸7}', /expected ',' or '}'/],
    ['decimal point without digits', '{"rate": 2.‸}', /after the decimal point/],
    ['exponent without digits', '{"rate": 4E‸}', /exponent/],
    ['minus without digits', '{"rate": -‸}', /after '-'/],
    ['NaN is not JSON', '{"rate": ‸NaN}', /unexpected character 'N'/],
    ['Infinity is not JSON', '{"rate": ‸Infinity}', /unexpected character 'I'/],
    ['truncated literal', '{"removable": tru‸}', /invalid literal/],
    ['misspelt literal', '{"removable": fa‸sle}', /invalid literal/],
    ['single-quoted key', "{‸'name': 1}", /quoted key/],
    ['comment', '{\n  ‸// a comment\n  "a": 1\n}', /quoted key/],
    ['tab inside a string', '["a‸\tb"]', /control character/],
    ['bad escape', '["a\\‸q"]', /bad escape/],
    ['bad unicode escape', '["\\u00‸G1"]', /\\u escape/],
    ['text after the document', '{"a": 1}\n‸}', /after the end/],
    ['empty input', '‸', /end of input/],
    ['only whitespace', '\n\n  ‸', /end of input/],
    ['after a 500-digit number', `[${'7'.repeat(500)}, ‸]`, /unexpected character ']'/],
    ['error on a CRLF line', '{\r\n  "a": 1,\r\n  "b": ‸,\r\n}', /unexpected character ','/],
  ];
  for (const [name, withCaret, message] of cases) {
    it(`locates: ${name}`, () => {
      const { text, line, column } = marked(withCaret);
      expect(() => JSON.parse(text)).toThrow(); // the engine agrees the text is invalid
      const got = locateJsonError(text);
      expect(got).toBeDefined();
      expect({ line: got!.line, column: got!.column }).toEqual({ line, column });
      expect(got!.message).toMatch(message);
    });
  }

  it('agrees with the JS engine on random corruptions of a scenario (seeded)', () => {
    // Reference: V8's JSON.parse, an independent parser. (1) validity: locateJsonError says "no
    // error" exactly when JSON.parse succeeds; (2) when V8's message gives "at position N" (0-based),
    // our line/column is the line/column of N; (3) when V8 names the unexpected character instead,
    // that character sits at our line/column; (4) "Unexpected end" means our position is the end.
    const base = readFileSync(join(import.meta.dirname, '..', '..', 'scenarios', 'harmful-candidate.json'), 'utf8');
    const alphabet = '{}[]:,"\\ \n0123456789.-+eEtrufalsn\t\u0001x';
    const rng = xoroshiro128plus(20240611);
    let checkedPositions = 0;
    for (let round = 0; round < 3000; round++) {
      let t = base;
      const edits = uniformInt(rng, 1, 3);
      for (let e = 0; e < edits; e++) {
        const p = uniformInt(rng, 0, t.length - 1);
        const kind = uniformInt(rng, 0, 2);
        const ch = alphabet[uniformInt(rng, 0, alphabet.length - 1)]!;
        t = kind === 0 ? t.slice(0, p) + t.slice(p + 1) : kind === 1 ? t.slice(0, p) + ch + t.slice(p) : t.slice(0, p) + ch + t.slice(p + 1);
      }
      let engineMessage: string | undefined;
      try {
        JSON.parse(t);
      } catch (e) {
        engineMessage = (e as Error).message;
      }
      const got = locateJsonError(t);
      expect(got === undefined, `validity of ${JSON.stringify(t)}`).toBe(engineMessage === undefined);
      if (engineMessage === undefined || got === undefined) continue;
      const pos = /at position (\d+)/.exec(engineMessage);
      const token = /^Unexpected token '(.)'/su.exec(engineMessage);
      if (pos) {
        expect({ line: got.line, column: got.column }, engineMessage).toEqual(lineColumnOf(t, Number(pos[1])));
        checkedPositions++;
      } else if (token) {
        const lineStart = t.split('\n').slice(0, got.line - 1).reduce((sum, l) => sum + l.length + 1, 0);
        expect(t[lineStart + got.column - 1], engineMessage).toBe(token[1]);
        checkedPositions++;
      } else if (engineMessage.startsWith('Unexpected end')) {
        expect({ line: got.line, column: got.column }).toEqual(lineColumnOf(t, t.length));
        checkedPositions++;
      }
    }
    expect(checkedPositions).toBeGreaterThan(1000);
  });
});
