// The whole public API of edgewise. This file only re-exports.
export * from './errors.js';
export type { Scenario, ClassSpec, CompatibilitySpec, CandidateSpec } from './model/scenario.js';
export { pairKey } from './model/scenario.js';
export { parseScenario, validateScenario } from './model/validate.js';
export { locateJsonError } from './model/json-locate.js';
export type { CompiledModel } from './model/compile.js';
export { compileModel, compileGraph, withPairs, withRates, edgePairs, findEdge } from './model/compile.js';
export type { Components } from './model/components.js';
export { components, bipartition, subModel } from './model/components.js';
export type { ExactResult } from './exact/result.js';
