/**
 * The stability verdict (synchronous, javascript-lp-solver), judged per connected component.
 *
 * Reference: "Stability of the stochastic matching model", J. Appl. Probab. 2016, with the
 * self-loop extension of 2021 (venue from memory): stable iff λ(I) < λ(N(I)) for every non-empty
 * independent set I without self-looped class. Independent sets are never enumerated here:
 *   - a bipartite component (no self-loop) is never stable; its heavier side is the certificate;
 *   - otherwise the edge-flow LP (programs.ts) decides: stable iff t* > TOLERANCE · σ_C
 *     (tolerance.ts). An unstable verdict is backed by a certificate found by cuts of the double
 *     cover (double-cover.ts) and verified; a stable verdict comes with a strictly positive edge flow,
 *     per-class headroom and the tightest sets (also from cuts). Should a cut ever expose a set whose
 *     slack is within the tolerance while the LP said stable, that verified set wins (the LP optimum
 *     was within solver precision of 0). Should the LP say unstable while no cut finds such a set,
 *     the design is too close to the boundary to decide and SolverError is thrown.
 */
import { SolverError, UnstableDesignError } from '../errors.js';
import type { CompiledModel } from '../model/compile.js';
import { bipartition, components } from '../model/components.js';
import { solveWithJsLp } from '../solvers/jslp.js';
import { bipartiteCertificate, certificateWithIds, compareTight, findOverloadedSet } from './certificate.js';
import { DoubleCover } from './double-cover.js';
import { asTightSet, componentHeadroom } from './headroom.js';
import { edgeFlowProgram, readEdgeFlow } from './programs.js';
import type { ComponentStability, IndexCertificate, StabilityReport } from './report.js';
import type { SetMeasure } from './sets.js';
import { TOLERANCE, flowScale } from './tolerance.js';

interface Judged {
  readonly component: ComponentStability;
  readonly tight: SetMeasure[];
}

function judgeComponent(model: CompiledModel, members: Int32Array, headroom: Float64Array, flow: Float64Array): Judged {
  const two = bipartition(model, members);
  if (two) {
    members.forEach((k) => (headroom[k] = NaN));
    const certificate = bipartiteCertificate(model, members, two.side);
    return { component: { members, bipartite: true, stable: false, certificate }, tight: [] };
  }
  const program = edgeFlowProgram(model, members);
  const sol = solveWithJsLp(program.lp);
  if (sol.status !== 'optimal') {
    throw new SolverError(`the edge-flow LP of a component (${members.length} classes) came back ${sol.status}${sol.message ? `: ${sol.message}` : ''}`);
  }
  const { minEdgeFlow, flow: mu } = readEdgeFlow(program, sol);
  const margin = TOLERANCE * flowScale(model, members);
  const cover = new DoubleCover(model, members);
  const unstable = (certificate: IndexCertificate): Judged => {
    members.forEach((k) => (headroom[k] = NaN));
    return { component: { members, bipartite: false, stable: false, minEdgeFlow, certificate }, tight: [] };
  };
  if (!(minEdgeFlow > margin)) {
    const certificate = findOverloadedSet(model, members, margin, cover);
    if (!certificate) {
      throw new SolverError(
        `cannot decide stability: the edge-flow LP gives a minimum edge flow of ${minEdgeFlow} (≤ ${margin}), ` +
          'yet no independent set is overloaded; the design sits on the stability boundary within numerical precision',
      );
    }
    return unstable(certificate);
  }
  const tight = componentHeadroom(model, members, cover, headroom);
  const first = tight[0];
  if (first && first.slack <= margin) {
    return unstable({ set: first.set, neighbours: first.neighbours, demand: first.demand, capacity: first.capacity, reason: 'overloaded' });
  }
  program.edges.forEach((e, j) => (flow[e] = mu[j]!));
  return { component: { members, bipartite: false, stable: true, minEdgeFlow }, tight };
}

/** Stability verdict, certificate or headroom and tightest sets of a compiled design. */
export function checkStability(model: CompiledModel): StabilityReport {
  const comps = components(model);
  const headroom = new Float64Array(model.n);
  const flow = new Float64Array(model.m);
  const judged = comps.members.map((members) => judgeComponent(model, members, headroom, flow));
  const stable = judged.every((j) => j.component.stable);
  const tight = judged.flatMap((j) => j.tight).sort(compareTight).map(asTightSet);
  const failing = judged.find((j) => !j.component.stable);
  return {
    stable,
    components: judged.map((j) => j.component),
    ...(failing ? { certificate: failing.component.certificate! } : {}),
    ...(stable ? { flow } : {}),
    headroom,
    tightSets: tight,
    ...(stable && tight.length > 0 ? { bottleneck: tight[0]! } : {}),
  };
}

/** Returns the report of a stable design; throws UnstableDesignError (with certificate) otherwise. */
export function assertStable(model: CompiledModel, timeUnit = 'time unit'): StabilityReport {
  const report = checkStability(model);
  if (!report.stable) throw new UnstableDesignError(certificateWithIds(model, report.certificate!), timeUnit);
  return report;
}
