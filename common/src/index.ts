export * from './sheet/sheet-format';
export { ENGINE_VERSION } from './version';
export type { HealthReport, Reachability } from './api/health';
export { evaluateSheet, definitionsOf, displayOptionsOf, type EvaluationCache, type SheetEvaluation } from './cells/evaluate-sheet';
export type * from './cells/types';
export { formatValue, formatNumber, DEFAULT_DISPLAY } from './units/display';
export { CIRCUIT_FUNCTION_NAMES } from './circuits/functions';
export { analyticSolution, numericSolution, dampingOf } from './circuits/transient';
export { toContractJson, type ContractOutput } from './cells/contract';
