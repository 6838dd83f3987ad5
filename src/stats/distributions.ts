/**
 * Probability distributions: CDFs, quantiles (inverse CDFs) and draws, for the schema's
 * `Distribution` union and for the Poisson counts.
 *
 * - uniform(min, max), normal(mean, sd): quantile by the inverse normal CDF (Acklam + Halley,
 *   see distributions-special.ts).
 * - lognormal(mean, sigmaLn): the schema gives the arithmetic mean m; ln X ~ N(mu, s^2) with
 *   mu = ln m - s^2/2, since E[X] = exp(mu + s^2/2) (Johnson, Kotz & Balakrishnan, Continuous
 *   Univariate Distributions vol. 1, 2nd ed., 1994, ch. 14).
 * - weibull(shape k, scale c): F(x) = 1 - exp(-(x/c)^k), quantile c (-ln(1-u))^(1/k).
 * - beta(alpha, beta) on [min, max]: CDF I_x(a, b); quantile by safeguarded Newton on the CDF;
 *   draws by Cheng's algorithm BA (R. C. H. Cheng, "Generating beta variates with nonintegral
 *   shape parameters", Comm. ACM 21(4):317-322, 1978), valid for all a, b > 0.
 * - empirical(values, weights): a discrete distribution on the values (sorted), quantile by the
 *   first cumulative weight >= u.
 * - Poisson(lambda): draws by sequential inversion of the CDF in chunks of mean <= 30
 *   (a sum of independent Poisson counts is Poisson with the summed mean), exact at any lambda.
 *
 * In the hot path, `compileDistribution` precomputes the parameters once so that `quantileOf`
 * does no allocation.
 */
import type { Distribution } from '../case/schema.js';
import {
  incompleteBetaRegularized as betaIncRegularized,
  incompleteBetaWithLogBeta as betaIncWithLnBeta,
} from './beta.js';
import { logGamma as lnGamma } from './log-gamma.js';
import { normalCdf, normalQuantile } from './normal.js';

/** Anything that yields uniforms in (0, 1). */
export interface UniformSource {
  uniform(): number;
}

export function uniformCdf(x: number, min: number, max: number): number {
  if (x <= min) return 0;
  if (x >= max) return 1;
  return (x - min) / (max - min);
}

export function normalCdfOf(x: number, mean: number, sd: number): number {
  if (sd === 0) return x < mean ? 0 : 1;
  return normalCdf((x - mean) / sd);
}

/** mu of ln X for a lognormal given its arithmetic mean and sigma of ln X. */
export function lognormalMuFromMean(mean: number, sigmaLn: number): number {
  return Math.log(mean) - (sigmaLn * sigmaLn) / 2;
}

export function lognormalCdf(x: number, mean: number, sigmaLn: number): number {
  if (x <= 0) return 0;
  const mu = lognormalMuFromMean(mean, sigmaLn);
  if (sigmaLn === 0) return x < Math.exp(mu) ? 0 : 1;
  return normalCdf((Math.log(x) - mu) / sigmaLn);
}

export function weibullCdf(x: number, shape: number, scale: number): number {
  if (x <= 0) return 0;
  return -Math.expm1(-((x / scale) ** shape));
}

export function weibullQuantile(u: number, shape: number, scale: number): number {
  return scale * (-Math.log1p(-u)) ** (1 / shape);
}

/** Beta CDF on [0, 1]. */
export function betaCdf(x: number, alpha: number, beta: number): number {
  return betaIncRegularized(x, alpha, beta);
}

/** Beta quantile on [0, 1]: Newton steps on I_x(a,b) - u kept inside a shrinking bracket. */
export function betaQuantile(u: number, alpha: number, beta: number): number {
  if (u <= 0) return 0;
  if (u >= 1) return 1;
  const lnB = lnGamma(alpha) + lnGamma(beta) - lnGamma(alpha + beta);
  return betaQuantileFrom(u, alpha, beta, lnB, 0, 1, alpha / (alpha + beta));
}

/**
 * Safeguarded Newton for I_x(a,b) = u from the start x inside the bracket [lo, hi]; stops at
 * |I_x - u| < 1e-14 or a bracket narrower than 1e-15.
 */
