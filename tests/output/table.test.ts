import { describe, expect, it } from 'vitest';
import { renderTable, type Column, type Table } from '../../src/output/text/table.js';
import { columns } from '../helpers/columns.js';
import { Rng } from '../helpers/random.js';

// The width-fitting table of src/output/text/table.ts. Layouts are written by hand from the
// documented rules (two spaces between columns, a rule under the header, secondary columns fold
// rightmost first into a table keyed by the key column); the property test checks, on seeded random
// tables and widths, that every line fits and that nothing is cut off: every cell token appears.

describe('renderTable, by hand', () => {
  it('the natural layout when it fits: left and right alignment, a rule under the header', () => {
    const t: Table = { columns: [{ header: 'class' }, { header: 'rate', align: 'right' }], rows: [['a', '1'], ['bb', '10']] };
    expect(renderTable(t, { width: 40 })).toEqual(['class  rate', '─────  ────', 'a         1', 'bb       10']);
  });

  it('draws a rule before the rows asked (a total row)', () => {
    const t: Table = { columns: [{ header: 'k' }, { header: 'v', align: 'right' }], rows: [['a', '1'], ['all', '2']], ruleBefore: [1] };
    expect(renderTable(t, { width: 40 })).toEqual(['k    v', '───  ─', 'a    1', '───  ─', 'all  2']);
  });

  // name 4 + first 10 + second 10 + third 10 + 3 separators = 40 columns: too wide for 30
  const four: Table = {
    columns: [{ header: 'name' }, { header: 'first', secondary: true }, { header: 'second' }, { header: 'third', secondary: true }],
    rows: [['row1', 'xxxxxxxxxx', 'yyyyyyyyyy', 'zzzzzzzzzz']],
  };

  it('folds the rightmost secondary column into a further table keyed by the key column', () => {
    expect(renderTable(four, { width: 30 })).toEqual([
      'name  first       second',
      '────  ──────────  ──────────',
      'row1  xxxxxxxxxx  yyyyyyyyyy',
      '',
      'name  third',
      '────  ──────────',
      'row1  zzzzzzzzzz',
      // the note wraps to the width too
      '(1 column folded below to fit',
      '30 columns; --wide shows one',
      'table)',
    ]);
  });

  it('--wide: one table with every column, whatever the width', () => {
    expect(renderTable(four, { width: 30, wide: true })).toEqual([
      'name  first       second      third',
      '────  ──────────  ──────────  ──────────',
      'row1  xxxxxxxxxx  yyyyyyyyyy  zzzzzzzzzz',
    ]);
  });

  it('wraps headers at spaces, then long cells of wrapping columns, before folding anything', () => {
    const t: Table = {
      columns: [{ header: 'pair' }, { header: 'what it does to waiting', wrap: true }, { header: 'Δ backlog', align: 'right' }],
      rows: [['a ↔ b', 'lowers the backlog of every class', '−0.5']],
    };
    // by hand: natural 5 + 33 + 9 + 2·2 = 51 > 40. 1. headers wrap at spaces: "Δ backlog" needs only
    // "backlog" (7): 5 + 33 + 7 + 4 = 49. 2. the wrapping column shrinks by the 9 still over: 24.
    expect(renderTable(t, { width: 40 })).toEqual([
      'pair   what it does to waiting         Δ',
      '                                 backlog',
      '─────  ────────────────────────  ───────',
      'a ↔ b  lowers the backlog of        −0.5',
      '       every class',
    ]);
  });

  it('a table too wide even for two columns still shows every folded column (nothing cut off)', () => {
    const long = Array.from({ length: 8 }, (_, k) => `word${k}`).join(' ');
    const t: Table = { columns: [{ header: 'key' }, { header: 'a' }, { header: 'b', secondary: true }], rows: [[long, long, 'tail-cell']] };
    const lines = renderTable(t, { width: 24 });
    for (const l of lines) expect(columns(l)).toBeLessThanOrEqual(24);
    expect(lines.join('\n')).toContain('tail-cell');
    expect(lines.join('\n')).toMatch(/1 column folded below/);
  });
});

describe('renderTable, property (seeded random tables)', () => {
  it('every line fits the width and every cell token appears whole', () => {
    const rng = new Rng(31337);
    for (let t = 0; t < 100; t++) {
      const ncol = rng.int(2, 10);
      const cols: Column[] = Array.from({ length: ncol }, (_, c) => ({
        header: Array.from({ length: rng.int(1, 3) }, (_, k) => `h${c}x${k}`).join(' '),
        ...(rng.chance(0.3) ? { align: 'right' as const } : {}),
        ...(c > 0 && rng.chance(0.4) ? { secondary: true } : {}),
        ...(rng.chance(0.4) ? { wrap: true } : {}),
      }));
      const rows = Array.from({ length: rng.int(1, 6) }, (_, r) => cols.map((_, c) => Array.from({ length: rng.int(0, 6) }, (_, k) => `r${r}c${c}w${k}`).join(' ')));
      const width = rng.int(24, 140);
      const lines = renderTable({ columns: cols, rows }, { width });
      for (const l of lines) expect(columns(l), `width ${width}: ${JSON.stringify(l)}`).toBeLessThanOrEqual(width);
      const text = lines.join('\n');
      for (const token of [...cols.map((c) => c.header), ...rows.flat()].flatMap((s) => s.split(' ')).filter((x) => x !== '')) {
        expect(new RegExp(`(^|\\s)${token}(\\s|$)`).test(text), `${token} at width ${width}`).toBe(true);
      }
    }
  });
});
