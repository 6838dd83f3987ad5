// Source: Hairer's ODEX extrapolation solver (odex package; Hairer, Norsett & Wanner, Solving ODEs I, sec. II.9) as an independent oracle.
/**
 * The whole engine (integrator + island assembly) against a general-purpose ODE solver, odex
 * (Hairer's GBS extrapolation method, E. Hairer, S. P. Norsett, G. Wanner, Solving ODEs I,
 * sec. II.9), on the same equations written out by hand here: a first-order-governor genset, a
 * grid-following battery with droop and virtual inertia, and a fuel cell, none reaching a limit.
 */
import { Solver } from 'odex';
import { describe, expect, it } from 'vitest';
import { EventResult } from '../../../src/grid/frequency/event-result.js';
import { compileIsland } from '../../../src/grid/frequency/island.js';
import { simulateEvent } from '../../../src/grid/frequency/simulate.js';
import {
  battery,
  fuelCell,
  genset,
  load,
  makeCase,
  makeScenario,
  RecordingTrace,
} from './fixtures.js';

describe('the engine against odex on the same equations', () => {
  it('gives the same frequency trajectory to 1e-5 Hz', () => {
    const c = makeCase(
      [
        genset('g1', 1000, {
          inertiaS: 3,
          droopPu: 0.05,
          governor: { order: 1, timeConstantS: 0.6 },
        }),
        battery('b1', 300, {
          control: 'grid-following',
          droopPu: 0.02,
          virtualInertiaS: 2,
          responseTimeConstantS: 0.05,
          energyKwh: 1000,
        }),
        fuelCell('fc', 200, { timeConstantS: 5, droopPu: 0.05 }),
      ],
      [load('l1', 'critical', 800, 1)],
    );
    const isl = compileIsland(c);
    const op = makeScenario(c, { dispatchKw: [400, 0, 100] });
    const out = new EventResult(3, 1);
    const trace = new RecordingTrace(0.5);
    simulateEvent(
      isl,
      op,
      { horizonS: 10, rocofWindowS: 0.1, relTol: 1e-8, absTol: 1e-10 },
      out,
      trace,
    );
    expect(out.status).toBe('ok');

    // The hand-written system, pu on 1000 kVA: y = [dw, p_genset, p_battery, p_fuelcell].
    const f = (_t: number, y: number[]) => {
      const [dw, pg, pb, pf] = y as [number, number, number, number];
      const loadPu = 0.8 * (1 + 1 * dw);
      const rocof = (pg + pb + pf - loadPu) / (2 * 3);
      return [
        rocof,
        (0.4 - (1 / 0.05) * dw - pg) / 0.6,
        (0 - (0.3 / 0.02) * dw - 2 * 2 * 0.3 * rocof - pb) / 0.05,
        (0.1 - (0.2 / 0.05) * dw - pf) / 5,
      ];
    };
    const solver = new Solver(4);
    solver.relativeTolerance = 1e-11;
    solver.absoluteTolerance = 1e-12;
    solver.maxSteps = 100000;
    for (const tS of [0.5, 1, 2, 5, 10]) {
      const ref = solver.solve(f, 0, [0, 0.4, 0, 0.1], tS);
      const k = trace.t.findIndex((t) => Math.abs(t - tS) < 1e-9);
      expect(k).toBeGreaterThanOrEqual(0);
      // Engine at relTol 1e-8 / absTol 1e-10 pu: 1e-5 Hz = 1.7e-7 pu leaves a wide margin.
      expect(Math.abs(trace.f[k]! - 60 * (1 + ref.y[0]!))).toBeLessThan(1e-5);
      expect(Math.abs(trace.p[k]![1]! - 1000 * ref.y[2]!)).toBeLessThan(1e-3);
    }
  });
});