function betaQuantileFrom(
  u: number,
  alpha: number,
  beta: number,
  lnB: number,
  lo: number,
  hi: number,
  x: number,
): number {
  for (let i = 0; i < 100; i++) {
    const f = betaIncWithLnBeta(x, alpha, beta, lnB) - u;
    if (f > 0) hi = x;
    else lo = x;
    if (Math.abs(f) < 1e-14 || hi - lo < 1e-15) break;
    const pdf = Math.exp((alpha - 1) * Math.log(x) + (beta - 1) * Math.log1p(-x) - lnB);
    let next = x - f / pdf;
    if (!(next > lo && next < hi) || !Number.isFinite(next)) next = 0.5 * (lo + hi);
    x = next;
  }
  return x;
}

/** Beta draw on [0, 1] by Cheng's algorithm BA (Comm. ACM 21:317, 1978). */
export function betaDraw(rng: UniformSource, alpha: number, beta: number): number {
  const s = alpha + beta;
  const m = Math.min(alpha, beta);
  const b = m <= 1 ? 1 / m : Math.sqrt((s - 2) / (2 * alpha * beta - s));
  const g = alpha + 1 / b;
  const ln4 = Math.log(4);
  for (;;) {
    const u1 = rng.uniform();
    const u2 = rng.uniform();
    const v = b * Math.log(u1 / (1 - u1));
    const w = alpha * Math.exp(v);
    if (!Number.isFinite(w)) {
      if (s * Math.log(s) + g * v - ln4 >= Math.log(u1 * u1 * u2)) return 1;
      continue;
    }
    if (s * Math.log(s / (beta + w)) + g * v - ln4 >= Math.log(u1 * u1 * u2)) return w / (beta + w);
  }
}

/** Poisson probability mass P(N = k). */
export function poissonPmf(k: number, lambda: number): number {
  if (k < 0 || !Number.isInteger(k)) return 0;
  if (lambda === 0) return k === 0 ? 1 : 0;
  return Math.exp(k * Math.log(lambda) - lambda - lnGamma(k + 1));
}

/** Poisson CDF P(N <= k) by summing the mass function. */
export function poissonCdf(k: number, lambda: number): number {
  if (k < 0) return 0;
  let sum = 0;
  for (let i = 0; i <= Math.floor(k); i++) sum += poissonPmf(i, lambda);
  return Math.min(1, sum);
}

// Chunk mean for Poisson inversion: e^-30 ~ 9e-14 stays far above underflow.
const poissonChunk = 30;

/** Poisson draw, exact at any mean (sequential inversion per chunk of mean <= 30). */
export function poissonDraw(rng: UniformSource, lambda: number): number {
  let count = 0;
  let remaining = lambda;
  while (remaining > 0) {
    const mu = Math.min(remaining, poissonChunk);
    remaining -= mu;
    const u = rng.uniform();
    let k = 0;
    let p = Math.exp(-mu);
    let cdf = p;
    while (u > cdf && k < 10000) {
      k++;
      p *= mu / k;
      cdf += p;
    }
    count += k;
  }
  return count;
}

/** Nodes of the beta quantile table used as Newton starting brackets. */
const betaTableSize = 256;

/** A distribution with its parameters precomputed for repeated quantile evaluation. */
export class CompiledDistribution {
  readonly kind: Distribution['kind'];
  private readonly a: number;
  private readonly b: number;
  private readonly min: number;
  private readonly max: number;
  private readonly values: Float64Array;
  private readonly cumulative: Float64Array;
  /** Beta: ln B(a, b) and exact quantiles at u = j / betaTableSize (Newton starting points). */
  private readonly lnB: number;
  private readonly betaTable: Float64Array;

