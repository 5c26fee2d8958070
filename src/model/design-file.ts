/**
 * A design file: a chosen design as changes to the scenario's design, written by
 * `recommend --save` and read by `--design FILE` on every command.
 *
 *   {"added": [["a", "b"]], "removed": [["c", "d"]]}
 *
 * The file `recommend --save` writes carries more (which scenario, cost, objective, figures, how it
 * was chosen); those fields are informative and checked for type only. Any other key is refused.
 */
import { InvalidScenarioError, type ScenarioProblem } from '../errors.js';
import { locateJsonError } from './json-locate.js';

export interface DesignFile {
  readonly added: ReadonlyArray<readonly [string, string]>;
  readonly removed: ReadonlyArray<readonly [string, string]>;
  /** The scenario's name, when the file says it. */
  readonly scenario?: string;
}

/** Keys `recommend --save` writes besides added/removed (informative). */
export const SAVED_DESIGN_KEYS = ['kind', 'scenario', 'objective', 'cost', 'backlog', 'objectiveValue', 'method', 'chosen', 'timeUnit', 'costUnit', 'budget'] as const;

const isObj = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

function preview(v: unknown): string {
  let s: string;
  try {
    s = typeof v === 'string' ? JSON.stringify(v) : Array.isArray(v) ? `an array of ${v.length}` : isObj(v) ? 'an object' : String(v);
  } catch {
    s = typeof v;
  }
  return s.length > 60 ? `${s.slice(0, 57)}…` : s;
}

/** Parses and checks a design file (throws InvalidScenarioError listing every problem). */
export function parseDesignFile(text: string, source: string): DesignFile {
  let doc: unknown;
  try {
    doc = JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
  } catch (e) {
    const where = locateJsonError(text);
    throw new InvalidScenarioError([{ path: '', message: where ? `malformed JSON at line ${where.line}, column ${where.column}: ${where.message}` : `malformed JSON: ${(e as Error).message}` }], source);
  }
  const problems: ScenarioProblem[] = [];
  if (!isObj(doc)) throw new InvalidScenarioError([{ path: '', message: `a design file is an object like {"added": [["a", "b"]], "removed": []}, found ${preview(doc)}` }], source);
  const pairs = (key: 'added' | 'removed'): Array<readonly [string, string]> => {
    const v = doc[key];
    if (v === undefined) return [];
    if (!Array.isArray(v)) {
      problems.push({ path: key, message: `must be an array of pairs like [["a", "b"]], found ${preview(v)}` });
      return [];
    }
    const out: Array<readonly [string, string]> = [];
    v.forEach((p: unknown, i: number) => {
      if (Array.isArray(p) && p.length === 2 && typeof p[0] === 'string' && typeof p[1] === 'string') out.push([p[0], p[1]]);
      else problems.push({ path: `${key}[${i}]`, message: `a pair is two class ids like ["a", "b"], found ${preview(p)}` });
    });
    return out;
  };
  const added = pairs('added');
  const removed = pairs('removed');
  for (const k of Object.keys(doc)) {
    if (k === 'added' || k === 'removed' || (SAVED_DESIGN_KEYS as readonly string[]).includes(k)) continue;
    const close = ['added', 'removed', ...SAVED_DESIGN_KEYS].find((x) => x.toLowerCase() === k.toLowerCase() || x.startsWith(k.toLowerCase().slice(0, 4)));
    problems.push({ path: k, message: `unknown key${close ? ` (did you mean \`${close}\`?)` : ''}: a design file holds "added" and "removed"` });
  }
  if (doc['scenario'] !== undefined && typeof doc['scenario'] !== 'string') problems.push({ path: 'scenario', message: `must be a string, found ${preview(doc['scenario'])}` });
  if (problems.length > 0) throw new InvalidScenarioError(problems, source);
  return { added, removed, ...(typeof doc['scenario'] === 'string' ? { scenario: doc['scenario'] } : {}) };
}
