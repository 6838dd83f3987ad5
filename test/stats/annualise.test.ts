// Source: REFERENCES.md 9.6 (Poisson thinning, Billinton & Allan; from memory there), with its recomputed check values.
import { describe, expect, it } from 'vitest';
import {
  failuresPerYear,
  perYearInterval,
  probabilityInYear,
  probabilityInYearCombined,
  probabilityInYearInterval,
} from '../../src/stats/annualise.js';

describe('annualisation by Poisson thinning (REFERENCES.md 9.6)', () => {
  it('reproduces the recomputed check values 1 - exp(-lambda p)', () => {
    // lambda = 2, p = 0.01 -> 0.019801; lambda = 0.5, p = 0.1 -> 0.048771; lambda = 10, p = 0.05 -> 0.393469
    expect(probabilityInYear(2, 0.01)).toBeCloseTo(0.019801, 6);
    expect(probabilityInYear(0.5, 0.1)).toBeCloseTo(0.048771, 6);
    expect(probabilityInYear(10, 0.05)).toBeCloseTo(0.393469, 6);
    expect(failuresPerYear(2, 0.01)).toBeCloseTo(0.02, 15);
  });

  it('does not use lambda p as a probability (at lambda p = 0.5 that overstates by 27 %)', () => {
    const p = probabilityInYear(10, 0.05);
    expect(p).not.toBeCloseTo(failuresPerYear(10, 0.05), 2);
    expect(failuresPerYear(10, 0.05) / p - 1).toBeCloseTo(0.27, 2);
    // and stays a probability when lambda p > 1
    expect(probabilityInYear(30, 0.5)).toBeLessThan(1);
  });

  it('maps an interval of p through monotonically', () => {
    const p = { estimate: 0.01, low: 0.008, high: 0.0125 };
    const y = probabilityInYearInterval(2, p);
    expect(y.low).toBeCloseTo(-Math.expm1(-0.016), 15);
    expect(y.high).toBeCloseTo(-Math.expm1(-0.025), 15);
    expect(y.low).toBeLessThan(y.estimate);
    expect(y.estimate).toBeLessThan(y.high);
    expect(perYearInterval(2, p)).toEqual({ estimate: 0.02, low: 0.016, high: 0.025 });
  });

  it('combines several event classes as 1 - exp(-sum lambda_i p_i)', () => {
    const c = probabilityInYearCombined([
      { ratePerYear: 2, probability: { estimate: 0.01, low: 0.005, high: 0.02 } },
      { ratePerYear: 0.5, probability: { estimate: 0.1, low: 0.05, high: 0.2 } },
    ]);
    expect(c.estimate).toBeCloseTo(1 - Math.exp(-(0.02 + 0.05)), 15);
    expect(c.low).toBeCloseTo(1 - Math.exp(-(0.01 + 0.025)), 15);
    expect(c.high).toBeCloseTo(1 - Math.exp(-(0.04 + 0.1)), 15);
  });
});
