/**
 * Why no allowed set restores stability, when even the all-allowed design (today's design plus every
 * allowed candidate, the limits taken one candidate at a time) is unstable. Its stability certificate
 * is an independent set I without self-pair with λ(I) ≥ λ(N(I)); relief.ts says which pairs relieve
 * it. Every allowed candidate is already in the design, so every relieving pair is either unlisted or
 * kept out by a rule: those are named.
 */
import type { DesignProblem } from '../problem.js';
import type { RepairSpace } from './space.js';
import { stabilityWith } from './stable.js';
import { reliefOf, setMasks } from './relief.js';
import type { BlockedPair, ForbiddenCandidate, Overload, Partner } from './types.js';

/** The overload of the all-allowed design, or undefined when that design is stable. */
export function overloadOf(problem: DesignProblem, space: RepairSpace, forbidden: readonly ForbiddenCandidate[]): Overload | undefined {
  const all = space.sub.toggles.map((_, j) => j);
  const report = stabilityWith(space.sub, all);
  if (report.stable) return undefined;
  const cert = report.certificate!;
  const masks = setMasks(problem.n, cert.set, cert.neighbours);
  const blocked: BlockedPair[] = [];
  const block = (a: number, b: number, rule: BlockedPair['rule'], origin: BlockedPair['origin'], source: number, full: readonly number[]): void => {
    const kind = reliefOf(masks, a, b);
    if (kind) blocked.push({ a, b, rule, origin, source, full, relief: kind });
  };
  const candidates: Array<{ source: number; add: () => void }> = [];
  for (const f of forbidden) candidates.push({ source: f.source, add: () => block(f.a, f.b, 'forbidden', 'candidate', f.source, []) });
  for (const l of space.limitBlocked) {
    const t = problem.toggles[l.toggle]!;
    candidates.push({ source: t.source, add: () => block(t.a, t.b, 'limit', 'candidate', t.source, l.full) });
  }
  candidates.sort((x, y) => x.source - y.source).forEach((c) => c.add());
  for (const r of problem.forcedOut) block(r.a, r.b, 'forbidden', 'compatibility', r.source, []);
  const partners: Partner[] = [];
  for (let k = 0; k < problem.n; k++) if (!masks.inI[k] && !masks.inN[k]) partners.push({ class: k, rate: problem.rates[k]! });
  partners.sort((x, y) => y.rate - x.rate || x.class - y.class);
  return {
    set: Int32Array.from(cert.set),
    neighbours: Int32Array.from(cert.neighbours),
    demand: cert.demand,
    capacity: cert.capacity,
    deficit: Math.max(0, cert.demand - cert.capacity),
    partners,
    blocked,
  };
}