  constructor(d: Distribution) {
    this.kind = d.kind;
    this.a = 0;
    this.b = 0;
    this.min = 0;
    this.max = 1;
    this.values = new Float64Array(0);
    this.cumulative = new Float64Array(0);
    this.lnB = 0;
    this.betaTable = new Float64Array(0);
    switch (d.kind) {
      case 'fixed':
        this.a = d.value;
        break;
      case 'uniform':
        this.min = d.min;
        this.max = d.max;
        break;
      case 'normal':
        this.a = d.mean;
        this.b = d.sd;
        break;
      case 'lognormal':
        this.a = lognormalMuFromMean(d.mean, d.sigmaLn);
        this.b = d.sigmaLn;
        break;
      case 'weibull':
        this.a = d.shape;
        this.b = d.scale;
        break;
      case 'beta':
        this.a = d.alpha;
        this.b = d.beta;
        this.min = d.min;
        this.max = d.max;
        this.lnB = lnGamma(d.alpha) + lnGamma(d.beta) - lnGamma(d.alpha + d.beta);
        this.betaTable = new Float64Array(betaTableSize + 1);
        for (let j = 1; j < betaTableSize; j++) {
          this.betaTable[j] = betaQuantile(j / betaTableSize, d.alpha, d.beta);
        }
        this.betaTable[betaTableSize] = 1;
        break;
      case 'empirical': {
        const n = d.values.length;
        const order = d.values.map((_, i) => i).sort((i, j) => d.values[i]! - d.values[j]!);
        this.values = new Float64Array(n);
        this.cumulative = new Float64Array(n);
        let total = 0;
        for (let i = 0; i < n; i++) total += d.weights ? (d.weights[order[i]!] ?? 0) : 1;
        let acc = 0;
        for (let i = 0; i < n; i++) {
          const k = order[i]!;
          this.values[i] = d.values[k]!;
          acc += (d.weights ? (d.weights[k] ?? 0) : 1) / total;
          this.cumulative[i] = acc;
        }
        this.cumulative[n - 1] = 1;
        break;
      }
    }
  }

  /** Inverse CDF at u in (0, 1); monotone in u, so equal uniforms give coupled draws. */
  quantile(u: number): number {
    switch (this.kind) {
      case 'fixed':
        return this.a;
      case 'uniform':
        return this.min + (this.max - this.min) * u;
      case 'normal':
        return this.a + this.b * normalQuantile(u);
      case 'lognormal':
        return Math.exp(this.a + this.b * normalQuantile(u));
      case 'weibull':
        return weibullQuantile(u, this.a, this.b);
      case 'beta': {
        // Exact quantile: Newton from the tabulated bracket (one or two CDF evaluations).
        const t = u * betaTableSize;
        const j = Math.min(Math.floor(t), betaTableSize - 1);
        const lo = this.betaTable[j]!;
        const hi = this.betaTable[j + 1]!;
        const x0 = lo + (t - j) * (hi - lo);
        const x = betaQuantileFrom(u, this.a, this.b, this.lnB, lo, hi, x0);
        return this.min + (this.max - this.min) * x;
      }
      case 'empirical': {
        const c = this.cumulative;
        let lo = 0;
        let hi = c.length - 1;
        while (lo < hi) {
          const mid = (lo + hi) >>> 1;
          if (c[mid]! >= u) hi = mid;
          else lo = mid + 1;
        }
        return this.values[lo]!;
      }
    }
  }

  /** CDF at x. */
  cdf(x: number): number {
    switch (this.kind) {
      case 'fixed':
        return x < this.a ? 0 : 1;
      case 'uniform':
        return uniformCdf(x, this.min, this.max);
      case 'normal':
        return normalCdfOf(x, this.a, this.b);
      case 'lognormal':
        if (x <= 0) return 0;
        return this.b === 0
          ? x < Math.exp(this.a)
            ? 0
            : 1
          : normalCdf((Math.log(x) - this.a) / this.b);
      case 'weibull':
        return weibullCdf(x, this.a, this.b);
      case 'beta':
        return betaCdf((x - this.min) / (this.max - this.min), this.a, this.b);
      case 'empirical': {
        let p = 0;
        for (let i = 0; i < this.values.length; i++) {
          if (this.values[i]! <= x) p = this.cumulative[i]!;
        }
        return p;
      }
    }
  }
}

/** Inverse CDF of a schema distribution (compiles it each call: use CompiledDistribution in loops). */
export function distributionQuantile(d: Distribution, u: number): number {
  return new CompiledDistribution(d).quantile(u);
}

/** CDF of a schema distribution. */
export function distributionCdf(d: Distribution, x: number): number {
  return new CompiledDistribution(d).cdf(x);
}

/**
 * One draw from a schema distribution with the exact method of each kind: inversion for all but
 * the beta, which uses Cheng's BA.
 */
export function drawDistribution(d: Distribution, rng: UniformSource): number {
  if (d.kind === 'beta') return d.min + (d.max - d.min) * betaDraw(rng, d.alpha, d.beta);
  return distributionQuantile(d, rng.uniform());
}
