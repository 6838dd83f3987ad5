// Source: Newcombe, Stat Med 17:857-872, 1998 (Table II); Fagerland, Lydersen & Laake, Statistical Analysis of Contingency Tables, 2017, ch. 2; Clopper & Pearson, Biometrika 26:404-413, 1934 (from memory); jstat as an oracle (REFERENCES.md 9.1-9.4).
import fc from 'fast-check';
import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';
import {
  chooseProportionMethod,
  clopperPearsonInterval,
  kishEffectiveSize,
  type ProportionMethod,
  proportionInterval,
  ruleOfThreeUpper,
  weightedProportionInterval,
  wilsonContinuityInterval,
  wilsonInterval,
  zeroEventsUpperBound,
} from '../../src/stats/proportion.js';
import { jStat } from './jstat-oracle.js';

/** Published limits are printed to 4 decimals: |ours - printed| <= 5e-5 (rounding). */
const printed4 = 5e-5 + 1e-12;
function expectLimits(i: { low: number; high: number }, low: number, high: number, tol = printed4) {
  expect(Math.abs(i.low - low)).toBeLessThanOrEqual(tol);
  expect(Math.abs(i.high - high)).toBeLessThanOrEqual(tol);
}

describe('single-proportion intervals against published check values', () => {
  it('13/16: Fagerland, Lydersen & Laake, Statistical Analysis of Contingency Tables (2017), ch. 2', () => {
    // REFERENCES.md 9.3(a): Wilson 0.5699-0.9341, Wilson CC 0.5369-0.9503, CP 0.5435-0.9595.
    expectLimits(wilsonInterval(13, 16, 0.95), 0.5699, 0.9341);
    expectLimits(wilsonContinuityInterval(13, 16, 0.95), 0.5369, 0.9503);
    expectLimits(clopperPearsonInterval(13, 16, 0.95), 0.5435, 0.9595);
  });

  it('Newcombe (1998), Stat Med 17:857-872, Table II examples (REFERENCES.md 9.3(b))', () => {
    const table: [number, number, [number, number], [number, number], [number, number]][] = [
      [81, 263, [0.2553, 0.3662], [0.2535, 0.3682], [0.2527, 0.3676]],
      [15, 148, [0.0624, 0.1605], [0.0598, 0.1644], [0.0578, 0.1617]],
      [0, 20, [0, 0.1611], [0, 0.2005], [0, 0.1684]],
      [1, 29, [0.0061, 0.1718], [0.0018, 0.1963], [0.0009, 0.1776]],
    ];
    for (const [x, n, w, cc, cp] of table) {
      expectLimits(wilsonInterval(x, n, 0.95), ...w);
      expectLimits(wilsonContinuityInterval(x, n, 0.95), ...cc);
      expectLimits(clopperPearsonInterval(x, n, 0.95), ...cp);
    }
  });

  it('Monte-Carlo-sized values (REFERENCES.md 9.3(c), recomputed, printed to 4 significant digits)', () => {
    const sig4 = (v: number) => 5e-4 * v; // half a unit in the 4th significant digit
    const w0 = wilsonInterval(0, 1000, 0.95);
    const cp0 = clopperPearsonInterval(0, 1000, 0.95);
    expect(w0.low).toBe(0);
    expect(Math.abs(w0.high - 0.003827)).toBeLessThan(sig4(0.003827));
    expect(Math.abs(cp0.high - 0.003682)).toBeLessThan(sig4(0.003682));
    expect(Math.abs(zeroEventsUpperBound(1000, 0.95) - 0.002991)).toBeLessThan(sig4(0.002991));
    expect(ruleOfThreeUpper(1000)).toBe(0.003);
    const w5 = wilsonInterval(5, 10000, 0.95);
    const cp5 = clopperPearsonInterval(5, 10000, 0.95);
    expectLimits(w5, 0.000214, 0.00117, sig4(0.00117));
    expectLimits(cp5, 0.000162, 0.001166, sig4(0.001166));
    expectLimits(wilsonInterval(50, 10000, 0.95), 0.003795, 0.006585, sig4(0.006585));
    expectLimits(clopperPearsonInterval(50, 10000, 0.95), 0.003713, 0.006587, sig4(0.006587));
  });

  it('rule of three vs the exact bounds at n = 20 (Hanley & Lippman-Hand 1983; REFERENCES.md 9.4)', () => {
    expect(ruleOfThreeUpper(20)).toBeCloseTo(0.15, 12);
    expect(zeroEventsUpperBound(20, 0.95)).toBeCloseTo(0.1391, 4);
    expect(clopperPearsonInterval(0, 20, 0.95).high).toBeCloseTo(0.1684, 4);
  });

  it('Clopper-Pearson limits are jstat beta quantiles (general-purpose library oracle)', () => {
    // jstat ibetainv is accurate to about 1e-8 relative at these shapes.
    for (const [x, n] of [
      [13, 16],
      [81, 263],
      [1, 29],
      [7, 5000],
    ] as const) {
      const cp = clopperPearsonInterval(x, n, 0.9);
      expect(Math.abs(cp.low / jStat.ibetainv(0.05, x, n - x + 1) - 1)).toBeLessThan(1e-7);
      expect(Math.abs(cp.high / jStat.ibetainv(0.95, x + 1, n - x) - 1)).toBeLessThan(1e-7);
    }
  });
});

