import { exitCodeOf } from '../../src/cli/exit.js';
import { describe, expect, it } from 'vitest';
import { InvalidScenarioError, type ScenarioProblem } from '../../src/errors.js';
import { parseScenario, validateScenario } from '../../src/model/validate.js';

// The expected outcomes below are read off the scenario format (docs/scenario-format.md): each
// document is written by hand so that it breaks exactly the rules named in the test.

/** The problems parseScenario reports for a document (fails the test if it does not throw). */
function problemsOf(doc: unknown, source?: string): readonly ScenarioProblem[] {
  const text = typeof doc === 'string' ? doc : JSON.stringify(doc);
  try {
    parseScenario(text, source);
  } catch (e) {
    expect(e).toBeInstanceOf(InvalidScenarioError);
    return (e as InvalidScenarioError).problems;
  }
  throw new Error('expected an InvalidScenarioError');
}

/** A small valid document; tests break one thing in a copy of it. */
function base(): Record<string, any> {
  return {
    name: 'pooling test',
    timeUnit: 'hour',
    classes: [
      { id: 'north', rate: 12.5 },
      { id: 'centre', rate: 20 },
      { id: 'east', rate: 7 },
    ],
    compatibilities: [['north', 'centre'], ['centre', 'centre'], ['centre', 'east']],
    candidates: [{ pair: ['north', 'east'], cost: 40 }],
    budget: 50,
  };
}

const paths = (ps: readonly ScenarioProblem[]): string[] => ps.map((p) => p.path);

