/**
 * jstat (npm, a general-purpose statistics library) as the outside oracle for the distribution
 * tests; loaded through createRequire because it ships no type declarations.
 */
import { createRequire } from 'node:module';

export interface JStat {
  erf(x: number): number;
  gammaln(x: number): number;
  ibeta(x: number, a: number, b: number): number;
  normal: {
    cdf(x: number, m: number, s: number): number;
    inv(p: number, m: number, s: number): number;
  };
  lognormal: { cdf(x: number, mu: number, sigma: number): number };
  weibull: { cdf(x: number, scale: number, shape: number): number };
  beta: {
    cdf(x: number, a: number, b: number): number;
    inv(p: number, a: number, b: number): number;
  };
  poisson: { cdf(k: number, l: number): number; pdf(k: number, l: number): number };
  uniform: { cdf(x: number, a: number, b: number): number };
}

const require = createRequire(import.meta.url);
export const jStat = (require('jstat') as { jStat: JStat }).jStat;

/** Kolmogorov-Smirnov statistic D_n of a sample against a continuous CDF. */
export function ksStatistic(sample: Float64Array, cdf: (x: number) => number): number {
  const s = Float64Array.from(sample).sort();
  const n = s.length;
  let d = 0;
  for (let i = 0; i < n; i++) {
    const f = cdf(s[i]!);
    d = Math.max(d, (i + 1) / n - f, f - i / n);
  }
  return d;
}

/**
 * Asymptotic KS critical value c(alpha) / sqrt(n), c = sqrt(-ln(alpha/2) / 2) (Kolmogorov's limit
 * distribution; e.g. Conover, Practical Nonparametric Statistics, 3rd ed., 1999, sec. 6.1, from memory).
 */
export function ksCritical(n: number, alpha: number): number {
  return Math.sqrt(-Math.log(alpha / 2) / 2) / Math.sqrt(n);
}
