/**
 * Protection, shedding, shutdown and start-up events: located in time, applied in order.
 */
import { describe, expect, it } from 'vitest';
import { CaseError } from '../../../src/errors.js';
import { EventResult } from '../../../src/grid/frequency/event-result.js';
import { compileIsland } from '../../../src/grid/frequency/island.js';
import { simulateEvent } from '../../../src/grid/frequency/simulate.js';
import { battery, genset, load, makeCase, makeScenario, pv, RecordingTrace } from './fixtures.js';

const gov = { order: 1, timeConstantS: 0.5 } as const;
/** A governor so slow it is frozen for the first seconds: the swing equation alone. */
const frozen = { order: 1, timeConstantS: 1e6 } as const;

function run(
  c: ReturnType<typeof makeCase>,
  o: Parameters<typeof makeScenario>[1],
  horizonS = 20,
  trace?: RecordingTrace,
) {
  const isl = compileIsland(c);
  const out = new EventResult(c.sources.length, c.loads.length);
  simulateEvent(isl, makeScenario(c, o), { horizonS, rocofWindowS: 0.1 }, out, trace);
  return out;
}

describe('under-frequency load shedding', () => {
  it('opens a stage exactly pickup + breaker time after the threshold crossing, sheddable load first, critical never', () => {
    // Swing equation with D = 0 and a frozen governor: f(t) = 60 - dP f0 t / (2H), a straight
    // line (Kundur 1994 sec. 11.1), so the crossing of 59.3 Hz is at t = 0.7 / 0.75 s.
    const c = makeCase(
      [genset('g1', 1000, { inertiaS: 4, governor: frozen })],
      [
        load('crit', 'critical', 300, 0),
        load('ess', 'essential', 300, 0),
        load('shed', 'sheddable', 100, 0),
      ],
      {
        protection: {
          ufls: [{ thresholdHz: 59.3, pickupDelayS: 0.1, breakerTimeS: 0.05, shareOfLoad: 0.25 }],
          shutdownUnderFrequencyHz: 50,
          shutdownDelayS: 0.5,
        },
      },
    );
    const out = run(c, { dispatchKw: [600] }, 3);
    const tCross = 0.7 / 0.75; // RoCoF 0.1 pu * 60 Hz / (2 * 4 s) = 0.75 Hz/s
    // Event location on the dense output to 1e-9 s; the frozen governor moves f by < 1e-6 Hz.
    expect(out.firstShedTimeS).toBeCloseTo(tCross + 0.15, 6);
    expect(out.shedStages).toBe(1);
    // 25 % of the 400 kW non-critical load: the 100 kW sheddable load, then 0 from essential.
    expect(out.shedKw).toBeCloseTo(100, 9);
    expect(out.shedKwByTier[2]).toBeCloseTo(100, 9);
    expect(out.shedKwByTier[0]).toBe(0);
    expect(out.loadServedFraction[2]).toBeCloseTo(0, 12);
    expect(out.loadServedFraction[0]).toBe(1);
  });

  it('does not shed when frequency recovers before the pickup delay ends', () => {
    const c = makeCase(
      [genset('g1', 1000, { inertiaS: 2, governor: gov })],
      [load('l', 'sheddable', 700)],
      {
        protection: {
          ufls: [{ thresholdHz: 59.8, pickupDelayS: 30, breakerTimeS: 0.05, shareOfLoad: 0.5 }],
          shutdownDelayS: 0.5,
        },
      },
    );
    // A 50 kW deficit: the nadir dips below 59.8 Hz, droop settles at -0.05/21 pu = -0.14 Hz,
    // back above the threshold long before the 30 s pickup delay ends.
    const out = run(c, { dispatchKw: [550], loadKw: [600] }, 40);
    expect(out.nadirHz).toBeLessThan(59.8);
    expect(out.fSettledHz).toBeGreaterThan(59.8);
    expect(out.shedStages).toBe(0);
  });
});

