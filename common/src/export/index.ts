export { exportCell, FORMULA_TRIGGERS, neutraliseText, startsLikeFormula } from './neutralise';
export type { ExportValue } from './neutralise';
