/**
 * Certificates of instability: finding them (without enumerating independent sets), checking them,
 * and turning them into the ids-based InstabilityCertificate of src/errors.ts.
 */
import type { InstabilityCertificate } from '../errors.js';
import type { CompiledModel } from '../model/compile.js';
import { DoubleCover } from './double-cover.js';
import type { IndexCertificate } from './report.js';
import { isIndependentLoopFree, measure, stripNeighbours, type SetMeasure } from './sets.js';

/**
 * A bipartite component (no self-loop) is never stable: its two sides S, T are independent with
 * N(S) = T and N(T) = S, and λ(S) ≥ λ(T) or the reverse. The certificate is the side with the larger
 * or equal rate. An isolated class without self-loop is the case T = ∅.
 */
export function bipartiteCertificate(model: CompiledModel, members: ArrayLike<number>, side: Int8Array): IndexCertificate {
  const s0: number[] = [];
  const s1: number[] = [];
  for (let i = 0; i < members.length; i++) (side[members[i]!] === 0 ? s0 : s1).push(members[i]!);
  const a = measure(model, s0);
  const b = measure(model, s1);
  const pick = s1.length === 0 || a.demand >= b.demand ? a : b;
  return { set: pick.set, neighbours: pick.neighbours, demand: pick.demand, capacity: pick.capacity, reason: 'bipartite' };
}

/** True when I is a non-empty independent self-loop-free set with λ(N(I)) − λ(I) ≤ margin. */
export function isCertificate(model: CompiledModel, set: ArrayLike<number>, margin = 0): boolean {
  if (set.length === 0 || !isIndependentLoopFree(model, set)) return false;
  const m = measure(model, set);
  return m.slack <= margin;
}

function toCertificate(m: SetMeasure, reason: IndexCertificate['reason']): IndexCertificate {
  return { set: m.set, neighbours: m.neighbours, demand: m.demand, capacity: m.capacity, reason };
}

/** Orders sets by slack ascending, ties to the larger set, then by members (deterministic). */
export function compareTight(a: SetMeasure, b: SetMeasure): number {
  const tie = 1e-12 * (Math.abs(a.demand) + Math.abs(b.demand) + Math.abs(a.capacity) + Math.abs(b.capacity));
  if (Math.abs(a.slack - b.slack) > tie) return a.slack - b.slack;
  if (a.set.length !== b.set.length) return b.set.length - a.set.length;
  for (let i = 0; i < a.set.length; i++) if (a.set[i] !== b.set[i]) return a.set[i]! - b.set[i]!;
  return 0;
}

/**
 * For every class v of the component without self-loop, the tightest independent self-loop-free set
 * containing v (one forced cut of the double cover each).
 */
export function tightestPerClass(model: CompiledModel, members: ArrayLike<number>, cover = new DoubleCover(model, members)): Map<number, SetMeasure> {
  const out = new Map<number, SetMeasure>();
  for (let i = 0; i < members.length; i++) {
    const v = members[i]!;
    if (model.selfLoop[v]) continue;
    const { set } = cover.tightestWith(i);
    out.set(v, measure(model, stripNeighbours(model, set)));
  }
  return out;
}

/**
 * A verified certificate for a non-bipartite component, or undefined when no independent set has
 * slack ≤ margin. First the plain minimum cut (finds any set with negative slack); on the boundary
 * (smallest slack exactly 0, which a plain cut cannot tell from the empty set) one forced cut per
 * class (see double-cover.ts) — the role of raising one class's rate by ε.
 */
export function findOverloadedSet(model: CompiledModel, members: ArrayLike<number>, margin: number, cover = new DoubleCover(model, members)): IndexCertificate | undefined {
  const a = cover.minimumSlackSet();
  if (a.length > 0) {
    const m = measure(model, stripNeighbours(model, a));
    if (m.set.length > 0 && m.slack <= margin && isIndependentLoopFree(model, m.set)) return toCertificate(m, 'overloaded');
  }
  let best: SetMeasure | undefined;
  for (const m of tightestPerClass(model, members, cover).values()) if (!best || compareTight(m, best) < 0) best = m;
  if (best && best.slack <= margin && isIndependentLoopFree(model, best.set)) return toCertificate(best, 'overloaded');
  return undefined;
}

/** Index certificate → ids-based certificate (src/errors.ts). */
export function certificateWithIds(model: CompiledModel, c: IndexCertificate): InstabilityCertificate {
  return {
    set: Array.from(c.set, (k) => model.ids[k]!),
    neighbours: Array.from(c.neighbours, (k) => model.ids[k]!),
    demand: c.demand,
    capacity: c.capacity,
    reason: c.reason,
  };
}
