/**
 * The one ASCII notation of classes and pairs, for CSV cells and command-line arguments, that works
 * whatever characters class ids contain:
 *
 *   pair        a~b          (a self-pair: a~a)
 *   list        a~b,c~d      (pairs) or a,b,c (classes)
 *
 * Inside an id, the three characters with a meaning here and the percent sign itself are written
 * as percent escapes: '%' → %25, ',' → %2C, '~' → %7E (and control characters as %XX). Every
 * other character, spaces and '-' included, is written as it is; only spaces at either end of an
 * id are written %20, because spaces around an item are ignored when reading. So "old-town~market" names the
 * pair of "old-town" and "market", and an id "a~b" is written "a%7Eb".
 */

const ESCAPE = /[%,~\u0000-\u001f\u007f]/g;

/** Spaces around an item are ignored when reading (so "a~b, c~d" reads well): only these. */
const AROUND = /^ +| +$/g;
const unpad = (s: string): string => s.replace(AROUND, '');

/** One id in the ASCII notation (spaces at either end of an id are written %20, as they would be read away). */
export function asciiId(id: string): string {
  return id.replace(ESCAPE, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase().padStart(2, '0')}`).replace(AROUND, (m) => '%20'.repeat(m.length));
}

/** One pair: "a~b". */
export function asciiPair(pair: readonly [string, string]): string {
  return `${asciiId(pair[0])}~${asciiId(pair[1])}`;
}

/** Pairs joined by commas: "a~b,c~d" ("" for none). */
export function asciiPairs(pairs: ReadonlyArray<readonly [string, string]>): string {
  return pairs.map(asciiPair).join(',');
}

/** Ids joined by commas: "a,b,c". */
export function asciiIds(ids: readonly string[]): string {
  return ids.map(asciiId).join(',');
}

/** Why a piece of ASCII notation could not be read. */
export class NotationError extends Error {}

/** Decodes one escaped id (throws NotationError on a bad escape). */
export function readAsciiId(text: string): string {
  return text.replace(/%(..)?/g, (m, hex: string | undefined) => {
    if (hex === undefined || !/^[0-9A-Fa-f]{2}$/.test(hex)) throw new NotationError(`"${m}" is not a percent escape (write %25 for a '%' inside an id)`);
    return String.fromCharCode(parseInt(hex, 16));
  });
}

/** "a,b,c" → ids (empty items skipped, surrounding spaces ignored). */
export function readAsciiIds(text: string): string[] {
  return text
    .split(',')
    .map(unpad)
    .filter((s) => s !== '')
    .map(readAsciiId);
}

/** "a~b" → [a, b]. */
export function readAsciiPair(text: string): [string, string] {
  const s = unpad(text);
  const parts = s.split('~').map(unpad);
  if (parts.length !== 2 || parts[0] === '' || parts[1] === '') {
    throw new NotationError(
      parts.length > 2
        ? `"${s}" has more than one '~' (write %7E for a '~' inside an id)`
        : `"${s}" is not a pair: write two class ids joined by '~', like a~b`,
    );
  }
  return [readAsciiId(parts[0]!), readAsciiId(parts[1]!)];
}

/** "a~b,c~d" → pairs. */
export function readAsciiPairs(text: string): Array<[string, string]> {
  return text
    .split(',')
    .map(unpad)
    .filter((s) => s !== '')
    .map(readAsciiPair);
}
