import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { execute, type CommandSpec } from '../../src/cli/command.js';
import { runWithExitCode } from '../../src/cli/exit.js';
import { memoryIO } from '../../src/cli/io.js';
import { InternalError } from '../../src/errors.js';
import { parseScenario } from '../../src/model/validate.js';
import { recommendCsv } from '../../src/output/csv.js';
import { LP_DIGITS, MACHINE_DIGITS, roundFigure } from '../../src/output/format.js';
import { renderCsv, renderJson } from '../../src/output/machine.js';
import { para } from '../../src/output/text/doc.js';
import { scenarioContext } from '../../src/usecases/context.js';
import { recommendUseCase } from '../../src/usecases/recommend.js';
import { numbersIn, significantDigits } from '../helpers/machine.js';

// Machine output (src/output/machine.ts): rounded to the digits the computation supports, estimates
// to their interval, never NaN/Infinity/null for a figure (a bug, exit 1). Expected roundings are
// worked out by hand below; the demos are checked for solver noise (1.000000001 and the like).

describe('renderJson', () => {
  it('rounds every non-integer figure to `precision` significant digits; integers stay', () => {
    const doc = JSON.parse(renderJson({ precision: 4, x: 1.23456789, y: -0.000123456, n: 12345678, big: 98765.4321, ok: true, s: 'text', none: null }));
    expect(doc).toEqual({ precision: 4, x: 1.235, y: -0.0001235, n: 12345678, big: 98770, ok: true, s: 'text' });
    // a key whose value is null (no figure: an unstable design has no backlog) is left out
    expect('none' in doc).toBe(false);
    // without `precision`, nine digits: 1.000000001 → 1 (solver noise), 0.20199999804 → 0.201999998;
    // figures read off a linear program are rounded to six digits first (0.20199999804 → 0.202)
    expect(JSON.parse(renderJson({ a: 1.000000001, b: 0.20199999804, c: [2 / 3] }))).toEqual({ a: 1, b: 0.201999998, c: [0.666666667] });
    expect(MACHINE_DIGITS).toBe(9);
    expect(roundFigure(0.20199999804, LP_DIGITS)).toBe(0.202);
  });

  it('rounds an estimate {mean, ci95} to its interval: two significant digits of the half-width', () => {
    // by hand: ci95 [15.1456, 16.4790] has half-width 0.6667 → two digits 0.67 → hundredths
    expect(JSON.parse(renderJson({ e: { mean: 15.8123, ci95: [15.1456, 16.479] } }))).toEqual({ e: { mean: 15.81, ci95: [15.15, 16.48] } });
    // half-width 36.5 → 37 → units: 1234.567 ± 36.5 → 1235 in [1198, 1271]
    expect(JSON.parse(renderJson({ e: { mean: 1234.567, ci95: [1198.067, 1271.067] } }))).toEqual({ e: { mean: 1235, ci95: [1198, 1271] } });
    // a figure beside its interval "xCi95" too: half-width 0.4679 → hundredths
    expect(JSON.parse(renderJson({ backlog: 4.56789, backlogCi95: [4.1, 5.03578] }))).toEqual({ backlog: 4.57, backlogCi95: [4.1, 5.04] });
  });

  it('drops undefined fields, writes typed arrays as arrays', () => {
    expect(JSON.parse(renderJson({ a: undefined, b: Float64Array.from([0.5, 1 / 3]) }))).toEqual({ b: [0.5, 0.333333333] });
  });

  it('refuses NaN and infinities anywhere (InternalError), naming where', () => {
    expect(() => renderJson({ a: { b: [1, NaN] } })).toThrow(InternalError);
    expect(() => renderJson({ a: { b: [1, NaN] } })).toThrow(/a\.b\[1\]/);
    expect(() => renderJson({ x: Infinity })).toThrow(InternalError);
    expect(() => renderJson({ e: { mean: -Infinity, ci95: [0, 1] } })).toThrow(InternalError);
    expect(() => renderJson({ e: { mean: 1, ci95: [0, Infinity] } })).toThrow(/an estimate at e/);
    expect(() => renderJson({ b: 1, bCi95: [0, NaN] })).toThrow(InternalError);
  });
});

describe('renderCsv', () => {
  it('rounds numbers, quotes by RFC 4180, refuses NaN', () => {
    expect(renderCsv(['a', 'b', 'c'], [[1.000000001, 'x,y', 'say "hi"'], [null, true, 2 / 3]])).toBe('a,b,c\n1,"x,y","say ""hi"""\n,true,0.666666667\n');
    expect(renderCsv(['a'], [[2 / 3]], 3)).toBe('a\n0.667\n');
    expect(() => renderCsv(['a'], [[NaN]])).toThrow(InternalError);
  });
});

describe('a NaN in a record is a bug: exit 1 with "internal error", never a null figure', () => {
  for (const mode of ['json', 'csv'] as const) {
    it(`--${mode}`, async () => {
      const io = memoryIO();
      const spec: CommandSpec<object, { warnings: string[]; backlog: number }> = {
        load: () => ({}),
        run: async () => ({ warnings: [] as string[], backlog: NaN }),
        text: () => [para('unused')],
        csv: (r) => renderCsv(['backlog'], [[r.backlog]]),
      };
      const code = await runWithExitCode(io, () => execute(spec, { [mode]: true }, io));
      expect(code).toBe(1);
      expect(io.stderr()).toMatch(/internal error \(please report\)/);
      expect(io.stdout()).toBe('');
    });
  }
});

describe('no solver noise in recommend --json / --csv on the demos', () => {
  const dir = join(import.meta.dirname, '..', '..', 'scenarios');
  const demos = readdirSync(dir).filter((f) => f.endsWith('.json') && f !== 'regional-shift-swap.json').sort();

  it.each(demos)('%s: every number has at most the record’s significant digits; LP figures at most six', async (file) => {
    const s = parseScenario(readFileSync(join(dir, file), 'utf8'), file);
    // what `recommend --json` and `--csv` print: renderJson and recommendCsv of the use case's record
    const record = await recommendUseCase(scenarioContext(s, { source: file }), { objective: 'total', jobs: 1, seed: 1, workerUrl: null });
    const digits = record.precision ?? MACHINE_DIGITS;
    const json = JSON.parse(renderJson(record));
    const numbers = numbersIn(json);
    expect(numbers.length).toBeGreaterThan(20);
    for (const { path, value } of numbers) {
      expect(Number.isFinite(value), path).toBe(true);
      if (!Number.isSafeInteger(value)) expect(significantDigits(value), `${path} = ${value}`).toBeLessThanOrEqual(digits);
      if (/flowMargin$/.test(path)) expect(significantDigits(value), `${path} = ${value}`).toBeLessThanOrEqual(LP_DIGITS);
    }
    const csv = recommendCsv(record).trim().split('\n').slice(1);
    for (const line of csv) {
      for (const cell of line.split(',')) {
        if (/^-?\d/.test(cell) && Number.isFinite(Number(cell))) expect(significantDigits(Number(cell)), `${line}`).toBeLessThanOrEqual(digits);
        expect(cell).not.toMatch(/^(NaN|Infinity|-Infinity|null|undefined)$/);
      }
    }
  });
});