describe('shutdown', () => {
  it('shuts down on under-frequency after its delay and stops there', () => {
    const c = makeCase(
      [genset('g1', 500, { inertiaS: 1, governor: gov })],
      [load('l', 'critical', 900)],
    );
    const out = run(c, { dispatchKw: [300] }, 20);
    expect(out.status).toBe('shutdown');
    expect(out.shutdown).toBe(true);
    expect(out.shutdownCause).toBe('under-frequency');
    expect(out.endTimeS).toBeLessThan(5);
    expect(Number.isFinite(out.nadirHz)).toBe(true);
    expect(out.nadirHz).toBeLessThan(57);
  });

  it('shuts down at once when no grid-forming source is left after separation', () => {
    const c = makeCase(
      [genset('g1', 500, { governor: gov }), pv('pv', 300)],
      [load('l', 'critical', 400)],
    );
    const out = run(c, { dispatchKw: [200, 200], tripped: [1, 0] });
    expect(out.shutdownCause).toBe('no grid-forming source');
    expect(out.endTimeS).toBe(0);
    expect(out.tripped[0]).toBe(1);
    expect(out.unitsTripped).toBe(1);
  });

  it('shuts down when the grid-forming battery runs out', () => {
    // 1 kWh battery at 12 % with a 10 % minimum: 72 kJ usable against a 200 kW deficit.
    const c = makeCase(
      [battery('b', 500, { energyKwh: 1, socMinFraction: 0.1 }), pv('pv', 300)],
      [load('l', 'critical', 400)],
    );
    const out = run(c, { dispatchKw: [0, 200], soc: 0.12 }, 10);
    expect(out.shutdownCause).toBe('battery exhausted');
    // About 72 kJ / 200 kW = 0.36 s, a little later as the load damping eases the draw.
    expect(out.endTimeS).toBeGreaterThan(0.3);
    expect(out.endTimeS).toBeLessThan(0.5);
    expect(out.socAtEnd[0]).toBeCloseTo(0.1, 6);
  });

  it('shuts down when the only grid-forming unit is overloaded', () => {
    const c = makeCase([battery('b', 100, { energyKwh: 500 })], [load('l', 'critical', 400)]);
    const out = run(c, { dispatchKw: [0] });
    expect(out.shutdownCause).toBe('grid-forming overload');
  });
});

describe('unit trips and standby starts', () => {
  it('trips an inverter on the IEEE 1547-2018 Table 18 UF2 default (56.5 Hz, 0.16 s)', () => {
    const c = makeCase(
      [genset('g1', 1000, { inertiaS: 4, governor: frozen }), pv('pv', 200)],
      [load('l', 'critical', 900, 0)],
      { protection: { ufls: [], shutdownUnderFrequencyHz: 40, shutdownDelayS: 0.5 } },
    );
    const trace = new RecordingTrace(0.001);
    const out = run(c, { dispatchKw: [500, 200] }, 1.5, trace);
    // RoCoF 0.2 * 60 / 8 = 1.5 Hz/s: 56.5 Hz at 3.5 / 1.5 = 2.333 s, trip 0.16 s later (2.49 s).
    expect(out.tripped[1]).toBe(0);
    const out2 = run(c, { dispatchKw: [500, 200] }, 3);
    expect(out2.tripped[1]).toBe(1);
    // After the trip the PV gives nothing.
    expect(out2.outputKwAtEnd[1]).toBe(0);
  });

  it('starts a standby genset after its start delay unless it fails to start', () => {
    const c = makeCase(
      [
        genset('g1', 1000, { governor: gov }),
        genset('g2', 500, { governor: gov, operation: 'standby', startDelayS: 10 }),
      ],
      [load('l', 'critical', 700)],
    );
    const trace = new RecordingTrace(0.5);
    const ok = run(c, { dispatchKw: [500, 0] }, 20, trace);
    const k9 = trace.t.findIndex((t) => t >= 9.5);
    const k12 = trace.t.findIndex((t) => t >= 12);
    expect(trace.p[k9]![1]).toBe(0);
    expect(trace.p[k12]![1]!).toBeGreaterThan(10);
    expect(ok.runningAtEnd[1]).toBe(1);
    // Both units on droop: the settled frequency is closer to nominal with the second unit.
    const failed = run(c, { dispatchKw: [500, 0], failsToStart: [0, 1] }, 20);
    expect(failed.runningAtEnd[1]).toBe(0);
    expect(ok.fSettledHz).toBeGreaterThan(failed.fSettledHz);
  });

  it('holds a source at zero during momentary cessation, then lets it return', () => {
    const c = makeCase(
      [genset('g1', 1000, { governor: gov }), pv('pv', 300)],
      [load('l', 'critical', 700)],
    );
    const trace = new RecordingTrace(0.1);
    const out = run(c, { dispatchKw: [400, 200], cessationS: [0, 1] }, 30, trace);
    expect(out.deficitKw).toBeCloseTo(300, 9);
    expect(trace.p[5]![1]).toBe(0);
    expect(out.outputKwAtEnd[1]!).toBeCloseTo(200, 0);
  });
});

