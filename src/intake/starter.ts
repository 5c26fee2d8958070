/**
 * `starter`: a small commented example set of CSV files for an invented scenario (peer study
 * partners on a tutoring marketplace), a README saying how to import them, the scenario built from
 * them by the import code itself, and an example arrival log for `fit`.
 */
import { importScenario } from './import-scenario.js';
import { starterLog, type LogClass } from './starter-log.js';

/** The import options the starter's scenario is built with (and the README shows). */
export const STARTER_IMPORT = { name: 'Peer study partners (tutoring marketplace, weekday evening)', timeUnit: 'hour', budget: 8 } as const;

const CLASSES = `# Classes: one row per kind of item that arrives. Here: learners asking for a study partner.
# id and rate (arrivals per hour, a Poisson stream) are required; every other column may be left empty.
# patience: mean time (hours) a learner waits before giving up; weight: importance in the weighted
# objective; waitTarget: mean wait to stay under (hours); maxCompatibilities: most pairings a class may
# have; maxAbandonment: largest share of learners who may give up (0 to 1).
# All figures are invented.
id,rate,label,group,patience,weight,waitTarget,maxCompatibilities,maxAbandonment,note
algebra-1,6,Algebra I,maths,0.5,1,0.25,,0.1,
algebra-2,4,Algebra II,maths,0.75,1,,,,
calculus,5,Calculus,maths,0.75,1.5,0.3,3,,first-year university
statistics,3,Statistics,maths,1,1,,,,
physics,3.5,Physics,science,0.75,1,,,,
chemistry,2.5,Chemistry,science,0.5,2,,,0.15,"exam season, ""lab write-ups"" mostly"
`;

const COMPATIBILITIES = `# Compatibilities: which learners can be paired today. a = b means two learners of the same class.
# removable: may a design drop the pairing (true/false, yes/no, 1/0); saving: what dropping it saves
# (here: moderator hours per week). Columns named data.<something> are kept as your own data.
a,b,removable,saving,value,note,data.sessionMinutes
algebra-1,algebra-1,no,,1,,45
algebra-1,algebra-2,no,,1.2,older learner explains,45
algebra-2,calculus,no,,1.2,,60
calculus,calculus,no,,1,,60
calculus,physics,yes,3,0.8,needs a moderator,60
calculus,statistics,yes,2,0.7,,60
physics,chemistry,no,,1,,50
`;

const CANDIDATES = `# Candidates: pairings a design may add, with what enabling each costs (moderator hours per week).
a,b,cost,value,note
statistics,statistics,4,1,a weekly study-group slot
chemistry,chemistry,3,1,
physics,physics,5,1,
statistics,algebra-2,2,0.6,
`;

const README = `Starter set: peer study partners on a tutoring marketplace (invented figures)
==========================================================================

classes.csv          the kinds of learners, their arrival rates per hour and optional targets
compatibilities.csv  which kinds can be paired today (removable ones with what dropping saves)
candidates.csv       pairings a design may add, with what each costs
scenario.json        the scenario built from the three files by the command below
arrivals.csv         an example arrival log (one invented evening), to measure rates from

Lines starting with # are comments; empty cells mean "not given". Edit the files in a spreadsheet
or text editor, then build the scenario again:

  edgewise import --classes classes.csv --compatibilities compatibilities.csv \\
    --candidates candidates.csv --name "${STARTER_IMPORT.name}" \\
    --time-unit ${STARTER_IMPORT.timeUnit} --budget ${STARTER_IMPORT.budget} -o scenario.json

and look at it:

  edgewise check scenario.json
  edgewise evaluate scenario.json
  edgewise recommend scenario.json

Rates and patience can be measured from an arrival log (one row per arrival) instead:

  edgewise fit arrivals.csv --time arrived --class class --outcome outcome --wait waited

prints each class's rate with its 95 % interval; add
"--compatibilities compatibilities.csv -o fitted.json" to write a scenario with the measured rates.
`;

export interface StarterFile {
  readonly name: string;
  readonly text: string;
}

/** The starter files, in writing order; scenario.json is built from the CSV files by `importScenario`. */
export function starterFiles(): StarterFile[] {
  const { document } = importScenario({
    classes: { text: CLASSES, file: 'classes.csv' },
    compatibilities: { text: COMPATIBILITIES, file: 'compatibilities.csv' },
    candidates: { text: CANDIDATES, file: 'candidates.csv' },
    ...STARTER_IMPORT,
  });
  return [
    { name: 'classes.csv', text: CLASSES },
    { name: 'compatibilities.csv', text: COMPATIBILITIES },
    { name: 'candidates.csv', text: CANDIDATES },
    { name: 'README.txt', text: README },
    { name: 'scenario.json', text: `${JSON.stringify(document, null, 2)}\n` },
    { name: 'arrivals.csv', text: starterLog(document['classes'] as LogClass[]) },
  ];
}
