import { describe, expect, it } from 'vitest';
import { InvalidScenarioError } from '../../src/errors.js';
import { readDesignFields } from '../../src/model/design-fields.js';
import { validateScenario } from '../../src/model/validate.js';

// The recommender fields (docs/scenario-format.md, "Recommender fields"): each rule of the
// documentation is checked on a small hand-written scenario.

const base = (over: Record<string, unknown> = {}, classExtra: Array<Record<string, unknown>> = []): Record<string, unknown> => ({
  classes: [
    { id: 'a', rate: 1, ...(classExtra[0] ?? {}) },
    { id: 'b', rate: 2, ...(classExtra[1] ?? {}) },
    { id: 'c', rate: 1.5, ...(classExtra[2] ?? {}) },
  ],
  compatibilities: [['a', 'b'], { pair: ['b', 'c'], removable: true, saving: 3 }, { pair: ['a', 'c'], removable: true, saving: 1 }],
  candidates: [{ pair: ['c', 'c'], cost: 4 }],
  ...over,
});

function problems(doc: Record<string, unknown>): Array<{ path: string; message: string }> {
  try {
    readDesignFields(validateScenario(doc));
  } catch (e) {
    expect(e).toBeInstanceOf(InvalidScenarioError);
    return [...(e as InvalidScenarioError).problems];
  }
  return [];
}

describe('readDesignFields', () => {
  it('reads defaults: no limit, no target, weight 1, nothing kept or forbidden', () => {
    const f = readDesignFields(validateScenario(base()));
    expect(Array.from(f.maxCompatibilities)).toEqual([Infinity, Infinity, Infinity]);
    expect(Array.from(f.waitTarget)).toEqual([Infinity, Infinity, Infinity]);
    expect(Array.from(f.weight)).toEqual([1, 1, 1]);
    expect(f.mustKeep).toEqual([]);
    expect(f.forbidden).toEqual([]);
  });

  it('reads every field when valid', () => {
    const doc = base({ mustKeep: [['c', 'b']], forbidden: [['a', 'c'], ['c', 'c']] }, [{ maxCompatibilities: 2, weight: 0 }, { waitTarget: 0.5 }, { weight: 2.5 }]);
    const f = readDesignFields(validateScenario(doc));
    expect(Array.from(f.maxCompatibilities)).toEqual([2, Infinity, Infinity]);
    expect(Array.from(f.waitTarget)).toEqual([Infinity, 0.5, Infinity]);
    expect(Array.from(f.weight)).toEqual([0, 1, 2.5]);
    expect(f.mustKeep).toEqual([['c', 'b']]);
    expect(f.forbidden).toEqual([['a', 'c'], ['c', 'c']]);
  });

  it('reads {pair, reason} entries like plain pairs, and checks them the same way', () => {
    const doc = base({ mustKeep: [{ pair: ['c', 'b'], reason: 'the night cover agreement' }], forbidden: [{ pair: ['c', 'c'], reason: 'breaks the rest rule' }, ['a', 'c']] });
    const f = readDesignFields(validateScenario(doc));
    expect(f.mustKeep).toEqual([['c', 'b']]);
    expect(f.forbidden).toEqual([['c', 'c'], ['a', 'c']]);
    expect(problems(base({ forbidden: [{ pair: ['a', 'zz'], reason: 'x' }] }))[0]).toMatchObject({ path: 'forbidden[0].pair', message: expect.stringMatching(/unknown class "zz"/) });
    expect(problems(base({ forbidden: [{ reason: 'x' }] }))[0]).toMatchObject({ path: 'forbidden[0].pair', message: expect.stringMatching(/two class ids/) });
    expect(problems(base({ forbidden: [{ pair: ['c', 'c'], reason: 3 }] }))[0]).toMatchObject({ path: 'forbidden[0].reason', message: expect.stringMatching(/must be a string/) });
    expect(problems(base({ mustKeep: [{ pair: ['c', 'b'], why: 'x' }] }))[0]).toMatchObject({ path: 'mustKeep[0].why', message: expect.stringMatching(/unknown field "why"/) });
  });

  it('names the path of every bad per-class value, all at once', () => {
    const got = problems(base({}, [{ maxCompatibilities: 1.5 }, { waitTarget: 0 }, { weight: -1 }]));
    expect(got.map((p) => p.path)).toEqual(['classes[0].maxCompatibilities', 'classes[1].waitTarget', 'classes[2].weight']);
    expect(problems(base({}, [{ maxCompatibilities: -1 }]))[0]!.message).toMatch(/whole number >= 0/);
    expect(problems(base({}, [{ waitTarget: 'soon' }]))[0]!.message).toMatch(/finite number > 0/);
  });

  it('checks mustKeep and forbidden pairs', () => {
    expect(problems(base({ mustKeep: 'a' }))[0]!.path).toBe('mustKeep');
    expect(problems(base({ mustKeep: [['a']] }))[0]).toMatchObject({ path: 'mustKeep[0]', message: expect.stringMatching(/two class ids/) });
    expect(problems(base({ mustKeep: [['a', 'zz']] }))[0]).toMatchObject({ path: 'mustKeep[0]', message: expect.stringMatching(/unknown class "zz"/) });
    expect(problems(base({ mustKeep: [['c', 'c']] }))[0]).toMatchObject({ path: 'mustKeep[0]', message: expect.stringMatching(/is a candidate/) });
    expect(problems(base({ mustKeep: [['a', 'a']] }))[0]).toMatchObject({ path: 'mustKeep[0]', message: expect.stringMatching(/not a compatibility/) });
    expect(problems(base({ mustKeep: [['a', 'b'], ['b', 'a']] }))[0]).toMatchObject({ path: 'mustKeep[1]', message: expect.stringMatching(/duplicate/) });
    expect(problems(base({ forbidden: [['a', 'b']] }))[0]).toMatchObject({ path: 'forbidden[0]', message: expect.stringMatching(/not removable/) });
    expect(problems(base({ forbidden: [['b', 'b']] }))[0]).toMatchObject({ path: 'forbidden[0]', message: expect.stringMatching(/neither a compatibility nor a candidate/) });
    expect(problems(base({ mustKeep: [['b', 'c']], forbidden: [['c', 'b']] }))[0]).toMatchObject({ path: 'forbidden[0]', message: expect.stringMatching(/both kept and forbidden/) });
  });

  it('refuses a limit below the compatibilities a class can never drop', () => {
    // b has a–b (not removable) and b–c kept by mustKeep: 2 fixed compatibilities > 1
    const got = problems(base({ mustKeep: [['b', 'c']] }, [{}, { maxCompatibilities: 1 }]));
    expect(got).toHaveLength(1);
    expect(got[0]).toMatchObject({ path: 'classes[1].maxCompatibilities', message: expect.stringMatching(/below the 2 compatibilities/) });
    // without mustKeep only a–b is fixed: a limit of 1 is fine
    expect(problems(base({}, [{}, { maxCompatibilities: 1 }]))).toEqual([]);
  });
});
