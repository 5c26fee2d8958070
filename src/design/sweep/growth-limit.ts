/**
 * How far a set G of classes can grow together (every λ_k, k ∈ G, times the same factor s, the other
 * rates fixed) before the design turns unstable.
 *
 * Derived for this project from the edge-flow characterisation of stability (see
 * src/stability/programs.ts): a connected non-bipartite component is stable iff λ = Bμ for some
 * strictly positive edge flow μ (B: class × edge incidence, 2 on a self-loop), i.e. iff λ lies in the
 * interior of the cone {Bμ : μ ≥ 0}, which is full-dimensional for such components. Along the ray
 * λ(s) = λ + (s − 1) λ_G (λ_G: the rates of G, zero elsewhere), starting inside the cone at s = 1, the
 * design stays stable exactly while λ(s) is interior, so the limit is the largest s with λ(s) in the
 * closed cone:
 *   max σ  s.t.  Σ_{e∋k} a_{k,e} μ_e − σ λ_G,k = λ_k  (every class k of the component),  μ ≥ 0,
 * and s* = 1 + σ*, the minimum over the components that hold a class of G (Infinity when the LP is
 * unbounded, e.g. every grown class has a self-loop). This is a different direction from one class's
 * headroom (e_k), hence its own LP. Solved with javascript-lp-solver; the answer is checked against
 * the constraints by the adapter.
 */
import { SolverError } from '../../errors.js';
import type { CompiledModel } from '../../model/compile.js';
import { components } from '../../model/components.js';
import type { LinearProgram, LpConstraint, LpVariable } from '../../solvers/lp.js';
import { solveWithJsLp } from '../../solvers/jslp.js';
import { componentEdges, incidenceRows } from '../../stability/programs.js';

/** How the limit was found (for outputs that must say so). */
export const GROWTH_LIMIT_METHOD = 'edge-flow LP along the growth direction (javascript-lp-solver, answer checked)';

/** The LP above for one component (rates in units of the component's mean rate). */
export function growthProgram(model: CompiledModel, members: ArrayLike<number>, grown: Uint8Array): LinearProgram {
  const edges = componentEdges(model, members);
  let total = 0;
  for (let i = 0; i < members.length; i++) total += model.rates[members[i]!]!;
  const unit = total / members.length;
  const rows = incidenceRows(model, members, edges);
  const sigma = edges.length;
  const variables: LpVariable[] = [...Array.from(edges, (e) => ({ name: `mu${e}` })), { name: 'sigma', lower: -Infinity }];
  const constraints: LpConstraint[] = rows.map((r, i) => {
    const k = members[i]!;
    const g = grown[k] ? model.rates[k]! / unit : 0;
    return {
      name: `class ${model.ids[k]}`,
      variables: g > 0 ? [...r.variables, sigma] : r.variables,
      coefficients: g > 0 ? [...r.coefficients, -g] : r.coefficients,
      relation: '=',
      rhs: model.rates[k]! / unit,
    };
  });
  return { sense: 'max', objective: { variables: [sigma], coefficients: [1] }, variables, constraints };
}

/**
 * The limit factor s* for growing `grow` (class indices): the design is stable for 1 <= s < s* when
 * it is stable today. Infinity when no component limits the growth.
 */
export function growthLimit(model: CompiledModel, grow: ArrayLike<number>): number {
  const grown = new Uint8Array(model.n);
  for (let i = 0; i < grow.length; i++) grown[grow[i]!] = 1;
  let limit = Infinity;
  for (const members of components(model).members) {
    if (!members.some((k) => grown[k] === 1)) continue;
    const sol = solveWithJsLp(growthProgram(model, members, grown));
    if (sol.status === 'unbounded') continue;
    if (sol.status !== 'optimal') {
      throw new SolverError(`the growth-limit LP of a component (${members.length} classes) came back ${sol.status}${sol.message ? `: ${sol.message}` : ''}`);
    }
    limit = Math.min(limit, 1 + sol.objective);
  }
  return limit;
}
