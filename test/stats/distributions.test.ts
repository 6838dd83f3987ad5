import { describe, expect, it } from 'vitest';
import type { Distribution } from '../../src/case/schema.js';
import { StreamRng } from '../../src/numeric/random-stream.js';
import { incompleteBetaRegularized as betaIncRegularized } from '../../src/stats/beta.js';
import {
  betaCdf,
  betaDraw,
  betaQuantile,
  CompiledDistribution,
  drawDistribution,
  lognormalCdf,
  poissonCdf,
  poissonDraw,
  poissonPmf,
  weibullCdf,
} from '../../src/stats/distributions.js';
import { logGamma as lnGamma } from '../../src/stats/log-gamma.js';
import { normalCdf, normalQuantile, normalUpperTail } from '../../src/stats/normal.js';

// erf and erfc through the normal tail: erfc(x) = 2 Q(x sqrt 2) (A&S eq. 26.2.29).
const erfc = (x: number) => 2 * normalUpperTail(x * Math.SQRT2);
const erf = (x: number) => 1 - erfc(x);

import { jStat, ksCritical, ksStatistic } from './distributions-oracle.js';

// KS significance for fixed-seed checks: 1e-3, so a correct sampler fails about once per 1000
// seeds; the seeds are fixed, so the outcome is deterministic.
const ksAlpha = 1e-3;
const n = 20_000;

function sampleOf(d: Distribution, seed: number): Float64Array {
  const rng = new StreamRng(seed);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = drawDistribution(d, rng);
  return out;
}

function meanVar(x: Float64Array): [number, number] {
  let s = 0;
  for (const v of x) s += v;
  const m = s / x.length;
  let q = 0;
  for (const v of x) q += (v - m) ** 2;
  return [m, q / (x.length - 1)];
}

describe('special functions against jstat', () => {
  it('erf and erfc match jstat.erf to 1e-13 over [-6, 6]', () => {
    for (let x = -6; x <= 6; x += 0.137) {
      expect(Math.abs(erf(x) - jStat.erf(x))).toBeLessThan(1e-13);
      expect(Math.abs(erfc(x) - (1 - jStat.erf(x)))).toBeLessThan(1e-13);
    }
    // Relative accuracy in the far tail: erfc(5) = 1.5374597944280349e-12 (A&S Table 7.1, from memory).
    expect(Math.abs(erfc(5) / 1.5374597944280349e-12 - 1)).toBeLessThan(1e-12);
  });

  it('lnGamma matches jstat.gammaln to 1e-12 relative', () => {
    for (const x of [0.1, 0.5, 1, 1.5, 2, 3.7, 10, 55.5, 170]) {
      const ref = jStat.gammaln(x);
      expect(Math.abs(lnGamma(x) - ref)).toBeLessThan(1e-12 * Math.max(1, Math.abs(ref)));
    }
    // Exact: Gamma(1/2) = sqrt(pi) (A&S 6.1.8).
    expect(Math.abs(lnGamma(0.5) - 0.5 * Math.log(Math.PI))).toBeLessThan(1e-14);
  });

  it('the regularised incomplete beta equals the binomial tail exactly and jstat.ibeta to 1e-8', () => {
    // I_x(a, n - a + 1) = P(Binomial(n, x) >= a) for integer shapes (A&S eq. 26.5.24).
    const choose = (m: number, k: number) => {
      let r = 1;
      for (let i = 1; i <= k; i++) r = (r * (m - k + i)) / i;
      return r;
    };
    for (const [a, b] of [
      [2, 5],
      [30, 40],
    ] as const) {
      const m = a + b - 1;
      for (let x = 0.01; x < 1; x += 0.049) {
        let tail = 0;
        for (let k = a; k <= m; k++) tail += choose(m, k) * x ** k * (1 - x) ** (m - k);
        expect(Math.abs(betaIncRegularized(x, a, b) - tail)).toBeLessThan(1e-13);
      }
    }
    // jstat's own accuracy is about 1e-8 at large shapes (measured against the binomial sums).
    for (const [a, b] of [
      [0.5, 0.5],
      [2, 3],
      [5, 1.5],
      [30, 40],
    ] as const) {
      for (let x = 0.01; x < 1; x += 0.049) {
        expect(Math.abs(betaIncRegularized(x, a, b) - jStat.ibeta(x, a, b))).toBeLessThan(1e-7);
      }
    }
  });

  it('the normal quantile inverts the CDF to double precision and matches jstat.normal.inv', () => {
    for (const p of [1e-12, 1e-6, 0.001, 0.02425, 0.1, 0.5, 0.77, 0.97575, 0.999, 1 - 1e-9]) {
      const x = normalQuantile(p);
      // Inversion to 1e-12 relative in the tail probability (double precision after Halley).
      expect(Math.abs(normalCdf(x) - p)).toBeLessThan(Math.max(1e-12 * Math.min(p, 1 - p), 4e-16));
      // jstat's inverse is itself good to about 2e-6 in the far tail (1e-12), far better centrally.
      expect(Math.abs(x - jStat.normal.inv(p, 0, 1))).toBeLessThan(p < 1e-9 ? 3e-6 : 1e-8);
    }
    // Phi^-1(0.975) = 1.959963984540054 (the two-sided 95 % point, A&S Table 26.5, from memory).
    expect(Math.abs(normalQuantile(0.975) - 1.959963984540054)).toBeLessThan(1e-14);
  });
});

