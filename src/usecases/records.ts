/**
 * Record types shared by the use cases. A record is plain, id-keyed data: what a command computed,
 * with the design every figure and verdict is measured against. The output layer renders any record
 * as text, JSON or CSV; the HTML page reads the same records. Records never hold NaN or infinities:
 * "not applicable" is null, "unbounded" is said in words.
 */
import type { InstabilityCertificate } from '../errors.js';
import type { CompiledModel } from '../model/compile.js';
import type { TightSet } from '../stability/report.js';

/** Two class ids; [a, a] is a class matched with itself. */
export type PairIds = readonly [string, string];

/** What every record carries. */
export interface RecordBase {
  /** The command that made it. */
  readonly command: string;
  readonly scenario: string;
  /** Rates are per this unit; waits are in it (text may show another, see --wait-unit). */
  readonly timeUnit: string;
  /** What the figures do not account for, or other cautions, said where they are printed. */
  readonly warnings: string[];
  /** Significant digits the figures support (machine output is rounded to them). */
  readonly precision?: number;
  /** The classes with the rates the figures are for (the demand variant's when one is chosen). */
  readonly classes: ClassInfo[];
}

export interface ClassInfo {
  readonly id: string;
  readonly label: string | null;
  /** Arrival rate per time unit. */
  readonly rate: number;
}

/** Which design a figure or verdict is measured against. */
export interface Reference {
  /** 'today' (the scenario's design), 'recommended', or 'design' (from --design). */
  readonly kind: 'today' | 'recommended' | 'design';
  /** Words for people: "today's design", "the recommended design", "the design in D.json". */
  readonly name: string;
  readonly added: PairIds[];
  readonly removed: PairIds[];
  /** Demand the figures are under: "today" or a demand variant's name. */
  readonly demand: string;
}

/** An independent set with its demand, the capacity of the classes that can serve it, and the difference. */
export interface SetRecord {
  readonly set: string[];
  readonly neighbours: string[];
  /** λ(I), per time unit. */
  readonly demand: number;
  /** λ(N(I)), per time unit. */
  readonly capacity: number;
  /** λ(N(I)) − λ(I): the spare capacity (negative or zero when overloaded). */
  readonly spareCapacity: number;
}

export interface CertificateRecord extends SetRecord {
  readonly reason: 'bipartite' | 'overloaded';
}

/** A set of allowed candidates whose addition makes an unstable design stable. */
export interface RepairRecord {
  readonly added: PairIds[];
  readonly cost: number;
}

/** Why no repair exists, and what kind of pair would relieve the overload. */
export interface NoRepairRecord {
  /** The set still overloaded with every allowed candidate added. */
  readonly overloaded: SetRecord;
  /** In words: which kind of pair would relieve it. */
  readonly relief: string;
  /** Candidates that would help but a rule of the scenario blocks. */
  readonly blocked: Array<{ readonly pair: PairIds; readonly rule: string }>;
}

/** How an unstable design fails and the ways out. */
export interface InstabilityRecord {
  readonly certificate: CertificateRecord;
  /** In words: "items from … can only be matched with …". */
  readonly message: string;
  /** Cheapest first; empty when none exists (see noRepair). */
  readonly repairs: RepairRecord[];
  readonly noRepair?: NoRepairRecord;
}

export const idsOf = (model: CompiledModel, set: ArrayLike<number>): string[] => Array.from(set, (k) => model.ids[k]!);

export function setRecord(model: CompiledModel, t: TightSet): SetRecord {
  return { set: idsOf(model, t.set), neighbours: idsOf(model, t.neighbours), demand: t.demand, capacity: t.capacity, spareCapacity: t.slack };
}

export function certificateRecord(c: InstabilityCertificate): CertificateRecord {
  return { set: [...c.set], neighbours: [...c.neighbours], demand: c.demand, capacity: c.capacity, spareCapacity: c.capacity - c.demand, reason: c.reason };
}

/** A pair of class indices as ids, in class order. */
export function pairIds(model: { readonly ids: readonly string[] }, a: number, b: number): PairIds {
  return a <= b ? [model.ids[a]!, model.ids[b]!] : [model.ids[b]!, model.ids[a]!];
}

/** A finite number, or null (records never hold NaN or infinities). */
export const finite = (x: number): number | null => (Number.isFinite(x) ? x : null);

/** Per-class values keyed by id (non-finite values become null). */
export function byClass(ids: readonly string[], values: ArrayLike<number>): Record<string, number | null> {
  const out: Record<string, number | null> = {};
  ids.forEach((id, k) => (out[id] = finite(values[k]!)));
  return out;
}
