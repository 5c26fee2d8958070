/**
 * Turns the issues of the zod schema (schema.ts) into edgewise's problems: one plain sentence per
 * problem, with its JSON path, the bad value shown by a bounded preview, and for an unknown key the
 * closest known key ("did you mean `waitTarget`?").
 */
import { distance } from 'fastest-levenshtein';
import type * as z from 'zod';
import { preview, type PathStep } from './preview.js';
import { KNOWN_KEYS } from './schema.js';

/** A problem before its path is formatted. */
export interface RawProblem {
  readonly path: readonly PathStep[];
  readonly message: string;
}

type Issue = z.core.$ZodIssue;

/** The value at `path` in the document, or undefined. */
export function valueAt(doc: unknown, path: readonly PathStep[]): unknown {
  let v = doc;
  for (const step of path) {
    if (typeof v !== 'object' || v === null) return undefined;
    if (!Object.prototype.hasOwnProperty.call(v, step)) return undefined;
    v = (v as Record<string | number, unknown>)[step];
  }
  return v;
}

/** Which kind of object sits at a path (for the known keys). */
function objectKind(path: readonly PathStep[]): keyof typeof KNOWN_KEYS | undefined {
  if (path.length === 0) return 'scenario';
  if (path.length !== 2 || typeof path[1] !== 'number') return undefined;
  switch (path[0]) {
    case 'classes':
      return 'class';
    case 'compatibilities':
      return 'compatibility';
    case 'candidates':
      return 'candidate';
    case 'mustKeep':
    case 'forbidden':
      return 'rule';
    default:
      return undefined;
  }
}

/** The known key closest to `key`: same letters ignoring case, or at most a small edit distance. */
export function closestKey(key: string, known: readonly string[]): string | undefined {
  if (key.length > 100) return undefined;
  const lower = key.toLowerCase();
  const same = known.find((k) => k.toLowerCase() === lower);
  if (same) return same;
  let best: string | undefined;
  let bestD = Infinity;
  for (const k of known) {
    const d = distance(lower, k.toLowerCase());
    if (d < bestD) {
      bestD = d;
      best = k;
    }
  }
  const allowed = Math.max(1, Math.floor(Math.min(key.length, best?.length ?? 0) / 3));
  return bestD <= allowed ? best : undefined;
}

function unknownKey(key: string, known: readonly string[] | undefined): string {
  const shown = preview(key);
  const close = known ? closestKey(key, known) : undefined;
  if (close) return `unknown field ${shown}: did you mean \`${close}\`?`;
  const list = known ? ` (known: ${known.filter((k) => k !== '$schema').join(', ')})` : '';
  return `unknown field ${shown}${list}; put data of your own under "data"`;
}

const PAIR = 'a pair must be two class ids like ["north", "centre"]';

/** Field names and the rule each number field follows, for messages. */
const NUMBER_RULE: Record<string, { readonly label: string; readonly rule: string }> = {
  rate: { label: 'rate ', rule: '> 0' },
  cost: { label: 'cost ', rule: '>= 0' },
  saving: { label: 'saving ', rule: '>= 0' },
  budget: { label: '', rule: '>= 0' },
  waitingCost: { label: '', rule: '>= 0' },
  patience: { label: 'mean patience ', rule: '> 0' },
  weight: { label: '', rule: '>= 0' },
  waitTarget: { label: 'mean wait target ', rule: '> 0 (time units)' },
  maxCompatibilities: { label: '', rule: 'a whole number >= 0' },
  maxAbandonment: { label: 'the abandonment share ', rule: 'in [0, 1)' },
  value: { label: 'value ', rule: 'any finite number' },
};

function numberRule(path: readonly PathStep[]): { label: string; rule: string } {
  const last = path[path.length - 1];
  if (path[0] === 'demand') return { label: 'rate ', rule: '>= 0 (0: no arrivals in this variant)' };
  if (typeof last === 'number' && path[path.length - 2] === 'rateCi95') return { label: 'an interval end ', rule: '>= 0' };
  return (typeof last === 'string' ? NUMBER_RULE[last] : undefined) ?? { label: '', rule: 'any finite number' };
}

