/**
 * The scenario file format, declared once (zod). From this one declaration come
 * - the field-level validation of every command (src/model/validate.ts runs it once, up front,
 *   then the cross-field checks of cross-checks.ts);
 * - the TypeScript types of the validated scenario (src/model/scenario.ts);
 * - docs/scenario.schema.json for editors (`npm run schema`, checked by tests/model/schema.test.ts).
 *
 * Every object is strict: an unknown key is refused (with a suggestion when a known key is close),
 * and users' own data goes under `data`, the one free-form place on the document, on classes, on
 * compatibilities and on candidates. Messages are written by schema-messages.ts from the issue
 * codes, so the declaration below only states the rules.
 */
import * as z from 'zod';
import { LIMITS } from './limits.js';

const text = (description: string) => z.string().max(LIMITS.textChars).meta({ description });
const classId = z
  .string()
  .max(LIMITS.idChars)
  .regex(/\S/)
  .meta({ description: 'a class id: a non-empty string, unique among the classes' });
const finite = (description: string) => z.number().meta({ description });
const nonNegative = (description: string) => z.number().min(0).meta({ description });
const positive = (description: string) => z.number().gt(0).meta({ description });
const data = z
  .record(z.string(), z.unknown())
  .meta({ description: "free-form data of your own (any JSON object); edgewise keeps it and never reads it" });

/** Two class ids; order does not matter, `["a", "a"]` is a self-loop (items of a match each other). */
export const pairSchema = z.tuple([classId, classId]).meta({ description: 'two class ids; ["a", "a"] means items of class a match each other' });

export const classSchema = z.strictObject({
  id: classId,
  rate: positive('Poisson arrival rate per time unit, finite and > 0'),
  label: text('a display name for people').optional(),
  group: text('a group the class belongs to (a unit, a region, a tier…), for reports').optional(),
  note: text('a remark for people').optional(),
  patience: positive('mean patience in time units (exponential): items leave after it; simulated figures only').optional(),
  weight: nonNegative('weight in the weighted objective of recommend (default 1)').optional(),
  waitTarget: positive('recommend: the mean wait of the class must stay at or below this (time units)').optional(),
  maxCompatibilities: z.int().min(0).meta({ description: 'recommend: at most this many compatibilities touch the class (a self-loop counts once)' }).optional(),
  maxAbandonment: z.number().min(0).lt(1).meta({ description: 'a limit on the share of the class’s arrivals that abandon, in [0, 1); needs a patience; judged on simulated figures' }).optional(),
  rateCi95: z
    .tuple([nonNegative('low end'), nonNegative('high end')])
    .meta({ description: '95 % interval [low, high] of a fitted rate, low <= rate <= high' })
    .optional(),
  data: data.optional(),
});

export const compatibilityObjectSchema = z.strictObject({
  pair: pairSchema,
  removable: z.boolean().meta({ description: 'may a design drop this compatibility? (default false)' }).optional(),
  saving: nonNegative('what dropping it saves (default 0)').optional(),
  value: finite('value per match along this pair (revenue, fit; negative for a detour)').optional(),
  note: text('a remark for people').optional(),
  data: data.optional(),
});

/** A compatibility: a bare pair, or the object form. */
export const compatibilitySchema = z.union([pairSchema, compatibilityObjectSchema]);

export const candidateSchema = z.strictObject({
  pair: pairSchema,
  cost: nonNegative('what enabling it costs'),
  value: finite('value per match along this pair (revenue, fit; negative for a detour)').optional(),
  note: text('a remark for people').optional(),
  data: data.optional(),
});

export const ruleObjectSchema = z.strictObject({
  pair: pairSchema,
  reason: text('why the rule exists, for people').optional(),
});

/** A mustKeep / forbidden entry: a bare pair, or {"pair": [...], "reason": "..."}. */
export const ruleSchema = z.union([pairSchema, ruleObjectSchema]);

/** One named rate set: class id → rate (0 = no arrivals of that class in the variant). */
export const demandRatesSchema = z.record(z.string(), nonNegative('the class’s rate in this variant; 0 = no arrivals'));

