import { describe, expect, it } from 'vitest';
import { designProblem } from '../../../src/design/space/problem.js';
import { forbiddenCandidates, repairs, type RepairResult } from '../../../src/design/repair/index.js';
import { readDesignFields } from '../../../src/model/design-fields.js';
import { validateScenario } from '../../../src/model/validate.js';

// Hand-built designs; every expected value is derived by hand in the comments from the stability
// condition of "Stability of the stochastic matching model", J. Appl. Probab. 2016 (with self-loops:
// stable iff λ(I) < λ(N(I)) for every non-empty independent set I without self-looped class).

async function run(doc: unknown, count = 5): Promise<{ result: RepairResult; pair: (j: number) => string; ids: readonly string[] }> {
  const scenario = validateScenario(doc);
  const fields = readDesignFields(scenario);
  const p = designProblem(scenario, fields);
  const result = await repairs(p, { count, forbiddenCandidates: forbiddenCandidates(scenario, fields) });
  return { result, pair: (j) => `${p.ids[p.toggles[j]!.a]}-${p.ids[p.toggles[j]!.b]}`, ids: p.ids };
}

describe('repairs of hand-built designs', () => {
  it('a bipartite path fixed only by a self-pair, although cheaper candidates exist', async () => {
    // Path a–b–c, rates 1, 3, 1: bipartite, {b} has λ = 3 ≥ λ(N(b)) = λ(a) + λ(c) = 2. The removable
    // b–c is kept (a repair only adds). Candidates a–c (1), a–a (1), b–b (2):
    //   {a–c}, {a–a}, {a–c, a–a}: b stays without a self-pair and N(b) = {a, c}: 3 ≥ 2, unstable;
    //   {b–b}: the loop-free independent sets are {a}, {c}, {a, c}, all with N = {b}: 1, 1, 2 < 3, stable.
    // Every other stable set contains b–b, so {b–b} (cost 2) is the only minimal repair.
    const { result, pair } = await run({
      classes: [
        { id: 'a', rate: 1 },
        { id: 'b', rate: 3 },
        { id: 'c', rate: 1 },
      ],
      compatibilities: [['a', 'b'], { pair: ['b', 'c'], removable: true, saving: 5 }],
      candidates: [
        { pair: ['a', 'c'], cost: 1 },
        { pair: ['a', 'a'], cost: 1 },
        { pair: ['b', 'b'], cost: 2 },
      ],
    });
    expect(result.status).toBe('repairs');
    if (result.status !== 'repairs') return;
    expect(result.repairs.map((r) => ({ pairs: r.added.map(pair), cost: r.cost }))).toEqual([{ pairs: ['b-b'], cost: 2 }]);
    expect(result.complete).toBe(true);
  });

  it('a balanced four-cycle: both sides need relief; ties by fewer pairs, then earlier pairs', async () => {
    // Square a–x–b–y–a, every rate 1: both sides {a, b} and {x, y} have λ = 2 = λ of their
    // neighbourhood. A side is relieved only by a pair inside it (I independent, so a pair from I to
    // outside N(I) must stay inside I here). Candidates in order: a–a (1), x–x (1), a–b (3), x–y (3).
    // One of {a–a, a–b} and one of {x–x, x–y} is needed; each of the four pairs is stable (checked
    // by listing the loop-free independent sets: with a–a and x–x they are {b}, {y} with N of rate 2;
    // with a–a and x–y, {x}, {b}, {y} with N of rate 3, 2, 3; the other two alike) and minimal.
    // Costs 2, 4, 4, 6; the two of cost 4 have the same size and the same sum of positions
    // (0 + 3 = 1 + 2), so the lexicographic rule puts {a–a, x–y} first.
    const { result, pair } = await run({
      classes: ['a', 'x', 'b', 'y'].map((id) => ({ id, rate: 1 })),
      compatibilities: [
        ['a', 'x'],
        ['x', 'b'],
        ['b', 'y'],
        ['y', 'a'],
      ],
      candidates: [
        { pair: ['a', 'a'], cost: 1 },
        { pair: ['x', 'x'], cost: 1 },
        { pair: ['a', 'b'], cost: 3 },
        { pair: ['x', 'y'], cost: 3 },
      ],
    });
    expect(result.status).toBe('repairs');
    if (result.status !== 'repairs') return;
    expect(result.repairs.map((r) => [r.added.map(pair).join(' + '), r.cost])).toEqual([
      ['a-a + x-x', 2],
      ['a-a + x-y', 4],
      ['x-x + a-b', 4],
      ['a-b + x-y', 6],
    ]);
  });

  it('an overloaded set that only forbidden pairs would relieve', async () => {
    // h–x, h–y, rates 1, 1, 1, and z (rate 2) alone with its self-pair. {x, y} has λ = 2 ≥ λ(h) = 1.
    // Allowed: h–h only; with it the loop-free independent sets of {h, x, y} are {x}, {y}, {x, y}, all
    // with N = {h}: slacks 0, 0, −1, so the most overloaded set is I = {x, y}, N(I) = {h}, deficit 1.
    // Relief: a pair inside I (x–y, forbidden) or from I to a class outside I ∪ N(I) = {z} (x–z,
    // forbidden; y–z, a removable compatibility the rules drop). z (rate 2) is the one partner.
    const { result, ids } = await run({
      classes: [
        { id: 'h', rate: 1 },
        { id: 'x', rate: 1 },
        { id: 'y', rate: 1 },
        { id: 'z', rate: 2 },
      ],
      compatibilities: [['h', 'x'], ['h', 'y'], ['z', 'z'], { pair: ['y', 'z'], removable: true, saving: 1 }],
      candidates: [
        { pair: ['h', 'h'], cost: 1 },
        { pair: ['x', 'y'], cost: 1 },
        { pair: ['x', 'z'], cost: 2 },
      ],
      forbidden: [
        ['x', 'y'],
        ['z', 'x'],
        ['y', 'z'],
      ],
    });
    expect(result.status).toBe('overloaded');
    if (result.status !== 'overloaded') return;
    const o = result.overload;
    const name = (k: number): string => ids[k]!;
    expect(Array.from(o.set, name)).toEqual(['x', 'y']);
    expect(Array.from(o.neighbours, name)).toEqual(['h']);
    expect([o.demand, o.capacity, o.deficit]).toEqual([2, 1, 1]);
    expect(o.partners.map((x) => [name(x.class), x.rate])).toEqual([['z', 2]]);
    expect(o.blocked.map((b) => [`${name(b.a)}-${name(b.b)}`, b.rule, b.origin, b.source, b.relief])).toEqual([
      ['x-y', 'forbidden', 'candidate', 1, 'within'],
      ['x-z', 'forbidden', 'candidate', 2, 'outside'],
      ['y-z', 'forbidden', 'compatibility', 3, 'outside'],
    ]);
  });

  it('a self-pair that maxCompatibilities keeps out', async () => {
    // Path a–b–c, rates 1, 3, 1, b allowed 2 compatibilities (it has them). b–b is blocked; c–c is
    // allowed but leaves {b} with N(b) = {a, c}: 3 ≥ 2. Relief of I = {b}: only inside it (every
    // other class is in N(I)), i.e. b–b, blocked by b's limit.
    const { result, ids } = await run({
      classes: [
        { id: 'a', rate: 1 },
        { id: 'b', rate: 3, maxCompatibilities: 2 },
        { id: 'c', rate: 1 },
      ],
      compatibilities: [
        ['a', 'b'],
        ['b', 'c'],
      ],
      candidates: [
        { pair: ['b', 'b'], cost: 1 },
        { pair: ['c', 'c'], cost: 1 },
      ],
    });
    expect(result.status).toBe('overloaded');
    if (result.status !== 'overloaded') return;
    const o = result.overload;
    expect(Array.from(o.set, (k) => ids[k])).toEqual(['b']);
    expect([o.demand, o.capacity, o.deficit]).toEqual([3, 2, 1]);
    expect(o.partners).toEqual([]);
    expect(o.blocked.map((b) => [b.rule, b.source, b.full.map((k) => ids[k]), b.relief])).toEqual([['limit', 0, ['b'], 'within']]);
  });

  it('two candidates that repair together but exceed a limit together', async () => {
    // k (rate 5) with p, q (rate 1 each); r, s (rate 2) alone with self-pairs; k allowed 3
    // compatibilities (has 2). {k} has λ = 5 ≥ λ(p, q) = 2. With k–r alone N(k) has rate 4 < 5, with
    // k–s alike; with both, 6 > 5 and the other loop-free independent sets {p}, {q}, {p, q} have N = {k}:
    // stable, but k then has 4 compatibilities.
    const { result, pair, ids } = await run({
      classes: [
        { id: 'k', rate: 5, maxCompatibilities: 3 },
        { id: 'p', rate: 1 },
        { id: 'q', rate: 1 },
        { id: 'r', rate: 2 },
        { id: 's', rate: 2 },
      ],
      compatibilities: [
        ['k', 'p'],
        ['k', 'q'],
        ['r', 'r'],
        ['s', 's'],
      ],
      candidates: [
        { pair: ['k', 'r'], cost: 1 },
        { pair: ['k', 's'], cost: 1.5 },
      ],
    });
    expect(result.status).toBe('limits');
    if (result.status !== 'limits') return;
    expect(result.withoutLimits!.added.map(pair)).toEqual(['k-r', 'k-s']);
    expect(result.withoutLimits!.cost).toBe(2.5);
    expect(result.overLimit.map((x) => [ids[x.class], x.degree, x.max])).toEqual([['k', 4, 3]]);
  });

  it('a stable design needs no repair; no candidate at all leaves the overloaded set of today', async () => {
    // triangle, rates 1: every independent set is a single class with N of rate 2 > 1
    const stable = await run({ classes: ['a', 'b', 'c'].map((id) => ({ id, rate: 1 })), compatibilities: [['a', 'b'], ['b', 'c'], ['a', 'c']] });
    expect(stable.result.status).toBe('stable-today');
    const stableNoPairs = await run({ classes: [{ id: 'a', rate: 1 }], compatibilities: [['a', 'a']] });
    expect(stableNoPairs.result.status).toBe('stable-today');
    // a–b with rates 1 and 2, nothing to add: I = {b}, N(I) = {a}, deficit 1, no partner, nothing blocked
    const none = await run({ classes: [{ id: 'a', rate: 1 }, { id: 'b', rate: 2 }], compatibilities: [['a', 'b']] });
    expect(none.result.status).toBe('overloaded');
    if (none.result.status !== 'overloaded') return;
    expect(Array.from(none.result.overload.set, (k) => none.ids[k])).toEqual(['b']);
    expect(none.result.overload.deficit).toBe(1);
    expect(none.result.overload.partners).toEqual([]);
    expect(none.result.overload.blocked).toEqual([]);
  });

  it('a repair above the budget says so', async () => {
    // one class a (rate 1) alone: only its self-pair (cost 3) makes it stable; the budget is 2
    const { result } = await run({ classes: [{ id: 'a', rate: 1 }], compatibilities: [], candidates: [{ pair: ['a', 'a'], cost: 3 }], budget: 2 });
    expect(result.status).toBe('repairs');
    if (result.status !== 'repairs') return;
    expect(result.repairs.map((r) => [r.cost, r.withinBudget])).toEqual([[3, false]]);
  });
});
