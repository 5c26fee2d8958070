/**
 * The rules that look across fields, which a JSON Schema cannot state: unique class ids, pairs that
 * name known classes and appear once, candidates that are not already compatibilities, rate
 * intervals around their rate, demand variants naming known classes, and the consistency of
 * mustKeep, forbidden and maxCompatibilities, and a maxAbandonment only where the class has a patience. They run on the raw document beside the schema pass
 * (every entry whose shape is wrong is skipped here: the schema reports it), so that every problem
 * is listed at once. Linear in the size of the document.
 */
import { preview, type PathStep } from './preview.js';
import { pairKey } from './scenario.js';
import type { RawProblem } from './schema-messages.js';
import { LIMITS } from './limits.js';

/** The name of the rates written in `classes`; reserved, so a variant cannot take it. */
export const TODAY = 'today';

const isObj = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
const isPair = (v: unknown): v is [string, string] => Array.isArray(v) && v.length === 2 && typeof v[0] === 'string' && typeof v[1] === 'string';
const own = (o: Record<string, unknown>, k: string): unknown => (Object.prototype.hasOwnProperty.call(o, k) ? o[k] : undefined);

/** The pair of an entry written as a bare pair or as {"pair": [...]}, and the path of the pair. */
function pairOf(entry: unknown, at: readonly PathStep[], bareAllowed: boolean): { pair: [string, string]; path: readonly PathStep[] } | undefined {
  if (bareAllowed && isPair(entry)) return { pair: entry, path: at };
  if (isObj(entry) && isPair(own(entry, 'pair'))) return { pair: own(entry, 'pair') as [string, string], path: [...at, 'pair'] };
  return undefined;
}

