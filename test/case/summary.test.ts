import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { loadCase } from '../../src/case/load.js';
import { distributionMean, rocofHzPerS, summarizeCase } from '../../src/case/summary.js';

/** jstat (npm "jstat" 1.9.6, general-purpose statistics) as an oracle; it ships no types. */
const jStat = createRequire(import.meta.url)('jstat') as {
  weibull: { mean(scale: number, shape: number): number };
  beta: { mean(alpha: number, beta: number): number };
};

describe('distributionMean', () => {
  it('matches jstat for Weibull and beta means', () => {
    // jstat as an independent oracle: jStat.weibull.mean(scale, shape) = scale * Gamma(1 + 1/shape)
    for (const [shape, scale] of [
      [0.8, 3],
      [1.5, 4],
      [2.2, 7.6],
    ] as const) {
      const ours = distributionMean({ kind: 'weibull', shape, scale });
      // jstat's gamma function is a Lanczos sum good to about 1e-8 relative (measured up to
      // 2e-8 here), so the comparison allows 1e-7 relative
      const oracle = jStat.weibull.mean(scale, shape);
      expect(Math.abs(ours - oracle) / oracle).toBeLessThan(1e-7);
    }
    const beta = distributionMean({ kind: 'beta', alpha: 6, beta: 4, min: 0.3, max: 0.95 });
    expect(beta).toBeCloseTo(0.3 + 0.65 * jStat.beta.mean(6, 4), 14);
  });

  it('is exact where Gamma is known in closed form', () => {
    // Gamma(2) = 1 (shape 1: the exponential, mean = scale); Gamma(3/2) = sqrt(pi)/2
    // (Abramowitz & Stegun, Handbook of Mathematical Functions, 6.1.8 and 6.1.9)
    expect(distributionMean({ kind: 'weibull', shape: 1, scale: 3 })).toBeCloseTo(3, 13);
    expect(distributionMean({ kind: 'weibull', shape: 2, scale: 2 })).toBeCloseTo(
      Math.sqrt(Math.PI),
      13,
    );
  });

  it('weights empirical values and halves a uniform range', () => {
    expect(distributionMean({ kind: 'empirical', values: [1, 3], weights: [3, 1] })).toBe(1.5);
    expect(distributionMean({ kind: 'uniform', min: 2, max: 6 })).toBe(4);
    expect(distributionMean({ kind: 'lognormal', mean: 4, sigmaLn: 0.9 })).toBe(4);
  });
});

describe('rocofHzPerS', () => {
  it('reproduces the recomputed check values of REFERENCES 1.2', () => {
    // df/dt = dP f0 / (2 H): 50 Hz, H = 5 s, 0.1 pu -> 0.50 Hz/s; 60 Hz, H = 4 s, 0.2 pu -> 1.50 Hz/s;
    // 60 Hz, H = 1 s, 0.3 pu -> 9.0 Hz/s (REFERENCES 1.2, recomputed from Kundur 1994 ch. 11)
    expect(rocofHzPerS(0.1, 50, 5)).toBeCloseTo(0.5, 12);
    expect(rocofHzPerS(0.2, 60, 4)).toBeCloseTo(1.5, 12);
    expect(rocofHzPerS(0.3, 60, 1)).toBeCloseTo(9, 12);
    expect(rocofHzPerS(0.1, 60, 0)).toBe(Number.POSITIVE_INFINITY);
  });
});

describe('summarizeCase on the Kestrel Island demo', () => {
  it('adds ratings, peaks by tier, reserve, battery hours and inertia as hand-computed', async () => {
    const s = summarizeCase((await loadCase('cases/kestrel-island.yaml')).case);
    expect(s.totalRatingKw).toBe(1200 + 1200 + 800 + 1500 + 1500 + 900);
    expect(s.peakByTierKw).toEqual({ critical: 480, essential: 1160, sheddable: 830 });
    // running: two 1200 kW gensets + 1500 kW battery; the standby genset does not spin
    expect(s.spinningAtSeparationKw).toBe(3900);
    expect(s.spinningReserveAtPeakKw).toBe(3900 - 2470);
    expect(s.reserveAfterStandbyStartKw).toBe(4700 - 2470);
    // (0.45 - 0.10) * 3000 kWh = 1050 kWh over the 480 kW critical peak
    expect(s.batteryReserveEnergyKwh).toBeCloseTo(1050, 9);
    expect(s.batteryHoursAtCriticalLoad).toBeCloseTo(1050 / 480, 12);
    // H_sys = sum(H_i S_i) / S_base = 2 * 1.1 s * 1500 kVA / 5000 kVA (REFERENCES 1.1)
    expect(s.inertiaSynchronousS).toBeCloseTo(0.66, 12);
    // battery 3 s * 1650 kVA + wind 0.08 pu/(Hz/s) * 60 Hz / 2 * 900 kVA, over 5000 kVA
    expect(s.inertiaEmulatedS).toBeCloseTo((3 * 1650 + 2.4 * 900) / 5000, 12);
    expect(s.ufls.map((u) => u.cumulativeShare.toFixed(2))).toEqual([
      '0.15',
      '0.30',
      '0.50',
      '0.70',
    ]);
    expect(s.shutdownUnderFrequencyHz).toBe(57);
    expect(s.outageHoursPerYear).toBeCloseTo(12, 12);
  });

  it('uses the default shutdown limits of the frequency engine when the case gives none', async () => {
    const s = summarizeCase((await loadCase('cases/tern-atoll/tern-atoll.yaml')).case);
    expect([s.shutdownUnderFrequencyHz, s.shutdownOverFrequencyHz]).toEqual([47.5, 52]);
  });

  it('notes that the hospital relies on shedding or the battery until the standby genset starts', async () => {
    const s = summarizeCase((await loadCase('cases/ridgeway-hospital.yaml')).case);
    // running at separation: CHP 800 kW + battery 1200 kW = 2000 kW against a 2550 kW peak
    expect(s.spinningReserveAtPeakKw).toBe(-550);
    expect(s.notes.some((n) => n.includes('until standby units start'))).toBe(true);
    const kestrel = summarizeCase((await loadCase('cases/kestrel-island.yaml')).case);
    expect(kestrel.notes).toEqual([]);
  });
});
