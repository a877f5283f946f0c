export * from './units';
export {
  R_DRY_AIR,
  STANDARD_CONDITIONS,
  STANDARD_PRESSURE_KPA,
  idealGasDensity,
  resolveStandardConditions,
  standardDensity,
  standardFlowToMassFactor,
  standardFlowToMassFlow,
} from './standard-flow';
export type { StandardConditions } from './standard-flow';
