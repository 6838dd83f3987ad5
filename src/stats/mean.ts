/**
 * The weighted mean of a quantity with a normal (Wald) interval from the linearised variance of
 * a ratio estimator; with equal weights it is the sample mean +/- z s / sqrt(n).
 *
 *   ybar = sum w y / sum w
 *   v(ybar) = n / (n - 1) * sum w^2 (y - ybar)^2 / (sum w)^2
 *           = n / (n - 1) * (S_w2y2 - 2 ybar S_w2y + ybar^2 S_w2) / (sum w)^2
 *   interval ybar -/+ z sqrt(v)
 * (W. G. Cochran, Sampling Techniques, 3rd ed., Wiley 1977, ch. 6, the variance of a ratio
 * estimate; section from memory). n counts the rows; Kish's effective size
 * n_eff = (sum w)^2 / sum w^2 is reported beside it.
 *
 * The expansion in raw sums lets the sums be accumulated exactly and merged across shards; the
 * variance of nearly constant data loses digits to cancellation and is floored at 0.
 * For a non-negative quantity whose nonzero values are few (rare unserved energy) the normal
 * interval is unreliable: callers may truncate at a physical bound (`lowerBound`), and the
 * summary says so in its method text.
 */
import { twoSidedZ } from './normal.js';

/** Sums over the rows of a weighted sample for one quantity y. */
export interface WeightedMomentSums {
  rows: number;
  sumWeights: number;
  sumSquaredWeights: number;
  /** sum w y */
  sumWeightedValues: number;
  /** sum w^2 y */
  sumSquaredWeightedValues: number;
  /** sum w^2 y^2 */
  sumSquaredWeightedSquares: number;
}

export interface MeanInterval {
  estimate: number;
  low: number;
  high: number;
  standardError: number;
  effectiveSize: number;
}

export function weightedMeanInterval(
  sums: WeightedMomentSums,
  confidenceLevel: number,
  options: { lowerBound?: number } = {},
): MeanInterval {
  const { rows, sumWeights: sw } = sums;
  if (!(rows > 0 && sw > 0))
    throw new RangeError(`weightedMeanInterval: expected rows and weights, got ${rows} rows`);
  const mean = sums.sumWeightedValues / sw;
  const centred =
    sums.sumSquaredWeightedSquares -
    2 * mean * sums.sumSquaredWeightedValues +
    mean * mean * sums.sumSquaredWeights;
  const variance = rows > 1 ? ((rows / (rows - 1)) * Math.max(0, centred)) / (sw * sw) : Infinity;
  const standardError = Math.sqrt(variance);
  const half = twoSidedZ(confidenceLevel) * standardError;
  let low = mean - half;
  if (options.lowerBound !== undefined) low = Math.max(options.lowerBound, low);
  return {
    estimate: mean,
    low,
    high: mean + half,
    standardError,
    effectiveSize: (sw * sw) / sums.sumSquaredWeights,
  };
}

/** The sums of `weightedMeanInterval` for arrays (weights 1 when omitted); non-finite y skipped. */
export function momentSumsOf(
  values: ArrayLike<number>,
  weights?: ArrayLike<number>,
): WeightedMomentSums {
  let rows = 0;
  let sw = 0;
  let sw2 = 0;
  let swy = 0;
  let sw2y = 0;
  let sw2y2 = 0;
  for (let i = 0; i < values.length; i++) {
    const y = values[i]!;
    if (!Number.isFinite(y)) continue;
    const w = weights ? weights[i]! : 1;
    const w2 = w * w;
    rows++;
    sw += w;
    sw2 += w2;
    swy += w * y;
    sw2y += w2 * y;
    sw2y2 += w2 * y * y;
  }
  return {
    rows,
    sumWeights: sw,
    sumSquaredWeights: sw2,
    sumWeightedValues: swy,
    sumSquaredWeightedValues: sw2y,
    sumSquaredWeightedSquares: sw2y2,
  };
}
