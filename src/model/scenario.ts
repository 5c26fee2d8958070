/**
 * The validated, in-memory form of a scenario file (see docs/scenario-format.md). The types are
 * derived from the one declaration of the format in schema.ts.
 */
export type { CandidateSpec, ClassSpec, CompatibilitySpec, DemandVariantSpec, IdPair, RuleSpec, Scenario } from './schema.js';

/**
 * Canonical key of an unordered pair, independent of order: the JSON text of the sorted pair, so
 * that no two distinct pairs share a key whatever characters the ids contain (U+0000 included).
 */
export function pairKey(a: string, b: string): string {
  return a <= b ? JSON.stringify([a, b]) : JSON.stringify([b, a]);
}
