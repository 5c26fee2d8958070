/**
 * Command-line values naming classes: `a,b,c` lists and `a-b` pairs. Class ids may contain '-'
 * (e.g. "old-town"), so a pair is split at the one '-' that leaves a known id on both sides.
 */
import { UsageError } from '../errors.js';
import type { CompiledModel } from '../model/compile.js';

function known(model: CompiledModel): string {
  const ids = model.ids.slice(0, 8).join(', ');
  return `known classes: ${ids}${model.n > 8 ? ', …' : ''}`;
}

/** `a,b,c` → class indices (each id once). */
export function parseClassList(model: CompiledModel, text: string, flag: string): number[] {
  const out: number[] = [];
  for (const raw of text.split(',')) {
    const id = raw.trim();
    if (id === '') continue;
    const k = model.index.get(id);
    if (k === undefined) throw new UsageError(`${flag}: unknown class "${id}" (${known(model)})`);
    if (!out.includes(k)) out.push(k);
  }
  if (out.length === 0) throw new UsageError(`${flag}: name at least one class`);
  return out;
}

/** `a-b` → [a, b] class indices (a = b allowed: a self-pair). */
export function parsePair(model: CompiledModel, text: string, flag: string): [number, number] {
  const s = text.trim();
  const found: Array<[number, number]> = [];
  for (let p = s.indexOf('-'); p >= 0; p = s.indexOf('-', p + 1)) {
    const a = model.index.get(s.slice(0, p));
    const b = model.index.get(s.slice(p + 1));
    if (a !== undefined && b !== undefined) found.push([a, b]);
  }
  if (found.length === 1) return found[0]!;
  if (found.length > 1) throw new UsageError(`${flag} ${s}: ambiguous pair (class ids contain '-'); it could be ${found.map(([a, b]) => `${model.ids[a]} + ${model.ids[b]}`).join(' or ')}`);
  throw new UsageError(`${flag} ${s}: expected two known class ids joined by '-', like a-b (${known(model)})`);
}

/** `a-b,c-d` → pairs. */
export function parsePairList(model: CompiledModel, text: string, flag: string): Array<[number, number]> {
  const pairs = text
    .split(',')
    .map((x) => x.trim())
    .filter((x) => x !== '')
    .map((x) => parsePair(model, x, flag));
  if (pairs.length === 0) throw new UsageError(`${flag}: name at least one pair, like a-b`);
  return pairs;
}
