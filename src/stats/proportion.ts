/**
 * Confidence intervals for a proportion p from x events in n trials, plain or weighted.
 *
 * Wilson score (Wilson, JASA 22:209-212, 1927), p^ = x/n, q^ = 1 - p^, z = Phi^-1(1 - alpha/2):
 *   L, U = [2 n p^ + z^2 -/+ z sqrt(z^2 + 4 n p^ q^)] / [2 (n + z^2)]
 * Wilson with continuity correction (Newcombe, Stat Med 17:857-872, 1998, method 4):
 *   L = [2 n p^ + z^2 - 1 - z sqrt(z^2 - 2 - 1/n + 4 p^ (n q^ + 1))] / [2 (n + z^2)]
 *   U = [2 n p^ + z^2 + 1 + z sqrt(z^2 + 2 - 1/n + 4 p^ (n q^ - 1))] / [2 (n + z^2)]
 *   L = 0 if x = 0, U = 1 if x = n.
 * Clopper-Pearson (Biometrika 26:404-413, 1934): L = Beta^-1(alpha/2; x, n - x + 1),
 *   U = Beta^-1(1 - alpha/2; x + 1, n - x), L = 0 if x = 0, U = 1 if x = n.
 * (Formulas as quoted in /work/shared/REFERENCES.md 9.1-9.2.)
 *
 * Which interval by default ("auto"): Wilson, unless fewer than 5 events (or fewer than 5
 * non-events) were seen, then Clopper-Pearson. Reason: Newcombe (1998) found Wilson's mean
 * coverage close to nominal but with dips well below it when n p is small, while
 * Clopper-Pearson never covers less than nominal (it is conservative); Brown, Cai & DasGupta
 * (Stat Sci 16:101-133, 2001, sec. 4.1.1) point to the same poor coverage of Wilson for x near
 * 0 or n. A screening tool reporting rare failures should err on the safe side exactly there.
 * The threshold 5 is common practice, no source.
 *
 * Weighted estimates (importance or stratified plans): p^ = sum w y / sum w with Kish's
 * effective sample size n_eff = (sum w)^2 / sum w^2 (L. Kish, Survey Sampling, Wiley 1965,
 * sec. 11.7; from memory), and the intervals above evaluated at n = n_eff, x = p^ n_eff
 * (non-integer x is fine in every formula; for Clopper-Pearson this is the approach of Korn &
 * Graubard, Survey Methodology 24:193-201, 1998, from memory). With equal weights n_eff = n.
 */
import { incompleteBetaInverse } from './beta.js';
import { twoSidedZ } from './normal.js';

export type ProportionMethod = 'wilson' | 'wilson-cc' | 'clopper-pearson';

export interface ProportionInterval {
  estimate: number;
  low: number;
  high: number;
  method: ProportionMethod;
}

/** Below this many events (or non-events) the default switches to Clopper-Pearson. */
export const fewEventsThreshold = 5;

function check(events: number, trials: number, confidenceLevel: number): void {
  if (!(trials > 0 && Number.isFinite(trials)))
    throw new RangeError(`proportion: expected trials > 0, got ${trials}`);
  if (!(events >= 0 && events <= trials))
    throw new RangeError(`proportion: expected 0 <= events <= trials, got ${events} of ${trials}`);
  if (!(confidenceLevel > 0 && confidenceLevel < 1))
    throw new RangeError(
      `proportion: expected a confidence level in (0, 1), got ${confidenceLevel}`,
    );
}

function ordered(estimate: number, low: number, high: number, method: ProportionMethod) {
  // Round-off can put a limit a hair past the estimate or [0, 1]; the limits are clamped to
  // them (the true limits lie inside by construction).
  const lo = Math.min(estimate, Math.max(0, low));
  const hi = Math.max(estimate, Math.min(1, high));
  return { estimate, low: lo, high: hi, method };
}

export function wilsonInterval(
  events: number,
  trials: number,
  confidenceLevel: number,
): ProportionInterval {
  check(events, trials, confidenceLevel);
  const z = twoSidedZ(confidenceLevel);
  const z2 = z * z;
  const p = events / trials;
  const centre = 2 * trials * p + z2;
  const spread = z * Math.sqrt(z2 + 4 * trials * p * (1 - p));
  const denominator = 2 * (trials + z2);
  const low = events === 0 ? 0 : (centre - spread) / denominator;
  const high = events === trials ? 1 : (centre + spread) / denominator;
  return ordered(p, low, high, 'wilson');
}

