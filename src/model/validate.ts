/**
 * Reading a scenario: the whole file is validated once, up front, the same way for every command.
 * Size limits first (limits.ts: refused at once, naming the limit), then the field rules of the one
 * schema (schema.ts) and the cross-field rules (cross-checks.ts), every problem listed at once with
 * its JSON path, in document order. Malformed JSON gives line and column (json-locate.ts).
 */
import { InvalidScenarioError, type ScenarioProblem } from '../errors.js';
import { crossChecks } from './cross-checks.js';
import { locateJsonError } from './json-locate.js';
import { ARRAY_LIMITS, LIMITS } from './limits.js';
import { formatPath, preview, type PathStep } from './preview.js';
import type { CompatibilitySpec, DemandVariantSpec, RuleSpec, Scenario } from './scenario.js';
import { scenarioFileSchema } from './schema.js';
import { issueProblems, type RawProblem } from './schema-messages.js';

const isObj = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/**
 * Parses and validates the text of a scenario file. Reports every problem at once by throwing
 * InvalidScenarioError (malformed JSON gives line and column).
 */
export function parseScenario(text: string, source?: string): Scenario {
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1); // byte-order mark left by some editors
  if (text.length > LIMITS.fileChars) {
    throw new InvalidScenarioError([{ path: '', message: `the file has ${text.length.toLocaleString('en-US')} characters, more than the limit of ${LIMITS.fileChars.toLocaleString('en-US')} (16 MiB)` }], source);
  }
  let doc: unknown;
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

/**
 * The first place where the document is nested deeper than LIMITS.depth or holds more than
 * LIMITS.values values (an explicit stack: no recursion), or undefined.
 */
function depthProblem(doc: unknown): ScenarioProblem | undefined {
  const stack: Array<{ v: unknown; depth: number; path: readonly PathStep[] | undefined }> = [{ v: doc, depth: 1, path: [] }];
  let values = 0;
  while (stack.length > 0) {
    const { v, depth, path } = stack.pop()!;
    if (++values > LIMITS.values) return { path: '', message: `more than ${LIMITS.values.toLocaleString('en-US')} values in the document: over the limit` };
    if (typeof v !== 'object' || v === null) continue;
    if (depth > LIMITS.depth) {
      return { path: path ? formatPath(path) : '', message: `nested deeper than the limit of ${LIMITS.depth} levels of arrays and objects` };
    }
    // paths are kept for the first few levels only (enough to point at the place)
    const keep = depth < 8 && path !== undefined;
    if (Array.isArray(v)) for (let i = v.length - 1; i >= 0; i--) stack.push({ v: v[i], depth: depth + 1, path: keep ? [...path, i] : path });
    else for (const k in v) if (Object.prototype.hasOwnProperty.call(v, k)) stack.push({ v: (v as Record<string, unknown>)[k], depth: depth + 1, path: keep ? [...path, k] : path });
  }
  return undefined;
}

/** Problems of the size limits on entry counts (checked before anything else reads the entries). */
function sizeProblems(doc: Record<string, unknown>): ScenarioProblem[] {
  const out: ScenarioProblem[] = [];
  for (const [field, limit] of ARRAY_LIMITS) {
    const v = doc[field];
    if (Array.isArray(v) && v.length > limit) {
      out.push({ path: field, message: `${v.length.toLocaleString('en-US')} entries: more than the limit of ${limit.toLocaleString('en-US')} ${field}` });
    }
  }
  const demand = doc.demand;
  if (isObj(demand)) {
    let count = 0;
    for (const k in demand) if (Object.prototype.hasOwnProperty.call(demand, k) && ++count > LIMITS.demandVariants) break;
    if (count > LIMITS.demandVariants) out.push({ path: 'demand', message: `more than the limit of ${LIMITS.demandVariants} demand variants` });
  }
  return out;
}

