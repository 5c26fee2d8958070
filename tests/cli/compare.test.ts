import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { compareCommand, parseBudgets } from '../../src/cli/commands/compare.js';
import { COMPARE_CSV_HEADER } from '../../src/output/csv.js';
import { MACHINE_DIGITS } from '../../src/output/format.js';
import { expectRounded } from '../helpers/machine.js';

/** JSON and CSV figures are the reference rounded to nine significant digits. */
const near = (actual: number, expected: number, what = ''): void => expectRounded(actual, expected, MACHINE_DIGITS, what);
import { runCommand } from '../helpers/cli.js';

// References (derived by hand; steps below):
//
// "Pit crews": K4 minus the edge {a, b} (classes a, b of degree 2; c, d of degree 3), no self-loop.
// Independent sets: {a}, {b}, {c}, {d}, {a, b}; N(a) = N(b) = N({a, b}) = {c, d},
// N(c) = {a, b, d}, N(d) = {a, b, c}. By the product form ("A product form for the general
// stochastic matching model", J. Appl. Probab. 2021), grouping words by the order σ in which their
// letters first appear, Σ_{w~σ} π(w)/π(∅) = T(σ) = ∏_i λ_{a_i} / (D_i − λ(A_i)) with
// D_i = λ(N(A_i)), and the mean count of k is (1/Z) Σ_σ T(σ) ([k ∈ σ] + Σ_{i ≥ pos(k)} λ_k/(D_i − λ(A_i))).
//
// Rates a = b = 0.1, c = d = 0.4:
//   T(a) = T(b) = 0.1/0.7 = 1/7, T(c) = T(d) = 0.4/0.2 = 2, T(a,b) = T(b,a) = (1/7)(0.1/0.6) = 1/42,
//   Z = 1 + 2/7 + 4 + 1/21 = 16/3;
//   counts: {a}: (1/7)(1 + 1/7) = 8/49 (×2), {c}: 2·3 = 6 (×2), (a,b): (1/42)(2 + 1/7 + 1/3) = 26/441 (×2);
//   Σ = 16/49 + 12 + 52/441 = 112/9, so L = (112/9)/(16/3) = 7/3.
//   With a ↔ b added (K4): each class is a geometric queue with ρ_k = λ_k/(1 − λ_k) (ρ = 1/9, 2/3),
//   Z = 1 + Σ ρ/(1 − ρ) = 1 + 1/4 + 4 = 21/4, L = (1/Z) Σ ρ/(1 − ρ)² = (4/21)(9/32 + 12) = 131/56 > 7/3:
//   the addition is harmful, so the best design within any budget is today's.
// Rates a = b = 0.2, c = 0.4, d = 0.2:
//   T(a) = T(b) = 0.2/0.4 = 1/2, T(c) = 0.4/0.2 = 2, T(d) = 0.2/0.6 = 1/3, T(a,b) = T(b,a) = (1/2)(0.2/0.2) = 1/2,
//   Z = 16/3; counts 3/4 (×2), 6, 4/9, and (a,b): (1/2)(1 + 1/2 + 1 + 1 + 1) = 9/4 (×2); Σ = 112/9, L = 7/3.
//   With a ↔ b added: ρ = 1/4 (×3), 2/3; Z = 1 + 1 + 2 = 4; L = (1/4)(3·4/9 + 6) = 11/6 < 7/3: helpful.

const dir = mkdtempSync(join(tmpdir(), 'edgewise-compare-'));
const pitCrews = (name: string, rates: [number, number, number, number]) => ({
  name,
  timeUnit: 'minute',
  costUnit: 'credits',
  classes: ['a', 'b', 'c', 'd'].map((id, k) => ({ id, rate: rates[k] })),
  compatibilities: [['a', 'c'], ['a', 'd'], ['b', 'c'], ['b', 'd'], ['c', 'd']],
  candidates: [{ pair: ['a', 'b'], cost: 5 }],
  budget: 10,
});
function file(name: string, doc: unknown): string {
  writeFileSync(join(dir, name), JSON.stringify(doc));
  return name;
}
async function run(opts: Parameters<typeof compareCommand>[0]) {
  return runCommand(compareCommand, opts, dir);
}

const harmful = file('harmful.json', pitCrews('pit crews, "quiet" night', [0.1, 0.1, 0.4, 0.4]));
const helpful = file('helpful.json', pitCrews('pit crews, busy day', [0.2, 0.2, 0.4, 0.2]));
const unstable = file('unstable.json', {
  name: 'lonely lobby',
  timeUnit: 'minute',
  classes: [{ id: 'x', rate: 1 }, { id: 'y', rate: 2 }],
  compatibilities: [['x', 'y']],
  candidates: [{ pair: ['y', 'y'], cost: 3 }],
  budget: 1,
});
const withDemand = file('demand.json', {
  ...pitCrews('pit crews with futures', [0.2, 0.2, 0.4, 0.2]),
  // derived by hand as above: under "rush" (a = b = 0.1, c = d = 0.4) today's design has 7/3 and the
  // K4 design 131/56, so the K4 design's worst case is max(11/6, 131/56) = 131/56 (rush), while
  // today's design has 7/3 under both: the robust choice is today's design.
  demand: { rush: { a: 0.1, b: 0.1, c: 0.4, d: 0.4 } },
});

