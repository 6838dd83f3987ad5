import { describe, expect, it } from 'vitest';
import {
  mcnemarTest,
  newcombePairedDifference,
  pairedMeanDifference,
  scaleTableToEffectiveSize,
} from '../../src/stats/paired.js';
import { jStat } from './jstat-oracle.js';

/** Check values are printed to 4 decimals: half a unit of the last digit. */
const printed4 = 5e-5 + 1e-12;

describe('Newcombe square-and-add interval for a paired difference (method 10)', () => {
  it('reproduces Cavo et al. (2012) [[59, 6], [16, 80]] -> -0.0621 (-0.1186, -0.0046)', () => {
    // REFERENCES.md 9.5, confirmed (quoted by a third party); Newcombe, Stat Med 17:2635-2650, 1998.
    const r = newcombePairedDifference(
      { both: 59, firstOnly: 6, secondOnly: 16, neither: 80 },
      0.95,
    );
    expect(Math.abs(r.estimate - -0.0621)).toBeLessThan(printed4);
    expect(Math.abs(r.low - -0.1186)).toBeLessThan(printed4);
    expect(Math.abs(r.high - -0.0046)).toBeLessThan(printed4);
  });

  it("reproduces Newcombe's (1998b) example (36, 12, 2, 0) -> 0.200 (0.0569, 0.3404)", () => {
    // REFERENCES.md 9.5: from memory, recomputed identical.
    const r = newcombePairedDifference(
      { both: 36, firstOnly: 12, secondOnly: 2, neither: 0 },
      0.95,
    );
    expect(r.estimate).toBeCloseTo(0.2, 14);
    expect(Math.abs(r.low - 0.0569)).toBeLessThan(printed4);
    expect(Math.abs(r.high - 0.3404)).toBeLessThan(printed4);
  });

  it('reproduces the recomputed Bentur et al. (2009) table [[1, 1], [7, 12]] -> -0.2857 (-0.5069, -0.0256)', () => {
    // REFERENCES.md 9.5: recomputed, not checked against a publication.
    const r = newcombePairedDifference({ both: 1, firstOnly: 1, secondOnly: 7, neither: 12 }, 0.95);
    expect(Math.abs(r.low - -0.5069)).toBeLessThan(printed4);
    expect(Math.abs(r.high - -0.0256)).toBeLessThan(printed4);
  });

  it('changes sign with the order of the designs', () => {
    const a = newcombePairedDifference(
      { both: 59, firstOnly: 6, secondOnly: 16, neither: 80 },
      0.95,
    );
    const b = newcombePairedDifference(
      { both: 59, firstOnly: 16, secondOnly: 6, neither: 80 },
      0.95,
    );
    expect(b.estimate).toBeCloseTo(-a.estimate, 15);
    expect(b.low).toBeCloseTo(-a.high, 15);
    expect(b.high).toBeCloseTo(-a.low, 15);
  });
});

describe("McNemar's test", () => {
  it('gives Z = -2.132, P = 0.0330 and exact conditional P = 0.0525 on [[59, 6], [16, 80]] (REFERENCES.md 9.5)', () => {
    const r = mcnemarTest(6, 16);
    expect(r.z).toBeCloseTo(-2.132, 3);
    expect(r.pAsymptotic).toBeCloseTo(0.033, 4);
    expect(r.pExact).toBeCloseTo(0.0525, 4);
    // exact: 2 P(X <= 6), X ~ Bin(22, 1/2) = 2 sum_k<=6 C(22, k) / 2^22, integer arithmetic
    let c = 1;
    let sum = 1;
    for (let k = 1; k <= 6; k++) {
      c = (c * (22 - k + 1)) / k;
      sum += c;
    }
    expect(Math.abs(r.pExact / ((2 * sum) / 2 ** 22) - 1)).toBeLessThan(1e-13);
    // and the general-purpose library agrees to its own accuracy (about 1e-9)
    expect(r.pExact).toBeCloseTo(2 * jStat.binomial.cdf(6, 22, 0.5), 9);
  });

  it('gives P = 1 without discordant pairs', () => {
    expect(mcnemarTest(0, 0)).toEqual({ z: 0, pAsymptotic: 1, pExact: 1 });
    expect(mcnemarTest(3, 3).pExact).toBe(1);
  });
});

describe('paired differences of means and weighted tables', () => {
  it('gives exactly zero with zero width when both designs give the same values', () => {
    const y = [0, 3, 0, 7.5, 1];
    const r = pairedMeanDifference(y, y, 0.95);
    expect(r.estimate).toBe(0);
    expect(r.low).toBe(0);
    expect(r.high).toBe(0);
  });

  it('is much narrower than the unpaired interval when the designs are correlated (common random numbers)', () => {
    // Designs differing by a small shift on top of a large common scenario effect.
    const base = Array.from({ length: 200 }, (_, i) => 50 + 40 * Math.sin(i * 1.7));
    const variant = base.map((v, i) => v - 1 - 0.1 * Math.cos(i));
    const paired = pairedMeanDifference(base, variant, 0.95);
    const sd = (xs: number[]) => {
      const m = xs.reduce((a, b) => a + b) / xs.length;
      return Math.sqrt(xs.reduce((a, x) => a + (x - m) ** 2, 0) / (xs.length - 1));
    };
    const unpairedHalf = 1.96 * Math.sqrt((sd(base) ** 2 + sd(variant) ** 2) / 200);
    expect((paired.high - paired.low) / 2).toBeLessThan(unpairedHalf / 50);
  });

  it('scales weighted cells to Kish effective size and keeps equal weights unchanged', () => {
    const t = scaleTableToEffectiveSize({ both: 2, firstOnly: 1, secondOnly: 3, neither: 4 }, 10);
    expect(t).toEqual({ both: 2, firstOnly: 1, secondOnly: 3, neither: 4 });
  });
});
