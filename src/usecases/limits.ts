/**
 * Work limits of the commands, in one place (documented in docs/scenario-format.md, "Size limits",
 * beside the file limits of src/model/limits.ts). A valid scenario can still ask a command for more
 * work than it can do in reasonable time; such a request is refused at once (UsageError, exit 2)
 * with a message naming the limit, instead of hours of work.
 */
import { UsageError } from '../errors.js';

export const WORK_LIMITS = {
  /** Removable compatibilities and candidates the recommender switches (its MILP has one binary each). */
  toggles: 300,
  /** Classes of a design the recommender (and compare, report) designs for. */
  designClasses: 2_000,
  /** Single changes `sensitivity` evaluates (candidates, or every absent pair with --all-pairs, plus removals). */
  changes: 20_000,
  /** Single changes × classes: each change of a large design costs about one pass over its classes. */
  changeWork: 50_000_000,
  /** Classes the report draws (above it the report leaves the graph drawing out, with a note). */
  drawnClasses: 400,
} as const;

/** Refuses a recommender run past the limits. */
export function checkDesignSize(classes: number, toggles: number, command: string): void {
  if (toggles > WORK_LIMITS.toggles) {
    throw new UsageError(
      `${command}: ${toggles.toLocaleString('en-US')} removable compatibilities and candidates, more than the limit of ${WORK_LIMITS.toggles} the recommender switches; ` +
        'mark fewer compatibilities removable or list fewer candidates (forbidden pairs and mustKeep do not count)',
    );
  }
  if (classes > WORK_LIMITS.designClasses) {
    throw new UsageError(`${command}: ${classes.toLocaleString('en-US')} classes, more than the limit of ${WORK_LIMITS.designClasses.toLocaleString('en-US')} the recommender designs for`);
  }
}

/** Refuses a sensitivity table past the limits. */
export function checkChangeCount(changes: number, classes: number, allPairs: boolean): void {
  if (changes > WORK_LIMITS.changes || changes * classes > WORK_LIMITS.changeWork) {
    throw new UsageError(
      `sensitivity: ${changes.toLocaleString('en-US')} single changes on ${classes.toLocaleString('en-US')} classes, more than the limit ` +
        `(${WORK_LIMITS.changes.toLocaleString('en-US')} changes, and changes × classes at most ${WORK_LIMITS.changeWork.toLocaleString('en-US')})` +
        (allPairs ? '; leave out --all-pairs to try only the candidates' : ''),
    );
  }
}
