import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseScenario } from '../../src/model/validate.js';
import { scenarioJsonSchemaText } from '../../src/model/schema.js';
import { checkSchema } from './mini-schema.js';

// docs/scenario.schema.json is generated from src/model/schema.ts (`npm run schema`) for editors;
// src/model/validate.ts is what edgewise enforces. These checks keep the two in step on the rules a
// schema can express (single fields). Reference: the keyword meanings of "JSON Schema Validation",
// draft 2020-12, implemented independently in ./mini-schema.ts.

const root = join(import.meta.dirname, '..', '..');
const schema = JSON.parse(readFileSync(join(root, 'docs', 'scenario.schema.json'), 'utf8'));

const validatorAccepts = (doc: unknown): boolean => {
  try {
    parseScenario(JSON.stringify(doc));
    return true;
  } catch {
    return false;
  }
};
const schemaAccepts = (doc: unknown): boolean => checkSchema(schema, doc).length === 0;

const good = (): Record<string, any> => ({
  $schema: '../docs/scenario.schema.json',
  name: 'swap test',
  timeUnit: 'day',
  description: 'a documented top-level field',
  costUnit: 'credits',
  itemWord: 'postings',
  waitingCost: 0.5,
  classes: [
    {
      id: 'icu-day',
      rate: 3,
      label: 'ICU day',
      group: 'icu',
      note: 'n',
      patience: 4,
      weight: 2,
      waitTarget: 1,
      maxCompatibilities: 3,
      maxAbandonment: 0.2,
      rateCi95: [2.5, 3.5],
      data: { unit: 'icu', nested: [1, { a: 2 }] },
    },
    { id: 'icu-night', rate: 2 },
  ],
  compatibilities: [['icu-day', 'icu-night'], { pair: ['icu-day', 'icu-day'], removable: true, saving: 2, value: -1.5, note: 'x', data: { km: 3 } }],
  candidates: [{ pair: ['icu-night', 'icu-night'], cost: 10, value: 4, note: 'y', data: {} }],
  mustKeep: [['icu-day', 'icu-night']],
  forbidden: [{ pair: ['icu-day', 'icu-day'], reason: 'rule' }],
  demand: { summer: { 'icu-night': 0 } },
  data: { owner: 'me' },
  budget: 12,
});

/** One field-level rule broken per document; both the schema and the validator must refuse it. */
const broken: Array<[string, (d: Record<string, any>) => void]> = [
  ['classes missing', (d) => delete d.classes],
  ['classes not an array', (d) => (d.classes = { id: 'a', rate: 1 })],
  ['classes empty', (d) => ((d.classes = []), (d.compatibilities = []), (d.candidates = []))],
  ['class not an object', (d) => d.classes.push('west')],
  ['class id missing', (d) => d.classes.push({ rate: 1 })],
  ['class id blank', (d) => d.classes.push({ id: '   ', rate: 1 })],
  ['class id a number', (d) => d.classes.push({ id: 4, rate: 1 })],
  ['rate missing', (d) => d.classes.push({ id: 'w' })],
  ['rate zero', (d) => (d.classes[0].rate = 0)],
  ['rate negative', (d) => (d.classes[0].rate = -1)],
  ['rate a string', (d) => (d.classes[0].rate = '3')],
  ['patience zero', (d) => (d.classes[0].patience = 0)],
  ['label a number', (d) => (d.classes[0].label = 1)],
  ['pair of three', (d) => d.compatibilities.push(['icu-day', 'icu-night', 'icu-day'])],
  ['pair of one', (d) => d.compatibilities.push(['icu-day'])],
  ['pair of numbers', (d) => d.compatibilities.push([1, 2])],
  ['compatibility a string', (d) => d.compatibilities.push('icu-day')],
  ['compatibility object without pair', (d) => d.compatibilities.push({ removable: true })],
  ['removable not boolean', (d) => (d.compatibilities[1].removable = 'yes')],
  ['saving negative', (d) => (d.compatibilities[1].saving = -2)],
  ['compatibilities not an array', (d) => (d.compatibilities = {})],
  ['candidate cost missing', (d) => delete d.candidates[0].cost],
  ['candidate cost negative', (d) => (d.candidates[0].cost = -10)],
  ['candidate a bare pair', (d) => (d.candidates[0] = ['icu-night', 'icu-night'])],
  ['candidates not an array', (d) => (d.candidates = 'none')],
  ['budget negative', (d) => (d.budget = -1)],
  ['budget a string', (d) => (d.budget = '12')],
  ['name a number', (d) => (d.name = 7)],
  ['timeUnit empty', (d) => (d.timeUnit = '')],
  ['timeUnit blank', (d) => (d.timeUnit = '  ')],
  ['unknown key in a class (a typo)', (d) => (d.classes[0].waittarget = 1)],
  ['unknown top-level key', (d) => (d.ringKm = 1)],
  ['unknown key on a compatibility', (d) => (d.compatibilities[1].km = 1)],
  ['unknown key on a candidate', (d) => (d.candidates[0].pingMs = 1)],
  ['maxAbandonment 1', (d) => (d.classes[0].maxAbandonment = 1)],
  ['maxCompatibilities not whole', (d) => (d.classes[0].maxCompatibilities = 1.5)],
  ['weight negative', (d) => (d.classes[0].weight = -1)],
  ['waitTarget zero', (d) => (d.classes[0].waitTarget = 0)],
  ['rateCi95 of one number', (d) => (d.classes[0].rateCi95 = [1])],
  ['rateCi95 negative end', (d) => (d.classes[0].rateCi95 = [-1, 4])],
  ['data an array', (d) => (d.classes[0].data = [1])],
  ['top-level data a string', (d) => (d.data = 'x')],
  ['value a string', (d) => (d.candidates[0].value = '4')],
  ['waitingCost negative', (d) => (d.waitingCost = -1)],
  ['demand rate negative', (d) => (d.demand.summer['icu-night'] = -1)],
  ['demand variant not an object', (d) => (d.demand.summer = 3)],
  ['rule of three ids', (d) => d.mustKeep.push(['icu-day', 'icu-night', 'icu-day'])],
  ['rule reason a number', (d) => (d.forbidden[0].reason = 3)],
  ['class id too long', (d) => (d.classes[1].id = 'x'.repeat(201))],
];

