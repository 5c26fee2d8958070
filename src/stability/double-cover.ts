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
    const nC = members.length;
    this.members = Int32Array.from(members);
    const local = scratchOf(model).local;
    for (let i = 0; i < nC; i++) local[members[i]!] = i;
    let total = 0;
    let arcs = 2 * nC;
    for (let i = 0; i < nC; i++) {
      const k = members[i]!;
      total += model.rates[k]!;
      arcs += model.adjStart[k + 1]! - model.adjStart[k]! + model.selfLoop[k]!;
    }
    this.demand = total;
    this.big = 4 * total + 1;
    // residuals below 2^-50 of the component's rate are rounding noise (sets at relative slack 1e-12 stay visible)
    const net = new FlowNetwork(2 + 2 * nC, arcs, 2 ** -50 * total);
    this.sourceArc = new Int32Array(nC);
    this.sinkArc = new Int32Array(nC);
    for (let i = 0; i < nC; i++) {
      const k = members[i]!;
      this.sourceArc[i] = net.addArc(0, 2 + i, model.rates[k]!);
      this.sinkArc[i] = net.addArc(2 + nC + i, 1, model.rates[k]!);
      if (model.selfLoop[k]) net.addArc(2 + i, 2 + nC + i, Infinity);
      for (let p = model.adjStart[k]!; p < model.adjStart[k + 1]!; p++) net.addArc(2 + i, 2 + nC + local[model.adj[p]!]!, Infinity);
    }
    for (let i = 0; i < nC; i++) local[members[i]!] = -1;
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
