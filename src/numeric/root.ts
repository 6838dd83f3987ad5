/**
 * Bracketed scalar root finding by the Illinois variant of regula falsi.
 *
 * Given g(a) and g(b) of opposite sign (g(a) may be 0), the secant point
 * c = b - g(b)(b - a)/(g(b) - g(a)) replaces the end point whose value has the same sign; when the same end
 * is replaced twice in a row, the value stored at the other end is halved (the Illinois modification), which restores
 * superlinear convergence (order ~1.44). A secant point outside the bracket falls back to bisection.
 * Source: M. Dowell and P. Jarratt, "A modified regula falsi method for computing the root of an
 * equation", BIT 11:168-174, 1971.
 *
 * The function is an object with `value(x)` so that callers pass no closures in hot loops.
 */

export interface ScalarFunction {
  value(x: number): number;
}

/**
 * A root of `f` in [a, b] given fa = f(a), fb = f(b) with fa * fb <= 0, to a bracket width of
 * `xTol`. Returns the end of the final bracket on b's side, where f has the strict sign of f(b)
 * (or b itself when f(b) = 0): a caller locating a threshold crossing lands just past it, so the
 * condition has certainly changed there.
 */
export function illinoisRoot(
  f: ScalarFunction,
  a: number,
  b: number,
  fa: number,
  fb: number,
  xTol: number,
  maxIterations = 80,
): number {
  if (fb === 0) return b;
  const signB = fb > 0 ? 1 : -1;
  let xa = a;
  let xb = b;
  let ga = fa;
  let gb = fb;
  let lastSide = 0;
  for (let it = 0; it < maxIterations && Math.abs(xb - xa) > xTol; it++) {
    let c = xb - (gb * (xb - xa)) / (gb - ga);
    if (!(c > Math.min(xa, xb) && c < Math.max(xa, xb))) c = 0.5 * (xa + xb);
    const fc = f.value(c);
    if (fc * signB > 0) {
      // c is on b's side. If b's side moved last time too, a is stuck: halve its value (Illinois).
      xb = c;
      gb = fc;
      if (lastSide === 1) ga *= 0.5;
      lastSide = 1;
    } else {
      xa = c;
      ga = fc;
      if (lastSide === -1) gb *= 0.5;
      lastSide = -1;
    }
  }
  return xb;
}
