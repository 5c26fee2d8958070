import { describe, expect, it } from 'vitest';
import { InvalidScenarioError } from '../../src/errors.js';
import { LIMITS } from '../../src/model/limits.js';
import { pairKey, type Scenario } from '../../src/model/scenario.js';
import { parseScenario } from '../../src/model/validate.js';
import { Rng } from '../helpers/random.js';

// Seeded fuzzing of hostile scenario files through parseScenario. Reference: the format as
// documented in docs/scenario-format.md. Each mutation breaks (or keeps) a documented rule and
// records the JSON path where the problem must be reported; every file must give either a valid
// Scenario that satisfies the documented invariants, or InvalidScenarioError listing a problem at
// every recorded path — never any other error, never an unbounded message.

/** A small valid document; mutations edit a copy. */
function base(): Record<string, any> {
  return {
    name: 'fuzz',
    timeUnit: 'hour',
    classes: [
      { id: 'north', rate: 12.5 },
      { id: 'centre', rate: 20, patience: 2 },
      { id: 'east', rate: 7, waitTarget: 1 },
      { id: 'south', rate: 3 },
    ],
    compatibilities: [['north', 'centre'], ['centre', 'centre'], { pair: ['centre', 'east'], removable: true, saving: 2 }],
    candidates: [{ pair: ['north', 'east'], cost: 40 }, { pair: ['south', 'centre'], cost: 5 }],
    demand: { peak: { north: 14 } },
    budget: 50,
  };
}

const nested = (depth: number, leaf: unknown): unknown => {
  let v = leaf;
  for (let i = 0; i < depth; i++) v = i % 2 ? [v] : { a: v };
  return v;
};

const hostileValues = (rng: Rng): unknown[] => [
  '12',
  null,
  true,
  [],
  {},
  [1, 2, 3],
  { id: 'x' },
  -1,
  0,
  1e308,
  -1e308,
  5e-324,
  'x'.repeat(rng.int(1, 5) * 100_000),
  nested(rng.int(20, 200), 1),
  '\u0000',
  '',
  '   ',
];

type Mutation = (d: Record<string, any>, rng: Rng) => string | undefined; // returns the path that must be reported

const pick = <T,>(rng: Rng, xs: readonly T[]): T => xs[rng.int(0, xs.length - 1)]!;

const mutations: Mutation[] = [
  (d, rng) => {
    const i = rng.int(0, 3);
    const v = pick(rng, hostileValues(rng).filter((x) => !(typeof x === 'number' && x > 0)));
    d.classes[i].rate = v;
    return `classes[${i}].rate`;
  },
  (d, rng) => {
    const i = 3; // the other ids stay, so that the mutations below keep their meaning
    d.classes[i].id = pick(rng, [7, null, '', '  ', 'x'.repeat(LIMITS.idChars + 1), ['north'], { a: 1 }]);
    return `classes[${i}].id`;
  },
  (d, rng) => {
    const i = rng.int(0, 3);
    const key = pick(rng, ['waittarget', 'rte', 'Rate', 'pingMs', 'ringKm', 'maxcompatibilities', 'lable', '__proto__', 'constructor']);
    d.classes[i][key] = 1;
    return key === '__proto__' ? undefined : `classes[${i}].${key}`; // a "__proto__" key written in JS code is no own key
  },
  (d) => {
    d.classes.push({ id: 'north', rate: 1 });
    return `classes[${d.classes.length - 1}].id`;
  },
  (d, rng) => {
    d.compatibilities.push([pick(rng, ['harbour', 'north\u0000', 'NORTH']), 'centre']);
    return `compatibilities[${d.compatibilities.length - 1}]`;
  },
  (d, rng) => {
    d.compatibilities.push(pick(rng, [['north'], ['a', 'b', 'c'], 7, 'north', [1, 2], { pair: 'north' }, nested(30, 'x')]));
    return `compatibilities[${d.compatibilities.length - 1}]`;
  },
  (d) => {
    d.compatibilities.push(['centre', 'north']);
    return `compatibilities[${d.compatibilities.length - 1}]`;
  },
  (d, rng) => {
    d.candidates[0].cost = pick(rng, hostileValues(rng).filter((x) => !(typeof x === 'number' && x >= 0)));
    return 'candidates[0].cost';
  },
  (d) => {
    d.candidates.push({ pair: ['centre', 'north'], cost: 1 });
    return `candidates[${d.candidates.length - 1}]`;
  },
  (d, rng) => {
    d.demand[pick(rng, ['today', '', 'late night'])] = { north: pick(rng, [-1, '3', null, 0]) };
    return undefined; // 'late night' with rate 0 is valid; the others are reported (checked below)
  },
  (d, rng) => {
    d.demand.peak[pick(rng, ['harbour', 'nort'])] = 3;
    return 'demand.peak';
  },
  (d, rng) => {
    d[pick(rng, ['extra', 'pingMs', 'Budget', 'classes2', 'timeunit'])] = 1;
    return undefined;
  },
  (d, rng) => {
    d.mustKeep = pick(rng, [[['north', 'east']], [['north', 'harbour']], 'north', [['centre', 'east']]]);
    return undefined;
  },
  (d, rng) => {
    d.budget = pick(rng, [-1, '50', null, 1e308, []]);
    return d.budget === 1e308 ? undefined : 'budget';
  },
  (d, rng) => {
    d.data = pick(rng, [nested(50, 'deep'), { any: [1, { b: 2 }] }, 'not an object']);
    return typeof d.data === 'string' ? 'data' : undefined;
  },
];

