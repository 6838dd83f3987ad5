/**
 * ln Gamma(x) for x > 0 and ln B(a, b), accurate to a few ulps of the result, including the
 * cancellation-prone case of one large argument (ln B(5, 1e7) in a Clopper-Pearson interval).
 *
 * Stirling's series (Abramowitz & Stegun, Handbook of Mathematical Functions, 1964, eq. 6.1.40):
 *   ln Gamma(z) = (z - 1/2) ln z - z + (1/2) ln(2 pi) + sum_{k=1..7} B_2k / (2k (2k - 1) z^(2k-1))
 * with the Bernoulli numbers B_2k (A&S Table 23.2) as exact fractions below. It is used for
 * z >= 15, where the first omitted term is below 1e-19; smaller x are shifted up with
 * Gamma(x) = Gamma(x + m) / (x (x + 1) ... (x + m - 1)) (A&S eq. 6.1.15).
 *
 * For ln B(a, b) with b = max >= 15, the difference ln Gamma(b) - ln Gamma(a + b) is formed
 * from the Stirling terms directly, so the large ln Gamma values never cancel:
 *   ln Gamma(b) - ln Gamma(a + b) = -(b - 1/2) log1p(a / b) - a ln(a + b) + a
 *                                   + s(b) - s(a + b),   s(z) = the series sum above.
 */

/** B_2k / (2k (2k - 1)) for k = 1..7: B2 = 1/6, B4 = -1/30, B6 = 1/42, B8 = -1/30,
 *  B10 = 5/66, B12 = -691/2730, B14 = 7/6 (A&S Table 23.2). */
const stirlingCoefficients = [
  1 / 6 / 2,
  -1 / 30 / 12,
  1 / 42 / 30,
  -1 / 30 / 56,
  5 / 66 / 90,
  -691 / 2730 / 132,
  7 / 6 / 182,
] as const;

/** Where the Stirling series is accurate to double precision with 7 terms. */
export const stirlingFrom = 15;
const halfLnTwoPi = 0.5 * Math.log(2 * Math.PI);

/** s(z) = sum_k B_2k / (2k (2k-1) z^(2k-1)) for z >= stirlingFrom. */
export function stirlingSeries(z: number): number {
  const z2 = 1 / (z * z);
  let sum = 0;
  for (let k = stirlingCoefficients.length - 1; k >= 0; k--)
    sum = sum * z2 + stirlingCoefficients[k]!;
  return sum / z;
}

/** ln Gamma(x), x > 0. */
export function logGamma(x: number): number {
  if (!(x > 0) || !Number.isFinite(x))
    throw new RangeError(`logGamma: expected a finite x > 0, got ${x}`);
  let shift = 0;
  let product = 1;
  while (x < stirlingFrom) {
    product *= x;
    x += 1;
    shift++;
  }
  const lgShifted = (x - 0.5) * Math.log(x) - x + halfLnTwoPi + stirlingSeries(x);
  return shift === 0 ? lgShifted : lgShifted - Math.log(product);
}

/** ln B(a, b) = ln Gamma(a) + ln Gamma(b) - ln Gamma(a + b), a, b > 0. */
export function logBeta(a: number, b: number): number {
  const small = Math.min(a, b);
  const large = Math.max(a, b);
  if (large < stirlingFrom) return logGamma(small) + logGamma(large) - logGamma(small + large);
  const sum = small + large;
  const difference =
    -(large - 0.5) * Math.log1p(small / large) -
    small * Math.log(sum) +
    small +
    stirlingSeries(large) -
    stirlingSeries(sum);
  return logGamma(small) + difference;
}
