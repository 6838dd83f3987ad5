/**
 * The regularised incomplete beta function I_x(a, b) and its inverse, for Clopper-Pearson
 * intervals and exact binomial tails (a, b > 0, not necessarily integer: weighted plans use
 * effective counts).
 *
 * I_x(a, b) = x^a (1 - x)^b / (a B(a, b)) * 1 / (1 + d1 / (1 + d2 / (1 + ...))),
 *   d_(2m+1) = -(a + m)(a + b + m) x / ((a + 2m)(a + 2m + 1)),
 *   d_(2m)   =  m (b - m) x / ((a + 2m - 1)(a + 2m)),
 * (Abramowitz & Stegun, Handbook of Mathematical Functions, 1964, eq. 26.5.8), evaluated by the
 * modified Lentz method (Thompson & Barnett, J. Comput. Phys. 64:490-509, 1986). It converges
 * fast for x < (a + 1) / (a + b + 2); above that, I_x(a, b) = 1 - I_(1-x)(b, a) (A&S 26.5.2).
 * The number of terms grows like sqrt(max(a, b)) (Press et al., Numerical Recipes, 3rd ed.,
 * 2007, sec. 6.4), so the iteration cap scales with it.
 *
 * The inverse solves I_x(a, b) = p by Newton's method inside a bracket that shrinks with every
 * evaluation (bisection, geometric when the bracket spans decades, whenever a step leaves it),
 * started from the leading term of the series at the nearer end: I ~ x^a / (a B) near 0 and
 * 1 - I ~ (1 - x)^b / (b B) near 1.
 */
import { RunError } from '../errors.js';
import { logBeta, stirlingFrom, stirlingSeries } from './log-gamma.js';

const tiny = 1e-300;
const fractionTolerance = 1e-15;

/** The continued fraction K = 1 / (1 + d1 / (1 + d2 / ...)) of A&S 26.5.8. */
function betaFraction(x: number, a: number, b: number): number {
  const maxTerms = 1000 + Math.ceil(20 * Math.sqrt(Math.max(a, b)));
  // Lentz for f = 0 + a1/(b1 + a2/(b2 + ...)), a1 = 1, a_(k+1) = d_k, all b = 1.
  let f = tiny;
  let c = f;
  let d = 0;
  for (let k = 0; k < maxTerms; k++) {
    let numerator: number;
    if (k === 0) numerator = 1;
    else if (k % 2 === 1) {
      const m = (k - 1) / 2;
      numerator = (-(a + m) * (a + b + m) * x) / ((a + 2 * m) * (a + 2 * m + 1));
    } else {
      const m = k / 2;
      numerator = (m * (b - m) * x) / ((a + 2 * m - 1) * (a + 2 * m));
    }
    d = 1 + numerator * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + numerator / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = c * d;
    f *= delta;
    if (Math.abs(delta - 1) < fractionTolerance) return f;
  }
  throw new RunError(
    `incomplete beta: continued fraction did not converge (x=${x}, a=${a}, b=${b})`,
  );
}

/**
 * ln(x^a (1-x)^b / B(a, b)). When a and b are both large the three terms are each ~1e7 and
 * cancel; then it is formed around the mode region x0 = a / (a + b), y0 = 1 - x0, with Stirling's
 * series for B (see log-gamma.ts), where every term is small and the rounding of x0 cancels to
 * first order (a / x0 = b / y0):
 *   a log1p((x - x0)/x0) + b log1p((x0 - x)/y0) + (1/2) ln(x0 y0 (a + b) / (2 pi))
 *   - s(a) - s(b) + s(a + b)
 * (the idea of DiDonato & Morris, ACM TOMS 18:360-373, 1992, Algorithm 708, sec. 3; from memory).
 */
function logFront(x: number, a: number, b: number, lnB: number): number {
  if (a < stirlingFrom || b < stirlingFrom) return a * Math.log(x) + b * Math.log1p(-x) - lnB;
  const n = a + b;
  const x0 = a / n;
  const y0 = b / n;
  return (
    a * Math.log1p((x - x0) / x0) +
    b * Math.log1p((x0 - x) / y0) +
    0.5 * Math.log((x0 * y0 * n) / (2 * Math.PI)) -
    stirlingSeries(a) -
    stirlingSeries(b) +
    stirlingSeries(n)
  );
}

function checkShape(name: string, a: number, b: number): void {
  if (!(a > 0 && b > 0 && Number.isFinite(a) && Number.isFinite(b)))
    throw new RangeError(`${name}: expected finite a > 0 and b > 0, got a=${a}, b=${b}`);
}

/** I_x(a, b), the CDF of Beta(a, b) at x. */
export function incompleteBetaRegularized(x: number, a: number, b: number): number {
  checkShape('incompleteBetaRegularized', a, b);
  if (Number.isNaN(x)) throw new RangeError('incompleteBetaRegularized: x is NaN');
  return incompleteBetaWithLogBeta(x, a, b, logBeta(a, b));
}

/**
 * I_x(a, b) given lnB = ln B(a, b), for callers that evaluate one distribution many times (the
 * sampler's beta quantiles); no argument checks: callers validated a and b once.
 */
export function incompleteBetaWithLogBeta(x: number, a: number, b: number, lnB: number): number {
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const front = Math.exp(logFront(x, a, b, lnB));
  if (x < (a + 1) / (a + b + 2)) return (front * betaFraction(x, a, b)) / a;
  return 1 - (front * betaFraction(1 - x, b, a)) / b;
}

/** The Beta(a, b) density at 0 < x < 1, given ln B(a, b). */
function betaDensity(x: number, a: number, b: number, lnB: number): number {
  return Math.exp(logFront(x, a, b, lnB) - Math.log(x) - Math.log1p(-x));
}

/** x with I_x(a, b) = p: the p-quantile of Beta(a, b). */
export function incompleteBetaInverse(p: number, a: number, b: number): number {
  checkShape('incompleteBetaInverse', a, b);
  if (!(p >= 0 && p <= 1))
    throw new RangeError(`incompleteBetaInverse: expected 0 <= p <= 1, got ${p}`);
  if (p === 0) return 0;
  if (p === 1) return 1;
  const lnB = logBeta(a, b);
  const mean = a / (a + b);
  const atMean = incompleteBetaRegularized(mean, a, b);
  let lo: number;
  let hi: number;
  let x: number;
  if (p < atMean) {
    lo = 0;
    hi = mean;
    x = Math.exp((Math.log(p) + Math.log(a) + lnB) / a);
  } else {
    lo = mean;
    hi = 1;
    x = -Math.expm1((Math.log1p(-p) + Math.log(b) + lnB) / b);
  }
  if (!(x > lo && x < hi)) x = lo === 0 ? hi / 2 : (lo + hi) / 2;
  for (let iteration = 0; iteration < 300; iteration++) {
    const g = incompleteBetaRegularized(x, a, b) - p;
    if (g === 0) return x;
    if (g > 0) hi = x;
    else lo = x;
    let next = x - g / betaDensity(x, a, b, lnB);
    if (!(next > lo && next < hi)) {
      // Bisect: geometrically when the bracket spans decades (tiny quantiles), else halve.
      next = lo > 0 && hi / lo > 8 ? Math.sqrt(lo * hi) : lo === 0 ? hi / 8 : 0.5 * (lo + hi);
    }
    if (Math.abs(next - x) <= 4e-16 * Math.max(x, next) || hi - lo <= 4e-16 * hi) return next;
    x = next;
  }
  throw new RunError(`incomplete beta inverse did not converge (p=${p}, a=${a}, b=${b})`);
}