describe('parseScenario: valid documents', () => {
  it('reads a full document', () => {
    const s = parseScenario(JSON.stringify(base()), 'pool.json');
    expect(s.name).toBe('pooling test');
    expect(s.timeUnit).toBe('hour');
    expect(s.classes.map((c) => [c.id, c.rate])).toEqual([['north', 12.5], ['centre', 20], ['east', 7]]);
    expect(s.compatibilities.map((c) => c.pair)).toEqual([['north', 'centre'], ['centre', 'centre'], ['centre', 'east']]);
    expect(s.candidates).toEqual([{ pair: ['north', 'east'], cost: 40 }]);
    expect(s.budget).toBe(50);
    expect(s.mustKeep).toEqual([]);
    expect(s.forbidden).toEqual([]);
    expect(s.demand).toEqual([]);
    expect('data' in s).toBe(false);
  });

  it('fills the documented defaults for a minimal document', () => {
    const s = parseScenario('{"classes": [{"id": "solo", "rate": 1}], "compatibilities": [["solo", "solo"]]}');
    expect(s.name).toBe('unnamed scenario');
    expect(s.timeUnit).toBe('time unit');
    expect(s.candidates).toEqual([]);
    expect(s.budget).toBeUndefined();
    expect('budget' in s).toBe(false);
    // pair form: removable defaults to false, saving to 0
    expect(s.compatibilities).toEqual([{ pair: ['solo', 'solo'], removable: false, saving: 0 }]);
  });

  it('accepts no compatibilities at all (validation is not a stability check)', () => {
    const s = parseScenario('{"classes": [{"id": "a", "rate": 1}]}');
    expect(s.compatibilities).toEqual([]);
  });

  it('reads both compatibility forms, a self-loop, and keeps extra fields on pairs', () => {
    const doc = base();
    doc.compatibilities = [
      ['north', 'centre'],
      { pair: ['centre', 'east'], removable: true, saving: 5, note: 'detour' },
      { pair: ['east', 'east'] },
    ];
    const s = parseScenario(JSON.stringify(doc));
    expect(s.compatibilities).toEqual([
      { pair: ['north', 'centre'], removable: false, saving: 0 },
      { pair: ['centre', 'east'], removable: true, saving: 5, note: 'detour' },
      { pair: ['east', 'east'], removable: false, saving: 0 },
    ]);
  });

  it('reads the documented top-level fields, ignores "$schema" and keeps "data" as written', () => {
    const doc = { $schema: '../docs/scenario.schema.json', description: 'invented', costUnit: 'credits', itemWord: 'riders', waitingCost: 2, ...base(), data: { tags: ['a', 1] } };
    const s = parseScenario(JSON.stringify(doc));
    expect(s).toMatchObject({ description: 'invented', costUnit: 'credits', itemWord: 'riders', waitingCost: 2, data: { tags: ['a', 1] } });
    expect('$schema' in s).toBe(false);
  });

  it('refuses a top-level "__proto__" field as an unknown key and leaves the prototype alone', () => {
    const ps = problemsOf('{"classes": [{"id": "a", "rate": 1}], "__proto__": {"polluted": true}}');
    expect(ps).toEqual([{ path: '__proto__', message: expect.stringMatching(/^unknown field "__proto__"/) }]);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });

  it('keeps per-class fields on the class object; own data only under "data"', () => {
    const doc = base();
    doc.classes[0] = { id: 'north', rate: 12.5, label: 'North', group: 'ring', note: 'n', patience: 0.25, maxAbandonment: 0.1, rateCi95: [11, 14], data: { ringKm: 3.2, tags: { zone: 1 } } };
    const s = parseScenario(JSON.stringify(doc));
    expect(s.classes[0]).toEqual(doc.classes[0]);
  });

  it('refuses unknown keys everywhere, suggesting a close known key (case or a small edit)', () => {
    const doc = base();
    doc.classes[0].waittarget = 0.5;
    doc.classes[1].rte = 4;
    doc.classes[2].ringKm = 3;
    doc.compatibilities[0] = { pair: ['north', 'centre'], removeable: true };
    doc.candidates[0].Cost = 1;
    doc.budgte = 3;
    const ps = problemsOf(doc);
    expect(ps).toEqual([
      { path: 'classes[0].waittarget', message: 'unknown field "waittarget": did you mean `waitTarget`?' },
      { path: 'classes[1].rte', message: 'unknown field "rte": did you mean `rate`?' },
      { path: 'classes[2].ringKm', message: expect.stringMatching(/^unknown field "ringKm" \(known: id, rate, .*\); put data of your own under "data"$/) },
      { path: 'compatibilities[0].removeable', message: 'unknown field "removeable": did you mean `removable`?' },
      { path: 'candidates[0].Cost', message: 'unknown field "Cost": did you mean `cost`?' },
      { path: 'budgte', message: 'unknown field "budgte": did you mean `budget`?' },
    ]);
  });

  it('reads mustKeep / forbidden in both forms and demand variants with zero rates', () => {
    const doc = { ...base(), compatibilities: [['north', 'centre'], { pair: ['centre', 'east'], removable: true }], mustKeep: [['centre', 'north']], forbidden: [{ pair: ['east', 'centre'], reason: 'closed road' }], demand: { night: { east: 0 } } };
    const s = parseScenario(JSON.stringify(doc));
    expect(s.mustKeep).toEqual([{ pair: ['centre', 'north'] }]);
    expect(s.forbidden).toEqual([{ pair: ['east', 'centre'], reason: 'closed road' }]);
    expect(s.demand).toEqual([{ name: 'night', rates: { east: 0 } }]);
  });

  it('a rate interval must hold its rate', () => {
    const doc = base();
    doc.classes[0].rateCi95 = [13, 14];
    expect(problemsOf(doc)).toEqual([{ path: 'classes[0].rateCi95', message: expect.stringMatching(/must contain the rate 12.5/) }]);
  });

  it('keeps extra fields on candidates', () => {
    const doc = base();
    doc.candidates = [{ pair: ['east', 'north'], cost: 0, note: 'free' }];
    expect(parseScenario(JSON.stringify(doc)).candidates).toEqual([{ pair: ['east', 'north'], cost: 0, note: 'free' }]);
  });

  it('ignores a byte-order mark at the start of the file', () => {
    expect(parseScenario('\uFEFF' + JSON.stringify(base())).classes).toHaveLength(3);
  });

  it('validateScenario takes an already-parsed object', () => {
    expect(validateScenario(base()).classes).toHaveLength(3);
  });
});

