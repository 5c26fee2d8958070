/**
 * Sets of classes (index arrays) and their demand, capacity and slack: for an independent set I,
 * demand λ(I), capacity λ(N(I)) and slack λ(N(I)) − λ(I).
 */
import type { CompiledModel } from '../model/compile.js';
import { scratchOf } from './scratch.js';

/**
 * N(set), ascending: every neighbour of a member, the member itself when it has a self-loop.
 * Time in the degrees of the members (not in the number of classes).
 */
export function neighbourhood(model: CompiledModel, set: ArrayLike<number>): Int32Array {
  const mark = scratchOf(model).markA;
  const out: number[] = [];
  const add = (k: number): void => {
    if (!mark[k]) {
      mark[k] = 1;
      out.push(k);
    }
  };
  for (let i = 0; i < set.length; i++) {
    const k = set[i]!;
    if (model.selfLoop[k]) add(k);
    for (let p = model.adjStart[k]!; p < model.adjStart[k + 1]!; p++) add(model.adj[p]!);
  }
  for (const k of out) mark[k] = 0;
  return Int32Array.from(out).sort();
}

/** λ(set). */
export function rateOf(model: CompiledModel, set: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < set.length; i++) s += model.rates[set[i]!]!;
  return s;
}

/** True when no two members are compatible and no member has a self-loop. */
export function isIndependentLoopFree(model: CompiledModel, set: ArrayLike<number>): boolean {
  const mark = scratchOf(model).markA;
  for (let i = 0; i < set.length; i++) mark[set[i]!] = 1;
  let ok = true;
  for (let i = 0; i < set.length && ok; i++) {
    const k = set[i]!;
    if (model.selfLoop[k]) ok = false;
    for (let p = model.adjStart[k]!; p < model.adjStart[k + 1]! && ok; p++) if (mark[model.adj[p]!]) ok = false;
  }
  for (let i = 0; i < set.length; i++) mark[set[i]!] = 0;
  return ok;
}

/** An independent set with its neighbourhood, demand λ(I), capacity λ(N(I)) and slack. */
export interface SetMeasure {
  readonly set: Int32Array;
  readonly neighbours: Int32Array;
  readonly demand: number;
  readonly capacity: number;
  readonly slack: number;
}

/** Measures a set (sorted copy). */
export function measure(model: CompiledModel, set: ArrayLike<number>): SetMeasure {
  const sorted = Int32Array.from(set).sort();
  const neighbours = neighbourhood(model, sorted);
  const demand = rateOf(model, sorted);
  const capacity = rateOf(model, neighbours);
  return { set: sorted, neighbours, demand, capacity, slack: capacity - demand };
}

/** A \ N(A): independent and self-loop free whenever A is any set (see double-cover.ts). */
export function stripNeighbours(model: CompiledModel, a: ArrayLike<number>): Int32Array {
  const nb = neighbourhood(model, a);
  const inN = scratchOf(model).markB;
  for (let i = 0; i < nb.length; i++) inN[nb[i]!] = 1;
  const out: number[] = [];
  for (let i = 0; i < a.length; i++) if (!inN[a[i]!]) out.push(a[i]!);
  for (let i = 0; i < nb.length; i++) inN[nb[i]!] = 0;
  return Int32Array.from(out).sort();
}
