// Source: Newcombe 1998 (paired interval, REFERENCES.md 9.5) and the law of total probability for the strata sums; property tests with fast-check at fixed seeds.
/**
 * Property tests (fast-check, fixed seeds): the stratified probabilities add back for any
 * weighted sample, the paired difference of any two outcome vectors is the difference of the
 * two estimates with an interval around it, and the knee does not depend on the units of the axes.
 */
import { tableFromArrays } from 'apache-arrow';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { compareDesigns } from '../../src/design/comparison.js';
import { computeDrivers } from '../../src/design/drivers.js';
import { findKnee } from '../../src/design/knee.js';
import { ScenarioFrame } from '../../src/design/scenarioFrame.js';

const row = fc.record({
  hour: fc.integer({ min: 0, max: 8759 }),
  soc: fc.double({ min: 0, max: 1, noNaN: true }),
  deficit: fc.double({ min: -500, max: 2000, noNaN: true }),
  shed: fc.boolean(),
  shutdown: fc.boolean(),
  shutdown2: fc.boolean(),
  // weights within a factor of 1000: far beyond what the sampling plans give (12 p_m for
  // monthly strata), so Kish effective counts reach tiny fractional Clopper-Pearson shapes
  weight: fc.double({ min: 0.01, max: 10, noNaN: true }),
});

function frameOf(
  rows: {
    hour: number;
    soc: number;
    deficit: number;
    shed: boolean;
    shutdown: boolean;
    weight: number;
  }[],
  shutdownKey: 'shutdown' | 'shutdown2' = 'shutdown',
) {
  return new ScenarioFrame(
    tableFromArrays({
      scenario_id: BigInt64Array.from(rows.map((_, i) => BigInt(i))),
      weight: Float64Array.from(rows.map((r) => r.weight)),
      hour_of_year: Int16Array.from(rows.map((r) => r.hour)),
      battery_soc: Float64Array.from(rows.map((r) => r.soc)),
      deficit_kw: Float64Array.from(rows.map((r) => r.deficit)),
      shed_kw: Float64Array.from(rows.map((r) => (r.shed ? 100 : 0))),
      shutdown: rows.map((r) => (r as Record<string, unknown>)[shutdownKey] as boolean),
    }),
    'generated',
  );
}

describe('properties', () => {
  it('stratified conditional probabilities add back to the overall estimate for any weights', () => {
    fc.assert(
      fc.property(fc.array(row, { minLength: 1, maxLength: 120 }), (rows) => {
        const result = computeDrivers(frameOf(rows), { confidenceLevel: 0.95 });
        for (const outcome of ['shutdown', 'load_shed'] as const)
          for (const driver of ['month', 'hour_of_day', 'soc_band', 'deficit_band']) {
            const total = result.rows
              .filter((r) => r.outcome === outcome && r.driver === driver)
              .reduce((s, r) => s + r.weightShare * r.probability, 0);
            // floating sums of at most 120 terms: 1e-12 absolute
            expect(Math.abs(total - result.overall[outcome])).toBeLessThan(1e-12);
          }
      }),
      { seed: 20261201, numRuns: 60 },
    );
  });

  it('the paired difference is the difference of the estimates, inside its interval', () => {
    fc.assert(
      fc.property(fc.array(row, { minLength: 2, maxLength: 150 }), (rows) => {
        const base = frameOf(rows, 'shutdown');
        const variant = frameOf(rows, 'shutdown2');
        const p = (key: 'shutdown' | 'shutdown2') => {
          let sw = 0;
          let swx = 0;
          for (const r of rows) {
            sw += r.weight;
            if ((r as Record<string, unknown>)[key]) swx += r.weight;
          }
          return swx / sw;
        };
        const summary = (est: number) => [
          { metric: 'p_shutdown', estimate: est, ciLow: 0, ciHigh: 1, unit: '1' },
        ];
        const result = compareDesigns({
          base,
          variant,
          baseSummary: summary(p('shutdown')),
          variantSummary: summary(p('shutdown2')),
          baseFailureDefinition: 'shutdown-only',
          variantFailureDefinition: 'shutdown-only',
          baseRatePerYear: 1,
          variantRatePerYear: 1,
          confidenceLevel: 0.95,
          identicalDesigns: false,
        });
        const r = result.rows[0]!;
        expect(Math.abs(r.difference - (p('shutdown2') - p('shutdown')))).toBeLessThan(1e-12);
        expect(r.diffCiLow).toBeLessThanOrEqual(r.difference + 1e-12);
        expect(r.diffCiHigh).toBeGreaterThanOrEqual(r.difference - 1e-12);
        expect(r.diffCiLow).toBeGreaterThanOrEqual(-1);
        expect(r.diffCiHigh).toBeLessThanOrEqual(1);
      }),
      { seed: 7, numRuns: 60 },
    );
  });

  it('the knee does not depend on the units of either axis', () => {
    fc.assert(
      fc.property(
        // integer heights and power-of-two scales keep every scaled coordinate exact, so a tie
        // between two candidate points cannot be broken differently by rounding
        fc.array(fc.integer({ min: 0, max: 1000 }), { minLength: 3, maxLength: 12 }),
        fc.integer({ min: -4, max: 8 }).map((k) => 2 ** k),
        fc.integer({ min: -4, max: 8 }).map((k) => 2 ** k),
        (ys, sx, sy) => {
          const points = ys.map((y, i) => ({ x: i, y }));
          const scaled = ys.map((y, i) => ({ x: 7 + sx * i, y: 3 + sy * y }));
          const a = findKnee(points);
          const b = findKnee(scaled);
          expect(b?.index).toBe(a?.index);
        },
      ),
      { seed: 11, numRuns: 200 },
    );
  });
});