describe('distribution draws against jstat CDFs (Kolmogorov-Smirnov and moments)', () => {
  const cases: [string, Distribution, (x: number) => number, number, number][] = [
    ['uniform', { kind: 'uniform', min: 2, max: 5 }, (x) => jStat.uniform.cdf(x, 2, 5), 3.5, 0.75],
    ['normal', { kind: 'normal', mean: 10, sd: 3 }, (x) => jStat.normal.cdf(x, 10, 3), 10, 9],
    [
      'lognormal',
      { kind: 'lognormal', mean: 4, sigmaLn: 0.8 },
      (x) => jStat.lognormal.cdf(x, Math.log(4) - 0.32, 0.8),
      4,
      // Var = m^2 (e^(s^2) - 1) (Johnson, Kotz & Balakrishnan 1994, ch. 14).
      16 * (Math.exp(0.64) - 1),
    ],
    [
      'weibull',
      { kind: 'weibull', shape: 1.5, scale: 6 },
      (x) => jStat.weibull.cdf(x, 6, 1.5),
      // Mean c Gamma(1 + 1/k) = 5.4165 (REFERENCES 8.6, recomputed).
      5.41652,
      36 * (Math.exp(jStat.gammaln(1 + 2 / 1.5)) - Math.exp(2 * jStat.gammaln(1 + 1 / 1.5))),
    ],
    [
      'beta',
      { kind: 'beta', alpha: 2, beta: 5, min: 0, max: 1 },
      (x) => jStat.beta.cdf(x, 2, 5),
      2 / 7,
      // Var = ab / ((a+b)^2 (a+b+1)).
      10 / (49 * 8),
    ],
    [
      'beta with small shapes',
      { kind: 'beta', alpha: 0.5, beta: 0.7, min: 0, max: 1 },
      (x) => jStat.beta.cdf(x, 0.5, 0.7),
      0.5 / 1.2,
      0.35 / (1.44 * 2.2),
    ],
  ];
  for (const [name, d, cdf, mean, variance] of cases) {
    it(`${name}: KS at alpha 1e-3 and mean/variance within 5 standard errors`, () => {
      const x = sampleOf(d, 1234);
      expect(ksStatistic(x, cdf)).toBeLessThan(ksCritical(n, ksAlpha));
      const [m, v] = meanVar(x);
      expect(Math.abs(m - mean)).toBeLessThan(5 * Math.sqrt(variance / n));
      // SE of the sample variance ~ sigma^2 sqrt(2/n) (normal case); x3 for heavier tails.
      expect(Math.abs(v - variance)).toBeLessThan(15 * variance * Math.sqrt(2 / n));
    });
  }

  it('our CDFs equal jstat CDFs for lognormal, Weibull and beta', () => {
    for (let x = 0.05; x < 12; x += 0.31) {
      expect(
        Math.abs(lognormalCdf(x, 4, 0.8) - jStat.lognormal.cdf(x, Math.log(4) - 0.32, 0.8)),
      ).toBeLessThan(1e-13);
      expect(Math.abs(weibullCdf(x, 1.5, 6) - jStat.weibull.cdf(x, 6, 1.5))).toBeLessThan(1e-13);
      // jstat's incomplete beta is good to ~2e-10 at these shapes (see above).
      expect(Math.abs(betaCdf(x / 12, 2, 5) - jStat.beta.cdf(x / 12, 2, 5))).toBeLessThan(1e-9);
    }
  });

  it('beta quantile inverts the beta CDF and matches jstat.beta.inv', () => {
    for (const [a, b] of [
      [2, 5],
      [0.5, 0.7],
      [4, 1],
    ] as const) {
      for (const p of [0.001, 0.05, 0.3, 0.5, 0.9, 0.999]) {
        const x = betaQuantile(p, a, b);
        expect(Math.abs(betaCdf(x, a, b) - p)).toBeLessThan(1e-12);
        expect(Math.abs(x - jStat.beta.inv(p, a, b))).toBeLessThan(1e-6);
      }
    }
  });

  it('the compiled beta quantile (tabulated start, Newton finish) is exact', () => {
    const c = new CompiledDistribution({ kind: 'beta', alpha: 6, beta: 4, min: 0.3, max: 0.95 });
    for (let u = 1e-6; u < 1; u += 0.0071) {
      const x = (c.quantile(u) - 0.3) / 0.65;
      // Newton stops at |I_x - u| < 1e-14; the scaling to [min, max] adds rounding only.
      expect(Math.abs(betaCdf(x, 6, 4) - u)).toBeLessThan(1e-12);
    }
  });

  it('quantiles are monotone in u, so common uniforms give coupled draws', () => {
    const ds: Distribution[] = [
      { kind: 'lognormal', mean: 3, sigmaLn: 1 },
      { kind: 'weibull', shape: 0.8, scale: 2 },
      { kind: 'beta', alpha: 2, beta: 2, min: 0.3, max: 0.95 },
      { kind: 'empirical', values: [8, 1, 4], weights: [1, 2, 1] },
    ];
    for (const d of ds) {
      const c = new CompiledDistribution(d);
      let prev = Number.NEGATIVE_INFINITY;
      for (let u = 0.001; u < 1; u += 0.01) {
        const q = c.quantile(u);
        expect(q).toBeGreaterThanOrEqual(prev);
        prev = q;
      }
    }
  });

  it('empirical draws hit each value with its weight (chi-square style check)', () => {
    const x = sampleOf({ kind: 'empirical', values: [8, 1, 4], weights: [1, 2, 1] }, 77);
    const count = (v: number) => x.filter((y) => y === v).length / n;
    // Binomial SE sqrt(p(1-p)/n) <= 0.0036; tolerance 5 SE.
    expect(Math.abs(count(1) - 0.5)).toBeLessThan(0.018);
    expect(Math.abs(count(4) - 0.25)).toBeLessThan(0.016);
    expect(Math.abs(count(8) - 0.25)).toBeLessThan(0.016);
    expect(new CompiledDistribution({ kind: 'empirical', values: [8, 1, 4] }).cdf(4)).toBeCloseTo(
      2 / 3,
      14,
    );
  });

  it('Cheng BA beta draws pass KS for a strongly skewed shape', () => {
    const rng = new StreamRng(99);
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = betaDraw(rng, 4, 1);
    expect(ksStatistic(x, (v) => jStat.beta.cdf(v, 4, 1))).toBeLessThan(ksCritical(n, ksAlpha));
  });
});

