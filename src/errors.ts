/**
 * Typed errors. Core code throws these; the CLI (src/cli/exit.ts) is the one place that turns them
 * into exit codes and messages.
 */

/** One problem found while validating a scenario, with the JSON path where it sits. */
export interface ScenarioProblem {
  /** JSON path such as `classes[2].rate` or `compatibilities[4]`; `""` for the whole document. */
  readonly path: string;
  readonly message: string;
}

/** Base class for every error edgewise throws on purpose. */
export class EdgewiseError extends Error {
  /** Exit code the CLI uses for this kind of error. */
  readonly exitCode: number = 1;
  constructor(message: string) {
    super(message);
    this.name = new.target.name;
  }
}

/** The scenario is malformed: lists every problem at once (exit 2). */
export class InvalidScenarioError extends EdgewiseError {
  override readonly exitCode = 2;
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
  override readonly exitCode = 2;
  readonly path: string;
  constructor(path: string, reason: string) {
    super(`cannot read scenario file ${path}: ${reason}`);
    this.path = path;
  }
}

/** Bad command-line usage or option value (exit 2). */
export class UsageError extends EdgewiseError {
  override readonly exitCode = 2;
}

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
  override readonly exitCode = 3;
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
  override readonly exitCode = 4;
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
export class PrecisionError extends EdgewiseError {
  override readonly exitCode = 4;
}

/** An external solver failed or returned an answer that violates the constraints (exit 5). */
export class SolverError extends EdgewiseError {
  override readonly exitCode = 5;
}

/** No design satisfies the constraints within the budget (exit 3). */
export class InfeasibleDesignError extends EdgewiseError {
  override readonly exitCode = 3;
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
