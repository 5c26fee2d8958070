import { describe, expect, it } from 'vitest';
import { InvalidTableError, type TableProblem } from '../../src/errors.js';
import { importScenario } from '../../src/intake/import-scenario.js';
import { readCsvTable } from '../../src/intake/csv-table.js';
import { parseScenario } from '../../src/model/validate.js';

// An invented coworking desk-swap network: members offering or wanting a desk for a day, by site.
const classes = `# a comment line
ID,Rate,Label,Group,Wait target,maxcompatibilities,Max_Abandonment,patience,weight,note
harbour,4,Harbour site,east,0.5,2,0.1,2,1.5,"quiet floor, ""no calls"""
mill,3,,west,,,,,,
depot,2.5,Depot,west,,,,,,
`;
const compat = `a,b,removable,saving,value,note,data.walkMinutes
harbour,harbour,no,,,,
harbour,mill,YES,4,1.5,shuttle,12
mill,depot,1,2.5,,,
depot,depot,false,,,,3
`;
const candidates = `a,b,cost,value,note
harbour,depot,6,,bike lane
mill,mill,2,0.5,
`;

/** The hand-written JSON of the same design. */
const handWritten = {
  name: 'desk swap',
  timeUnit: 'day',
  budget: 5,
  classes: [
    { id: 'harbour', rate: 4, label: 'Harbour site', group: 'east', waitTarget: 0.5, maxCompatibilities: 2, maxAbandonment: 0.1, patience: 2, weight: 1.5, note: 'quiet floor, "no calls"' },
    { id: 'mill', rate: 3, group: 'west' },
    { id: 'depot', rate: 2.5, label: 'Depot', group: 'west' },
  ],
  compatibilities: [
    ['harbour', 'harbour'],
    { pair: ['harbour', 'mill'], removable: true, saving: 4, value: 1.5, note: 'shuttle', data: { walkMinutes: 12 } },
    { pair: ['mill', 'depot'], removable: true, saving: 2.5 },
    { pair: ['depot', 'depot'], data: { walkMinutes: 3 } },
  ],
  candidates: [
    { pair: ['harbour', 'depot'], cost: 6, note: 'bike lane' },
    { pair: ['mill', 'mill'], cost: 2, value: 0.5 },
  ],
};

function problemsOf(f: () => unknown): readonly TableProblem[] {
  try {
    f();
  } catch (e) {
    if (e instanceof InvalidTableError) return e.problems;
    throw e;
  }
  throw new Error('expected InvalidTableError');
}

