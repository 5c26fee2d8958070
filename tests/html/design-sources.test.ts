import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { compileGraph, compileModel } from '../../src/model/compile.js';
import { parseScenario } from '../../src/model/validate.js';
import { pairKey } from '../../src/model/scenario.js';
import { sensitivityRows, sweepView } from '../../src/report/design-sources.js';
import type { SensitivityRow } from '../../src/report/report-data.js';
import { permutationOracle } from '../helpers/permutation-oracle.js';

// The report's views of the design layer's single-change table and load sweep.
// References: the permutation-sum closed form of the product form ("A product form for the general
// stochastic matching model", J. Appl. Probab. 2021; tests/helpers/permutation-oracle.ts); the
// K4-minus-one-edge values 7/3 and 11/6 derived by hand in tests/cli/compare.test.ts; and the
// near-saturation result ("Flexibility can hurt dynamic matching system performance", SIGMETRICS
// Perform. Eval. Rev. 2022, from memory): an edge joining two neighbours of the saturating set hurts
// near saturation.

const root = join(import.meta.dirname, '..', '..');

describe('sensitivityRows', () => {
  it('lists every candidate and only the removable compatibilities, each equal to a fresh closed-form evaluation', () => {
    const s = parseScenario(readFileSync(join(root, 'scenarios', 'ride-pooling-hub.json'), 'utf8'));
    const model = compileModel(s);
    const { rows, notes } = sensitivityRows(s, model);
    expect(notes).toEqual([]);
    const adds = rows.filter((r) => r.kind === 'add');
    const removes = rows.filter((r) => r.kind === 'remove');
    expect(adds.map((r) => pairKey(r.pair[0], r.pair[1])).sort()).toEqual(s.candidates.map((c) => pairKey(c.pair[0], c.pair[1])).sort());
    expect(removes.map((r) => pairKey(r.pair[0], r.pair[1])).sort()).toEqual(s.compatibilities.filter((c) => c.removable).map((c) => pairKey(c.pair[0], c.pair[1])).sort());
    const base = permutationOracle(model).backlogTotal;
    const ids = s.classes.map((c) => c.id);
    const at = new Map(ids.map((id, k) => [id, k]));
    for (const r of rows) {
      const pairs = s.compatibilities.map((c) => c.pair).filter((p) => r.kind === 'add' || pairKey(p[0], p[1]) !== pairKey(r.pair[0], r.pair[1]));
      if (r.kind === 'add') pairs.push(r.pair as [string, string]);
      const ref = permutationOracle(compileGraph(ids, s.classes.map((c) => c.rate), pairs.map((p) => [at.get(p[0])!, at.get(p[1])!] as [number, number]))).backlogTotal;
      expect(r.stable).toBe(true);
      expect(r.backlog).toBeCloseTo(ref, 8);
      expect(r.delta).toBeCloseTo(ref - base, 8);
      expect(r.flagged).toBe(r.kind === 'add' ? ref > base : ref <= base);
      expect(r.why).toMatch(/^exact: /);
    }
    expect(rows.find((r) => r.kind === 'remove')!.money).toBeGreaterThan(0);
  });

  it('says why there is no table for an unstable design', () => {
    const s = parseScenario(readFileSync(join(root, 'scenarios', 'unstable-example.json'), 'utf8'));
    const r = sensitivityRows(s, compileModel(s));
    expect(r.rows).toEqual([]);
    expect(r.notes[0]).toMatch(/unstable/);
  });
});

describe('sweepView', () => {
  // K4 minus a–b, rates a = b = 0.2, c = 0.4, d = 0.2: today 7/3, with a–b 11/6 (helps today).
  // Growing c: N(c) = {a, b, d} with λ = 0.6, so c saturates at s* = 0.6 / 0.4 = 1.5 (derived by
  // hand; K4 has the same limit, λ_c < Λ − λ_c). a–b joins two neighbours of {c}, so near s* it
  // hurts (published condition): the curves must cross, with a–b starting to hurt.
  const model = compileGraph(['a', 'b', 'c', 'd'], [0.2, 0.2, 0.4, 0.2], [[0, 2], [0, 3], [1, 2], [1, 3], [2, 3]]);
  const rows: SensitivityRow[] = [{ kind: 'add', pair: ['a', 'b'], money: 5, stable: true, backlog: 11 / 6, delta: 11 / 6 - 7 / 3, flagged: false, predicted: true }];
  const v = sweepView(model, ['c'], null, rows, { steps: 12, timeUnit: 'minute', name: (id) => id.toUpperCase() });

  it('starts from today: 7/3 for the design, 11/6 with a–b', () => {
    expect(v.curves.map((c) => c.name)).toEqual(["today's design", 'with A – B']);
    expect(v.curves[0]!.points[0]).toEqual({ load: 1, backlog: expect.closeTo(7 / 3, 10) });
    expect(v.curves[1]!.points[0]).toEqual({ load: 1, backlog: expect.closeTo(11 / 6, 10) });
    expect(v.limit).toBeCloseTo(1.5, 7);
  });

  it('shows the crossover where a–b starts to hurt, between today and the limit', () => {
    expect(v.crossovers.length).toBe(1);
    expect(v.crossovers[0]!.label).toBe('Adding A – B starts to hurt');
    expect(v.crossovers[0]!.load).toBeGreaterThan(1);
    expect(v.crossovers[0]!.load).toBeLessThan(1.5);
    const last = (k: number) => v.curves[k]!.points[v.curves[k]!.points.length - 1]!;
    expect(last(1).backlog).toBeGreaterThan(last(0).backlog);
  });
});