describe('the default interval rule', () => {
  it('uses Clopper-Pearson below 5 events or non-events and Wilson otherwise (Newcombe 1998)', () => {
    expect(chooseProportionMethod(0, 1000)).toBe('clopper-pearson');
    expect(chooseProportionMethod(4, 1000)).toBe('clopper-pearson');
    expect(chooseProportionMethod(5, 1000)).toBe('wilson');
    expect(chooseProportionMethod(997, 1000)).toBe('clopper-pearson');
    expect(proportionInterval(3, 100, 0.95)).toEqual(clopperPearsonInterval(3, 100, 0.95));
    expect(proportionInterval(30, 100, 0.95)).toEqual(wilsonInterval(30, 100, 0.95));
  });

  it('covers a known p in 90-99 % of 200 seeded binomial samples (nominal 95 %)', () => {
    // Synthetic check: X ~ Binomial(n, p) with p known; seeded, so the count is deterministic.
    // Binomial sampling error of a 95 % coverage over 200 trials is about 1.5 points.
    const rng = seedrandom.alea('holdfast-coverage-1');
    for (const [p, n] of [
      [0.05, 400],
      [0.3, 150],
      [0.01, 500],
    ] as const) {
      let coveredAuto = 0;
      let coveredWilson = 0;
      for (let rep = 0; rep < 200; rep++) {
        let x = 0;
        for (let i = 0; i < n; i++) if (rng() < p) x++;
        const auto = proportionInterval(x, n, 0.95);
        const w = wilsonInterval(x, n, 0.95);
        if (auto.low <= p && p <= auto.high) coveredAuto++;
        if (w.low <= p && p <= w.high) coveredWilson++;
      }
      expect(coveredAuto / 200).toBeGreaterThanOrEqual(0.9);
      expect(coveredAuto / 200).toBeLessThanOrEqual(0.99);
      expect(coveredWilson / 200).toBeGreaterThanOrEqual(0.9);
      expect(coveredWilson / 200).toBeLessThanOrEqual(0.99);
    }
  });
});

