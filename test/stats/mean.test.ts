// Source: Cochran, Sampling Techniques, 3rd ed., 1977, ch. 6 (ratio-estimator variance, from memory); Kish, Survey Sampling, 1965 (effective sample size, from memory).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { momentSumsOf, weightedMeanInterval } from '../../src/stats/mean.js';
import { twoSidedZ } from '../../src/stats/normal.js';

/** Two-pass sample mean and standard deviation (the textbook definition). */
function plainMeanSd(ys: number[]) {
  const mean = ys.reduce((a, b) => a + b) / ys.length;
  const ss = ys.reduce((a, y) => a + (y - mean) ** 2, 0);
  return { mean, sd: Math.sqrt(ss / (ys.length - 1)) };
}

describe('weighted mean with a normal interval', () => {
  it('reduces to mean +/- z s / sqrt(n) with equal weights (any common weight)', () => {
    const ys = [3.1, 0, 0, 7.25, 12, 0.5, 4, 4, 9.75, 1];
    const { mean, sd } = plainMeanSd(ys);
    const z = twoSidedZ(0.95);
    for (const w of [1, 0.25, 7]) {
      const r = weightedMeanInterval(
        momentSumsOf(
          ys,
          ys.map(() => w),
        ),
        0.95,
      );
      // the one-pass raw-sum variance differs from the two-pass one by rounding only: 1e-12
      expect(r.estimate).toBeCloseTo(mean, 12);
      expect(r.low).toBeCloseTo(mean - (z * sd) / Math.sqrt(ys.length), 12);
      expect(r.high).toBeCloseTo(mean + (z * sd) / Math.sqrt(ys.length), 12);
      expect(r.effectiveSize).toBeCloseTo(ys.length, 12);
    }
  });

  it('uses the linearised variance n/(n-1) sum w^2 (y - ybar)^2 / (sum w)^2 (Cochran 1977, ch. 6)', () => {
    const ys = [1, 2, 3, 10];
    const ws = [1, 2, 1, 0.5];
    const sw = 4.5;
    const ybar = (1 + 4 + 3 + 5) / sw;
    const v = ((4 / 3) * ws.reduce((a, w, i) => a + w * w * (ys[i]! - ybar) ** 2, 0)) / (sw * sw);
    const r = weightedMeanInterval(momentSumsOf(ys, ws), 0.9);
    expect(r.estimate).toBeCloseTo(ybar, 14);
    expect(r.standardError).toBeCloseTo(Math.sqrt(v), 13);
    expect(r.effectiveSize).toBeCloseTo(sw ** 2 / 6.25, 13);
  });

  it('truncates at a physical lower bound only when asked', () => {
    const ys = [0, 0, 0, 0, 100];
    expect(weightedMeanInterval(momentSumsOf(ys), 0.95).low).toBeLessThan(0);
    expect(weightedMeanInterval(momentSumsOf(ys), 0.95, { lowerBound: 0 }).low).toBe(0);
  });

  it('skips non-finite values (not computed) instead of counting them as zero', () => {
    const s = momentSumsOf([1, Number.NaN, 3]);
    expect(s.rows).toBe(2);
    expect(weightedMeanInterval(s, 0.95).estimate).toBe(2);
  });

  it('contains the estimate and narrows when the same data are repeated (fast-check)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1e3, max: 1e3, noNaN: true }), { minLength: 3, maxLength: 50 }),
        (ys) => {
          const a = weightedMeanInterval(momentSumsOf(ys), 0.95);
          const b = weightedMeanInterval(momentSumsOf([...ys, ...ys, ...ys, ...ys]), 0.95);
          expect(a.low).toBeLessThanOrEqual(a.estimate);
          expect(a.estimate).toBeLessThanOrEqual(a.high);
          expect(b.high - b.low).toBeLessThanOrEqual(
            a.high - a.low + 1e-9 * (1 + Math.abs(a.estimate)),
          );
        },
      ),
      { seed: 5, numRuns: 200 },
    );
  });
});
