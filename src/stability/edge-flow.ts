/**
 * The largest least edge flow of a component, t* = max t s.t. Σ_{e∋k} a_{k,e} μ_e = λ_k (k ∈ C),
 * μ_e ≥ t (a = 2 on a self-loop), and an edge flow attaining it, by minimum cuts of the double cover
 * instead of a linear program. Derived for this project:
 *
 * 1. Write μ = t + x with x ≥ 0. Then A x = b(t) := λ − t·d, where d_k = Σ_{e∋k} a_{k,e} (the
 *    degree, a self-loop counted twice). So t is feasible iff b(t) ≥ 0 and the double cover H with
 *    capacities b(t) (double-cover.ts: s → i' of b_i, i' → j'' infinite for j ∈ N(i), j'' → sink of
 *    b_j) saturates: x_ij = (f(i'→j'') + f(j'→i''))/2 and x_ii = f(i'→i'')/2 turn a saturating flow
 *    into a solution, and a solution x into a saturating flow (f(i'→j'') = x_ij, f(i'→i'') = 2x_ii).
 * 2. H saturates iff no cut is cheaper than Σ b: for every set A, g_A(t) := b(N(A)) − b(A) ≥ 0, where
 *    g_A(t) = c_A − t·e_A with c_A = λ(N(A)) − λ(A) and e_A = d(N(A)) − d(A). The least g over A,
 *    G(t) = (maximum flow at t) − Σ b(t), is concave and piecewise linear in t.
 * 3. b(t) ≥ 0 means t ≤ σ = min_k λ_k / d_k. Start at t = σ. While H does not saturate at t, the
 *    source side A of a minimum cut has g_A(t) < 0; then e_A > 0 (a component with an odd cycle or a
 *    self-loop is feasible for every t low enough, so no g_A can stay negative as t decreases), and
 *    the next t is the root c_A / e_A < t. This is Newton's method on G from the right: it stops at
 *    t* after finitely many cuts (each one a different A), in practice two to four.
 * The root is computed from the rates, so t* carries the rates' precision. When the cuts disagree
 * with the arithmetic (no progress within MAX_ROUNDS, or e_A ≤ 0 by rounding), the caller falls back
 * to the linear program.
 *
 * Components here are connected and not bipartite, or a bipartite one with a self-loop.
 */
import type { CompiledModel } from '../model/compile.js';
import { coverNetwork, type CoverNetwork } from './double-cover.js';
import { scratchOf } from './scratch.js';
import { flowScale } from './tolerance.js';

/** More rounds than this mean the cuts and the arithmetic disagree: give up (the caller uses the LP). */
const MAX_ROUNDS = 64;

/** t* and μ (by global edge index; edges outside the component untouched), or null to use the LP. */
export interface LeastEdgeFlow {
  readonly minEdgeFlow: number;
  /** Writes μ_e of an optimal flow into flow[e] for the component's edges. */
  writeFlow(flow: Float64Array): void;
}

export function leastEdgeFlow(model: CompiledModel, members: Int32Array): LeastEdgeFlow | null {
  // H with no capacity yet on its source and sink arcs: each round sets b(t)
  const cover = coverNetwork(model, members, () => 0);
  const nC = members.length;
  const { local, markA: inN } = scratchOf(model);
  for (let i = 0; i < nC; i++) local[members[i]!] = i;
  try {
    return newton(model, members, cover, local, inN);
  } finally {
    for (let i = 0; i < nC; i++) local[members[i]!] = -1;
  }
}

function newton(model: CompiledModel, members: Int32Array, cover: CoverNetwork, local: Int32Array, inN: Uint8Array): LeastEdgeFlow | null {
  const nC = members.length;
  const { net, sourceArc, sinkArc, pairArcs, demand: total } = cover;
  const rate = new Float64Array(nC);
  const degree = new Float64Array(nC);
  for (let i = 0; i < nC; i++) {
    const k = members[i]!;
    rate[i] = model.rates[k]!;
    degree[i] = model.adjStart[k + 1]! - model.adjStart[k]! + 2 * model.selfLoop[k]!;
  }
  const empty = net.snapshot();
  const done = (t: number): LeastEdgeFlow => ({
    minEdgeFlow: t,
    writeFlow(flow: Float64Array): void {
      for (const { edge } of pairArcs) flow[edge] = t;
      // x_ij = (f(i'→j'') + f(j'→i''))/2: each direction is one adjacency arc; x_ii = f(i'→i'')/2
      for (const { arc, edge } of pairArcs) flow[edge] = flow[edge]! + net.flowOn(arc) / 2;
    },
  });

  let t = flowScale(model, members);
  if (!Number.isFinite(t)) return null;
  const touched: number[] = [];
  for (let round = 0; round < MAX_ROUNDS; round++) {
    net.restore(empty);
    let supply = 0;
    for (let i = 0; i < nC; i++) {
      const b = Math.max(0, rate[i]! - t * degree[i]!);
      net.addCapacity(sourceArc[i]!, b);
      net.addCapacity(sinkArc[i]!, b);
      supply += b;
    }
    if (net.augment(0, 1) >= supply - 2 ** -44 * total) return done(t);
    // A: the left copies on the source side of a minimum cut (those that cannot reach the sink);
    // c = λ(N(A)) − λ(A) and e = d(N(A)) − d(A)
    const reach = net.reachesSink(1);
    let c = 0;
    let e = 0;
    const mark = (j: number): void => {
      if (inN[j]) return;
      inN[j] = 1;
      touched.push(j);
    };
    for (let i = 0; i < nC; i++) {
      if (reach[2 + i]) continue;
      c -= rate[i]!;
      e -= degree[i]!;
      const k = members[i]!;
      if (model.selfLoop[k]) mark(k);
      for (let p = model.adjStart[k]!; p < model.adjStart[k + 1]!; p++) mark(model.adj[p]!);
    }
    for (const j of touched) {
      c += rate[local[j]!]!;
      e += degree[local[j]!]!;
      inN[j] = 0;
    }
    touched.length = 0;
    if (!(e > 0)) return null;
    const next = c / e;
    if (!(next < t)) return done(t); // a cut of rounding noise at t*: t is the optimum
    t = next;
  }
  return null;
}
