/**
 * Risk ratio of two independent groups with the Katz log interval:
 *   RR = (x1 / n1) / (x2 / n2),
 *   se(ln RR) = sqrt(1/x1 - 1/n1 + 1/x2 - 1/n2),
 *   CI = RR * exp(-/+ z * se).
 * Katz, Baptista, Azen & Pike, "Obtaining confidence intervals for the risk ratio in cohort
 * studies", Biometrics 34(3):469-474, 1978 (citation from memory). With a zero count the
 * interval is taken after adding 0.5 to every cell of the 2x2 table (events + 0.5, totals + 1; the usual
 * zero-cell correction; common practice, no source). Counts may be fractional: weighted samples
 * pass effective counts (Kish effective sample size, see drivers.ts).
 *
 * Notation: x1, n1 = events and trials in the stratum; x2, n2 = the same in the rest.
 */

export interface RiskRatio {
  ratio: number;
  low: number;
  high: number;
}

export function katzRiskRatio(
  x1: number,
  n1: number,
  x2: number,
  n2: number,
  z: number,
): RiskRatio {
  const nan = { ratio: Number.NaN, low: Number.NaN, high: Number.NaN };
  if (!(n1 > 0 && n2 > 0) || (x1 <= 0 && x2 <= 0)) return nan;
  const ratio = x1 / n1 / (x2 / n2);
  const zero = x1 <= 0 || x2 <= 0;
  const [a, m, b, k] = zero ? [x1 + 0.5, n1 + 1, x2 + 0.5, n2 + 1] : [x1, n1, x2, n2];
  const center = Math.log(a / m / (b / k));
  const se = Math.sqrt(Math.max(0, 1 / a - 1 / m + 1 / b - 1 / k));
  return { ratio, low: Math.exp(center - z * se), high: Math.exp(center + z * se) };
}
