export { checkLimits } from './limits';
export { layOutGridPass, layOutSheetGrid } from './grid';
export { canonicalDecimal, sameReading } from './normalise';
export { DEFAULT_PARSE_OPTIONS, FLAG_TOKENS, parseReading } from './parse-value';
export { compareRows, mismatchRate } from './reconcile';
export type { CompareRowsOptions, PassEntries } from './reconcile';
