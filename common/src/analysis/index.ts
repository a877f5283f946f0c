export { AnalysisError } from './errors';
export {
  chainComponents,
  compileChain,
  evaluateChain,
  evaluateChainMany,
  propagateChain,
  scaledOutputStep,
  twoPointToLinear,
} from './calibration';
export type { ChainEvaluation, CompiledChain, CompiledStep } from './calibration';
export { ALLOWED_FUNCTIONS, compileExpression, derivedUncertainty, expressionSymbols } from './derived';
export type { CompiledExpression, Correlation, DerivedInput, DerivedUncertaintyOptions } from './derived';
export { DEFAULT_CONFIDENCE, fitTrend, fitWindow, predictAt, selectWindow } from './trend-fit';
export type { FitOptions, PredictOptions, WindowSeries } from './trend-fit';
export { evaluateStability, validateStabilityRule } from './stability';
export type { StabilityOptions } from './stability';
export {
  DEFAULT_COVERAGE_FACTOR,
  FIT_COMPONENT_NAME,
  accuracyComponent,
  combineBudget,
  fitComponent,
  formatNumber,
  resolutionComponent,
  statedComponent,
} from './uncertainty';
export type { CombineOptions, ComponentInput } from './uncertainty';
export { AIR_ENTHALPY_TABLE_SOURCE } from './air-enthalpy-table';
export {
  DEFAULT_AIR_CP,
  airEnthalpyFromTable,
  airEnthalpyTableSlope,
  energyBalance,
  enthalpyFunction,
  massBalance,
  measuredFromBudget,
} from './balance';
export type { BalanceOptions, EnthalpyFunction } from './balance';
export { stableValue } from './stable-value';
export { twoSidedStudentT } from './student-t';
