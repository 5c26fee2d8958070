import { UndirectedGraph } from 'graphology';
import type { CompiledModel } from '../model/compile.js';
import type { ExactResult } from '../exact/result.js';

/** Node attributes written by `toGraph` / `assignMetrics`. */
export interface ClassAttributes {
  rate: number;
  selfCompatible: boolean;
  backlog?: number;
  wait?: number;
  immediateMatch?: number;
}

/** Edge attributes written by `toGraph` / `assignMetrics`. */
export interface CompatibilityAttributes {
  matchRate?: number;
}

/**
 * The design as a graphology graph (undirected, self-loops allowed; node key = class id, edge key =
 * "a|b"), for users who want to feed it to graphology's own algorithms or layouts. With a result,
 * the exact metrics are assigned as attributes.
 */
export function toGraph(model: CompiledModel, result?: ExactResult): UndirectedGraph<ClassAttributes, CompatibilityAttributes> {
  const g = new UndirectedGraph<ClassAttributes, CompatibilityAttributes>({ type: 'undirected', allowSelfLoops: true, multi: false });
  for (let k = 0; k < model.n; k++) g.addNode(model.ids[k]!, { rate: model.rates[k]!, selfCompatible: model.selfLoop[k] === 1 });
  for (let e = 0; e < model.m; e++) {
    const a = model.ids[model.edgeA[e]!]!;
    const b = model.ids[model.edgeB[e]!]!;
    g.addUndirectedEdgeWithKey(`${a}|${b}`, a, b, {});
  }
  if (result) assignMetrics(g, model, result);
  return g;
}

/** Writes the exact metrics onto an existing graph built by `toGraph` (the "assign" step). */
export function assignMetrics(g: UndirectedGraph<ClassAttributes, CompatibilityAttributes>, model: CompiledModel, result: ExactResult): void {
  for (let k = 0; k < model.n; k++) {
    g.mergeNodeAttributes(model.ids[k]!, { backlog: result.backlog[k]!, wait: result.wait[k]!, immediateMatch: result.immediateMatch[k]! });
  }
  for (let e = 0; e < model.m; e++) {
    const key = `${model.ids[model.edgeA[e]!]!}|${model.ids[model.edgeB[e]!]!}`;
    g.mergeEdgeAttributes(key, { matchRate: result.matchRates[e]! });
  }
}
