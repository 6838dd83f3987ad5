import { describe, expect, it } from 'vitest';
import { normalCdf, normalQuantile, normalUpperTail, twoSidedZ } from '../../src/stats/normal.js';
import { jStat } from './jstat-oracle.js';

describe('standard normal CDF', () => {
  it('matches jstat to 1e-9 (absolute) over [-8, 8]', () => {
    // Oracle: jstat 1.9.6 normal.cdf (erf-based); 1e-9 is the accuracy the task asks for.
    for (let x = -8; x <= 8; x += 0.01)
      expect(Math.abs(normalCdf(x) - jStat.normal.cdf(x, 0, 1))).toBeLessThan(1e-9);
  });

  it('matches jstat in relative terms where jstat is itself accurate (|x| <= 5)', () => {
    for (let x = -5; x <= 0; x += 0.05) {
      const ref = jStat.normal.cdf(x, 0, 1);
      expect(Math.abs(normalCdf(x) / ref - 1)).toBeLessThan(1e-9);
    }
  });

  it('keeps relative accuracy in the far tail (asymptotic series of the Mills ratio)', () => {
    // Abramowitz & Stegun 26.2.12: Q(x) ~ phi(x)/x (1 - 1/x^2 + 3/x^4 - 15/x^6 + 105/x^8),
    // truncation error below 945/x^10 relative: 1e-10 at x = 20.
    for (const x of [20, 25, 30]) {
      const phi = Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI);
      const x2 = 1 / (x * x);
      const series = (phi / x) * (1 - x2 + 3 * x2 * x2 - 15 * x2 ** 3 + 105 * x2 ** 4);
      expect(Math.abs(normalUpperTail(x) / series - 1)).toBeLessThan(2e-10);
      expect(normalCdf(-x)).toBe(normalUpperTail(x));
    }
  });

  it('is continuous across the switch between series and continued fraction at |x| = 3', () => {
    // Both methods are exact in the limit; they must agree to rounding at the seam.
    const below = normalCdf(-3 + 1e-12);
    const at = normalCdf(-3);
    const density = Math.exp(-4.5) / Math.sqrt(2 * Math.PI);
    expect(Math.abs(below - at - density * 1e-12) / at).toBeLessThan(1e-13);
  });
});

describe('standard normal quantile', () => {
  it('matches jstat to 1e-9 for 1e-6 <= p <= 1 - 1e-6', () => {
    // Oracle: jstat normal.inv; outside this range jstat's erfcinv loses accuracy itself.
    for (let p = 1e-6; p < 1 - 1e-6; p = p < 0.01 ? p * 1.5 : p + 0.0025)
      expect(Math.abs(normalQuantile(p) - jStat.normal.inv(p, 0, 1))).toBeLessThan(1e-9);
  });

  it('inverts the CDF to 1e-13 relative down to p = 1e-300', () => {
    for (let e = 1; e <= 300; e += 7) {
      const p = 10 ** -e;
      expect(Math.abs(normalCdf(normalQuantile(p)) / p - 1)).toBeLessThan(1e-13);
    }
  });

  it('gives the familiar 95 % critical value 1.959964 (common practice, no source)', () => {
    expect(twoSidedZ(0.95)).toBeCloseTo(1.959963984540054, 13);
    expect(normalQuantile(0.5)).toBe(0);
    expect(normalQuantile(0)).toBe(Number.NEGATIVE_INFINITY);
    expect(() => normalQuantile(1.5)).toThrow(RangeError);
  });
});
