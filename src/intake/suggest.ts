/** "Did you mean" for a misspelt name: the closest known name by edit distance (fastest-levenshtein), if close enough. */
import { distance as leven } from 'fastest-levenshtein';

/** Normalised form used to compare names: lower case, without spaces, '_' and '-'. */
export function normaliseName(name: string): string {
  return name.toLowerCase().replace(/[\s_-]+/g, '');
}

/**
 * The known name closest to `name` (after normalising both), when at most a third of its letters
 * (at least one, at most three) would change; undefined otherwise.
 */
export function closestName(name: string, known: readonly string[]): string | undefined {
  const n = normaliseName(name);
  const limit = Math.min(3, Math.max(1, Math.floor(n.length / 3)));
  let best: string | undefined;
  let bestDistance = Infinity;
  for (const k of known) {
    const d = leven(n, normaliseName(k));
    if (d < bestDistance) {
      best = k;
      bestDistance = d;
    }
  }
  return bestDistance <= limit ? best : undefined;
}

/** " (did you mean "x"?)" or "", for messages. */
export function didYouMean(name: string, known: readonly string[]): string {
  const k = closestName(name, known);
  return k === undefined ? '' : ` (did you mean "${k}"?)`;
}
