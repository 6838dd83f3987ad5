import { gamma } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { caseSchema } from '../../src/case/schema.js';
import { powerCurveKw, WindResource } from '../../src/sample/wind-output.js';
import { weibullQuantile } from '../../src/stats/distributions.js';

describe('wind resource', () => {
  it('Weibull quantiles average to c Gamma(1 + 1/k) (REFERENCES 8.6, gamma from mathjs)', () => {
    for (const [k, c, expected] of [
      [2, 8, 7.0898],
      [1.5, 6, 5.4165],
    ] as const) {
      const exact = c * (gamma(1 + 1 / k) as number);
      // REFERENCES 8.6 recomputed values to 4 decimals.
      expect(exact).toBeCloseTo(expected, 3);
      const m = 200_000;
      let sum = 0;
      for (let j = 0; j < m; j++) sum += weibullQuantile((j + 0.5) / m, k, c);
      // Midpoint rule on the quantile function: the error is dominated by the last cell, where the
      // quantile grows like (ln m)^(1/k); 1e-3 relative covers it at m = 2e5.
      expect(Math.abs(sum / m / exact - 1)).toBeLessThan(1e-3);
    }
  });

  it('shears 10 m to 80 m by 1.3459 with alpha = 1/7 (REFERENCES 8.6)', () => {
    const w = caseSchema.parse({
      name: 'Invented wind check',
      system: { frequencyHz: 60, voltageKv: 0.48, baseKva: 500 },
      sources: [
        {
          id: 'w1',
          kind: 'wind',
          bus: 'm',
          ratingKw: 100,
          resource: { kind: 'parametric', weibullScaleMPerSByMonth: Array(12).fill(7) },
        },
      ],
      loads: [{ id: 'l', bus: 'm', tier: 'critical', peakKw: 50 }],
      network: { buses: [{ id: 'm' }], pccBus: 'm' },
      events: { islandingRatePerYear: 1, outageDurationH: { kind: 'fixed', value: 2 } },
    }).sources[0]!;
    if (w.kind !== 'wind') throw new Error('fixture');
    const r = new WindResource(w, null);
    // Median of Weibull(2, c): c (ln 2)^(1/2); at hub c = 7 * 1.3459.
    expect(r.hubSpeedMPerS(0, 0.5)).toBeCloseTo(7 * 1.3459 * Math.sqrt(Math.LN2), 3);
    // Expected output lies between 0 and the rating.
    expect(r.expectedKw(0)).toBeGreaterThan(0);
    expect(r.expectedKw(0)).toBeLessThan(100);
  });

  it('power curve: zero below cut-in and from cut-out on, rating between rated and cut-out', () => {
    const p = (v: number) => powerCurveKw(v, 500, 3.5, 12, 25);
    expect(p(0)).toBe(0);
    expect(p(3.49)).toBe(0);
    expect(p(3.5)).toBe(0);
    expect(p(25)).toBe(0);
    expect(p(30)).toBe(0);
    expect(p(12)).toBe(500);
    expect(p(24.9)).toBe(500);
    // Cubic between cut-in and rated (REFERENCES 8.6): at 8 m/s (512 - 42.875)/(1728 - 42.875) of rating.
    expect(p(8)).toBeCloseTo((500 * (512 - 42.875)) / (1728 - 42.875), 10);
    let prev = 0;
    for (let v = 3.5; v < 12; v += 0.1) {
      expect(p(v)).toBeGreaterThanOrEqual(prev);
      prev = p(v);
    }
  });
});
