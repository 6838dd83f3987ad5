// Source: Dormand & Prince, J. Comput. Appl. Math. 6:19-26, 1980; Hairer, Norsett & Wanner, Solving ODEs I, sec. II.4-II.6; odex as an oracle.
import { Solver } from 'odex';
import { describe, expect, it } from 'vitest';
import {
  DormandPrince,
  dormandPrinceTableau,
  type OdeSystem,
  type StepControl,
} from '../../src/numeric/dormand-prince.js';

/** y'' = -y as a first-order system; exact solution y = cos t (y(0) = 1, y'(0) = 0). */
class Oscillator implements OdeSystem {
  derivatives(_t: number, y: Float64Array, dy: Float64Array): void {
    dy[0] = y[1]!;
    dy[1] = -y[0]!;
  }
}

/** Van der Pol oscillator, mu = 1 (Hairer, Norsett & Wanner I, sec. I.16). */
class VanDerPol implements OdeSystem {
  derivatives(_t: number, y: Float64Array, dy: Float64Array): void {
    dy[0] = y[1]!;
    dy[1] = (1 - y[0]! * y[0]!) * y[1]! - y[0]!;
  }
}

const tight: StepControl = { relTol: 1e-10, absTol: 1e-12, maxStepS: 1, minStepS: 1e-12 };

function integrate(sys: OdeSystem, y0: number[], tEnd: number, ctl: StepControl, fixedH = 0) {
  const dp = new DormandPrince(y0.length);
  const y = Float64Array.from(y0);
  dp.restart(sys, 0, y, fixedH > 0 ? fixedH : 1e-3);
  while (dp.t1 < tEnd - 1e-12) {
    const outcome = dp.step(
      sys,
      tEnd - dp.t1,
      ctl,
      fixedH > 0 ? Math.min(fixedH, tEnd - dp.t1) : 0,
    );
    if (outcome === 'failed') throw new Error('integration failed');
  }
  return dp;
}

describe('Dormand-Prince 5(4) tableau', () => {
  // Dormand & Prince 1980, table 5.2: consistency conditions of any explicit RK tableau.
  it('has rows of A summing to c, and weights b summing to one, error weights to zero', () => {
    const t = dormandPrinceTableau;
    t.a.forEach((row, i) => {
      const sum = row.reduce((s: number, v: number) => s + v, 0);
      expect(sum).toBeCloseTo(t.c[i]!, 14);
    });
    expect(t.b.reduce((s: number, v: number) => s + v, 0)).toBeCloseTo(1, 14);
    expect(t.e.reduce((s: number, v: number) => s + v, 0)).toBeCloseTo(0, 14);
  });
});

