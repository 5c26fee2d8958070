// The public API of edgewise. This file only re-exports: the core (scenario, model, stability, exact
// evaluation, simulation), the use cases (one per command, each returning one record), and the
// output layer that renders any record.

// scenario and model
export * from './errors.js';
export type { Scenario, ClassSpec, CompatibilitySpec, CandidateSpec, RuleSpec, DemandVariantSpec, IdPair } from './model/scenario.js';
export { scenarioFileSchema, scenarioJsonSchema } from './model/schema.js';
export { LIMITS } from './model/limits.js';
export { pairKey } from './model/scenario.js';
export { parseScenario, validateScenario } from './model/validate.js';
export { parseDesignFile, type DesignFile } from './model/design-file.js';
export { compileModel, compileGraph, type CompiledModel } from './model/compile.js';
export { cyclePairs, completePairs, randomRegularPairs, randomPairs } from './model/generators.js';

// core computations
export { checkStability } from './stability/check.js';
export type { StabilityReport, TightSet } from './stability/report.js';
export { evaluateExact, evaluateBacklog, DEFAULT_MAX_SETS, type ExactOptions } from './exact/evaluate.js';
export type { ExactResult } from './exact/result.js';
export { singleChangeEvaluator, type ChangeResult, type SingleChangeEvaluator } from './exact/single-change.js';
export { simulate, type SimulationOptions, type SimulationResult } from './sim/simulate.js';
export { POLICIES, POLICY_DESCRIPTION, type PolicyName } from './sim/policy.js';
export { designProblem, type DesignProblem } from './design/space/problem.js';
export { recommend, type RecommendOptions, type Recommendation } from './design/search/recommend.js';
export { decide, type Decision, type Verdict } from './design/decision/decide.js';

// use cases: one record per command
export { scenarioContext, type ScenarioContext, type ContextOptions } from './usecases/context.js';
export { checkUseCase, type CheckRecord } from './usecases/check.js';
export { evaluateUseCase, type EvaluateRecord } from './usecases/evaluate.js';
export { simulateUseCase, type SimulateRecord } from './usecases/simulate.js';
export { sensitivityUseCase, type SensitivityRecord } from './usecases/sensitivity.js';
export { sweepUseCase, type SweepRecord } from './usecases/sweep.js';
export { recommendUseCase, type RecommendRecord } from './usecases/recommend.js';
export { compareUseCase, type CompareRecord } from './usecases/compare.js';
export { reportUseCase, decisionRecord, type ReportRecord } from './usecases/report.js';

// output: text, JSON, CSV, HTML, graphs
export { renderJson, renderCsv } from './output/machine.js';
export { renderDoc, type Block } from './output/text/doc.js';
export { renderReport } from './html/report-html.js';
export { toGraph, assignMetrics } from './output/graph.js';

// intake: spreadsheets and event logs to scenarios
export { importScenario, type ImportInput } from './intake/import-scenario.js';
export { starterFiles, type StarterFile } from './intake/starter.js';
export { fitLog, type FitOptions, type FitResult, type ClassFit } from './intake/fit-log.js';
export { fitScenario } from './intake/fit-scenario.js';
