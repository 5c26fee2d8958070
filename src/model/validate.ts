import { InvalidScenarioError, type ScenarioProblem } from '../errors.js';
import { locateJsonError } from './json-locate.js';
import { pairKey, type CandidateSpec, type ClassSpec, type CompatibilitySpec, type Scenario } from './scenario.js';

const KNOWN_TOP = new Set(['name', 'timeUnit', 'classes', 'compatibilities', 'candidates', 'budget']);

const isObj = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
const show = (v: unknown): string => (v === undefined ? 'missing' : JSON.stringify(v) ?? String(v));

/**
 * Parses and validates the text of a scenario file. Reports every problem at once by throwing
 * InvalidScenarioError (malformed JSON gives line and column).
 */
export function parseScenario(text: string, source?: string): Scenario {
  let doc: unknown;
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1); // byte-order mark left by some editors
  try {
    doc = JSON.parse(text);
  } catch (e) {
    const where = locateJsonError(text);
    const message = where
      ? `malformed JSON at line ${where.line}, column ${where.column}: ${where.message}`
      : `malformed JSON: ${(e as Error).message}`;
    throw new InvalidScenarioError([{ path: '', message }], source);
  }
  return validateScenario(doc, source);
}

/** Validates an already-parsed scenario object; throws InvalidScenarioError listing every problem. */
export function validateScenario(doc: unknown, source?: string): Scenario {
  const problems: ScenarioProblem[] = [];
  const bad = (path: string, message: string): void => {
    problems.push({ path, message });
  };
  if (!isObj(doc)) {
    throw new InvalidScenarioError([{ path: '', message: `a scenario must be a JSON object, found ${Array.isArray(doc) ? 'an array' : show(doc)}` }], source);
  }

  const name = doc.name === undefined ? 'unnamed scenario' : doc.name;
  if (typeof name !== 'string') bad('name', `must be a string, found ${show(doc.name)}`);
  const timeUnit = doc.timeUnit === undefined ? 'time unit' : doc.timeUnit;
  if (typeof timeUnit !== 'string' || timeUnit.trim() === '') bad('timeUnit', `must be a non-empty string such as "hour", found ${show(doc.timeUnit)}`);

  // ---- classes
  const classes: ClassSpec[] = [];
  const ids = new Set<string>();
  if (doc.classes === undefined) bad('classes', 'missing: list the item classes, e.g. [{"id": "north", "rate": 12.5}]');
  else if (!Array.isArray(doc.classes)) bad('classes', `must be an array, found ${show(doc.classes)}`);
  else {
    if (doc.classes.length === 0) bad('classes', 'empty model: at least one class is needed');
    doc.classes.forEach((c: unknown, i: number) => {
      const p = `classes[${i}]`;
      if (!isObj(c)) {
        bad(p, `must be an object like {"id": "north", "rate": 12.5}, found ${show(c)}`);
        return;
      }
      let ok = true;
      if (c.id === undefined) {
        bad(`${p}.id`, 'missing class id');
        ok = false;
      } else if (typeof c.id !== 'string' || c.id.trim() === '') {
        bad(`${p}.id`, `must be a non-empty string, found ${show(c.id)}`);
        ok = false;
      } else if (ids.has(c.id)) {
        bad(`${p}.id`, `duplicate class id "${c.id}"`);
        ok = false;
      }
      if (c.rate === undefined) {
        bad(`${p}.rate`, `rate missing for class ${show(c.id)}`);
        ok = false;
      } else if (typeof c.rate !== 'number' || !Number.isFinite(c.rate)) {
        bad(`${p}.rate`, `rate must be a finite number, found ${show(c.rate)}`);
        ok = false;
      } else if (c.rate <= 0) {
        bad(`${p}.rate`, `rate must be > 0, found ${c.rate}${c.rate === 0 ? ' (drop the class instead)' : ''}`);
        ok = false;
      }
      if (c.label !== undefined && typeof c.label !== 'string') bad(`${p}.label`, `must be a string, found ${show(c.label)}`);
      if (c.patience !== undefined && (typeof c.patience !== 'number' || !Number.isFinite(c.patience) || c.patience <= 0)) {
        bad(`${p}.patience`, `mean patience must be a finite number > 0, found ${show(c.patience)}`);
        ok = false;
      }
      if (typeof c.id === 'string' && c.id.trim() !== '') ids.add(c.id);
      if (ok) classes.push({ ...c, id: c.id as string, rate: c.rate as number } as ClassSpec);
    });
  }

  // ---- pairs (shared by compatibilities and candidates)
  const seen = new Map<string, string>();
  const readPair = (v: unknown, path: string): [string, string] | undefined => {
    if (!Array.isArray(v) || v.length !== 2 || typeof v[0] !== 'string' || typeof v[1] !== 'string') {
      bad(path, `a pair must be two class ids like ["north", "centre"], found ${show(v)}`);
      return undefined;
    }
    let ok = true;
    for (const id of new Set(v as string[])) {
      if (!ids.has(id)) {
        bad(path, `unknown class "${id}"${ids.size > 0 ? ` (known: ${[...ids].slice(0, 8).join(', ')}${ids.size > 8 ? ', …' : ''})` : ''}`);
        ok = false;
      }
    }
    return ok ? [v[0], v[1]] : undefined;
  };
  const nonNegative = (v: unknown, path: string, what: string): number | undefined => {
    if (v === undefined) return 0;
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      bad(path, `${what} must be a finite number, found ${show(v)}`);
      return undefined;
    }
    if (v < 0) {
      bad(path, `${what} must be >= 0, found ${v}`);
      return undefined;
    }
    return v;
  };

  const compatibilities: CompatibilitySpec[] = [];
  if (doc.compatibilities !== undefined && !Array.isArray(doc.compatibilities)) {
    bad('compatibilities', `must be an array of pairs, found ${show(doc.compatibilities)}`);
  } else {
    ((doc.compatibilities as unknown[] | undefined) ?? []).forEach((c, i) => {
      const p = `compatibilities[${i}]`;
      let pair: [string, string] | undefined;
      let removable = false;
      let saving: number | undefined = 0;
      let rest: Record<string, unknown> = {};
      if (Array.isArray(c)) pair = readPair(c, p);
      else if (isObj(c)) {
        pair = readPair(c.pair, `${p}.pair`);
        if (c.removable !== undefined && typeof c.removable !== 'boolean') bad(`${p}.removable`, `must be true or false, found ${show(c.removable)}`);
        removable = c.removable === true;
        saving = nonNegative(c.saving, `${p}.saving`, 'saving');
        rest = c;
      } else {
        bad(p, `must be a pair ["a", "b"] or an object {"pair": ["a", "b"], "removable": true, "saving": 5}, found ${show(c)}`);
        return;
      }
      if (!pair) return;
      const key = pairKey(pair[0], pair[1]);
      const prev = seen.get(key);
      if (prev !== undefined) {
        bad(p, `duplicate pair ${show(pair)}: already given at ${prev}`);
        return;
      }
      seen.set(key, p);
      if (saving === undefined) return;
      compatibilities.push({ ...rest, pair, removable, saving });
    });
  }

  const candidates: CandidateSpec[] = [];
  if (doc.candidates !== undefined && !Array.isArray(doc.candidates)) {
    bad('candidates', `must be an array of {"pair": [...], "cost": ...}, found ${show(doc.candidates)}`);
  } else {
    ((doc.candidates as unknown[] | undefined) ?? []).forEach((c, i) => {
      const p = `candidates[${i}]`;
      if (!isObj(c)) {
        bad(p, `must be an object {"pair": ["a", "b"], "cost": 40}, found ${show(c)}`);
        return;
      }
      const pair = readPair(c.pair, `${p}.pair`);
      if (c.cost === undefined) bad(`${p}.cost`, 'cost missing');
      const cost = c.cost === undefined ? undefined : nonNegative(c.cost, `${p}.cost`, 'cost');
      if (!pair) return;
      const key = pairKey(pair[0], pair[1]);
      const prev = seen.get(key);
      if (prev !== undefined) {
        bad(p, prev.startsWith('compatibilities')
          ? `candidate ${show(pair)} is already a compatibility (${prev})`
          : `duplicate pair ${show(pair)}: already given at ${prev}`);
        return;
      }
      seen.set(key, p);
      if (cost === undefined) return;
      candidates.push({ ...c, pair, cost });
    });
  }

  let budget: number | undefined;
  if (doc.budget !== undefined) {
    if (typeof doc.budget !== 'number' || !Number.isFinite(doc.budget) || doc.budget < 0) bad('budget', `must be a finite number >= 0, found ${show(doc.budget)}`);
    else budget = doc.budget;
  }

  if (problems.length > 0) throw new InvalidScenarioError(problems, source);
  // fromEntries defines own properties, so even a "__proto__" key is kept as data
  const extra: Record<string, unknown> = Object.fromEntries(Object.entries(doc).filter(([k]) => !KNOWN_TOP.has(k)));
  return {
    name: name as string,
    timeUnit: timeUnit as string,
    classes,
    compatibilities,
    candidates,
    ...(budget === undefined ? {} : { budget }),
    extra,
  };
}
