import type { CompiledModel } from '../model/compile.js';
import { buildAlias, type AliasTable } from './alias.js';
import { POLICY_CODE, priorityRanks, type PolicyName } from './policy.js';

/**
 * Everything a replication needs, compiled once into typed arrays (plain data: it is copied to
 * worker threads as is). Indices only; ids stay at the boundary.
 */
export interface SimModel {
  readonly n: number;
  readonly m: number;
  /** Class ids, for messages only. */
  readonly ids: readonly string[];
  readonly rates: Float64Array;
  readonly totalRate: number;
  /** Candidates of an arrival of class k: nbr[nbrStart[k] .. nbrStart[k+1]), k itself first when self-looped. */
  readonly nbrStart: Int32Array;
  readonly nbr: Int32Array;
  /** Edge used when the arrival of k takes an item of nbr[p]. */
  readonly nbrEdge: Int32Array;
  readonly alias: AliasTable;
  /** Abandonment rate 1/patience of each class (0 = patient). */
  readonly abandonRate: Float64Array;
  /** True when some class abandons. */
  readonly impatient: boolean;
  readonly policy: number;
  /** Priority rank of each class as a partner (lower = preferred); all 0 unless policy is priority. */
  readonly rank: Int32Array;
}

export interface SimModelOptions {
  readonly policy?: PolicyName;
  /** Priority order as class indices (first = most preferred partner). */
  readonly priority?: readonly number[];
  /** Mean patience of each class; 0, Infinity or NaN mean patient. */
  readonly patience?: ArrayLike<number>;
}

export function buildSimModel(model: CompiledModel, options: SimModelOptions = {}): SimModel {
  const { n } = model;
  const nbrStart = new Int32Array(n + 1);
  const nbr: number[] = [];
  const nbrEdge: number[] = [];
  for (let k = 0; k < n; k++) {
    nbrStart[k] = nbr.length;
    if (model.selfLoop[k]) {
      nbr.push(k);
      nbrEdge.push(model.selfEdge[k]!);
    }
    for (let p = model.adjStart[k]!; p < model.adjStart[k + 1]!; p++) {
      nbr.push(model.adj[p]!);
      nbrEdge.push(model.adjEdge[p]!);
    }
  }
  nbrStart[n] = nbr.length;
  const abandonRate = new Float64Array(n);
  let impatient = false;
  if (options.patience) {
    for (let k = 0; k < n; k++) {
      const p = options.patience[k]!;
      if (p > 0 && Number.isFinite(p)) {
        abandonRate[k] = 1 / p;
        impatient = true;
      }
    }
  }
  const policy = options.policy ?? 'fcfm';
  return {
    n,
    m: model.m,
    ids: [...model.ids],
    rates: Float64Array.from(model.rates),
    totalRate: model.totalRate,
    nbrStart,
    nbr: Int32Array.from(nbr),
    nbrEdge: Int32Array.from(nbrEdge),
    alias: buildAlias(model.rates),
    abandonRate,
    impatient,
    policy: POLICY_CODE[policy],
    rank: policy === 'ranked' ? priorityRanks(n, options.priority ?? []) : new Int32Array(n),
  };
}