describe('weighted proportions (Kish effective sample size)', () => {
  it('reduce to the plain intervals with equal weights', () => {
    // w = 1: bit-identical; w = 0.37: n_eff = n and x_eff = x up to rounding (1e-12).
    const plain = proportionInterval(13, 16, 0.95);
    const ones = weightedProportionInterval(
      { sumWeights: 16, sumSquaredWeights: 16, sumEventWeights: 13 },
      0.95,
    );
    expect(ones.low).toBe(plain.low);
    expect(ones.high).toBe(plain.high);
    // also at study sizes where n^2 would round (n > 9.4e7)
    const big = weightedProportionInterval(
      { sumWeights: 3e8, sumSquaredWeights: 3e8, sumEventWeights: 12345 },
      0.95,
    );
    expect(big.effectiveSize).toBe(3e8);
    expect(big.low).toBe(wilsonInterval(12345, 3e8, 0.95).low);
    expect(big.high).toBe(wilsonInterval(12345, 3e8, 0.95).high);
    const w = 0.37;
    const scaled = weightedProportionInterval(
      { sumWeights: 16 * w, sumSquaredWeights: 16 * w * w, sumEventWeights: 13 * w },
      0.95,
    );
    expect(scaled.effectiveSize).toBeCloseTo(16, 12);
    expect(scaled.low).toBeCloseTo(plain.low, 12);
    expect(scaled.high).toBeCloseTo(plain.high, 12);
  });

  it('computes p^ = sum w y / sum w and n_eff = (sum w)^2 / sum w^2 (Kish 1965)', () => {
    const weights = [0.5, 0.5, 2, 2, 1, 3];
    const events = [1, 0, 1, 0, 0, 0];
    const sw = weights.reduce((a, b) => a + b);
    const sw2 = weights.reduce((a, b) => a + b * b, 0);
    const swy = weights.reduce((a, b, i) => a + b * events[i]!, 0);
    const r = weightedProportionInterval(
      { sumWeights: sw, sumSquaredWeights: sw2, sumEventWeights: swy },
      0.95,
    );
    expect(r.estimate).toBeCloseTo(2.5 / 9, 15);
    expect(kishEffectiveSize(sw, sw2)).toBeCloseTo(81 / 18.5, 12);
    // few effective events -> Clopper-Pearson at the effective counts
    expect(r.method).toBe('clopper-pearson');
    const cp = clopperPearsonInterval((2.5 / 9) * (81 / 18.5), 81 / 18.5, 0.95);
    expect(r.low).toBeCloseTo(cp.low, 12);
    expect(r.high).toBeCloseTo(cp.high, 12);
  });
});

describe('interval properties (fast-check)', () => {
  const methods: ProportionMethod[] = ['wilson', 'wilson-cc', 'clopper-pearson'];
  const case_ = fc
    .tuple(
      fc.integer({ min: 1, max: 5000 }),
      fc.double({ min: 0, max: 1, noNaN: true }),
      fc.constantFrom(0.8, 0.9, 0.95, 0.99),
    )
    .map(([n, f, level]) => ({ n, x: Math.round(f * n), level }));

  it('contain the estimate and lie in [0, 1]', () => {
    fc.assert(
      fc.property(case_, ({ n, x, level }) => {
        for (const m of methods) {
          const i = proportionInterval(x, n, level, m);
          expect(i.low).toBeGreaterThanOrEqual(0);
          expect(i.high).toBeLessThanOrEqual(1);
          expect(i.low).toBeLessThanOrEqual(i.estimate);
          expect(i.estimate).toBeLessThanOrEqual(i.high);
        }
      }),
      { seed: 11, numRuns: 300 },
    );
  });

  it('narrow as n grows at a fixed proportion (x, n) -> (4x, 4n)', () => {
    fc.assert(
      fc.property(case_, ({ n, x, level }) => {
        for (const m of methods) {
          const a = proportionInterval(x, n, level, m);
          const b = proportionInterval(4 * x, 4 * n, level, m);
          expect(b.high - b.low).toBeLessThan(a.high - a.low);
        }
      }),
      { seed: 12, numRuns: 300 },
    );
  });

  it('widen with the confidence level', () => {
    fc.assert(
      fc.property(case_, ({ n, x }) => {
        for (const m of methods) {
          const a = proportionInterval(x, n, 0.9, m);
          const b = proportionInterval(x, n, 0.99, m);
          expect(b.high - b.low).toBeGreaterThan(a.high - a.low);
        }
      }),
      { seed: 13, numRuns: 200 },
    );
  });
});
