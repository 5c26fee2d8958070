/**
 * A tiny JSON Schema (draft 2020-12) checker for the keywords docs/scenario.schema.json uses, written
 * from the keyword definitions of "JSON Schema Validation" (draft 2020-12) and "JSON Schema Core"
 * (prefixItems/items, $ref to #/$defs). It throws on any keyword it does not know, so the schema
 * cannot silently rely on something this checker skips.
 */
type Schema = boolean | { readonly [k: string]: unknown };

const ANNOTATIONS = new Set(['$schema', '$defs', '$comment', 'title', 'description']);
const KEYWORDS = new Set([
  'type',
  'required',
  'properties',
  'additionalProperties',
  'items',
  'prefixItems',
  'minItems',
  'maxItems',
  'minimum',
  'exclusiveMinimum',
  'maximum',
  'exclusiveMaximum',
  'minLength',
  'maxLength',
  'pattern',
  'oneOf',
  'anyOf',
  'propertyNames',
  '$ref',
]);

const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

function typeOk(type: string, v: unknown): boolean {
  switch (type) {
    case 'object':
      return isObject(v);
    case 'array':
      return Array.isArray(v);
    case 'string':
      return typeof v === 'string';
    case 'number':
      return typeof v === 'number' && Number.isFinite(v);
    case 'integer':
      return typeof v === 'number' && Number.isInteger(v);
    case 'boolean':
      return typeof v === 'boolean';
    case 'null':
      return v === null;
    default:
      throw new Error(`mini-schema: unknown type ${type}`);
  }
}

/** Returns the list of failures (JSON-pointer-ish path + keyword); empty = valid. */
export function checkSchema(root: Schema, value: unknown): string[] {
  const errors: string[] = [];
  const resolve = (ref: string): Schema => {
    const m = /^#\/\$defs\/([A-Za-z0-9_-]+)$/.exec(ref);
    if (!m || !isObject(root) || !isObject(root.$defs) || !(m[1]! in root.$defs)) throw new Error(`mini-schema: cannot resolve ${ref}`);
    return root.$defs[m[1]!] as Schema;
  };
  const check = (s: Schema, v: unknown, path: string, out: string[]): void => {
    if (s === true) return;
    if (s === false) {
      out.push(`${path}: false schema`);
      return;
    }
    for (const k of Object.keys(s)) if (!KEYWORDS.has(k) && !ANNOTATIONS.has(k)) throw new Error(`mini-schema: unsupported keyword ${k}`);
    if (typeof s.$ref === 'string') check(resolve(s.$ref), v, path, out);
    if (typeof s.type === 'string' && !typeOk(s.type, v)) {
      out.push(`${path}: type ${s.type}`);
      return;
    }
    if (Array.isArray(s.oneOf)) {
      const passing = s.oneOf.filter((sub) => {
        const o: string[] = [];
        check(sub as Schema, v, path, o);
        return o.length === 0;
      }).length;
      if (passing !== 1) out.push(`${path}: oneOf (${passing} branches pass)`);
    }
    if (Array.isArray(s.anyOf)) {
      const passing = s.anyOf.some((sub) => {
        const o: string[] = [];
        check(sub as Schema, v, path, o);
        return o.length === 0;
      });
      if (!passing) out.push(`${path}: anyOf (no branch passes)`);
    }
    if (typeof v === 'number') {
      if (typeof s.minimum === 'number' && !(v >= s.minimum)) out.push(`${path}: minimum`);
      if (typeof s.exclusiveMinimum === 'number' && !(v > s.exclusiveMinimum)) out.push(`${path}: exclusiveMinimum`);
      if (typeof s.maximum === 'number' && !(v <= s.maximum)) out.push(`${path}: maximum`);
      if (typeof s.exclusiveMaximum === 'number' && !(v < s.exclusiveMaximum)) out.push(`${path}: exclusiveMaximum`);
    }
    if (typeof v === 'string') {
      if (typeof s.pattern === 'string' && !new RegExp(s.pattern, 'u').test(v)) out.push(`${path}: pattern`);
      // lengths count code points ("JSON Schema Validation" 6.3.1)
      if (typeof s.minLength === 'number' && [...v].length < s.minLength) out.push(`${path}: minLength`);
      if (typeof s.maxLength === 'number' && [...v].length > s.maxLength) out.push(`${path}: maxLength`);
    }
    if (Array.isArray(v)) {
      if (typeof s.minItems === 'number' && v.length < s.minItems) out.push(`${path}: minItems`);
      if (typeof s.maxItems === 'number' && v.length > s.maxItems) out.push(`${path}: maxItems`);
      const prefix = Array.isArray(s.prefixItems) ? (s.prefixItems as Schema[]) : [];
      v.forEach((item, i) => {
        if (i < prefix.length) check(prefix[i]!, item, `${path}/${i}`, out);
        else if (s.items !== undefined) check(s.items as Schema, item, `${path}/${i}`, out);
      });
    }
    if (isObject(v)) {
      if (Array.isArray(s.required)) for (const r of s.required as string[]) if (!Object.hasOwn(v, r)) out.push(`${path}: required ${r}`);
      const props = isObject(s.properties) ? s.properties : {};
      if (s.propertyNames !== undefined) for (const k of Object.keys(v)) check(s.propertyNames as Schema, k, `${path}/${k}`, out);
      for (const [k, item] of Object.entries(v)) {
        if (Object.hasOwn(props, k)) check(props[k] as Schema, item, `${path}/${k}`, out);
        else if (s.additionalProperties !== undefined) check(s.additionalProperties as Schema, item, `${path}/${k}`, out);
      }
    }
  };
  check(root, value, '', errors);
  return errors;
}