describe('parseScenario: one problem at a time, each with its JSON path', () => {
  it('malformed JSON gives the line and column where the error was put', () => {
    // A trailing comma ends line 4, so a value is expected next; line 5 is `  ]`, whose `]` sits at
    // column 3 (two spaces before it). That is where the error was put.
    const text = ['{', '  "classes": [', '    {"id": "a", "rate": 1},', '    {"id": "b", "rate": 2},', '  ]', '}'].join('\n');
    const ps = problemsOf(text, 'broken.json');
    expect(ps).toHaveLength(1);
    expect(ps[0]!.path).toBe('');
    expect(ps[0]!.message).toMatch(/^malformed JSON at line 5, column 3: /);
  });

  it('malformed JSON: unterminated string points at the end', () => {
    const text = '{\n  "name": "ride\n';
    // Line 2 is `  "name": "ride` and then a raw newline, which JSON forbids inside a string. Counted by
    // hand: 2 spaces + `"name": ` (8) + `"ride` (5) = 15 characters, so the newline is column 16.
    const ps = problemsOf(text);
    expect(ps[0]!.message).toMatch(/line 2, column 16: control character in string/);
  });

  it('a document that is not an object', () => {
    expect(problemsOf('[1, 2]')).toEqual([{ path: '', message: expect.stringMatching(/must be a JSON object, found an array/) }]);
    expect(problemsOf('null')[0]!.message).toMatch(/must be a JSON object, found null/);
    expect(problemsOf('"text"')[0]!.message).toMatch(/must be a JSON object/);
  });

  it('classes missing, not an array, empty model', () => {
    const doc = base();
    delete doc.classes;
    delete doc.compatibilities;
    delete doc.candidates;
    expect(problemsOf(doc)).toEqual([{ path: 'classes', message: expect.stringMatching(/^missing/) }]);
    expect(problemsOf({ classes: { id: 'a', rate: 1 } })).toEqual([{ path: 'classes', message: expect.stringMatching(/must be an array/) }]);
    expect(problemsOf({ classes: [] })).toEqual([{ path: 'classes', message: expect.stringMatching(/empty model/) }]);
  });

  it('a class that is not an object', () => {
    const doc = base();
    doc.classes.push('west');
    expect(problemsOf(doc)).toEqual([{ path: 'classes[3]', message: expect.stringMatching(/must be an object/) }]);
  });

  it('missing class id, empty id, non-string id', () => {
    const doc = base();
    doc.classes.push({ rate: 3 }, { id: '  ', rate: 3 }, { id: 7, rate: 3 });
    expect(problemsOf(doc)).toEqual([
      { path: 'classes[3].id', message: 'missing class id' },
      { path: 'classes[4].id', message: expect.stringMatching(/non-empty string/) },
      { path: 'classes[5].id', message: expect.stringMatching(/non-empty string, found 7/) },
    ]);
  });

  it('duplicate class id is reported at the second occurrence', () => {
    const doc = base();
    doc.classes.push({ id: 'centre', rate: 3 });
    expect(problemsOf(doc)).toEqual([{ path: 'classes[3].id', message: 'duplicate class id "centre"' }]);
  });

  it('rate missing, not a number, non-finite, zero, negative', () => {
    const doc = base();
    doc.classes.push({ id: 'w1' }, { id: 'w2', rate: '12' }, { id: 'w3', rate: null }, { id: 'w4', rate: 0 }, { id: 'w5', rate: -2 });
    expect(problemsOf(doc)).toEqual([
      { path: 'classes[3].rate', message: expect.stringMatching(/rate missing/) },
      { path: 'classes[4].rate', message: expect.stringMatching(/finite number > 0, found "12"/) },
      { path: 'classes[5].rate', message: expect.stringMatching(/finite number > 0, found null/) },
      { path: 'classes[6].rate', message: expect.stringMatching(/> 0, found 0/) },
      { path: 'classes[7].rate', message: expect.stringMatching(/> 0, found -2/) },
    ]);
  });

  it('a rate that overflows to Infinity (1e999 in the file) is non-finite', () => {
    const text = '{"classes": [{"id": "a", "rate": 1e999}]}';
    expect(JSON.parse(text).classes[0].rate).toBe(Infinity); // the engine reads 1e999 as Infinity
    expect(problemsOf(text)).toEqual([{ path: 'classes[0].rate', message: expect.stringMatching(/finite number/) }]);
  });

  it('non-finite rates given directly to validateScenario', () => {
    for (const rate of [NaN, Infinity, -Infinity]) {
      expect(() => validateScenario({ classes: [{ id: 'a', rate }] })).toThrow(/classes\[0\]\.rate: rate must be a finite number/);
    }
  });

  it('label must be a string; patience must be a finite number > 0', () => {
    const doc = base();
    doc.classes[0].label = 5;
    doc.classes[1].patience = 0;
    doc.classes[2].patience = 'long';
    expect(problemsOf(doc)).toEqual([
      { path: 'classes[0].label', message: expect.stringMatching(/must be a string/) },
      { path: 'classes[1].patience', message: expect.stringMatching(/> 0, found 0/) },
      { path: 'classes[2].patience', message: expect.stringMatching(/found "long"/) },
    ]);
  });

  it('name and timeUnit types', () => {
    const doc = base();
    doc.name = 3;
    doc.timeUnit = ' ';
    expect(paths(problemsOf(doc))).toEqual(['name', 'timeUnit']);
  });

  it('unknown class in a pair (both forms, candidates too), listing known ids', () => {
    const doc = base();
    doc.compatibilities.push(['north', 'south'], { pair: ['west', 'centre'] });
    doc.candidates.push({ pair: ['north', 'harbour'], cost: 1 });
    const ps = problemsOf(doc);
    expect(ps).toEqual([
      { path: 'compatibilities[3]', message: 'unknown class "south" (known: north, centre, east)' },
      { path: 'compatibilities[4].pair', message: expect.stringMatching(/^unknown class "west"/) },
      { path: 'candidates[1].pair', message: expect.stringMatching(/^unknown class "harbour"/) },
    ]);
  });

  it('an unknown class in a self-loop is reported once', () => {
    const doc = base();
    doc.compatibilities.push(['south', 'south']);
    expect(problemsOf(doc)).toEqual([{ path: 'compatibilities[3]', message: expect.stringMatching(/unknown class "south"/) }]);
  });

  it('both unknown classes of a pair are reported', () => {
    const doc = base();
    doc.compatibilities.push(['south', 'west']);
    expect(problemsOf(doc).map((p) => p.message)).toEqual([
      expect.stringMatching(/"south"/),
      expect.stringMatching(/"west"/),
    ]);
  });

  it('malformed pairs', () => {
    const doc = base();
    doc.compatibilities.push(['north'], ['north', 'centre', 'east'], [1, 2], 'north-centre', { pair: 'north' });
    expect(problemsOf(doc)).toEqual([
      { path: 'compatibilities[3]', message: expect.stringMatching(/two class ids/) },
      { path: 'compatibilities[4]', message: expect.stringMatching(/two class ids/) },
      { path: 'compatibilities[5]', message: expect.stringMatching(/two class ids/) },
      { path: 'compatibilities[6]', message: expect.stringMatching(/must be a pair .* or an object/) },
      { path: 'compatibilities[7].pair', message: expect.stringMatching(/two class ids/) },
    ]);
  });

  it('duplicate pair (a,b) then (b,a), and a duplicate self-loop', () => {
    const doc = base();
    doc.compatibilities.push(['centre', 'north'], { pair: ['centre', 'centre'], removable: true });
    expect(problemsOf(doc)).toEqual([
      { path: 'compatibilities[3]', message: 'duplicate pair ["centre","north"]: already given at compatibilities[0]' },
      { path: 'compatibilities[4]', message: 'duplicate pair ["centre","centre"]: already given at compatibilities[1]' },
    ]);
  });

  it('a candidate that is already a compatibility (either order), and duplicate candidates', () => {
    const doc = base();
    doc.candidates.push({ pair: ['centre', 'north'], cost: 3 }, { pair: ['east', 'north'], cost: 9 });
    expect(problemsOf(doc)).toEqual([
      { path: 'candidates[1]', message: 'candidate ["centre","north"] is already a compatibility (compatibilities[0])' },
      { path: 'candidates[2]', message: 'duplicate pair ["east","north"]: already given at candidates[0]' },
    ]);
  });

  it('negative or non-numeric cost, missing cost, negative saving, removable not boolean', () => {
    const doc = base();
    doc.compatibilities[0] = { pair: ['north', 'centre'], removable: 'yes', saving: -1 };
    doc.compatibilities[2] = { pair: ['centre', 'east'], saving: '5' };
    doc.candidates = [{ pair: ['north', 'east'], cost: -40 }, { pair: ['east', 'east'] }, { pair: ['north', 'north'], cost: 'cheap' }, ['east', 'north']];
    expect(problemsOf(doc)).toEqual([
      { path: 'compatibilities[0].removable', message: expect.stringMatching(/true or false/) },
      { path: 'compatibilities[0].saving', message: 'saving must be >= 0, found -1' },
      { path: 'compatibilities[2].saving', message: expect.stringMatching(/finite number >= 0, found "5"/) },
      { path: 'candidates[0].cost', message: 'cost must be >= 0, found -40' },
      { path: 'candidates[1].cost', message: 'cost missing' },
      { path: 'candidates[2].cost', message: expect.stringMatching(/finite number >= 0, found "cheap"/) },
      { path: 'candidates[3]', message: expect.stringMatching(/must be an object/) },
    ]);
  });

  it('compatibilities / candidates that are not arrays; bad budget', () => {
    expect(paths(problemsOf({ ...base(), compatibilities: { a: 1 }, candidates: 'none', budget: -1 }))).toEqual([
      'compatibilities',
      'candidates',
      'budget',
    ]);
    expect(problemsOf({ ...base(), budget: '50' })).toEqual([{ path: 'budget', message: expect.stringMatching(/finite number >= 0/) }]);
  });

  it('InvalidScenarioError: exit code 2, source and every problem in the message', () => {
    const doc = base();
    doc.classes[1].rate = 0;
    doc.budget = -5;
    try {
      parseScenario(JSON.stringify(doc), 'scenarios/pool.json');
      expect.unreachable();
    } catch (e) {
      const err = e as InvalidScenarioError;
      expect(exitCodeOf(err)).toBe(2);
      expect(err.source).toBe('scenarios/pool.json');
      expect(err.message.split('\n')).toEqual([
        'scenarios/pool.json: 2 problems',
        expect.stringMatching(/^  - classes\[1\]\.rate: rate must be > 0, found 0/),
        expect.stringMatching(/^  - budget: must be a finite number >= 0, found -5$/),
      ]);
    }
  });
});

