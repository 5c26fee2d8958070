/**
 * Cuts in the bipartite double cover of one component, used to find certificates, headroom and
 * tight sets in polynomial time (derived for this project):
 *
 * H has a source s, a left copy i' and a right copy j'' of every class, arcs s → i' of capacity λ_i,
 * i' → j'' of infinite capacity for every j ∈ N(i) (i' → i'' when i has a self-loop) and j'' → sink
 * of capacity λ_j. A cut whose source side holds the left copies of A must also hold N(A)'' and costs
 * λ(V∖A) + λ(N(A)) = λ(V) + [λ(N(A)) − λ(A)], so a minimum cut minimises slack(A) = λ(N(A)) − λ(A)
 * over all sets A.
 *
 * For any A, I = A ∖ N(A) is independent and self-loop free (a member adjacent to another member,
 * or to itself, lies in N(A)), and slack(I) ≤ slack(A): (1) N(I) ∩ A = ∅, since x ∈ A adjacent to
 * i ∈ I would put i in N(A); so N(I) ⊆ N(A) ∖ A; (2) A ∖ I = A ∩ N(A). Hence N(I) and A ∖ I are
 * disjoint parts of N(A), λ(N(A)) ≥ λ(N(I)) + λ(A ∖ I), and
 * slack(A) = λ(N(A)) − λ(I) − λ(A ∖ I) ≥ λ(N(I)) − λ(I) = slack(I).
 *
 * Forcing a class v into A and out of N(A) (arcs s → v' and v'' → sink made effectively infinite)
 * gives min over A ∋ v with v ∉ N(A) of slack(A); the I = A ∖ N(A) of that cut contains v, so this is
 * min over independent self-loop-free I ∋ v of slack(I): the headroom of v.
 */
import type { CompiledModel } from '../model/compile.js';
import { FlowNetwork } from './maxflow.js';
import { scratchOf } from './scratch.js';

/** The network H of one component, as built by coverNetwork. */
export interface CoverNetwork {
  readonly net: FlowNetwork;
  /** Arc s → i' and arc i'' → sink of each member (local index i). */
  readonly sourceArc: Int32Array;
  readonly sinkArc: Int32Array;
  /** The arc i' → j'' of each adjacency entry and self-loop, with the edge it stands for. */
  readonly pairArcs: ReadonlyArray<{ readonly arc: number; readonly edge: number }>;
  /** λ(C). */
  readonly demand: number;
}

/**
 * H for the members of one component: node 0 the source, 1 the sink, 2 + i the left copy and
 * 2 + |C| + i the right copy of member i; the arcs s → i' and i'' → sink of capacity
 * `capacity(k)` for class k, and the infinite arcs i' → j'' of its compatibilities. Residuals below
 * 2^-50 of λ(C) count as zero (sets at relative slack 1e-12 stay visible).
 */
export function coverNetwork(model: CompiledModel, members: ArrayLike<number>, capacity: (k: number) => number): CoverNetwork {
  const nC = members.length;
  const local = scratchOf(model).local;
  for (let i = 0; i < nC; i++) local[members[i]!] = i;
  let total = 0;
  let arcs = 2 * nC;
  for (let i = 0; i < nC; i++) {
    const k = members[i]!;
    total += model.rates[k]!;
    arcs += model.adjStart[k + 1]! - model.adjStart[k]! + model.selfLoop[k]!;
  }
  const net = new FlowNetwork(2 + 2 * nC, arcs, 2 ** -50 * total);
  const sourceArc = new Int32Array(nC);
  const sinkArc = new Int32Array(nC);
  const pairArcs: Array<{ arc: number; edge: number }> = [];
  for (let i = 0; i < nC; i++) {
    const k = members[i]!;
    sourceArc[i] = net.addArc(0, 2 + i, capacity(k));
    sinkArc[i] = net.addArc(2 + nC + i, 1, capacity(k));
    if (model.selfLoop[k]) pairArcs.push({ arc: net.addArc(2 + i, 2 + nC + i, Infinity), edge: model.selfEdge[k]! });
    for (let p = model.adjStart[k]!; p < model.adjStart[k + 1]!; p++) {
      pairArcs.push({ arc: net.addArc(2 + i, 2 + nC + local[model.adj[p]!]!, Infinity), edge: model.adjEdge[p]! });
    }
  }
  for (let i = 0; i < nC; i++) local[members[i]!] = -1;
  return { net, sourceArc, sinkArc, pairArcs, demand: total };
}

export class DoubleCover {
  private readonly net: FlowNetwork;
  private readonly members: Int32Array;
  private readonly sourceArc: Int32Array;
  private readonly sinkArc: Int32Array;
  private readonly base: Float64Array;
  /** λ(C). */
  readonly demand: number;
  /** Value of the maximum flow of H (= λ(C) + min(0, min_A slack(A))). */
  readonly maxFlow: number;
  private readonly big: number;

  constructor(model: CompiledModel, members: ArrayLike<number>) {
    this.members = Int32Array.from(members);
    const { net, sourceArc, sinkArc, demand } = coverNetwork(model, members, (k) => model.rates[k]!);
    this.demand = demand;
    this.big = 4 * demand + 1;
    this.sourceArc = sourceArc;
    this.sinkArc = sinkArc;
    this.maxFlow = net.augment(0, 1);
    this.base = net.snapshot();
    this.net = net;
  }

  /** Left copies on the largest minimum-cut source side, as global class indices. */
  private sourceSide(): Int32Array {
    const reach = this.net.reachesSink(1);
    const out: number[] = [];
    for (let i = 0; i < this.members.length; i++) if (!reach[2 + i]) out.push(this.members[i]!);
    return Int32Array.from(out);
  }

  /** A set A minimising slack(A) over all sets (empty when the minimum is 0, i.e. H saturates). */
  minimumSlackSet(): Int32Array {
    this.net.restore(this.base);
    return this.sourceSide();
  }

  /**
   * A set A ∋ v with v ∉ N(A) minimising slack(A), and that minimum as measured by the flow
   * (λ(C) + slack = the forced maximum flow). `localV` is v's position in `members`.
   */
  tightestWith(localV: number): { set: Int32Array; flowSlack: number } {
    const net = this.net;
    net.restore(this.base);
    net.addCapacity(this.sourceArc[localV]!, this.big);
    net.addCapacity(this.sinkArc[localV]!, this.big);
    const value = this.maxFlow + net.augment(0, 1);
    const set = this.sourceSide();
    net.restore(this.base);
    return { set, flowSlack: value - this.demand };
  }
}
