/**
 * Checks of the one pair notation (docs/glossary.md, "Notation"): in text a pair is written
 * `a ↔ b`; in CSV cells `a~b` with '%', ',' and '~' inside ids escaped.
 */

export interface Names {
  /** Class ids. */
  readonly ids: readonly string[];
  /** Labels (or null), in class order. */
  readonly labels: ReadonlyArray<string | null>;
  /** Every pair the scenario names (compatibilities and candidates), as ids. */
  readonly pairs: ReadonlyArray<readonly [string, string]>;
}

/** The names of a scenario document. */
export function namesOf(doc: { classes: Array<{ id: string; label?: string }>; compatibilities: unknown[]; candidates?: Array<{ pair: [string, string] }> }): Names {
  const pair = (c: unknown): [string, string] => (Array.isArray(c) ? (c as [string, string]) : (c as { pair: [string, string] }).pair);
  return {
    ids: doc.classes.map((c) => c.id),
    labels: doc.classes.map((c) => c.label ?? null),
    pairs: [...doc.compatibilities.map(pair), ...(doc.candidates ?? []).map((c) => c.pair)],
  };
}

/** Every spelling of a pair in `text` other than `a ↔ b`: the offending snippets (empty when none). */
export function otherPairSpellings(text: string, names: Names): string[] {
  const bad: string[] = [];
  const around = (i: number): string => text.slice(Math.max(0, i - 30), i + 30);
  for (const m of text.matchAll(/ – /g)) bad.push(`' – ' in …${around(m.index)}…`);
  for (const m of text.matchAll(/↔/g)) {
    if (text[m.index - 1] !== ' ' || text[m.index + 1] !== ' ') bad.push(`'↔' without spaces in …${around(m.index)}…`);
  }
  // '~' only where an id holds one
  let stripped = text;
  for (const id of [...names.ids].sort((a, b) => b.length - a.length)) stripped = stripped.split(id).join('');
  for (const m of stripped.matchAll(/~/g)) bad.push(`'~' in …${stripped.slice(Math.max(0, m.index - 30), m.index + 30)}…`);
  // two names of a pair joined by '-', '–', '~', '/' or '↔' without spaces, or ' - '
  const nameSets = [names.ids, names.labels.map((l, k) => l ?? names.ids[k]!)];
  for (const [x, y] of names.pairs) {
    for (const set of nameSets) {
      const a = set[names.ids.indexOf(x)]!;
      const b = set[names.ids.indexOf(y)]!;
      for (const [p, q] of [[a, b], [b, a]] as const) {
        for (const join of ['-', '–', '~', '/', '↔', ' - ']) {
          const s = `${p}${join}${q}`;
          if (names.ids.some((id) => id.includes(s))) continue; // an id that happens to read like a join
          if (text.includes(s)) bad.push(`'${s}'`);
        }
      }
    }
  }
  return [...new Set(bad)];
}
