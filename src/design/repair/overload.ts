/**
 * Why no allowed set restores stability, when even the all-allowed design (today's design plus every
 * allowed candidate, the limits taken one candidate at a time) is unstable. Its stability certificate
 * is an independent set I without self-pair with λ(I) ≥ λ(N(I)); relief.ts says which pairs relieve
 * it. Every allowed candidate is already in the design, so every relieving pair is either unlisted or
 * kept out by a rule: those are named.
 */
import type { DesignProblem } from '../space/problem.js';
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
  type Listed = Omit<BlockedPair, 'relief'>;
  const listed: Listed[] = [
    ...forbidden.map((f): Listed => ({ a: f.a, b: f.b, rule: 'forbidden', origin: 'candidate', source: f.source, full: [] })),
    ...space.limitBlocked.map(({ toggle, full }): Listed => {
      const t = problem.toggles[toggle]!;
      return { a: t.a, b: t.b, rule: 'limit', origin: 'candidate', source: t.source, full };
    }),
  ].sort((x, y) => x.source - y.source);
  for (const r of problem.forcedOut) listed.push({ a: r.a, b: r.b, rule: 'forbidden', origin: 'compatibility', source: r.source, full: [] });
  const blocked: BlockedPair[] = [];
  for (const b of listed) {
    const relief = reliefOf(masks, b.a, b.b);
    if (relief) blocked.push({ ...b, relief });
  }
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
