/**
 * The stability verdict (synchronous), judged per connected component.
 *
 * Reference: "Stability of the stochastic matching model", J. Appl. Probab. 2016, with the
 * self-loop extension of 2021 (venue from memory): stable iff λ(I) < λ(N(I)) for every non-empty
 * independent set I without self-looped class. Independent sets are never enumerated here:
 *   - a bipartite component (no self-loop) is never stable; its heavier side is the certificate;
 *   - a single self-looped class is always stable (no such I exists);
 *   - otherwise floating-point tools find the candidate tightest sets — the largest least edge
 *     flow t* (edge-flow.ts, by minimum cuts; the edge-flow LP of programs.ts when those give up)
 *     says whether to look for an overloaded set, minimum cuts of the double cover
 *     (double-cover.ts) find the set of smallest slack containing each class — and the sign of
 *     λ(N(I)) − λ(I) of those sets is decided exactly from the rates as decimals (exact-slack.ts).
 *     Verdicts are therefore exact down to relative slacks far below 1e-12 (what limits them is
 *     whether the cuts find the tightest set, i.e. double precision, about 1e-15 of the rates).
 *
 * Rates are divided by a power of two near their mean first (model/rate-scale.ts) and the figures
 * scaled back, so any finite positive rates give the same verdict and figures times the scale.
 * Classes of rate 0 (a demand variant without that class) receive no items: the verdict is that of
 * the classes with a positive rate (zero-rate.ts).
 */
import { UnstableDesignError } from '../errors.js';
import type { CompiledModel } from '../model/compile.js';
import { bipartition, components } from '../model/components.js';
import { scaledModel } from '../model/rate-scale.js';
import { solveWithJsLp } from '../solvers/jslp.js';
import { SolverError } from '../errors.js';
import { bipartiteCertificate, certificateWithIds, compareTight } from './certificate.js';
import { DoubleCover } from './double-cover.js';
import { exactSlack } from '../model/exact-slack.js';
import { asTightSet, componentHeadroom } from './headroom.js';
import { edgeFlowProgram, readEdgeFlow } from './programs.js';
import { leastEdgeFlow, type LeastEdgeFlow } from './edge-flow.js';
import type { ComponentStability, IndexCertificate, StabilityReport } from './report.js';
import { scratchOf } from './scratch.js';
import { measure, stripNeighbours, type SetMeasure } from './sets.js';
import { TOLERANCE, flowScale } from './tolerance.js';
import { scaledReport } from './scale-report.js';
import { checkWithZeroRates } from './zero-rate.js';

interface Judged {
  readonly component: ComponentStability;
  readonly tight: SetMeasure[];
}

/** Sets whose floating slack is within this share of their capacity get their slack decided exactly. */
const NEAR_BOUNDARY = 1e-6;

/**
 * The set with its slack replaced by the exact one (original rates, divided by `scale` into the
 * working units: exact for a power of two), when it is near the boundary.
 */
function decided(m: SetMeasure, original: ArrayLike<number>, scale: number): SetMeasure {
  if (m.slack > NEAR_BOUNDARY * Math.abs(m.capacity)) return m;
  const exact = exactSlack(original, m.set, m.neighbours);
  return { ...m, slack: exact.value / scale };
}

/** t* and an optimal flow by the linear program (programs.ts), when the cuts of edge-flow.ts give up. */
function edgeFlowByLp(model: CompiledModel, members: Int32Array): LeastEdgeFlow {
  const program = edgeFlowProgram(model, members);
  const sol = solveWithJsLp(program.lp);
  if (sol.status !== 'optimal') {
    throw new SolverError(`the edge-flow LP of a component (${members.length} classes) came back ${sol.status}${sol.message ? `: ${sol.message}` : ''}`);
  }
  const { minEdgeFlow, flow: mu } = readEdgeFlow(program, sol);
  return { minEdgeFlow, writeFlow: (flow) => program.edges.forEach((e, j) => (flow[e] = Math.max(0, mu[j]!))) };
}