describe('parseScenario: many problems at once', () => {
  it('lists every problem of a badly broken document, in document order', () => {
    const doc = {
      name: ['not', 'a', 'string'],
      timeUnit: '',
      classes: [
        { id: 'north', rate: 10 },
        { id: 'north', rate: 4 }, // duplicate id
        { rate: 3 }, // missing id
        { id: 'east' }, // rate missing
        { id: 'west', rate: 0 }, // zero rate
        { id: 'south', rate: -1, patience: -2 }, // negative rate, bad patience
        { id: 'harbour', rate: 'fast' }, // not a number
      ],
      compatibilities: [
        ['north', 'east'],
        ['east', 'north'], // duplicate pair
        ['north', 'airport'], // unknown class
        { pair: ['west', 'west'], removable: true, saving: -3 }, // negative saving
        'north', // not a pair
      ],
      candidates: [
        { pair: ['north', 'east'], cost: 5 }, // already a compatibility
        { pair: ['south', 'harbour'], cost: -10 }, // negative cost
        { pair: ['moon', 'north'] }, // unknown class + cost missing
      ],
      budget: Number.NaN, // JSON.stringify writes null
    };
    const ps = problemsOf(doc, 'broken.json');
    expect(paths(ps)).toEqual([
      'name',
      'timeUnit',
      'classes[1].id',
      'classes[2].id',
      'classes[3].rate',
      'classes[4].rate',
      'classes[5].rate',
      'classes[5].patience',
      'classes[6].rate',
      'compatibilities[1]',
      'compatibilities[2]',
      'compatibilities[3].saving',
      'compatibilities[4]',
      'candidates[0]',
      'candidates[1].cost',
      'candidates[2].pair',
      'candidates[2].cost',
      'budget',
    ]);
    expect(ps.map((p) => p.message)).toEqual([
      expect.stringMatching(/must be a string/),
      expect.stringMatching(/non-empty string/),
      'duplicate class id "north"',
      'missing class id',
      expect.stringMatching(/rate missing/),
      expect.stringMatching(/> 0, found 0/),
      expect.stringMatching(/> 0, found -1/),
      expect.stringMatching(/patience/),
      expect.stringMatching(/finite number > 0, found "fast"/),
      expect.stringMatching(/duplicate pair/),
      expect.stringMatching(/unknown class "airport"/),
      'saving must be >= 0, found -3',
      expect.stringMatching(/must be a pair/),
      expect.stringMatching(/already a compatibility/),
      'cost must be >= 0, found -10',
      expect.stringMatching(/unknown class "moon"/),
      'cost missing',
      expect.stringMatching(/finite number >= 0, found null/),
    ]);
  });
});