/** The documented invariants of a valid scenario. */
function checkValid(s: Scenario): void {
  const ids = new Set(s.classes.map((c) => c.id));
  expect(ids.size).toBe(s.classes.length);
  expect(s.classes.length).toBeGreaterThan(0);
  for (const c of s.classes) {
    expect(c.id.trim()).not.toBe('');
    expect(Number.isFinite(c.rate) && c.rate > 0).toBe(true);
  }
  const keys = new Set<string>();
  for (const p of [...s.compatibilities, ...s.candidates]) {
    expect(ids.has(p.pair[0]) && ids.has(p.pair[1])).toBe(true);
    const k = pairKey(p.pair[0], p.pair[1]);
    expect(keys.has(k)).toBe(false);
    keys.add(k);
  }
  for (const v of s.demand) for (const [id, r] of Object.entries(v.rates)) expect(ids.has(id) && r >= 0 && Number.isFinite(r)).toBe(true);
}

/** Parses; returns the problems (or [] for a valid file after checking it), failing on any other error. */
function outcome(text: string): Array<{ path: string; message: string }> {
  try {
    checkValid(parseScenario(text, 'fuzz.json'));
    return [];
  } catch (e) {
    if (!(e instanceof InvalidScenarioError)) throw e;
    expect(e.problems.length).toBeGreaterThan(0);
    for (const p of e.problems) {
      expect(typeof p.path).toBe('string');
      expect(p.message.length).toBeGreaterThan(0);
      expect(p.message.length, p.message.slice(0, 200)).toBeLessThan(1200); // bounded previews
      expect(p.path.length).toBeLessThan(400);
    }
    return [...e.problems];
  }
}

describe('hostile scenario files (seeded fuzz)', () => {
  it('combined mutations: valid Scenario or InvalidScenarioError with every recorded path', () => {
    const rng = new Rng(1_000_003);
    let invalid = 0;
    for (let t = 0; t < 300; t++) {
      const d = base();
      const want: string[] = [];
      // up to four distinct mutations (one never undoes another's recorded problem)
      const chosen = new Set<number>();
      const k = rng.int(1, 4);
      while (chosen.size < k) chosen.add(rng.int(0, mutations.length - 1));
      for (const j of chosen) {
        const path = mutations[j]!(d, rng);
        if (path) want.push(path);
      }
      const problems = outcome(JSON.stringify(d));
      if (problems.length > 0) invalid++;
      const paths = problems.map((p) => p.path);
      for (const w of want) expect(paths.some((p) => p === w || p.startsWith(`${w}.`) || p.startsWith(`${w}[`)), `${w} in ${paths.join(' | ')}`).toBe(true);
    }
    expect(invalid).toBeGreaterThan(150);
  });

  it('malformed text: truncations, deep nesting (closed or not), stray bytes; line and column always given', () => {
    const rng = new Rng(77_777);
    const good = JSON.stringify(base(), null, 2);
    const texts = [
      '['.repeat(100_000),
      '['.repeat(100_000) + ']'.repeat(100_000),
      '{"a":'.repeat(100_000),
      '{"a":'.repeat(100_000) + '1' + '}'.repeat(100_000),
      `{"classes": ${'['.repeat(100_000)}`,
      '\u0000',
      '',
      'NaN',
      '{"classes": [{"id": "a", "rate": 1e999}]}',
    ];
    for (let t = 0; t < 60; t++) {
      const cut = rng.int(0, good.length - 1);
      texts.push(good.slice(0, cut));
      texts.push(good.slice(0, cut) + pick(rng, ['}', ']', ',', '"', '\u0000', 'x', '{{', '/*']) + good.slice(cut));
    }
    for (const text of texts) {
      const problems = outcome(text);
      if (problems.length === 0) continue;
      for (const p of problems) if (p.message.startsWith('malformed JSON')) expect(p.message).toMatch(/^malformed JSON at line \d+, column \d+: /);
    }
  });

  it('documents past a size limit are refused naming the limit (classes, candidates, nesting, file size)', () => {
    const many = (n: number) => Array.from({ length: n }, (_, k) => ({ id: `c${k}`, rate: 1 }));
    const cases: Array<[string, string, RegExp]> = [
      ['classes', JSON.stringify({ classes: many(LIMITS.classes + 1) }), /more than the limit of 20,000 classes/],
      ['candidates', JSON.stringify({ classes: many(2), candidates: Array.from({ length: LIMITS.candidates + 1 }, () => ({ pair: ['c0', 'c1'], cost: 1 })) }), /limit of 10,000 candidates/],
      ['data', JSON.stringify({ classes: many(1), data: nested(LIMITS.depth + 5, 1) }), /deeper than the limit of 64/],
      ['', ' '.repeat(LIMITS.fileChars + 1), /more than the limit of/],
    ];
    for (const [path, text, message] of cases) {
      const problems = outcome(text);
      expect(problems).toHaveLength(1);
      expect(problems[0]!.path.startsWith(path)).toBe(true);
      expect(problems[0]!.message).toMatch(message);
    }
  });

  it('a giant value where a number belongs is previewed in a few dozen characters', () => {
    const d = base();
    d.classes[0].rate = nested(60, 'x'.repeat(1_000_000));
    d.classes[1].label = 'y'.repeat(LIMITS.textChars + 1);
    const problems = outcome(JSON.stringify(d));
    expect(problems.map((p) => p.path)).toEqual(['classes[0].rate', 'classes[1].label']);
    for (const p of problems) expect(p.message.length).toBeLessThan(200);
  });
});
