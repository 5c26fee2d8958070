/**
 * The linear programs of the stability layer, written in the solver-neutral form of
 * src/solvers/lp.ts, for one connected component. B is the class × edge incidence matrix with
 * a_{k,e} = 1 for an ordinary edge at k and 2 for the self-loop of k.
 */
import type { CompiledModel } from '../model/compile.js';
import type { LinearProgram, LpConstraint, LpSolution, LpVariable } from '../solvers/lp.js';
import { scratchOf } from './scratch.js';

/**
 * Edges of a component (`members` is a whole connected component), ascending; time in the
 * members' degrees.
 */
export function componentEdges(model: CompiledModel, members: ArrayLike<number>): Int32Array {
  const out: number[] = [];
  for (let i = 0; i < members.length; i++) {
    const k = members[i]!;
    if (model.selfEdge[k]! >= 0) out.push(model.selfEdge[k]!);
    for (let p = model.adjStart[k]!; p < model.adjStart[k + 1]!; p++) if (model.adj[p]! > k) out.push(model.adjEdge[p]!);
  }
  return Int32Array.from(out).sort();
}

/** Rows Σ_{e∋k} a_{k,e} x_{col(e)} for each member k, as sparse (variables, coefficients). */
export function incidenceRows(model: CompiledModel, members: ArrayLike<number>, edges: Int32Array): Array<{ variables: number[]; coefficients: number[] }> {
  const local = scratchOf(model).local;
  for (let i = 0; i < members.length; i++) local[members[i]!] = i;
  const rows = Array.from({ length: members.length }, () => ({ variables: [] as number[], coefficients: [] as number[] }));
  edges.forEach((e, col) => {
    const a = model.edgeA[e]!;
    const b = model.edgeB[e]!;
    if (a === b) {
      rows[local[a]!]!.variables.push(col);
      rows[local[a]!]!.coefficients.push(2);
    } else {
      for (const k of [a, b]) {
        rows[local[k]!]!.variables.push(col);
        rows[local[k]!]!.coefficients.push(1);
      }
    }
  });
  for (let i = 0; i < members.length; i++) local[members[i]!] = -1;
  return rows;
}

/** The edge-flow LP of a component, and how to read its solution. */
export interface EdgeFlowProgram {
  readonly lp: LinearProgram;
  /** Global edge index of LP column j (j < edges.length); the last column is t. */
  readonly edges: Int32Array;
  /** Rates were divided by this (the component's mean rate) before solving. */
  readonly rateUnit: number;
}

/**
 * max t s.t. Σ_{e∋k} a_{k,e} μ_e = λ_k (k ∈ C), μ_e ≥ t, t free — written with μ_e = t + ν_e
 * (ν ≥ 0) and rates in units of the component's mean rate. The n equalities are posed as
 * Bμ ≤ λ plus one aggregate row 1ᵀBμ = 2 Σ_e μ_e ≥ Σ_k λ_k; together they force Bμ = λ, and the
 * simplex then needs one artificial row instead of n (several times faster on large components).
 */
export function edgeFlowProgram(model: CompiledModel, members: ArrayLike<number>): EdgeFlowProgram {
  const edges = componentEdges(model, members);
  const mC = edges.length;
  let total = 0;
  for (let i = 0; i < members.length; i++) total += model.rates[members[i]!]!;
  const rateUnit = total / members.length;
  const tCol = mC;
  const variables: LpVariable[] = [];
  for (let j = 0; j < mC; j++) variables.push({ name: `nu${edges[j]}` });
  variables.push({ name: 't', lower: -Infinity });
  const rows = incidenceRows(model, members, edges);
  const constraints: LpConstraint[] = rows.map((r, i) => {
    let d = 0;
    for (const a of r.coefficients) d += a;
    return {
      name: `class ${model.ids[members[i]!]}`,
      variables: [...r.variables, tCol],
      coefficients: [...r.coefficients, d],
      relation: '<=',
      rhs: model.rates[members[i]!]! / rateUnit,
    };
  });
  constraints.push({
    name: 'all demand matched',
    variables: [...Array.from({ length: mC }, (_, j) => j), tCol],
    coefficients: [...Array.from({ length: mC }, () => 2), 2 * mC],
    relation: '>=',
    rhs: total / rateUnit,
  });
  return { lp: { sense: 'max', objective: { variables: [tCol], coefficients: [1] }, variables, constraints }, edges, rateUnit };
}

/** t* in rate units, and the edge flows μ_e = t* + ν_e (per LP column) of an optimal solution. */
export function readEdgeFlow(p: EdgeFlowProgram, sol: LpSolution): { minEdgeFlow: number; flow: Float64Array } {
  const mC = p.edges.length;
  const t = sol.values[mC]!;
  const flow = new Float64Array(mC);
  for (let j = 0; j < mC; j++) flow[j] = p.rateUnit * (t + Math.max(0, sol.values[j]!));
  return { minEdgeFlow: p.rateUnit * t, flow };
}

/**
 * Headroom LP of class k in its component: max s s.t. Σ_{e∋j} a_{j,e} μ_e = λ_j + s·[j = k] (j ∈ C),
 * μ ≥ 0, s free. Unbounded exactly when k has a self-loop (its loop absorbs any growth). The last
 * column is s. Rates are used as given.
 */
export function headroomProgram(model: CompiledModel, members: ArrayLike<number>, k: number): LinearProgram {
  const edges = componentEdges(model, members);
  const mC = edges.length;
  const variables: LpVariable[] = [];
  for (let j = 0; j < mC; j++) variables.push({ name: `mu${edges[j]}` });
  variables.push({ name: 's', lower: -Infinity });
  const rows = incidenceRows(model, members, edges);
  const constraints: LpConstraint[] = rows.map((r, i) => {
    const j = members[i]!;
    return {
      name: `class ${model.ids[j]}`,
      variables: j === k ? [...r.variables, mC] : r.variables,
      coefficients: j === k ? [...r.coefficients, -1] : r.coefficients,
      relation: '=',
      rhs: model.rates[j]!,
    };
  });
  return { sense: 'max', objective: { variables: [mC], coefficients: [1] }, variables, constraints };
}

/** Headroom read from a solved headroomProgram: Infinity when unbounded, NaN when infeasible. */
export function readHeadroom(sol: LpSolution): number {
  if (sol.status === 'unbounded') return Infinity;
  if (sol.status === 'optimal') return sol.objective;
  return NaN;
}
