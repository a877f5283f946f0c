// The analysis computations come from common/src/analysis by path, not through @dialsheet/common:
// they bring mathjs and jstat, and only the analysis pages (loaded lazily) should download them.
// Every file of this feature imports them from here, so the path is written once.
export {
  AnalysisError,
  chainComponents,
  compileChain,
  compileExpression,
  energyBalance,
  evaluateStability,
  massBalance,
  measuredFromBudget,
  predictAt,
  stableValue,
  validateStabilityRule,
} from '../../../../../common/src/analysis';
export type { CompiledChain } from '../../../../../common/src/analysis';
export { STANDARD_CONDITIONS, standardDensity } from '../../../../../common/src/units';
