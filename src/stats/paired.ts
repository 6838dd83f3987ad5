/**
 * Paired comparison of two designs run on the same scenarios (common random numbers).
 *
 * Each scenario gives a pair of outcomes (first design, second design); for an event the pairs
 * form a 2x2 table [[a, b], [c, d]]: a = both fail, b = first only, c = second only,
 * d = neither; N = a + b + c + d, p1 = (a + b)/N, p2 = (a + c)/N, Delta = p1 - p2 = (b - c)/N.
 *
 * Newcombe's square-and-add interval for Delta (Newcombe, "Improved confidence intervals for
 * the difference between binomial proportions based on paired data", Stat Med 17:2635-2650,
 * 1998, method 10; as quoted in REFERENCES.md 9.5): Wilson intervals (l1, u1) for p1 and
 * (l2, u2) for p2; A = a d - b c, phi = (A - N/2) / sqrt(r1 r2 c1 c2) if A > N/2, 0 if
 * 0 <= A <= N/2, A / sqrt(r1 r2 c1 c2) if A < 0 (0 if a margin r1 = a+b, r2 = c+d, c1 = a+c,
 * c2 = b+d is 0);
 *   L = Delta - sqrt((p1 - l1)^2 + (u2 - p2)^2 - 2 phi (p1 - l1)(u2 - p2))
 *   U = Delta + sqrt((p2 - l2)^2 + (u1 - p1)^2 - 2 phi (p2 - l2)(u1 - p1))
 *
 * McNemar's test: Z = (b - c) / sqrt(b + c), two-sided P = 2 Q(|Z|); exact conditional version:
 * b ~ Binomial(b + c, 1/2) under no difference, P = min(1, 2 P(X <= min(b, c))), with
 * P(X <= k) = I_(1/2)(n - k, k + 1) (A&S 26.5.24). (REFERENCES.md 9.5.)
 *
 * Means: the paired difference d = y1 - y2 per scenario, its weighted mean and normal interval
 * (mean.ts), the usual paired-t large-sample interval.
 *
 * Weighted plans: pass cell sums of weights scaled to Kish's effective size
 * (`scaleTableToEffectiveSize`), as for a single proportion (proportion.ts).
 */

import { incompleteBetaRegularized } from './beta.js';
import { type MeanInterval, momentSumsOf, weightedMeanInterval } from './mean.js';
import { normalUpperTail } from './normal.js';
import { wilsonInterval } from './proportion.js';

export interface PairedTable {
  /** a: both designs have the event */
  both: number;
  /** b: only the first design */
  firstOnly: number;
  /** c: only the second design */
  secondOnly: number;
  /** d: neither */
  neither: number;
}

export interface DifferenceInterval {
  /** p1 - p2 */
  estimate: number;
  low: number;
  high: number;
  first: number;
  second: number;
}

function total(t: PairedTable): number {
  const n = t.both + t.firstOnly + t.secondOnly + t.neither;
  if (!(n > 0) || Math.min(t.both, t.firstOnly, t.secondOnly, t.neither) < 0)
    throw new RangeError('paired table: expected non-negative cells with a positive total');
  return n;
}

export function newcombePairedDifference(
  t: PairedTable,
  confidenceLevel: number,
): DifferenceInterval {
  const n = total(t);
  const { both: a, firstOnly: b, secondOnly: c, neither: d } = t;
  const p1 = (a + b) / n;
  const p2 = (a + c) / n;
  const delta = (b - c) / n;
  const w1 = wilsonInterval(a + b, n, confidenceLevel);
  const w2 = wilsonInterval(a + c, n, confidenceLevel);
  const marginProduct = (a + b) * (c + d) * (a + c) * (b + d);
  const cross = a * d - b * c;
  let phi = 0;
  if (marginProduct > 0) {
    if (cross > n / 2) phi = (cross - n / 2) / Math.sqrt(marginProduct);
    else if (cross < 0) phi = cross / Math.sqrt(marginProduct);
  }
  const dl1 = p1 - w1.low;
  const du1 = w1.high - p1;
  const dl2 = p2 - w2.low;
  const du2 = w2.high - p2;
  const low = delta - Math.sqrt(Math.max(0, dl1 * dl1 + du2 * du2 - 2 * phi * dl1 * du2));
  const high = delta + Math.sqrt(Math.max(0, dl2 * dl2 + du1 * du1 - 2 * phi * dl2 * du1));
  return {
    estimate: delta,
    low: Math.max(-1, low),
    high: Math.min(1, high),
    first: p1,
    second: p2,
  };
}

export interface McNemarResult {
  /** (b - c) / sqrt(b + c); 0 when there are no discordant pairs */
  z: number;
  pAsymptotic: number;
  pExact: number;
}

/** McNemar's test on the discordant counts b (first only) and c (second only). */
export function mcnemarTest(firstOnly: number, secondOnly: number): McNemarResult {
  if (!(firstOnly >= 0 && secondOnly >= 0))
    throw new RangeError('mcnemarTest: expected non-negative discordant counts');
  const discordant = firstOnly + secondOnly;
  if (discordant === 0) return { z: 0, pAsymptotic: 1, pExact: 1 };
  const z = (firstOnly - secondOnly) / Math.sqrt(discordant);
  const k = Math.min(firstOnly, secondOnly);
  const lowerTail = k >= discordant ? 1 : incompleteBetaRegularized(0.5, discordant - k, k + 1);
  return { z, pAsymptotic: 2 * normalUpperTail(Math.abs(z)), pExact: Math.min(1, 2 * lowerTail) };
}

/** Scales weight-sum cells so that they total Kish's effective size (sum w)^2 / sum w^2. */
export function scaleTableToEffectiveSize(
  weighted: PairedTable,
  sumSquaredWeights: number,
): PairedTable {
  const sw = total(weighted);
  const k = sw / sumSquaredWeights; // n_eff / sum w
  return {
    both: weighted.both * k,
    firstOnly: weighted.firstOnly * k,
    secondOnly: weighted.secondOnly * k,
    neither: weighted.neither * k,
  };
}

/** The paired interval for E[y1 - y2]: the weighted mean of per-scenario differences. */
export function pairedMeanDifference(
  first: ArrayLike<number>,
  second: ArrayLike<number>,
  confidenceLevel: number,
  weights?: ArrayLike<number>,
): MeanInterval {
  if (first.length !== second.length)
    throw new RangeError('pairedMeanDifference: the two designs need the same scenarios');
  const d = new Float64Array(first.length);
  for (let i = 0; i < d.length; i++) d[i] = first[i]! - second[i]!;
  return weightedMeanInterval(momentSumsOf(d, weights), confidenceLevel);
}