describe('compileIsland', () => {
  it('applies IEEE 1547-2018 Table 18 defaults to inverters, scaled by f0/60 at 50 Hz', () => {
    for (const f0 of [60, 50] as const) {
      const c = makeCase([genset('g1', 1000), pv('pv', 100)], [load('l', 'critical', 500)], {
        frequencyHz: f0,
      });
      const isl = compileIsland(c);
      const levels: number[] = [];
      const delays: number[] = [];
      for (let k = 0; k < isl.monitorCount; k++)
        if (isl.monTarget[k] === 1 && isl.monAction[k] === 0) {
          levels.push(f0 * (1 + isl.monLevel[k]!));
          delays.push(isl.monDelayS[k]!);
        }
      const s = f0 / 60;
      expect(levels.map((v) => Number(v.toFixed(9)))).toEqual(
        [56.5, 58.5, 62, 61.2].map((v) => Number((v * s).toFixed(9))),
      );
      expect(delays).toEqual([0.16, 300, 0.16, 300]);
    }
  });

  it('rejects an island with no grid-forming source, naming the field', () => {
    const c = makeCase(
      [pv('pv', 100), battery('b', 100, { control: 'grid-following' })],
      [load('l', 'critical', 50)],
    );
    expect(() => compileIsland(c)).toThrow(CaseError);
    try {
      compileIsland(c);
    } catch (e) {
      expect((e as CaseError).problems[0]!.path).toBe('/sources');
      expect((e as CaseError).problems[0]!.message).toMatch(/grid-forming/);
    }
  });
});

describe('reuse', () => {
  it('gives bit-identical results for the same scenario whatever ran before (no state leaks)', () => {
    const c = makeCase(
      [genset('g1', 1000, { governor: gov }), battery('b', 300), pv('pv', 300)],
      [load('l', 'critical', 500), load('s', 'sheddable', 300)],
      {
        protection: {
          ufls: [{ thresholdHz: 59.5, pickupDelayS: 0.1, breakerTimeS: 0.05, shareOfLoad: 0.5 }],
          shutdownDelayS: 0.5,
        },
      },
    );
    const isl = compileIsland(c);
    const a = makeScenario(c, { dispatchKw: [300, 0, 250] });
    const b = makeScenario(c, { dispatchKw: [700, 100, 0], cessationS: [0, 0, 2] });
    const o = { horizonS: 20, rocofWindowS: 0.1 };
    const r1 = new EventResult(3, 2);
    const r2 = new EventResult(3, 2);
    simulateEvent(isl, a, o, r1);
    simulateEvent(isl, b, o, r2);
    simulateEvent(isl, a, o, r2);
    expect(r2).toEqual(r1);
  });
});

describe('a run that cannot be integrated', () => {
  it("ends as 'failed' with a reason and no NaN anywhere in the result", () => {
    const c = makeCase(
      [genset('g1', 1000, { governor: gov }), pv('pv', 300)],
      [load('l', 'critical', 700)],
    );
    const isl = compileIsland(c);
    const op = makeScenario(c, { dispatchKw: [400, Number.NaN] });
    const out = new EventResult(2, 1);
    simulateEvent(isl, op, { horizonS: 10, rocofWindowS: 0.1 }, out);
    expect(out.status).toBe('failed');
    expect(out.message).toMatch(/integration failed/);
    for (const v of [
      out.deficitKw,
      out.nadirHz,
      out.zenithHz,
      out.fSettledHz,
      out.rocofMaxHzPerS,
      out.shedKw,
    ])
      expect(Number.isFinite(v)).toBe(true);
    for (const arr of [
      out.outputKwAtEnd,
      out.socAtEnd,
      out.energyDeliveredKwh,
      out.loadServedFraction,
    ])
      for (const v of arr) expect(Number.isFinite(v)).toBe(true);
  });
});
