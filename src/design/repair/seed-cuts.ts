/**
 * Cuts known before the first solve: the relieving cut (../milp.ts) of every overloaded set today's
 * design shows — the certificate of each unstable component and, for a bipartite component whose two
 * sides weigh the same, the other side too (N(T) = S there, so T is overloaded exactly when
 * λ(T) ≥ λ(S)). Every repair must relieve each of them, so the MILP need not find that out one
 * unstable answer at a time.
 */
import { SolverError } from '../../errors.js';
import type { StabilityReport } from '../../stability/report.js';
import type { DesignProblem } from '../problem.js';
import { relievingCut, type ToggleCut } from '../milp.js';
import { stabilityWith } from './stable.js';

/** Relative tie below which the two sides of a bipartite component count as equal. */
const SIDE_TIE = 1e-12;

export function seedCuts(sub: DesignProblem): ToggleCut[] {
  const today = new Uint8Array(sub.toggles.length);
  const out: ToggleCut[] = [];
  const push = (set: ArrayLike<number>, neighbours: ArrayLike<number>): void => {
    const cut = relievingCut(sub, today, { set, neighbours });
    if (cut) out.push(cut);
  };
  let report: StabilityReport;
  try {
    report = stabilityWith(sub, []);
  } catch (e) {
    if (e instanceof SolverError) return out; // today's design on the boundary: no certificate to seed with
    throw e;
  }
  for (const c of report.components) {
    const cert = c.certificate;
    if (!cert) continue;
    push(cert.set, cert.neighbours);
    if (cert.reason === 'bipartite' && cert.neighbours.length > 0 && cert.capacity >= cert.demand * (1 - SIDE_TIE)) push(cert.neighbours, cert.set);
  }
  return out;
}
