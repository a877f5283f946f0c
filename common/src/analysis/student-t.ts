// The web app type-checks common's sources through a path alias, so jstat's declarations must
// travel with the file that imports it; an import cannot bring in an ambient module declaration.
// eslint-disable-next-line @typescript-eslint/triple-slash-reference -- see above
/// <reference path="./jstat.d.ts" />
// Student-t quantiles from jstat (a maintained statistics library) rather than our own series.
// jstat's quantile agrees with published tables to about 1e-8 relative, far inside what an
// interval printed to a few digits needs.
import { jStat } from 'jstat';
import { AnalysisError, assertFiniteNumber } from './errors';

/** t(α/2, dof): the two-sided quantile for a confidence level such as 0.95. */
export function twoSidedStudentT(confidence: number, dof: number): number {
  assertFiniteNumber(confidence, 'confidence level');
  if (!(confidence > 0 && confidence < 1)) {
    throw new AnalysisError(`confidence level must lie between 0 and 1 (e.g. 0.95), got ${confidence}`);
  }
  if (!Number.isInteger(dof) || dof < 1) throw new AnalysisError(`degrees of freedom must be a whole number ≥ 1, got ${dof}`);
  const q = jStat.studentt.inv(1 - (1 - confidence) / 2, dof);
  if (!Number.isFinite(q) || q <= 0) {
    throw new AnalysisError(`could not compute the Student-t quantile for confidence ${confidence} and ${dof} degrees of freedom`);
  }
  return q;
}