export function crossChecks(doc: Record<string, unknown>): RawProblem[] {
  const problems: RawProblem[] = [];
  const bad = (path: readonly PathStep[], message: string): void => void problems.push({ path, message });

  // ---- classes: unique ids
  const ids = new Map<string, number>();
  const classes = Array.isArray(doc.classes) ? (doc.classes as unknown[]) : [];
  classes.forEach((c, i) => {
    if (!isObj(c)) return;
    const id = own(c, 'id');
    if (typeof id !== 'string' || id.trim() === '') return;
    if (ids.has(id)) bad(['classes', i, 'id'], `duplicate class id ${preview(id)}`);
    else ids.set(id, i);
    const rate = own(c, 'rate');
    const ci = own(c, 'rateCi95');
    if (typeof rate === 'number' && Array.isArray(ci) && ci.length === 2 && typeof ci[0] === 'number' && typeof ci[1] === 'number') {
      if (!(ci[0] <= rate && rate <= ci[1])) bad(['classes', i, 'rateCi95'], `the interval ${preview(ci)} must contain the rate ${rate} (low <= rate <= high)`);
    }
  });
  const known = [...ids.keys()];
  const hint = known.length > 0 ? ` (known: ${known.slice(0, 8).map((k) => preview(k, 30).replace(/^"|"$/g, '')).join(', ')}${known.length > 8 ? ', …' : ''})` : '';
  const unknownIn = (pair: readonly string[], path: readonly PathStep[]): boolean => {
    let ok = true;
    for (const id of new Set(pair)) {
      if (!ids.has(id)) {
        bad(path, `unknown class ${preview(id)}${hint}`);
        ok = false;
      }
    }
    return ok;
  };

  // ---- compatibilities and candidates: known ids, each pair once
  const seen = new Map<string, readonly PathStep[]>();
  const compat = new Map<string, { index: number; removable: boolean }>();
  const candidates = new Map<string, number>();
  const where = (p: readonly PathStep[]): string => `${String(p[0])}[${String(p[1])}]`;
  const listOf = (field: string): unknown[] => (Array.isArray(doc[field]) ? (doc[field] as unknown[]) : []);
  for (const field of ['compatibilities', 'candidates'] as const) {
    listOf(field).forEach((entry, i) => {
      const at: PathStep[] = [field, i];
      const found = pairOf(entry, at, field === 'compatibilities');
      if (!found || !unknownIn(found.pair, found.path)) return;
      const key = pairKey(found.pair[0], found.pair[1]);
      const prev = seen.get(key);
      if (prev !== undefined) {
        bad(
          at,
          field === 'candidates' && prev[0] === 'compatibilities'
            ? `candidate ${preview(found.pair)} is already a compatibility (${where(prev)})`
            : `duplicate pair ${preview(found.pair)}: already given at ${where(prev)}`,
        );
        return;
      }
      seen.set(key, at);
      if (field === 'compatibilities') compat.set(key, { index: i, removable: isObj(entry) && own(entry, 'removable') === true });
      else candidates.set(key, i);
    });
  }

  // ---- mustKeep and forbidden
  const rules = (field: 'mustKeep' | 'forbidden'): Map<string, { index: number; pair: [string, string] }> => {
    const out = new Map<string, { index: number; pair: [string, string] }>();
    listOf(field).forEach((entry, i) => {
      const at: PathStep[] = [field, i];
      const found = pairOf(entry, at, true);
      if (!found || !unknownIn(found.pair, found.path)) return;
      const pair = found.pair;
      const key = pairKey(pair[0], pair[1]);
      const prev = out.get(key);
      if (prev !== undefined) {
        bad(at, `duplicate pair ${preview(pair)}: already given at ${field}[${prev.index}]`);
        return;
      }
      out.set(key, { index: i, pair });
      const c = compat.get(key);
      if (field === 'mustKeep' && c === undefined) {
        bad(
          at,
          candidates.has(key)
            ? `${preview(pair)} is a candidate (candidates[${candidates.get(key)}]), not a compatibility: mustKeep can only protect existing compatibilities`
            : `${preview(pair)} is not a compatibility of the scenario, so there is nothing to keep`,
        );
      }
      if (field === 'forbidden') {
        if (c !== undefined && !c.removable) {
          bad(at, `${preview(pair)} is a compatibility that is not removable (compatibilities[${c.index}]): mark it "removable": true or drop it from forbidden`);
        } else if (c === undefined && !candidates.has(key)) {
          bad(at, `${preview(pair)} is neither a compatibility nor a candidate, so forbidding it has no effect`);
        }
      }
    });
    return out;
  };
  const kept = rules('mustKeep');
  const forbidden = rules('forbidden');
  for (const [key, f] of forbidden) {
    const k = kept.get(key);
    if (k !== undefined) bad(['forbidden', f.index], `${preview(f.pair)} is also in mustKeep[${k.index}]: a pair cannot be both kept and forbidden`);
  }

  // ---- maxCompatibilities: the compatibilities no design can drop must fit under it
  const fixed = new Map<string, number>();
  listOf('compatibilities').forEach((entry) => {
    const found = pairOf(entry, [], true);
    if (!found || !ids.has(found.pair[0]) || !ids.has(found.pair[1])) return;
    const key = pairKey(found.pair[0], found.pair[1]);
    const removable = isObj(entry) && own(entry, 'removable') === true;
    if (removable && !kept.has(key)) return;
    for (const id of new Set(found.pair)) fixed.set(id, (fixed.get(id) ?? 0) + 1);
  });
  classes.forEach((c, i) => {
    if (!isObj(c)) return;
    const mc = own(c, 'maxCompatibilities');
    const id = own(c, 'id');
    if (typeof mc !== 'number' || !Number.isInteger(mc) || mc < 0 || typeof id !== 'string' || ids.get(id) !== i) return;
    const f = fixed.get(id) ?? 0;
    if (f > mc) {
      bad(['classes', i, 'maxCompatibilities'], `${mc} is below the ${f} compatibilities of ${preview(id)} that cannot be dropped (not removable or in mustKeep)`);
    }
  });

  // ---- maxAbandonment: only items with a patience abandon, so the limit needs one
  classes.forEach((c, i) => {
    if (!isObj(c)) return;
    const limit = own(c, 'maxAbandonment');
    if (typeof limit !== 'number' || own(c, 'patience') !== undefined) return;
    const id = own(c, 'id');
    bad(
      ['classes', i, 'maxAbandonment'],
      `a limit of ${limit} on the abandonment share of ${typeof id === 'string' ? preview(id) : 'this class'} can never bind: the class has no "patience", so its items never abandon; give the class a patience (mean, time units) or drop the limit`,
    );
  });

  // ---- demand variants
  const demand = own(doc, 'demand');
  if (isObj(demand)) {
    const names = Object.keys(demand);
    if (names.length === 0) bad(['demand'], 'empty: list at least one named rate set, or leave the field out');
    if (names.length > LIMITS.demandVariants) bad(['demand'], `${names.length} variants: more than the limit of ${LIMITS.demandVariants}`);
    for (const name of names.slice(0, LIMITS.demandVariants)) {
      const set = demand[name];
      if (name.trim() === '') bad(['demand', name], 'a demand variant needs a non-empty name');
      else if (name === TODAY) bad(['demand', name], `the name "${TODAY}" is reserved for the rates written in classes; pick another name`);
      else if (name.length > LIMITS.idChars) bad(['demand', name], `a variant name of ${name.length} characters: longer than the limit of ${LIMITS.idChars}`);
      if (!isObj(set)) continue;
      const changed = Object.keys(set);
      if (changed.length === 0) bad(['demand', name], 'empty: name at least one class and its rate');
      for (const id of changed) if (!ids.has(id)) bad(['demand', name, id], `unknown class ${preview(id)}${hint}`);
    }
  }
  return problems;
}