function judgeComponent(model: CompiledModel, original: ArrayLike<number>, scale: number, members: Int32Array, headroom: Float64Array, flow: Float64Array): Judged {
  if (members.length === 1 && model.selfLoop[members[0]!]) {
    // one class matching its own kind: every item waits for the next one, μ(loop) = λ / 2
    const k = members[0]!;
    headroom[k] = Infinity;
    flow[model.selfEdge[k]!] = model.rates[k]! / 2;
    return { component: { members, bipartite: false, stable: true, minEdgeFlow: model.rates[k]! / 2 }, tight: [] };
  }
  const two = bipartition(model, members, scratchOf(model).side);
  if (two) {
    members.forEach((k) => (headroom[k] = NaN));
    const certificate = bipartiteCertificate(model, members, two.side);
    return { component: { members, bipartite: true, stable: false, certificate }, tight: [] };
  }
  const least = leastEdgeFlow(model, members) ?? edgeFlowByLp(model, members);
  const minEdgeFlow = least.minEdgeFlow;
  const cover = new DoubleCover(model, members);
  const unstable = (m: SetMeasure): Judged => {
    members.forEach((k) => (headroom[k] = NaN));
    const certificate: IndexCertificate = { set: m.set, neighbours: m.neighbours, demand: m.demand, capacity: m.capacity, reason: 'overloaded' };
    return { component: { members, bipartite: false, stable: false, minEdgeFlow, certificate }, tight: [] };
  };
  if (!(minEdgeFlow > TOLERANCE * flowScale(model, members))) {
    // the LP doubts: the plain minimum cut finds a set of negative slack if there is one
    const a = cover.minimumSlackSet();
    if (a.length > 0) {
      const m = decided(measure(model, stripNeighbours(model, a)), original, scale);
      if (m.set.length > 0 && m.slack <= 0) return unstable(m);
    }
  }
  // the tightest set containing each class; those near the boundary decided exactly
  const tight = componentHeadroom(model, members, cover, headroom).map((m) => decided(m, original, scale));
  tight.sort(compareTight);
  const first = tight[0];
  if (first && first.slack <= 0) return unstable(first);
  for (const m of tight) for (let i = 0; i < m.set.length; i++) headroom[m.set[i]!] = Math.min(headroom[m.set[i]!]!, m.slack);
  least.writeFlow(flow);
  return { component: { members, bipartite: false, stable: true, minEdgeFlow }, tight };
}

/** The verdict on a model whose rates are all positive and of moderate size. */
function judgeAll(model: CompiledModel, original: ArrayLike<number>, scale: number): StabilityReport {
  const comps = components(model);
  const headroom = new Float64Array(model.n);
  const flow = new Float64Array(model.m);
  const judged = comps.members.map((members) => judgeComponent(model, original, scale, members, headroom, flow));
  const stable = judged.every((j) => j.component.stable);
  const tight = judged.flatMap((j) => j.tight).sort(compareTight).map(asTightSet);
  const failing = judged.find((j) => !j.component.stable);
  const bottleneck = stable && tight.length > 0 ? tight[0]! : undefined;
  return {
    stable,
    components: judged.map((j) => j.component),
    ...(failing ? { certificate: failing.component.certificate! } : {}),
    ...(stable ? { flow } : {}),
    headroom,
    tightSets: tight,
    ...(bottleneck ? { bottleneck, relativeSlack: bottleneck.slack / bottleneck.capacity } : {}),
  };
}

/** Stability verdict, certificate or headroom and tightest sets of a compiled design. */
export function checkStability(model: CompiledModel): StabilityReport {
  for (let k = 0; k < model.n; k++) if (!(model.rates[k]! > 0)) return checkWithZeroRates(model, checkStability);
  const { working, scale } = scaledModel(model);
  return scaledReport(judgeAll(working, model.rates, scale), scale);
}

/** Returns the report of a stable design; throws UnstableDesignError (with certificate) otherwise. */
export function assertStable(model: CompiledModel, timeUnit = 'time unit'): StabilityReport {
  const report = checkStability(model);
  if (!report.stable) throw new UnstableDesignError(certificateWithIds(model, report.certificate!), timeUnit);
  return report;
}