describe('docs/scenario.schema.json agrees with the validator', () => {
  it('the committed file is the one generated from src/model/schema.ts (run `npm run schema` after a change)', () => {
    expect(readFileSync(join(root, 'docs', 'scenario.schema.json'), 'utf8')).toBe(scenarioJsonSchemaText());
  });

  it('is a draft 2020-12 schema whose required lists match the validator', () => {
    expect(schema.$schema).toBe('https://json-schema.org/draft/2020-12/schema');
    expect(schema.required).toEqual(['classes']);
    const cls = schema.properties.classes.items;
    expect(cls.required).toEqual(['id', 'rate']);
    expect(schema.properties.candidates.items.required).toEqual(['pair', 'cost']);
    expect(Object.keys(schema.properties).sort()).toEqual(
      ['$schema', 'budget', 'candidates', 'classes', 'compatibilities', 'costUnit', 'data', 'demand', 'description', 'forbidden', 'itemWord', 'mustKeep', 'name', 'timeUnit', 'waitingCost'].sort(),
    );
    // unknown keys are refused by the validator, so the schema refuses them too; data is free-form
    expect(schema.additionalProperties).toBe(false);
    expect(cls.additionalProperties).toBe(false);
    expect(schema.properties.candidates.items.additionalProperties).toBe(false);
    expect(cls.properties.data.type).toBe('object');
  });

  it('both accept a full valid document and a minimal one', () => {
    for (const doc of [good(), { classes: [{ id: 'a', rate: 1 }] }]) {
      expect(checkSchema(schema, doc)).toEqual([]);
      expect(validatorAccepts(doc)).toBe(true);
    }
  });

  it('both accept every shipped scenario', () => {
    const dir = join(root, 'scenarios');
    const files = readdirSync(dir).filter((f) => f.endsWith('.json'));
    expect(files.length).toBeGreaterThanOrEqual(5);
    for (const f of files) {
      const doc = JSON.parse(readFileSync(join(dir, f), 'utf8'));
      expect(checkSchema(schema, doc), f).toEqual([]);
      expect(validatorAccepts(doc), f).toBe(true);
    }
  });

  for (const [name, breakIt] of broken) {
    it(`both refuse: ${name}`, () => {
      const doc = good();
      breakIt(doc);
      expect(schemaAccepts(doc)).toBe(false);
      expect(validatorAccepts(doc)).toBe(false);
    });
  }

  it('the mini checker itself refuses what it should (sanity of the reference)', () => {
    expect(checkSchema({ type: 'number', exclusiveMinimum: 0 }, 0)).toHaveLength(1);
    expect(checkSchema({ type: 'number', minimum: 0 }, 0)).toEqual([]);
    expect(checkSchema({ oneOf: [{ type: 'string' }, { type: 'string' }] }, 'x')).toHaveLength(1);
    expect(() => checkSchema({ uniqueItems: true }, [])).toThrow(/unsupported keyword/);
  });

  it('cross-field rules are the validator’s alone (documented limit of the schema)', () => {
    const unknownClass = good();
    unknownClass.compatibilities.push(['icu-day', 'theatre']);
    const duplicateId = good();
    duplicateId.classes.push({ id: 'icu-day', rate: 1 });
    const candidateIsCompatibility = good();
    candidateIsCompatibility.candidates.push({ pair: ['icu-night', 'icu-day'], cost: 1 });
    for (const doc of [unknownClass, duplicateId, candidateIsCompatibility]) {
      expect(schemaAccepts(doc)).toBe(true);
      expect(validatorAccepts(doc)).toBe(false);
    }
  });
});
