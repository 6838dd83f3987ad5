/**
 * Distribution of the clearness index k (ratio of ground to extraterrestrial irradiance) by the
 * Hollands-Huget density, one per month:
 *   p(k) = C ((k_max - k) / k_max) e^(lambda k),  0 <= k <= k_max,
 *   C = lambda^2 k_max / (e^(lambda k_max) - 1 - lambda k_max)
 * lambda is solved (bisection) so that the mean equals the month's mean clearness index.
 * Source: K. G. T. Hollands and R. G. Huget, "A probability density function for the clearness
 * index, with applications", Solar Energy 30:195-209, 1983 (citation confirmed, density from
 * memory: REFERENCES 8.5). k_max = 0.864 (REFERENCES 8.5, from memory, a daily value; used for
 * hours here as a screening approximation).
 *
 * Draws use a tabulated inverse CDF: the CDF is exact (closed form) at 256 nodes of k and
 * interpolated linearly in between, so a draw costs a binary search and no transcendental call.
 */

/** Upper limit of the clearness index (REFERENCES 8.5, from memory). */
export const clearnessMaxDefault = 0.864;

const tableNodes = 256;

// Unnormalised CDF G(k) = int_0^k (1 - x/km) e^(lambda x) dx, stable at every lambda:
// for |lambda k| < 1 the power series k sum (lk)^n/(n+1)! - k^2/km sum (lk)^n (n+1)/(n+2)!.
function unnormalisedCdf(k: number, lambda: number, kMax: number): number {
  const t = lambda * k;
  if (Math.abs(t) < 1) {
    let a = 0;
    let b = 0;
    let fact = 1; // n!
    let power = 1; // t^n
    for (let n = 0; n < 30; n++) {
      a += power / (fact * (n + 1));
      b += (power * (n + 1)) / (fact * (n + 1) * (n + 2));
      power *= t;
      fact *= n + 1;
    }
    return k * a - ((k * k) / kMax) * b;
  }
  const em1 = Math.expm1(t);
  return em1 / lambda - (t * Math.exp(t) - em1) / (lambda * lambda * kMax);
}

/** Hollands-Huget CDF at k. */
export function hollandsHugetCdf(k: number, lambda: number, kMax = clearnessMaxDefault): number {
  if (k <= 0) return 0;
  if (k >= kMax) return 1;
  return unnormalisedCdf(k, lambda, kMax) / unnormalisedCdf(kMax, lambda, kMax);
}

/** Mean of the Hollands-Huget density, by Simpson's rule on 400 intervals (error << 1e-8). */
export function hollandsHugetMean(lambda: number, kMax = clearnessMaxDefault): number {
  const n = 400;
  const h = kMax / n;
  let num = 0;
  let den = 0;
  for (let i = 0; i <= n; i++) {
    const k = i * h;
    const w = i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2;
    const p = (1 - k / kMax) * Math.exp(lambda * k);
    num += w * k * p;
    den += w * p;
  }
  return num / den;
}

/** The lambda giving the requested mean (the mean rises monotonically with lambda). */
export function hollandsHugetLambda(mean: number, kMax = clearnessMaxDefault): number {
  // Keep the mean strictly inside (0, kMax): the limits need lambda -> -inf / +inf.
  const target = Math.min(Math.max(mean, 0.02 * kMax), 0.95 * kMax);
  let lo = -200;
  let hi = 200;
  for (let i = 0; i < 80; i++) {
    const mid = 0.5 * (lo + hi);
    if (hollandsHugetMean(mid, kMax) < target) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** A tabulated inverse CDF of one Hollands-Huget distribution. */
export class ClearnessTable {
  readonly lambda: number;
  private readonly cdf = new Float64Array(tableNodes + 1);
  private readonly step: number;

  constructor(
    mean: number,
    readonly kMax = clearnessMaxDefault,
  ) {
    this.lambda = hollandsHugetLambda(mean, kMax);
    this.step = kMax / tableNodes;
    for (let i = 0; i <= tableNodes; i++) {
      this.cdf[i] = hollandsHugetCdf(i * this.step, this.lambda, kMax);
    }
    this.cdf[tableNodes] = 1;
  }

  /** Clearness index at cumulative probability u in (0, 1). */
  quantile(u: number): number {
    const c = this.cdf;
    let lo = 0;
    let hi = tableNodes;
    while (hi - lo > 1) {
      const mid = (lo + hi) >>> 1;
      if (c[mid]! <= u) lo = mid;
      else hi = mid;
    }
    const span = c[hi]! - c[lo]!;
    const frac = span > 0 ? (u - c[lo]!) / span : 0;
    return (lo + frac) * this.step;
  }
}

/**
 * Default mean clearness index per month, northern hemisphere (January first): an invented
 * temperate climate (illustrative, no source). Shifted by six months south of the equator.
 */
export const defaultClearnessByMonth: readonly number[] = [
  0.4, 0.44, 0.48, 0.5, 0.52, 0.55, 0.57, 0.56, 0.52, 0.47, 0.42, 0.38,
];
