/**
 * Facts of the trade the model must show (common practice, no source, unless noted).
 */
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
  pv,
  RecordingTrace,
  wind,
} from './fixtures.js';

const gov = { order: 1, timeConstantS: 0.5 } as const;

function run(
  c: ReturnType<typeof makeCase>,
  o: Parameters<typeof makeScenario>[1],
  horizonS = 30,
  dt = 0.01,
) {
  const isl = compileIsland(c);
  const out = new EventResult(c.sources.length, c.loads.length);
  const trace = new RecordingTrace(dt);
  simulateEvent(
    isl,
    makeScenario(c, o),
    { horizonS, rocofWindowS: 0.1, relTol: 1e-7, absTol: 1e-9 },
    out,
    trace,
  );
  return { out, trace };
}

describe('facts of the trade', () => {
  it('PV at maximum power point adds no upward power; curtailed PV with headroom does (common practice, no source; IEEE 1547-2018 frequency-watt, REFERENCES.md 2.6)', () => {
    const mk = (operation: 'mppt' | 'curtailed') =>
      makeCase(
        [
          genset('g1', 1000, { governor: gov }),
          pv('pv1', 500, { operation, headroomFraction: 0.2 }),
        ],
        [load('l1', 'critical', 900)],
      );
    const mppt = run(mk('mppt'), { dispatchKw: [400, 300], availableKw: [1000, 300] });
    expect(mppt.out.nadirHz).toBeLessThan(60 - 0.036);
    expect(Math.max(...mppt.trace.p.map((p) => p[1]!))).toBeLessThanOrEqual(300 + 1e-9);
    const curtailed = run(mk('curtailed'), { dispatchKw: [400, 300], availableKw: [1000, 375] });
    expect(Math.max(...curtailed.trace.p.map((p) => p[1]!))).toBeGreaterThan(310);
    expect(Math.max(...curtailed.trace.p.map((p) => p[1]!))).toBeLessThanOrEqual(375 + 1e-9);
  });

  it('wind synthetic inertia ends within tens of seconds and a recovery dip follows (common practice, no source; mechanism as in Kang et al., Energies 2025)', () => {
    const c = makeCase(
      [
        genset('g1', 1000, { governor: gov }),
        wind('w1', 900, {
          rotorInertiaS: 4.5,
          syntheticInertia: {
            rocofGainPuPerHzPerS: 0.08,
            droopGainPuPerHz: 0.3,
            capFraction: 0.1,
            deadbandHz: 0.1,
          },
          minRotorSpeedPu: 0.7,
          recoveryTimeS: 25,
        }),
      ],
      [load('l1', 'critical', 900)],
    );
    const { out, trace } = run(c, { dispatchKw: [400, 300] }, 60, 0.1);
    expect(out.status).toBe('ok');
    const pw = trace.p.map((p) => p[1]!);
    // Support up to the 10 % cap (90 kW) above the pre-event 300 kW ...
    expect(Math.max(...pw)).toBeGreaterThan(300 + 85);
    expect(Math.max(...pw)).toBeLessThanOrEqual(300 + 90 + 1e-9);
    // ... ending within tens of seconds, then output below the pre-event value (the dip).
    const kDip = pw.findIndex((p) => p < 300 - 10);
    expect(kDip).toBeGreaterThan(0);
    expect(trace.t[kDip]!).toBeGreaterThan(5);
    expect(trace.t[kDip]!).toBeLessThan(40);
  });

  it('a fuel cell of the same rating as a battery arrests a deficit far worse (common practice, no source)', () => {
    const mk = (second: ReturnType<typeof fuelCell>) =>
      makeCase(
        [genset('g1', 600, { inertiaS: 1, governor: gov }), second],
        [load('l1', 'critical', 700)],
      );
    const withFc = run(
      mk(fuelCell('x', 400, { timeConstantS: 5 })),
      { dispatchKw: [300, 200] },
      20,
    );
    const withBattery = run(
      mk(battery('x', 400, { control: 'grid-following', energyKwh: 400 })),
      { dispatchKw: [300, 200] },
      20,
    );
    const devFc = 60 - withFc.out.nadirHz;
    const devBattery = 60 - withBattery.out.nadirHz;
    expect(devFc).toBeGreaterThan(2 * devBattery);
  });

  it('a battery responds within tens of milliseconds, a genset governor in hundreds (common practice, no source)', () => {
    const mk = (control: 'grid-forming' | 'grid-following') =>
      makeCase(
        [
          genset('g1', 1000, { governor: gov }),
          battery('b1', 400, {
            control,
            energyKwh: 400,
            responseTimeConstantS: 0.05,
            virtualInertiaS: 1,
          }),
        ],
        [load('l1', 'critical', 700)],
      );
    // Grid-forming: its inertial share of the 200 kW deficit at once, (H_b S_b)/(sum H S) with
    // H_b = 1 + 0.05/(2*0.02) = 2.25 s on 400 kVA against the genset's 2 s on 1000 kVA.
    const gf = run(mk('grid-forming'), { dispatchKw: [500, 0] }, 2, 0.001);
    expect(gf.trace.p[1]![1]!).toBeGreaterThan(0.9 * 200 * (900 / 2900));
    // Grid-following: its virtual-inertia reference acts through the 50 ms lag: most of it within
    // 3 time constants (150 ms), while the genset (Tg 0.5 s) has then moved far less.
    const gfl = run(mk('grid-following'), { dispatchKw: [500, 0] }, 2, 0.001);
    const k150 = gfl.trace.t.findIndex((t) => t >= 0.15 - 1e-9);
    const batteryKw = gfl.trace.p[k150]![1]!;
    const gensetKw = gfl.trace.p[k150]![0]! - 500;
    expect(batteryKw).toBeGreaterThan(2 * gensetKw);
    expect(batteryKw).toBeGreaterThan(50);
  });

  it('a second-order gas unit overshoots its settled output (common practice, no source)', () => {
    const mk = (governor: object) =>
      makeCase(
        [
          genset('g1', 1000, { fuel: 'gas', governor }),
          battery('b', 300, { droopPu: 0.02, energyKwh: 300 }),
        ],
        [load('l1', 'critical', 600)],
      );
    const second = run(
      mk({ order: 2, naturalFrequencyRadPerS: 2, dampingRatio: 0.3 }),
      { dispatchKw: [400, 0] },
      60,
      0.05,
    );
    const first = run(mk({ order: 1, timeConstantS: 0.4 }), { dispatchKw: [400, 0] }, 60, 0.05);
    expect(second.out.status).toBe('ok');
    // Both settle on the same droop share (steady state does not depend on the governor's lag).
    const settled = first.out.outputKwAtEnd[0]!;
    expect(second.out.outputKwAtEnd[0]!).toBeCloseTo(settled, 0);
    const peak = (r: typeof first) => Math.max(...r.trace.p.map((p) => p[0]!)) - 400;
    expect(peak(second)).toBeGreaterThan(1.3 * (settled - 400));
    expect(peak(first)).toBeLessThan(1.1 * (settled - 400));
  });

  it('an exporting island goes over-frequency and its PV curtails by the 1547 droop (REFERENCES.md 2.6)', () => {
    const c = makeCase(
      [genset('g1', 1000, { governor: gov }), pv('pv1', 500)],
      [load('l1', 'critical', 500)],
    );
    const { out } = run(c, { dispatchKw: [400, 400] }, 60);
    expect(out.deficitKw).toBeCloseTo(-300, 9);
    expect(out.zenithHz).toBeGreaterThan(60.036);
    expect(out.outputKwAtEnd[1]!).toBeLessThan(400);
    // Settled: the genset droop (20 pu), the load damping (0.5 pu) and the PV droop beyond its
    // deadband (0.5/0.05 = 10 pu) share the 0.3 pu surplus: dw = (0.3 + 10 db) / 30.5.
    const db = 0.036 / 60;
    expect(out.fSettledHz - 60).toBeCloseTo(((0.3 + 10 * db) / 30.5) * 60, 4);
  });
});

