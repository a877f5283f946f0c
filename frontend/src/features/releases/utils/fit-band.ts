import type { TrendFit } from '@dialsheet/common';

/**
 * The fitted line and the confidence interval of the mean response at t:
 * ŷ ± t(α/2, n−2)·s·√(1/n + (t − t̄)²/Sxx) (Montgomery & Runger, Applied Statistics and
 * Probability for Engineers, §11-5.2). Everything it needs is in the stored fit, so the report
 * draws it without loading the statistics library.
 */
export function fitBand(fit: TrendFit, t: number): { y: number; low: number; high: number } {
  const y = fit.yMean + fit.slope * (t - fit.tMean);
  if (fit.n < 3 || !(fit.sxx > 0)) return { y, low: y, high: y };
  const half = fit.tQuantile * fit.residualSd * Math.sqrt(1 / fit.n + (t - fit.tMean) ** 2 / fit.sxx);
  return { y, low: y - half, high: y + half };
}