describe('Poisson counts', () => {
  it('mass and CDF match jstat', () => {
    for (const lambda of [0.3, 2, 17.5, 60]) {
      for (const k of [0, 1, 3, 10, 20, 70]) {
        expect(Math.abs(poissonPmf(k, lambda) - jStat.poisson.pdf(k, lambda))).toBeLessThan(1e-12);
        expect(Math.abs(poissonCdf(k, lambda) - jStat.poisson.cdf(k, lambda))).toBeLessThan(1e-10);
      }
    }
  });

  for (const lambda of [0.5, 4, 75]) {
    it(`draws at mean ${lambda} have the Poisson frequencies (mean, variance, cell frequencies)`, () => {
      const rng = new StreamRng(4242);
      const m = 20_000;
      const x = new Float64Array(m);
      for (let i = 0; i < m; i++) x[i] = poissonDraw(rng, lambda);
      const [mean, variance] = meanVar(x);
      // Mean and variance both equal lambda; SE of the mean sqrt(lambda/n).
      expect(Math.abs(mean - lambda)).toBeLessThan(5 * Math.sqrt(lambda / m));
      expect(Math.abs(variance / lambda - 1)).toBeLessThan(0.06);
      const mode = Math.floor(lambda);
      const freq = x.filter((v) => v === mode).length / m;
      const p = jStat.poisson.pdf(mode, lambda);
      expect(Math.abs(freq - p)).toBeLessThan(5 * Math.sqrt((p * (1 - p)) / m));
    });
  }
});