/** Sorts problems in document order: keys in the order written, entries by index, then as found. */
function inDocumentOrder(doc: unknown, problems: RawProblem[]): RawProblem[] {
  const keyIndex = new WeakMap<object, Map<string, number>>();
  const orderOf = (path: readonly PathStep[]): number[] => {
    const out: number[] = [];
    let v: unknown = doc;
    for (const step of path) {
      if (typeof v !== 'object' || v === null) break;
      if (typeof step === 'number') out.push(step);
      else {
        let m = keyIndex.get(v);
        if (!m) {
          m = new Map(Object.keys(v).map((k, i) => [k, i] as const));
          keyIndex.set(v, m);
        }
        out.push(m.get(step) ?? Number.MAX_SAFE_INTEGER);
      }
      v = Object.prototype.hasOwnProperty.call(v, step) ? (v as Record<string | number, unknown>)[step] : undefined;
    }
    return out;
  };
  const keyed = problems.map((p, i) => ({ p, i, order: orderOf(p.path) }));
  keyed.sort((a, b) => {
    const n = Math.min(a.order.length, b.order.length);
    for (let k = 0; k < n; k++) if (a.order[k] !== b.order[k]) return a.order[k]! - b.order[k]!;
    return a.i - b.i;
  });
  return keyed.map((k) => k.p);
}

/** Validates an already-parsed scenario object; throws InvalidScenarioError listing every problem. */
export function validateScenario(doc: unknown, source?: string): Scenario {
  if (!isObj(doc)) {
    throw new InvalidScenarioError([{ path: '', message: `a scenario must be a JSON object, found ${Array.isArray(doc) ? 'an array' : preview(doc)}` }], source);
  }
  // entry counts past a limit are refused at once (that is what keeps huge files fast); a value
  // nested too deep is one more problem (nothing below walks a value recursively)
  const sizes = sizeProblems(doc);
  if (sizes.length > 0) throw new InvalidScenarioError(sizes, source);
  const deep = depthProblem(doc);

  // jitless: a file is parsed once per process, and zod's compiled fast path for object shapes costs
  // more to build than it saves on one parse (measured: 3.8 against 2.0 ms on a 15-class file)
  const parsed = scenarioFileSchema.safeParse(doc, { jitless: true });
  const raw: RawProblem[] = parsed.success ? [] : parsed.error.issues.flatMap((issue) => issueProblems(issue, doc));
  raw.push(...crossChecks(doc));
  if (raw.length > 0 || !parsed.success || deep) {
    const seen = new Set<string>();
    const problems: ScenarioProblem[] = deep ? [deep] : [];
    for (const p of inDocumentOrder(doc, raw)) {
      const path = formatPath(p.path);
      const key = `${path}\u0000${p.message}`;
      if (seen.has(key)) continue;
      seen.add(key);
      problems.push({ path, message: p.message });
    }
    throw new InvalidScenarioError(problems, source);
  }
  const file = parsed.data;
  const compatibilities: CompatibilitySpec[] = (file.compatibilities ?? []).map((c) =>
    Array.isArray(c) ? { pair: [c[0], c[1]], removable: false, saving: 0 } : { ...c, removable: c.removable ?? false, saving: c.saving ?? 0 },
  );
  const rule = (r: NonNullable<typeof file.mustKeep>[number]): RuleSpec => (Array.isArray(r) ? { pair: [r[0], r[1]] } : r);
  // demand comes from the raw document, so that a class id such as "__proto__" is kept
  const rawDemand = isObj(doc.demand) ? doc.demand : {};
  const demand: DemandVariantSpec[] = Object.keys(rawDemand).map((name) => ({
    name,
    rates: Object.fromEntries(Object.entries(rawDemand[name] as Record<string, number>)),
  }));
  const { $schema: _ignored, name, timeUnit, classes, compatibilities: _c, candidates, mustKeep, forbidden, demand: _d, ...rest } = file;
  void _ignored;
  void _c;
  void _d;
  return {
    ...rest,
    name: name ?? 'unnamed scenario',
    timeUnit: timeUnit ?? 'time unit',
    classes,
    compatibilities,
    candidates: candidates ?? [],
    mustKeep: (mustKeep ?? []).map(rule),
    forbidden: (forbidden ?? []).map(rule),
    demand,
  };
}
