import { describe, expect, it } from 'vitest';
import { readDesignFields } from '../../src/model/design-fields.js';
import { validateScenario } from '../../src/model/validate.js';
import {
  admissibleBeforeEvaluation,
  degrees,
  designChanges,
  designCost,
  designKey,
  designOfKey,
  designPairs,
  designProblem,
  roundCost,
} from '../../src/design/space/problem.js';

// Costs and constraints of designs on a hand-written scenario; every expected value is derived by
// hand in the comments from the rule "cost = Σ costs of added candidates − Σ savings of dropped
// compatibilities" (forced removals of forbidden pairs always count).

const scenario = validateScenario({
  classes: [
    { id: 'a', rate: 1, maxCompatibilities: 2 },
    { id: 'b', rate: 2 },
    { id: 'c', rate: 1.5, maxCompatibilities: 2 },
  ],
  compatibilities: [
    ['a', 'b'],
    { pair: ['b', 'c'], removable: true, saving: 3 },
    { pair: ['c', 'a'], removable: true, saving: 1 },
    { pair: ['b', 'b'], removable: true, saving: 0.1 },
  ],
  candidates: [
    { pair: ['c', 'c'], cost: 4 },
    { pair: ['a', 'a'], cost: 0.2 },
  ],
  forbidden: [['a', 'c']],
  mustKeep: [['b', 'b']],
  budget: 1,
});

describe('designProblem', () => {
  const p = designProblem(scenario, readDesignFields(scenario));

  it('splits compatibilities into fixed pairs, toggles and forced removals', () => {
    // a–b not removable and b–b in mustKeep: fixed; b–c removable: toggle; c–a forbidden: forced out
    expect(p.fixed).toEqual([
      [0, 1],
      [1, 1],
    ]);
    expect(p.toggles.map((t) => [t.a, t.b, t.kind, t.price])).toEqual([
      [1, 2, 'removable', 3],
      [2, 2, 'candidate', 4],
      [0, 0, 'candidate', 0.2],
    ]);
    expect(p.forcedOut).toEqual([{ a: 0, b: 2, saving: 1, source: 2 }]);
    expect(p.costOffset).toBe(-1);
    expect(Array.from(p.today)).toEqual([1, 0, 0]);
    expect(p.budget).toBe(1);
    expect(Array.from(p.fixedDegree)).toEqual([1, 2, 0]); // a: a–b; b: a–b, b–b (a loop counts once)
  });

  it('costs designs by hand', () => {
    // today [1,0,0]: only the forced removal: −1
    expect(designCost(p, [1, 0, 0])).toBe(-1);
    // drop b–c, add c–c: −1 − 3 + 4 = 0
    expect(designCost(p, [0, 1, 0])).toBe(0);
    // drop b–c only: −1 − 3 = −4
    expect(designCost(p, [0, 0, 0])).toBe(-4);
    // keep b–c, add both candidates: −1 + 4 + 0.2 = 3.2 (exactly, after rounding to 1e-9)
    expect(designCost(p, [1, 1, 1])).toBe(3.2);
    expect(roundCost(0.1 + 0.2)).toBe(0.3);
    expect(Object.is(roundCost(-1e-12), 0)).toBe(true);
  });

  it('lists pairs, changes, degrees and limits', () => {
    const d = Uint8Array.from([1, 1, 0]);
    expect(designPairs(p, d)).toEqual([
      [0, 1],
      [1, 1],
      [1, 2],
      [2, 2],
    ]);
    expect(designChanges(p, d)).toEqual({ added: [1], removed: [] });
    expect(designChanges(p, [0, 0, 1])).toEqual({ added: [2], removed: [0] });
    // c: b–c and c–c = 2 (limit 2); a: a–b = 1
    expect(Array.from(degrees(p, d))).toEqual([1, 3, 2]);
    // [1,1,0] costs 3 > budget 1
    expect(admissibleBeforeEvaluation(p, d)).toBe(false);
    // [0,1,0] costs 0 <= 1 and c has c–c only
    expect(admissibleBeforeEvaluation(p, [0, 1, 0])).toBe(true);
    // [1,1,1] would give a two compatibilities (a–b, a–a) = limit, c two (b–c, c–c) = limit, but costs 3.2
    expect(admissibleBeforeEvaluation(p, [1, 1, 1])).toBe(false);
    expect(designKey(d)).toBe('110');
    expect(Array.from(designOfKey('011'))).toEqual([0, 1, 1]);
  });

  it('takes the budget from the option first, then the scenario, else no limit', () => {
    expect(designProblem(scenario, readDesignFields(scenario), 7).budget).toBe(7);
    const { budget: _drop, ...rest } = scenario;
    expect(designProblem(rest, readDesignFields(rest)).budget).toBe(Infinity);
  });
});