describe('quasi-steady grid-following lags', () => {
  it('change the nadir only slightly when the lag is far faster than the island (singular perturbation)', () => {
    const c = makeCase(
      [
        genset('g1', 1000, { governor: gov }),
        battery('b1', 300, {
          control: 'grid-following',
          responseTimeConstantS: 0.02,
          virtualInertiaS: 1,
        }),
      ],
      [load('l1', 'critical', 700)],
    );
    const isl = compileIsland(c);
    const op = makeScenario(c, { dispatchKw: [500, 0] });
    const full = new EventResult(2, 1);
    const qss = new EventResult(2, 1);
    const o = { horizonS: 30, rocofWindowS: 0.1, relTol: 1e-8, absTol: 1e-10 };
    simulateEvent(isl, op, o, full);
    simulateEvent(isl, op, { ...o, quasiSteadyLagS: 0.05 }, qss);
    // Singular perturbation: dropping a lag T changes the response by O(T / t_nadir) of the
    // lagged unit's share, here 20 ms / ~0.6 s = 3 % of the dip at most (measured: ~1 %).
    const dip = 60 - full.nadirHz;
    expect(Math.abs(qss.nadirHz - full.nadirHz)).toBeLessThan(0.03 * dip);
    expect(qss.rhsEvaluations).toBeLessThan(full.rhsEvaluations);
    expect(qss.fSettledHz).toBeCloseTo(full.fSettledHz, 6);
  });
});