describe('importScenario', () => {
  it('gives, after validation, the same scenario as the hand-written JSON (field order aside)', () => {
    const { document, scenario } = importScenario({
      classes: { text: classes, file: 'classes.csv' },
      compatibilities: { text: compat, file: 'compat.csv' },
      candidates: { text: candidates, file: 'cand.csv' },
      name: 'desk swap',
      timeUnit: 'day',
      budget: 5,
    });
    expect(scenario).toEqual(parseScenario(JSON.stringify(handWritten)));
    expect(parseScenario(JSON.stringify(document))).toEqual(scenario);
  });

  it('reads header names whatever their case, spaces or underscores, and keeps data.<key> columns as numbers or text', () => {
    const { scenario } = importScenario({
      classes: { text: 'Id,RATE,data.site code,data.floors\nx,1,A-7,3\n', file: 'c.csv' },
      compatibilities: { text: 'A,B\nx,x\n', file: 'p.csv' },
    });
    expect(scenario.classes[0]).toEqual({ id: 'x', rate: 1, data: { 'site code': 'A-7', floors: 3 } });
    expect(scenario.timeUnit).toBe('hour');
  });

  it('reads semicolon-separated files and points at decimal commas', () => {
    const { scenario } = importScenario({ classes: { text: 'id;rate\nx;1.5\n', file: 'c.csv' }, compatibilities: { text: 'a;b\nx;x\n', file: 'p.csv' } });
    expect(scenario.classes[0]!.rate).toBe(1.5);
    const p = problemsOf(() => importScenario({ classes: { text: 'id;rate\nx;1,5\n', file: 'c.csv' } }));
    expect(p).toEqual([{ file: 'c.csv', row: 2, column: 'rate', message: expect.stringContaining('write a decimal point: 1.5') }]);
  });

  it('reports every problem of every file at once, each with file, row (as an editor numbers lines) and column', () => {
    const badClasses = `# comment: line 1
id,rate,wait_target,maxAbandonment,patiense
a,0,,,
b,fast,-1,1.2,
a,2,,,
,3,,,
`;
    const badCompat = `a,b,removable,saving
a,zz,maybe,
b,b,,-3
b,b,,
`;
    const badCand = `a,b,cost
a,b,
`;
    const p = problemsOf(() =>
      importScenario({
        classes: { text: badClasses, file: 'classes.csv' },
        compatibilities: { text: badCompat, file: 'compat.csv' },
        candidates: { text: badCand, file: 'cand.csv' },
      }),
    );
    const at = (file: string, row?: number, column?: string) => p.filter((x) => x.file === file && x.row === row && x.column === column).map((x) => x.message);
    expect(at('classes.csv', 2, 'patiense')[0]).toMatch(/unknown column "patiense" \(did you mean "patience"\?\)/);
    expect(at('classes.csv', 3, 'rate')[0]).toMatch(/> 0/);
    expect(at('classes.csv', 4, 'rate')[0]).toMatch(/must be a number, found "fast"/);
    expect(at('classes.csv', 4, 'wait_target')[0]).toMatch(/> 0/);
    expect(at('classes.csv', 4, 'maxAbandonment')[0]).toMatch(/share/);
    expect(at('classes.csv', 5, 'id')[0]).toMatch(/duplicate class id "a"/); // from the scenario validator, mapped to its row
    expect(at('classes.csv', 6, 'id')[0]).toMatch(/required/);
    expect(at('compat.csv', 2, 'removable')[0]).toMatch(/true or false/);
    expect(at('compat.csv', 2)[0]).toMatch(/unknown class "zz"/);
    expect(at('compat.csv', 3, 'saving')[0]).toMatch(/>= 0/);
    expect(at('compat.csv', 4)[0]).toMatch(/duplicate pair/);
    expect(at('cand.csv', 2, 'cost')[0]).toMatch(/required/);
    expect(p).toHaveLength(12);
    // the error's message lists them per file
    try {
      importScenario({ classes: { text: badClasses, file: 'classes.csv' } });
    } catch (e) {
      expect((e as Error).message).toMatch(/^classes\.csv: \d+ problems\n {2}- row 2, column patiense: unknown column/);
    }
  });

  it('refuses a maxCompatibilities below the fixed compatibilities of a class (recommender fields), at its row', () => {
    const p = problemsOf(() =>
      importScenario({ classes: { text: 'id,rate,maxCompatibilities\nx,1,0\n', file: 'c.csv' }, compatibilities: { text: 'a,b\nx,x\n', file: 'p.csv' } }),
    );
    expect(p).toEqual([{ file: 'c.csv', row: 2, column: 'maxCompatibilities', message: expect.stringContaining('cannot be dropped') }]);
  });

  it('names missing columns, stray cells, a missing header and malformed quoting', () => {
    expect(problemsOf(() => importScenario({ classes: { text: 'id,label\nx,y\n', file: 'c.csv' } }))[0]!.message).toMatch(/missing column "rate"/);
    expect(problemsOf(() => importScenario({ classes: { text: 'id,rate\nx,1,2\n', file: 'c.csv' } }))).toEqual([{ file: 'c.csv', row: 2, message: expect.stringContaining('3 cells') }]);
    expect(problemsOf(() => importScenario({ classes: { text: '# only a comment\n', file: 'c.csv' } }))[0]!.message).toMatch(/no header/);
    expect(problemsOf(() => importScenario({ classes: { text: 'id,rate\n"x,1\n', file: 'c.csv' } }))[0]!.message).toMatch(/not readable as CSV/);
    expect(problemsOf(() => importScenario({ classes: { text: 'id,rate\n', file: 'c.csv' } }))[0]!.message).toMatch(/no class rows/);
  });
});

describe('readCsvTable', () => {
  it('gives the line where each row starts, counting comments, blank lines and quoted line breaks; drops a BOM and CRLF', () => {
    const problems: TableProblem[] = [];
    const t = readCsvTable('\uFEFF# c\r\nid,note\r\nx,"two\r\nlines"\r\n\r\ny, room #3 \r\n,\r\n', 'f.csv', problems)!;
    expect(problems).toEqual([]);
    expect(t.header).toEqual(['id', 'note']);
    expect(t.headerRow).toBe(2);
    expect(t.rows).toEqual([
      { row: 3, cells: ['x', 'two\nlines'] },
      { row: 6, cells: ['y', 'room #3'] },
    ]);
  });

  it('reads a table without quotes (the fast path) exactly as the same table with a quoted cell', () => {
    const plain = '\uFEFF# c\r\n  # indented comment\r\nid;note\r\nx;a\r\n\r\n \r\ny; room #3 \r\n;\r\nz;b';
    const quoted = plain.replace('x;a', 'x;"a"');
    const a = readCsvTable(plain, 'f.csv', [])!;
    const b = readCsvTable(quoted, 'f.csv', [])!;
    expect(a).toEqual(b);
    expect(a.delimiter).toBe(';');
    expect(a.headerRow).toBe(3);
    expect(a.rows).toEqual([
      { row: 4, cells: ['x', 'a'] },
      { row: 7, cells: ['y', 'room #3'] },
      { row: 9, cells: ['z', 'b'] },
    ]);
  });
});