export const scenarioFileSchema = z
  .strictObject({
    $schema: z.string().meta({ description: 'path or URL of this schema, for editors; ignored' }).optional(),
    name: text('shown in reports (default "unnamed scenario")').optional(),
    timeUnit: text('unit of rates, waits and patience, e.g. "hour" (default "time unit")').regex(/\S/).optional(),
    description: text('a paragraph for the report').optional(),
    costUnit: text('the unit of costs, savings and the budget, e.g. "credits per week"').optional(),
    itemWord: text('what one item is called in reports, plural (e.g. "riders")').optional(),
    budget: nonNegative('what a recommended design may spend').optional(),
    waitingCost: nonNegative('cost per waiting item per time unit, traded against match value').optional(),
    classes: z.array(classSchema).min(1).meta({ description: 'the item classes, at least one' }),
    compatibilities: z.array(compatibilitySchema).meta({ description: 'which classes match (default none)' }).optional(),
    candidates: z.array(candidateSchema).meta({ description: 'compatibilities a design may add, with costs' }).optional(),
    mustKeep: z.array(ruleSchema).meta({ description: 'recommend: compatibilities no design may drop' }).optional(),
    forbidden: z.array(ruleSchema).meta({ description: 'recommend: pairs no design may contain' }).optional(),
    demand: z
      .record(z.string(), demandRatesSchema)
      .meta({ description: 'named rate sets: each overrides the rates of the classes it names ("today" is reserved)' })
      .optional(),
    data: data.optional(),
  })
  .meta({ title: 'edgewise scenario', description: 'A design of a dynamic matching system (see docs/scenario-format.md).' });

/** Known keys of each kind of object, for the "did you mean" suggestions. */
export const KNOWN_KEYS = {
  scenario: Object.keys(scenarioFileSchema.shape),
  class: Object.keys(classSchema.shape),
  compatibility: Object.keys(compatibilityObjectSchema.shape),
  candidate: Object.keys(candidateSchema.shape),
  rule: Object.keys(ruleObjectSchema.shape),
} as const;

/** The JSON Schema (draft 2020-12) of the file, as written to docs/scenario.schema.json. */
export function scenarioJsonSchema(): Record<string, unknown> {
  const schema = z.toJSONSchema(scenarioFileSchema, { target: 'draft-2020-12', io: 'input' }) as Record<string, unknown>;
  return {
    $schema: schema.$schema,
    ...schema,
    $comment:
      'Generated from src/model/schema.ts by `npm run schema`; do not edit. Cross-field rules (unknown class ids, duplicates, ' +
      'mustKeep/forbidden consistency, size limits) are checked by edgewise only.',
  };
}

/** The text of docs/scenario.schema.json (two-space indent, final newline). */
export function scenarioJsonSchemaText(): string {
  return `${JSON.stringify(scenarioJsonSchema(), null, 2)}\n`;
}

type DeepReadonly<T> = T extends readonly [infer A, infer B]
  ? readonly [DeepReadonly<A>, DeepReadonly<B>]
  : T extends ReadonlyArray<infer U>
    ? ReadonlyArray<DeepReadonly<U>>
    : T extends object
      ? { readonly [K in keyof T]: DeepReadonly<T[K]> }
      : T;

type FileOf<S extends z.ZodType> = z.output<S>;

/** Two class ids. */
export type IdPair = readonly [string, string];
export type ClassSpec = DeepReadonly<FileOf<typeof classSchema>>;
export type CompatibilitySpec = DeepReadonly<Omit<FileOf<typeof compatibilityObjectSchema>, 'removable' | 'saving'> & { removable: boolean; saving: number }>;
export type CandidateSpec = DeepReadonly<FileOf<typeof candidateSchema>>;
export type RuleSpec = DeepReadonly<FileOf<typeof ruleObjectSchema>>;
export interface DemandVariantSpec {
  readonly name: string;
  readonly rates: Readonly<Record<string, number>>;
}
type ScenarioFile = FileOf<typeof scenarioFileSchema>;
export type Scenario = DeepReadonly<
  Omit<ScenarioFile, '$schema' | 'name' | 'timeUnit' | 'classes' | 'compatibilities' | 'candidates' | 'mustKeep' | 'forbidden' | 'demand'>
> & {
  readonly name: string;
  readonly timeUnit: string;
  readonly classes: readonly ClassSpec[];
  readonly compatibilities: readonly CompatibilitySpec[];
  readonly candidates: readonly CandidateSpec[];
  readonly mustKeep: readonly RuleSpec[];
  readonly forbidden: readonly RuleSpec[];
  readonly demand: readonly DemandVariantSpec[];
};
