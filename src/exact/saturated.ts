import type { InstabilityCertificate } from '../errors.js';
import type { CompiledModel } from '../model/compile.js';

/** Class indices (of `model`) of a two-word mask over `members` (local index q ↔ members[q]). */
export function maskMembers(members: ArrayLike<number>, lo: number, hi: number): Int32Array {
  const out: number[] = [];
  for (let q = 0; q < members.length; q++) {
    if (q < 32 ? (lo >>> q) & 1 : (hi >>> (q - 32)) & 1) out.push(members[q]!);
  }
  return Int32Array.from(out);
}

/**
 * Certificate from a set A met by the recursion with λ(N(A)) <= λ(A ∖ S) (class indices of
 * `model`): I = A ∖ S has λ(I) = λ(A ∖ S) >= λ(N(A)) >= λ(N(I)).
 */
export function certificateOfSet(model: CompiledModel, set: ArrayLike<number>): InstabilityCertificate {
  const ids: string[] = [];
  const nb = new Uint8Array(model.n);
  let demand = 0;
  for (let q = 0; q < set.length; q++) {
    const k = set[q]!;
    if (model.selfLoop[k]) continue;
    ids.push(model.ids[k]!);
    demand += model.rates[k]!;
    for (let p = model.adjStart[k]!; p < model.adjStart[k + 1]!; p++) nb[model.adj[p]!] = 1;
  }
  const neighbours: string[] = [];
  let capacity = 0;
  for (let k = 0; k < model.n; k++) {
    if (!nb[k]) continue;
    neighbours.push(model.ids[k]!);
    capacity += model.rates[k]!;
  }
  return { set: ids, neighbours, demand, capacity, reason: 'overloaded' };
}