describe('DormandPrince', () => {
  it('integrates the harmonic oscillator to the requested tolerance', () => {
    const dp = integrate(new Oscillator(), [1, 0], 10, tight);
    // Global error ~ tolerance times the number of steps: 1e-8 is generous for 1e-10 per step.
    expect(dp.y1[0]).toBeCloseTo(Math.cos(10), 8);
    expect(dp.y1[1]).toBeCloseTo(-Math.sin(10), 8);
  });

  it('converges with order five under fixed steps (halving h divides the error by ~32)', () => {
    const sys = new Oscillator();
    const errors = [0.2, 0.1, 0.05].map((h) => {
      const dp = integrate(sys, [1, 0], 4, tight, h);
      return Math.abs(dp.y1[0]! - Math.cos(4));
    });
    // HNW I sec. II.4: a method of order p has global error C h^p; log2 ratios near p = 5.
    const p1 = Math.log2(errors[0]! / errors[1]!);
    const p2 = Math.log2(errors[1]! / errors[2]!);
    expect(p1).toBeGreaterThan(4.6);
    expect(p1).toBeLessThan(5.4);
    expect(p2).toBeGreaterThan(4.6);
    expect(p2).toBeLessThan(5.4);
  });

  it('has dense output that matches the solution inside a step to fourth order', () => {
    const sys = new Oscillator();
    const errs = [0.4, 0.2].map((h) => {
      const dp = new DormandPrince(2);
      dp.restart(sys, 0, Float64Array.of(1, 0), h);
      dp.step(sys, h, tight, h);
      return Math.abs(dp.interpolateComponent(0, 0.5) - Math.cos(0.5 * h));
    });
    // HNW I sec. II.6: the continuous extension has order 4, local error O(h^5).
    expect(Math.log2(errs[0]! / errs[1]!)).toBeGreaterThan(4.5);
    const dp = new DormandPrince(2);
    dp.restart(sys, 0, Float64Array.of(1, 0), 0.3);
    dp.step(sys, 0.3, tight, 0.3);
    expect(dp.interpolateComponent(0, 1)).toBeCloseTo(dp.y1[0]!, 15);
    expect(dp.interpolateComponent(0, 0)).toBe(1);
    // Slope of the dense output at the ends equals h f(y) (Hermite conditions).
    expect(dp.interpolateComponentSlope(1, 0) / 0.3).toBeCloseTo(dp.k1[1]!, 12);
    expect(dp.interpolateComponentSlope(1, 1) / 0.3).toBeCloseTo(dp.k7[1]!, 12);
  });

  it('agrees with an independent extrapolation solver (odex, Hairer GBS method) on Van der Pol', () => {
    const ours = integrate(new VanDerPol(), [2, 0], 10, tight);
    const solver = new Solver(2);
    solver.relativeTolerance = 1e-12;
    solver.absoluteTolerance = 1e-12;
    solver.maxSteps = 100000;
    const ref = solver.solve(
      (_x, y) => [y[1]!, (1 - y[0]! * y[0]!) * y[1]! - y[0]!],
      0,
      [2, 0],
      10,
    );
    // Both solvers at ~1e-10..1e-12 tolerance: agreement to 1e-7 absorbs their global errors.
    expect(Math.abs(ours.y1[0]! - ref.y[0]!)).toBeLessThan(1e-7);
    expect(Math.abs(ours.y1[1]! - ref.y[1]!)).toBeLessThan(1e-7);
  });

  it('lands exactly on a requested end point and reports a non-finite state as failed', () => {
    const sys = new Oscillator();
    const dp = integrate(sys, [1, 0], 1.2345, { ...tight, relTol: 1e-6, absTol: 1e-8 });
    expect(dp.t1).toBeCloseTo(1.2345, 12);
    const blowUp: OdeSystem = {
      derivatives(_t, y, dy) {
        dy[0] = y[0]! * y[0]! * 1e300;
      },
    };
    const d2 = new DormandPrince(1);
    d2.restart(blowUp, 0, Float64Array.of(1e10), 1);
    expect(d2.step(blowUp, 1, tight)).toBe('failed');
  });

  it('gives the same steps and values with quadrature components left out of the stage sums', () => {
    // Van der Pol plus two integrals its right-hand side never reads: q0 = int y0 dt and
    // q1 = int y1^2 dt. Stage values of q are never read, so readCount = 2 must reproduce the
    // full computation exactly (same accepted steps, bit-identical state and dense output).
    const sys: OdeSystem = {
      derivatives(_t, y, dy) {
        dy[0] = y[1]!;
        dy[1] = (1 - y[0]! * y[0]!) * y[1]! - y[0]!;
        dy[2] = y[0]!;
        dy[3] = y[1]! * y[1]!;
      },
    };
    const ctl: StepControl = { relTol: 1e-6, absTol: 1e-8, maxStepS: 1, minStepS: 1e-12 };
    const run = (readCount: number) => {
      const dp = new DormandPrince(4, readCount);
      dp.restart(sys, 0, Float64Array.of(2, 0, 0, 0), 1e-3);
      while (dp.t1 < 5 - 1e-12) dp.step(sys, 5 - dp.t1, ctl);
      return dp;
    };
    const full = run(4);
    const quad = run(2);
    expect(quad.steps).toBe(full.steps);
    expect(quad.rejected).toBe(full.rejected);
    expect(Array.from(quad.y1)).toEqual(Array.from(full.y1));
    expect(quad.interpolateComponent(3, 0.37)).toBe(full.interpolateComponent(3, 0.37));
    expect(() => new DormandPrince(2, 3)).toThrow(RangeError);
  });
});
