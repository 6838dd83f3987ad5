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
 * The inverse solves ln I_x(a, b) = ln p by safeguarded Newton in ln x inside a bracket that
 * shrinks with every evaluation (bisection in ln x whenever a step leaves it or stalls), started
 * from the leading term of the series at the nearer end: I ~ x^a / (a B) near 0 and
 * 1 - I ~ (1 - x)^b / (b B) near 1 (the upper side is solved as the lower side of Beta(b, a)).
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

/**
 * ln I_x(a, b) for 0 < x < 1, without forming I itself where it would underflow (tiny shapes
 * give I ~ x^a / (a B) with x far below 1e-300 long before I is small).
 */
function logLowerTail(x: number, a: number, b: number, lnB: number): number {
  if (x < (a + 1) / (a + b + 2))
    return logFront(x, a, b, lnB) + Math.log(betaFraction(x, a, b)) - Math.log(a);
  return Math.log1p(-(Math.exp(logFront(x, a, b, lnB)) * betaFraction(1 - x, b, a)) / b);
}

// Smallest positive double (subnormal): the bracket's floor; a quantile below it rounds to 0.
const smallestX = Number.MIN_VALUE;
// Relative step in x at which the search stops: two ulps of a double.
const relativeStepTolerance = 4.5e-16;
// Bisections alone need ln(745 / 4.5e-16) / ln 2 ~ 61 steps; Newton steps only ever shorten it.
const maxIterations = 400;

/**
 * x in (0, hi] with I_x(a, b) = p, given I_hi >= p. Newton's method on
 * g(t) = ln I_(e^t)(a, b) - ln p in t = ln x, where g'(t) = x f(x) / I_x and g is nearly
 * linear for small x (g ~ a t + const), so tiny shapes converge in a few steps. Safeguarded as
 * in Press et al., Numerical Recipes, 3rd ed., 2007, sec. 9.4 (rtsafe): a step that leaves the
 * bracket or does not halve the previous step is replaced by bisection in t (geometric in x).
 * The step is applied as x e^(dt), which keeps x to full relative precision even near 1e-300.
 */
function lowerQuantile(p: number, a: number, b: number, lnB: number, hi: number): number {
  const logP = Math.log(p);
  if (logLowerTail(smallestX, a, b, lnB) >= logP) return 0;
  let lo = smallestX;
  // Start from the leading term x^a / (a B), clamped into the bracket.
  let x = Math.exp((logP + Math.log(a) + lnB) / a);
  if (!(x > lo && x < hi)) x = Math.sqrt(lo) * Math.sqrt(hi);
  let previousStep = Math.log(hi / lo);
  let step = previousStep;
  for (let iteration = 0; iteration < maxIterations; iteration++) {
    const logI = logLowerTail(x, a, b, lnB);
    const g = logI - logP;
    if (g === 0) return x;
    if (g > 0) hi = x;
    else lo = x;
    const slope = Math.exp(logFront(x, a, b, lnB) - Math.log1p(-x) - logI);
    let dt = -g / slope;
    const newton = x * Math.exp(dt);
    const stalled = Math.abs(2 * dt) > Math.abs(previousStep);
    previousStep = step;
    let next: number;
    if (newton > lo && newton < hi && !stalled && Number.isFinite(dt)) next = newton;
    else {
      next = Math.sqrt(lo) * Math.sqrt(hi);
      dt = Math.log(next / x);
    }
    step = dt;
    if (Math.abs(dt) <= relativeStepTolerance || hi / lo <= 1 + relativeStepTolerance) return next;
    x = next;
  }
  // Unreachable in exact arithmetic: the bracket at least halves (in ln x) every two steps.
  throw new RunError(`incomplete beta inverse did not converge (p=${p}, a=${a}, b=${b})`);
}

/**
 * x with I_x(a, b) = p: the p-quantile of Beta(a, b), for any finite a, b > 0. Below 1/2 it
 * solves for x directly; above it for y = 1 - x in I_y(b, a) = 1 - p (A&S 26.5.2), so
 * quantiles close to 1 keep their distance from 1 to full relative precision until the
 * subtraction at the end.
 */
export function incompleteBetaInverse(p: number, a: number, b: number): number {
  checkShape('incompleteBetaInverse', a, b);
  if (!(p >= 0 && p <= 1))
    throw new RangeError(`incompleteBetaInverse: expected 0 <= p <= 1, got ${p}`);
  if (p === 0) return 0;
  if (p === 1) return 1;
  const lnB = logBeta(a, b);
  // Pivot at x = 1/2, not at the mean: a quantile below 1/2 solved as 1 - y would keep only
  // the absolute precision of y near 1 (1e-16), losing relative digits of a small x.
  if (p < incompleteBetaWithLogBeta(0.5, a, b, lnB)) return lowerQuantile(p, a, b, lnB, 0.5);
  return 1 - lowerQuantile(1 - p, b, a, lnB, 0.5);
}