export function wilsonContinuityInterval(
  events: number,
  trials: number,
  confidenceLevel: number,
): ProportionInterval {
  check(events, trials, confidenceLevel);
  const z = twoSidedZ(confidenceLevel);
  const z2 = z * z;
  const n = trials;
  const p = events / n;
  const q = 1 - p;
  const denominator = 2 * (n + z2);
  const low =
    events === 0
      ? 0
      : (2 * n * p + z2 - 1 - z * Math.sqrt(Math.max(0, z2 - 2 - 1 / n + 4 * p * (n * q + 1)))) /
        denominator;
  const high =
    events === trials
      ? 1
      : (2 * n * p + z2 + 1 + z * Math.sqrt(Math.max(0, z2 + 2 - 1 / n + 4 * p * (n * q - 1)))) /
        denominator;
  return ordered(p, low, high, 'wilson-cc');
}

export function clopperPearsonInterval(
  events: number,
  trials: number,
  confidenceLevel: number,
): ProportionInterval {
  check(events, trials, confidenceLevel);
  const alpha = 1 - confidenceLevel;
  const p = events / trials;
  const low = events === 0 ? 0 : incompleteBetaInverse(alpha / 2, events, trials - events + 1);
  const high =
    events === trials ? 1 : incompleteBetaInverse(1 - alpha / 2, events + 1, trials - events);
  return ordered(p, low, high, 'clopper-pearson');
}

/** The default rule: Clopper-Pearson when fewer than 5 events or non-events, else Wilson. */
export function chooseProportionMethod(events: number, trials: number): ProportionMethod {
  return Math.min(events, trials - events) < fewEventsThreshold ? 'clopper-pearson' : 'wilson';
}

export function proportionInterval(
  events: number,
  trials: number,
  confidenceLevel: number,
  method: ProportionMethod | 'auto' = 'auto',
): ProportionInterval {
  const m = method === 'auto' ? chooseProportionMethod(events, trials) : method;
  if (m === 'wilson') return wilsonInterval(events, trials, confidenceLevel);
  if (m === 'wilson-cc') return wilsonContinuityInterval(events, trials, confidenceLevel);
  return clopperPearsonInterval(events, trials, confidenceLevel);
}

/** Kish's effective sample size (sum w)^2 / sum w^2. */
export function kishEffectiveSize(sumWeights: number, sumSquaredWeights: number): number {
  if (!(sumWeights > 0 && sumSquaredWeights > 0))
    throw new RangeError(
      `kishEffectiveSize: expected positive weight sums, got ${sumWeights}, ${sumSquaredWeights}`,
    );
  // sum w * (sum w / sum w^2), not (sum w)^2 / sum w^2: with unit weights it is exactly n even
  // where n^2 would round (n > 9.4e7).
  return sumWeights * (sumWeights / sumSquaredWeights);
}

/** Sums over the rows of a weighted sample for one indicator y in {0, 1}. */
export interface WeightedCountSums {
  /** sum of w over all rows */
  sumWeights: number;
  /** sum of w^2 over all rows */
  sumSquaredWeights: number;
  /** sum of w over the rows with the event */
  sumEventWeights: number;
}

export interface WeightedProportionInterval extends ProportionInterval {
  effectiveSize: number;
}

/** Weighted proportion with its interval at Kish's effective size (see the header). */
export function weightedProportionInterval(
  sums: WeightedCountSums,
  confidenceLevel: number,
  method: ProportionMethod | 'auto' = 'auto',
): WeightedProportionInterval {
  const nEff = kishEffectiveSize(sums.sumWeights, sums.sumSquaredWeights);
  const p = Math.min(1, Math.max(0, sums.sumEventWeights / sums.sumWeights));
  // x_eff = p n_eff, formed as sum(w y) * (sum w / sum w^2): with unit weights it is exactly
  // the event count, so plain sampling gets exactly the plain interval.
  const events = Math.min(nEff, sums.sumEventWeights * (sums.sumWeights / sums.sumSquaredWeights));
  const interval = proportionInterval(events, nEff, confidenceLevel, method);
  return {
    estimate: p,
    low: Math.min(p, interval.low),
    high: Math.max(p, interval.high),
    method: interval.method,
    effectiveSize: nEff,
  };
}

/** Rule of three: one-sided 95 % upper bound 3/n after zero events in n trials
 *  (Hanley & Lippman-Hand, JAMA 249:1743-1745, 1983). */
export function ruleOfThreeUpper(trials: number): number {
  return 3 / trials;
}

/** Exact one-sided upper bound after zero events in n trials: 1 - (1 - level)^(1/n). */
export function zeroEventsUpperBound(trials: number, confidenceLevel: number): number {
  return -Math.expm1(Math.log1p(-confidenceLevel) / trials);
}
