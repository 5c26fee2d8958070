/**
 * Typed errors. Core code throws these; the CLI (src/cli/exit.ts) is the one place that turns them
 * into exit codes and messages, by class.
 */

/** One problem found while validating a scenario, with the JSON path where it sits. */
export interface ScenarioProblem {
  /** JSON path such as `classes[2].rate` or `compatibilities[4]`; `""` for the whole document. */
  readonly path: string;
  readonly message: string;
}

/** Base class for every error edgewise throws on purpose. */
export class EdgewiseError extends Error {
  constructor(message: string) {
    super(message);
    this.name = new.target.name;
  }
}

/** The scenario is malformed: lists every problem at once (exit 2). */
export class InvalidScenarioError extends EdgewiseError {
  readonly problems: readonly ScenarioProblem[];
  readonly source: string | undefined;
  constructor(problems: readonly ScenarioProblem[], source?: string) {
    const head = `${source ?? 'scenario'}: ${problems.length} problem${problems.length === 1 ? '' : 's'}`;
    super([head, ...problems.map((p) => `  - ${p.path === '' ? '(document)' : p.path}: ${p.message}`)].join('\n'));
    this.problems = problems;
    this.source = source;
  }
}

/** A file could not be read (exit 2). */
export class ScenarioFileError extends EdgewiseError {
  readonly path: string;
  constructor(path: string, reason: string) {
    super(`cannot read scenario file ${path}: ${reason}`);
    this.path = path;
  }
}

/** One problem found in an input table (CSV), located by file, row (line as an editor shows it) and column. */
export interface TableProblem {
  readonly file: string;
  /** Line number in the file, the header being row 1 (comment lines count, as in an editor). */
  readonly row?: number;
  /** Column name as written in the header. */
  readonly column?: string;
  readonly message: string;
}

/** One or more input tables are malformed: lists every problem at once, per file (exit 2). */
export class InvalidTableError extends EdgewiseError {
  readonly problems: readonly TableProblem[];
  constructor(problems: readonly TableProblem[]) {
    const files = [...new Set(problems.map((p) => p.file))];
    const lines: string[] = [];
    for (const file of files) {
      const mine = problems.filter((p) => p.file === file);
      lines.push(`${file}: ${mine.length} problem${mine.length === 1 ? '' : 's'}`);
      for (const p of mine) {
        const where = [p.row === undefined ? '' : `row ${p.row}`, p.column === undefined ? '' : `column ${p.column}`].filter((w) => w !== '').join(', ');
        lines.push(`  - ${where === '' ? '' : `${where}: `}${p.message}`);
      }
    }
    super(lines.join('\n'));
    this.problems = problems;
  }
}

/** Bad command-line usage or option value (exit 2). */
export class UsageError extends EdgewiseError {}

/**
 * A certificate of instability: an independent set I of classes without self-loop whose demand
 * λ(I) is at least the capacity λ(N(I)) of the classes that can match it.
 */
export interface InstabilityCertificate {
  /** Class ids in I. */
  readonly set: readonly string[];
  /** Class ids in N(I). */
  readonly neighbours: readonly string[];
  /** λ(I). */
  readonly demand: number;
  /** λ(N(I)). */
  readonly capacity: number;
  /** Why this component fails: a bipartite component, or a set violating the stability condition. */
  readonly reason: 'bipartite' | 'overloaded';
}

/** The design is unstable: carries its certificate (exit 3). */
export class UnstableDesignError extends EdgewiseError {
  readonly certificate: InstabilityCertificate;
  readonly timeUnit: string;
  constructor(certificate: InstabilityCertificate, timeUnit = 'time unit', describe?: string) {
    super(describe ?? describeCertificate(certificate, timeUnit));
    this.certificate = certificate;
    this.timeUnit = timeUnit;
  }
}

/** The exact evaluation would need too many independent sets (exit 4). */
export class TooLargeError extends EdgewiseError {
  readonly count: number;
  readonly limit: number;
  constructor(message: string, count: number, limit: number) {
    super(message);
    this.count = count;
    this.limit = limit;
  }
}

/**
 * The design is stable but so close to the stability boundary that double precision cannot give
 * exact figures with any correct digit (exit 4, like a design too large for exact evaluation:
 * estimate it with the simulator).
 */
export class PrecisionError extends EdgewiseError {}

/** An external solver failed or returned an answer that violates the constraints (exit 5). */
export class SolverError extends EdgewiseError {}

/**
 * A figure came out NaN or infinite where it must be a number, or another invariant broke: a bug
 * (exit 1, "please report"), never a null figure with exit 0.
 */
export class InternalError extends EdgewiseError {}

/** The run was stopped (SIGINT or SIGTERM) before it finished (exit 130). */
export class InterruptedError extends EdgewiseError {}

/** No design satisfies the constraints within the budget (exit 3). */
export class InfeasibleDesignError extends EdgewiseError {
}

/**
 * A rate for a sentence: whole numbers below a million with one decimal ("4.0"), others with four
 * significant digits, trailing zeros of the mantissa dropped and the exponent kept whole
 * ("2e-10", "1.235e+300").
 */
export function formatRate(x: number): string {
  if (Number.isInteger(x) && Math.abs(x) < 1e6) return x.toFixed(1);
  if (!Number.isFinite(x)) return String(x);
  const [mantissa, exponent] = x.toPrecision(4).split('e') as [string, string | undefined];
  const m = mantissa.includes('.') ? mantissa.replace(/\.?0+$/, '') : mantissa;
  return exponent === undefined ? m : `${m}e${exponent}`;
}
const fmt = formatRate;

function list(ids: readonly string[]): string {
  if (ids.length === 0) return 'nothing';
  if (ids.length === 1) return ids[0]!;
  return `${ids.slice(0, -1).join(', ')} and ${ids[ids.length - 1]}`;
}

/** Human sentence for a certificate, e.g. "items from north and east (18.0/hour) can only be matched with centre (15.5/hour)". */
export function describeCertificate(c: InstabilityCertificate, timeUnit = 'time unit'): string {
  const u = `/${timeUnit}`;
  const lead = `unstable: items from ${list(c.set)} (${fmt(c.demand)}${u}) `;
  const tail =
    c.neighbours.length === 0
      ? 'have no compatible class at all'
      : `can only be matched with ${list(c.neighbours)} (${fmt(c.capacity)}${u})`;
  const why = c.reason === 'bipartite' ? ' — the component is bipartite, so one side always outgrows the other' : '';
  return lead + tail + why;
}
