/**
 * jstat (a general-purpose statistics library, npm "jstat" 1.9.6) as an independent oracle.
 * It ships no type declarations; this types the few functions the tests use, without a global
 * module declaration. Its own accuracy is about 1e-8 relative away from the far tails (its
 * log-gamma is a Lanczos sum), which bounds the tolerances of the comparisons.
 */
import { createRequire } from 'node:module';

interface JStat {
  ibeta(x: number, a: number, b: number): number;
  ibetainv(p: number, a: number, b: number): number;
  gammaln(x: number): number;
  betaln(a: number, b: number): number;
  normal: {
    cdf(x: number, mean: number, sd: number): number;
    inv(p: number, mean: number, sd: number): number;
  };
  binomial: { cdf(k: number, n: number, p: number): number };
}

export const jStat = createRequire(import.meta.url)('jstat') as JStat;
