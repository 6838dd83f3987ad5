/**
 * From the probability p that one islanding event ends in failure to yearly risk.
 *
 * Islanding events arrive as a Poisson process of rate lambda per year and each fails
 * independently with probability p, so failures are a thinned Poisson process of rate lambda p:
 *   failures per year   E[N] = lambda p
 *   P(>= 1 failure in a year) = 1 - exp(-lambda p)
 *   several event classes i:  1 - exp(-sum_i lambda_i p_i)
 * An interval [pL, pU] for p maps through both (they increase in p) with lambda taken as known.
 * lambda p is not a probability: at lambda p = 0.5 it overstates P(>= 1) by 27 %.
 * (REFERENCES.md 9.6, "standard result", e.g. R. Billinton & R. N. Allan, Reliability
 * Evaluation of Power Systems, 2nd ed., Plenum 1996; from memory.)
 */

export interface Interval {
  estimate: number;
  low: number;
  high: number;
}

function checkRate(ratePerYear: number): void {
  if (!(ratePerYear >= 0 && Number.isFinite(ratePerYear)))
    throw new RangeError(`annualise: expected a rate >= 0 per year, got ${ratePerYear}`);
}

/** Expected failures per year, lambda p. */
export function failuresPerYear(ratePerYear: number, probability: number): number {
  checkRate(ratePerYear);
  return ratePerYear * probability;
}

/** P(at least one failure in a year) = 1 - exp(-lambda p), by expm1 for small lambda p. */
export function probabilityInYear(ratePerYear: number, probability: number): number {
  checkRate(ratePerYear);
  return -Math.expm1(-ratePerYear * probability);
}

/** Maps a per-event interval of p (or of a per-event mean) to per year: lambda * each limit. */
export function perYearInterval(ratePerYear: number, perEvent: Interval): Interval {
  return {
    estimate: failuresPerYear(ratePerYear, perEvent.estimate),
    low: failuresPerYear(ratePerYear, perEvent.low),
    high: failuresPerYear(ratePerYear, perEvent.high),
  };
}

/** Maps an interval of p to P(>= 1 failure in a year), limit by limit. */
export function probabilityInYearInterval(ratePerYear: number, perEvent: Interval): Interval {
  return {
    estimate: probabilityInYear(ratePerYear, perEvent.estimate),
    low: probabilityInYear(ratePerYear, perEvent.low),
    high: probabilityInYear(ratePerYear, perEvent.high),
  };
}

export interface EventClass {
  ratePerYear: number;
  /** Per-event failure probability with its interval. */
  probability: Interval;
}

/**
 * P(>= 1 failure in a year) over several independent event classes. The limits combine the
 * classes' limits (all low, all high): each is a monotone image of its own interval, so the
 * result brackets the truth whenever every class interval does; its joint confidence is at
 * least 1 - sum of the classes' alphas (Bonferroni), not the single level.
 */
export function probabilityInYearCombined(classes: readonly EventClass[]): Interval {
  let estimate = 0;
  let low = 0;
  let high = 0;
  for (const c of classes) {
    checkRate(c.ratePerYear);
    estimate += c.ratePerYear * c.probability.estimate;
    low += c.ratePerYear * c.probability.low;
    high += c.ratePerYear * c.probability.high;
  }
  return { estimate: -Math.expm1(-estimate), low: -Math.expm1(-low), high: -Math.expm1(-high) };
}
