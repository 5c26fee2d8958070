/**
 * Groups of classes for the graph drawing, and the short names drawn inside a group. Classes that
 * share a `group` form one group; without any `group`, classes whose ids share the part before the
 * first '-', '_', '.' or ':' do (icu-day and icu-night form "icu"). Inside a group the words its
 * labels all start with become the group's caption and are left out of each member's name
 * ("Intensive care: day shift" and "Intensive care: night shift" → caption "Intensive care",
 * members "day shift" and "night shift").
 */

export interface GroupInput {
  readonly id: string;
  readonly label: string;
  readonly group?: string;
}

export interface ClassGroup {
  /** Caption drawn with the group (null for a class on its own, or when the graph is not grouped). */
  readonly caption: string | null;
  /** Member indices, in input order. */
  readonly members: readonly number[];
}

export interface Grouping {
  /** At least two groups and one of them with two or more members; otherwise one group of all. */
  readonly grouped: boolean;
  readonly groups: readonly ClassGroup[];
  /** Name of each class as drawn (without its group's caption words). */
  readonly names: readonly string[];
}

const SEPARATOR = /[-_.:]/;
/** Characters that may end a shared label prefix or start a remainder. */
const BOUNDARY = /[\s\-_.:/,;(]/;

/** The id's part before its first separator, or null when there is none (or nothing before it). */
export function idPrefix(id: string): string | null {
  const k = id.search(SEPARATOR);
  return k > 0 ? id.slice(0, k) : null;
}

export function groupClasses(nodes: readonly GroupInput[], longest = 18): Grouping {
  const explicit = nodes.some((v) => v.group !== undefined && v.group.trim() !== '');
  const keyOf = (v: GroupInput, i: number): string => {
    const g = explicit ? (v.group?.trim() || null) : idPrefix(v.id);
    return g === null ? `\u0000${i}` : `g:${g}`;
  };
  const byKey = new Map<string, number[]>();
  nodes.forEach((v, i) => {
    const k = keyOf(v, i);
    const list = byKey.get(k);
    if (list) list.push(i);
    else byKey.set(k, [i]);
  });
  const lists = [...byKey.entries()];
  const grouped = lists.length >= 2 && lists.some(([, m]) => m.length >= 2);
  const names = nodes.map((v) => v.label);
  if (!grouped) return { grouped: false, groups: [{ caption: null, members: nodes.map((_, i) => i) }], names };
  const groups: ClassGroup[] = lists.map(([key, members]) => {
    if (members.length < 2) return { caption: null, members };
    const labels = members.map((i) => nodes[i]!.label);
    const prefix = sharedPrefix(labels);
    let caption = explicit ? key.slice(2) : (prefix ? tidyCaption(prefix) : '') || key.slice(2);
    if (prefix) {
      let rest = labels.map((l) => tidyRest(l.slice(prefix.length)));
      if (rest.some((r) => r.length > longest)) {
        const suffix = sharedSuffix(rest);
        if (suffix) rest = rest.map((r) => tidyRest(r.slice(0, r.length - suffix.length)));
      }
      members.forEach((i, k) => (names[i] = rest[k]!));
    }
    if (caption === '') caption = key.slice(2);
    return { caption, members };
  });
  return { grouped: true, groups, names };
}

/** The longest prefix shared by all labels that ends at a word boundary and leaves each a non-empty rest. */
function sharedPrefix(labels: readonly string[]): string {
  const first = labels[0]!;
  let n = first.length;
  for (const l of labels) {
    let k = 0;
    while (k < n && k < l.length && l[k]!.toLowerCase() === first[k]!.toLowerCase()) k++;
    n = k;
  }
  // back off to a boundary: the prefix must end just before (or with) a boundary character in every label
  for (let k = n; k > 0; k--) {
    const ok = labels.every((l) => k < l.length && (BOUNDARY.test(l[k]!) || BOUNDARY.test(l[k - 1]!)) && meaningful(tidyRest(l.slice(k))));
    if (ok && tidyCaption(first.slice(0, k)) !== '') return first.slice(0, k);
  }
  return '';
}

/** The longest suffix shared by all (at least two) names that starts at a word boundary and leaves each a non-empty rest. */
function sharedSuffix(names: readonly string[]): string {
  if (names.length < 2) return '';
  const first = names[0]!;
  let n = first.length;
  for (const s of names) {
    let k = 0;
    while (k < n && k < s.length && s[s.length - 1 - k]!.toLowerCase() === first[first.length - 1 - k]!.toLowerCase()) k++;
    n = k;
  }
  for (let k = n; k > 0; k--) {
    const ok = names.every((s) => {
      const cut = s.length - k;
      return cut > 0 && (BOUNDARY.test(s[cut - 1]!) || BOUNDARY.test(s[cut]!)) && meaningful(tidyRest(s.slice(0, cut)));
    });
    if (ok) return first.slice(first.length - k);
  }
  return '';
}

/** A name that says something on its own: not empty and not only digits (which would read as key numbers). */
function meaningful(s: string): boolean {
  return s !== '' && !/^[\d\s.,]+$/.test(s);
}

function tidyCaption(s: string): string {
  return s.replace(/[\s\-_.:/,;(]+$/, '').trim();
}

function tidyRest(s: string): string {
  let r = s.replace(/^[\s\-_.:/,;]+/, '').replace(/[\s\-_.:/,;]+$/, '').trim();
  if (/^\([^()]*\)$/.test(r)) r = r.slice(1, -1).trim();
  else if (r.endsWith(')') && !r.includes('(')) r = r.slice(0, -1).trim();
  else if (r.startsWith('(') && !r.includes(')')) r = r.slice(1).trim();
  return r;
}