/** The message for a wrong type or a missing value at `path`. */
function typeMessage(path: readonly PathStep[], expected: string, found: unknown): string {
  const last = path[path.length - 1];
  const parent = path[path.length - 2];
  const f = preview(found);
  if (found === undefined) {
    if (last === 'id') return 'missing class id';
    if (last === 'classes') return 'missing: list the item classes, e.g. [{"id": "north", "rate": 12.5}]';
    if (last === 'pair') return `missing: ${PAIR}`;
    return `${typeof last === 'string' ? last : 'value'} missing`;
  }
  switch (expected) {
    case 'number':
    case 'int': {
      const { label, rule } = numberRule(path);
      if (last === 'maxCompatibilities') return `must be a whole number >= 0, found ${f}`;
      return `${label}must be a finite number${rule === 'any finite number' ? '' : ` ${rule}`}, found ${f}`;
    }
    case 'string':
      if (last === 'id') return `must be a non-empty string, found ${f}`;
      if (last === 'timeUnit') return `must be a non-empty string such as "hour", found ${f}`;
      return `must be a string, found ${f}`;
    case 'boolean':
      return `must be true or false, found ${f}`;
    case 'tuple':
      return last === 'rateCi95' ? `must be two numbers [low, high], found ${f}` : `${PAIR}, found ${f}`;
    case 'array':
      if (last === 'compatibilities') return `must be an array of pairs, found ${f}`;
      if (last === 'candidates') return `must be an array of {"pair": [...], "cost": ...}, found ${f}`;
      if (last === 'mustKeep' || last === 'forbidden') return `must be an array of pairs like [["north", "centre"]], found ${f}`;
      return `must be an array, found ${f}`;
    case 'object':
    case 'record':
      if (parent === 'classes') return `must be an object like {"id": "north", "rate": 12.5}, found ${f}`;
      if (parent === 'candidates') return `must be an object {"pair": ["a", "b"], "cost": 40}, found ${f}`;
      if (last === 'demand' && path.length === 1) return `must be an object of named rate sets like {"peak": {"north": 12}}, found ${f}`;
      if (path[0] === 'demand' && path.length === 2) return `must be an object mapping class ids to rates, found ${f}`;
      if (last === 'data') return `must be an object (data of your own, any JSON object), found ${f}`;
      if (path.length === 0) return `a scenario must be a JSON object, found ${f}`;
      return `must be an object, found ${f}`;
    default:
      return `must be ${expected}, found ${f}`;
  }
}

function rangeMessage(path: readonly PathStep[], found: unknown): string {
  const { label, rule } = numberRule(path);
  const last = path[path.length - 1];
  if (last === 'maxCompatibilities') return `must be a whole number >= 0, found ${preview(found)}`;
  return label === '' ? `must be a finite number ${rule}, found ${preview(found)}` : `${label}must be ${rule}, found ${preview(found)}`;
}

/** Index of the step `pair` in a path (issues inside a pair are reported once, on the pair). */
function pairPrefix(path: readonly PathStep[]): readonly PathStep[] | undefined {
  const j = path.indexOf('pair');
  if (j >= 0 && j < path.length - 1) return path.slice(0, j + 1);
  // a bare pair written directly as a compatibility / rule: compatibilities[i][k]
  if (path.length >= 3 && typeof path[1] === 'number' && typeof path[2] === 'number' && ['compatibilities', 'mustKeep', 'forbidden'].includes(path[0] as string)) {
    return path.slice(0, 2);
  }
  return undefined;
}

/** Problems for one zod issue; `doc` is the raw document (for the values found). */
export function issueProblems(issue: Issue, doc: unknown, prefix: readonly PathStep[] = []): RawProblem[] {
  const path = [...prefix, ...(issue.path as PathStep[])];
  const inPair = pairPrefix(path);
  if (inPair) return [{ path: inPair, message: `${PAIR}, found ${preview(valueAt(doc, inPair))}` }];
  const found = valueAt(doc, path);
  switch (issue.code) {
    case 'unrecognized_keys': {
      const kind = objectKind(path);
      return issue.keys.map((key) => ({ path: [...path, key], message: unknownKey(key, kind ? KNOWN_KEYS[kind] : undefined) }));
    }
    case 'invalid_type':
      return [{ path, message: typeMessage(path, issue.expected, found) }];
    case 'too_small':
    case 'too_big':
      if (issue.origin === 'number' || issue.origin === 'int') return [{ path, message: rangeMessage(path, found) }];
      if (issue.origin === 'array' && path[path.length - 1] === 'classes') return [{ path, message: 'empty model: at least one class is needed' }];
      if (issue.origin === 'array' && path[path.length - 1] === 'rateCi95') return [{ path, message: `must be two numbers [low, high], found ${preview(found)}` }];
      if (issue.origin === 'array') return [{ path, message: `${PAIR}, found ${preview(found)}` }];
      if (issue.origin === 'string' && issue.code === 'too_big') {
        return [{ path, message: `${(found as string).length} characters: longer than the limit of ${String(issue.maximum)}` }];
      }
      return [{ path, message: `${issue.message}, found ${preview(found)}` }];
    case 'invalid_format': {
      const last = path[path.length - 1];
      if (last === 'timeUnit') return [{ path, message: `must be a non-empty string such as "hour", found ${preview(found)}` }];
      return [{ path, message: `must be a non-empty string, found ${preview(found)}` }];
    }
    case 'invalid_union': {
      // the bare-pair branch for an array, the object branch for an object
      if (Array.isArray(found)) return [{ path, message: `${PAIR}, found ${preview(found)}` }];
      if (typeof found === 'object' && found !== null) return issue.errors[1]!.flatMap((i) => issueProblems(i, doc, path));
      const what = path[0] === 'compatibilities' ? '{"pair": ["a", "b"], "removable": true, "saving": 5}' : '{"pair": ["a", "b"], "reason": "…"}';
      return [{ path, message: `must be a pair ["a", "b"] or an object ${what}, found ${preview(found)}` }];
    }
    default:
      return [{ path, message: `${issue.message}, found ${preview(found)}` }];
  }
}