describe('compare --json', () => {
  let j: any;
  beforeAll(async () => {
    const r = await run({ files: [harmful, helpful, unstable, withDemand], json: true });
    expect(r.code).toBe(0);
    j = JSON.parse(r.out);
  });

  it('one column per scenario, in argument order', () => {
    expect(j.columns.map((c: any) => c.source)).toEqual([harmful, helpful, unstable, withDemand]);
    expect(j.columns[0].scenario).toBe('pit crews, "quiet" night');
  });

  it("today's backlog and stability match the hand-derived 7/3", () => {
    for (const c of [j.columns[0], j.columns[1]]) {
      expect(c.stable).toBe(true);
      near(c.backlog, 7 / 3, 'backlog today');
      expect(c.bottleneck).not.toBeNull();
    }
  });

  it('best design within budget: keep today when the candidate is harmful (131/56 > 7/3), add it when it helps (11/6)', () => {
    const [h, g] = j.columns;
    expect(h.recommended.added).toEqual([]);
    expect(h.recommended.cost).toBe(0);
    near(h.recommended.backlog, 7 / 3);
    expect(g.recommended.added).toEqual([['a', 'b']]);
    expect(g.recommended.cost).toBe(5);
    near(g.recommended.backlog, 11 / 6);
  });

  it('an unstable scenario gets its certificate and the cheapest fix out of reach of the budget', () => {
    const u = j.columns[2];
    expect(u.stable).toBe(false);
    expect(u.backlog).toBeUndefined();
    // the bipartite pair x–y cannot be stable (J. Appl. Probab. 2016); y–y costs 3 > budget 1
    expect(u.instability.message).toMatch(/bipartite/);
    expect(u.instability.repairs).toEqual([{ added: [['y', 'y']], cost: 3 }]);
    expect(u.recommended).toBeUndefined();
    expect(u.note).toMatch(/budget/);
  });

  it('demand variants: worst case of the best design is 131/56 under "rush"; the robust choice is today\'s design (7/3)', () => {
    const d = j.columns[3];
    expect(d.variants).toEqual(['rush']);
    expect(d.underVariants).toEqual([{ variant: 'rush', stable: true, backlog: expect.any(Number), maxWait: expect.any(Number), maxWaitClass: expect.any(String), method: 'exact' }]);
    near(d.underVariants[0].backlog, 7 / 3);
    expect(d.recommended.added).toEqual([['a', 'b']]);
    near(d.recommended.worstBacklog, 131 / 56);
    expect(d.recommended.worstUnder).toBe('rush');
    expect(d.robust.added).toEqual([]);
    near(d.robust.worstBacklog, 7 / 3);
  });
});

describe('compare --budgets', () => {
  it('one column per budget of one scenario: budget 0 keeps 7/3, budget 10 reaches 11/6', async () => {
    const r = await run({ files: [helpful], budgets: '0,10', json: true });
    expect(r.code).toBe(0);
    const cols = JSON.parse(r.out).columns;
    expect(cols.map((c: any) => c.budget)).toEqual([0, 10]);
    near(cols[0].recommended.backlog, 7 / 3);
    near(cols[1].recommended.backlog, 11 / 6);
  });

  it('gives the same answer whatever the concurrency', async () => {
    const one = await run({ files: [helpful, harmful], budgets: '0,10', json: true, jobs: 1 });
    const three = await run({ files: [helpful, harmful], budgets: '0,10', json: true, jobs: 3 });
    expect(three.out).toBe(one.out);
  });

  it('parses budgets and refuses bad ones (exit 2)', async () => {
    expect(parseBudgets('50, 100,200')).toEqual([50, 100, 200]);
    for (const bad of ['50,,100', '-1', 'ten']) {
      const r = await run({ files: [helpful], budgets: bad });
      expect(r.code).toBe(2);
      expect(r.err).toMatch(/--budgets/);
    }
  });
});

describe('compare output formats', () => {
  it('the table has one column per scenario and names the rows', async () => {
    const r = await run({ files: [harmful, helpful] });
    expect(r.code).toBe(0);
    const lines = r.out.split('\n');
    expect(lines.some((l) => l.includes('harmful.json') && l.includes('helpful.json'))).toBe(true);
    for (const row of ["today's design", 'bottleneck (spare capacity)', 'total backlog', 'worst class wait', 'recommended design', 'its cost']) {
      expect(r.out).toContain(row);
    }
    expect(r.out).toContain('2.333'); // 7/3
    expect(r.out).toContain('1.833'); // 11/6
    expect(r.out).toContain('add a ↔ b');
  });

  it('--csv: a header and one RFC 4180 line per column (quotes doubled, fields with commas quoted)', async () => {
    const r = await run({ files: [harmful, helpful], csv: true });
    expect(r.code).toBe(0);
    const rows = parseCsv(r.out);
    expect(rows[0]).toEqual([...COMPARE_CSV_HEADER]);
    expect(rows.length).toBe(3);
    expect(rows[1]![1]).toBe('pit crews, "quiet" night');
    const at = (name: string): number => rows[0]!.indexOf(name);
    near(Number(rows[1]![at('backlog')]), 7 / 3);
    expect(rows[2]![at('recommendedAdded')]).toBe('a~b');
    near(Number(rows[2]![at('recommendedBacklog')]), 11 / 6);
  });

  it('refuses --json with --csv and no files (exit 2)', async () => {
    expect((await run({ files: [harmful], json: true, csv: true })).code).toBe(2);
    expect((await run({ files: [] })).code).toBe(2);
    expect((await run({ files: ['missing.json'] })).code).toBe(2);
  });
});

/** A small RFC 4180 reader written here (quoted fields, doubled quotes, CRLF or LF). */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i]!;
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') {
        field += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else field += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') {
      row.push(field);
      field = '';
    } else if (ch === '\n' || ch === '\r') {
      if (ch === '\r' && text[i + 1] === '\n') i++;
      row.push(field);
      rows.push(row);
      row = [];
      field = '';
    } else field += ch;
  }
  if (field !== '' || row.length > 0) rows.push([...row, field]);
  return rows;
}
