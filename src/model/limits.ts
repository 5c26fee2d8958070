/**
 * Size limits of a scenario file, in one place (documented in docs/scenario-format.md, "Size
 * limits"). A file past any of them is refused at once (InvalidScenarioError, exit 2) with a message
 * naming the limit, before any other work: the limits are chosen so that every command either
 * finishes in reasonable time or is refused within a second or two.
 *
 * - 20 000 classes: `check` on 20 000 classes takes seconds (`npm run bench`, stability); 120 000
 *   classes in a 5 MB file are refused while reading.
 * - 100 000 compatibilities and 10 000 candidates: enough for a 20 000-class design with five
 *   neighbours per class; the recommender's search space grows with the candidates.
 */
export const LIMITS = {
  /**
   * Size of the file: bytes of a file on disk (src/cli/load.ts checks it before reading), UTF-16
   * code units of a text given to parseScenario (the same for ASCII).
   */
  fileChars: 16 * 1024 * 1024,
  /** Depth of nested arrays and objects, the document itself counting 1. */
  depth: 64,
  /** Entries of `classes`. */
  classes: 20_000,
  /** Entries of `compatibilities`. */
  compatibilities: 100_000,
  /** Entries of `candidates`. */
  candidates: 10_000,
  /** Entries of `mustKeep` and of `forbidden`, each. */
  rules: 100_000,
  /** Named rate sets in `demand`. */
  demandVariants: 100,
  /** Characters of a class id. */
  idChars: 200,
  /** Characters of any other text field (name, label, note, description…). */
  textChars: 10_000,
  /** JSON values in the whole document (arrays, objects and scalars), checked while measuring depth. */
  values: 5_000_000,
} as const;

/** Names of the array fields capped in LIMITS, with their cap. */
export const ARRAY_LIMITS: ReadonlyArray<readonly [field: string, limit: number]> = [
  ['classes', LIMITS.classes],
  ['compatibilities', LIMITS.compatibilities],
  ['candidates', LIMITS.candidates],
  ['mustKeep', LIMITS.rules],
  ['forbidden', LIMITS.rules],
];
