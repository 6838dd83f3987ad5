import { describe, expect, it } from 'vitest';
import { buildOutageModel, OutageResult, simulateOutage } from '../../src/energy/outage.js';
import {
  constantConditions,
  FakeEvent,
  FakeHooks,
  inventedCase,
  load,
  scenarioFor,
} from './fixture.js';

// A contingency hands the frequency engine the operating point just before the failure; its
// power balance must close (gridImportKw = 0: sum of dispatch = load served), the failed unit
// flagged. Invented island: two 100 kW gensets, a 50 kW battery, 120 kW of load.
const c = inventedCase(
  [
    { id: 'gA', bus: 'main', kind: 'genset', ratingKw: 100, inertiaS: 1, minLoadingFraction: 0.3 },
    { id: 'gB', bus: 'main', kind: 'genset', ratingKw: 100, inertiaS: 1, minLoadingFraction: 0.3 },
    { id: 'bess', bus: 'main', kind: 'battery', ratingKw: 50, energyKwh: 100, socMinFraction: 0.1 },
  ],
  [load('ward', 'critical', 50), load('shop', 'sheddable', 70)],
);
const cond = constantConditions([50, 70], [100, 100, 50]);

function run(respond?: ConstructorParameters<typeof FakeHooks>[3], ttfA = 5.5, outageH = 12) {
  const hooks = new FakeHooks(c, 0, cond, respond);
  const m = buildOutageModel(c, hooks);
  const sc = scenarioFor(c, 0, outageH, cond);
  sc.timeToFailureH[0] = ttfA;
  const ev = new FakeEvent(3, 2);
  ev.socAtEnd[2] = 0.1; // battery at its floor: the gensets carry the load
  const out = new OutageResult(3, 2);
  simulateOutage(m, sc, ev, out);
  return { out, hooks };
}

describe('a unit failure during the outage', () => {
  it('runs one frequency event from a balanced operating point with the failed unit flagged', () => {
    const { out, hooks } = run();
    expect(out.contingencies).toBe(1);
    expect(hooks.ops.length).toBe(1);
    const op = hooks.ops[0]!;
    expect(op.gridImportKw).toBe(0);
    expect(Array.from(op.trippedAtSeparation)).toEqual([1, 0, 0]);
    expect(Array.from(op.available)).toEqual([1, 1, 1]);
    expect(Array.from(op.running)).toEqual([1, 1, 1]);
    expect(op.dispatchKw[0]).toBeCloseTo(60, 12);
    const dispatch = op.dispatchKw.reduce((a, b) => a + b, 0);
    const served = op.loadKw.reduce((a, b) => a + b, 0);
    expect(dispatch).toBeCloseTo(served, 12);
    expect(served).toBeCloseTo(120, 12);
    expect(op.hourOfYear).toBe(5);
  });

  it('continues on the units left: gB alone carries 100 of 120 kW until the grid returns', () => {
    const { out } = run();
    expect(out.unservedKwh).toBeCloseTo(20 * (12 - 5.5), 9);
    expect(out.criticalLost).toBe(false);
    expect(out.worstContingency).toBe('gA at 5.50 h: ridden through');
  });

  it('keeps the load shed by the event off until the next step, then restores what it can', () => {
    const { out } = run((_op, ev) => {
      ev.shedKw = 70;
      ev.shedKwByTier[2] = 70;
      ev.loadServedFraction[1] = 0;
    });
    // 70 kW off from 5.5 h to 6 h, then 20 kW short (gB alone) from 6 h to 12 h.
    expect(out.unservedKwh).toBeCloseTo(70 * 0.5 + 20 * 6, 9);
    expect(out.worstContingency).toBe('gA at 5.50 h: 70.0 kW shed');
    expect(out.lolH).toBeCloseTo(12 - 5.5, 9);
  });

  it('counts no event for a failure after the grid returned or of a unit not online', () => {
    expect(run(undefined, 13).out.contingencies).toBe(0);
    const hooks = new FakeHooks(c, 0, cond);
    const m = buildOutageModel(c, hooks);
    const sc = scenarioFor(c, 0, 12, cond);
    sc.available[0] = 0;
    sc.timeToFailureH[0] = 2;
    const out = new OutageResult(3, 2);
    simulateOutage(m, sc, new FakeEvent(3, 2), out);
    expect(out.contingencies).toBe(0);
  });
});

describe('the frequency event at separation', () => {
  it('keeps its UFLS shedding until the first step ends, counted over the event too', () => {
    const hooks = new FakeHooks(c, 0, cond);
    const m = buildOutageModel(c, hooks);
    const sc = scenarioFor(c, 0, 3, cond);
    const ev = new FakeEvent(3, 2);
    ev.socAtEnd[2] = 0.1;
    ev.shedKw = 70;
    ev.shedKwByTier[2] = 70;
    ev.loadServedFraction[1] = 0;
    const out = new OutageResult(3, 2);
    simulateOutage(m, sc, ev, out);
    expect(out.unservedKwh).toBeCloseTo(70 * 1, 9); // the event (t0) and the rest of hour 0
    expect(out.lolH).toBeCloseTo(1, 12);
    expect(out.criticalLost).toBe(false);
  });

  it('starts from the pre-separation state when the event failed numerically', () => {
    const m = buildOutageModel(c, new FakeHooks(c, 0, cond));
    const sc = scenarioFor(c, 0, 3, cond);
    sc.socFraction[2] = 0.1;
    const ev = new FakeEvent(3, 2);
    ev.status = 'failed';
    ev.runningAtEnd.fill(0);
    ev.loadServedFraction.fill(0);
    const out = new OutageResult(3, 2);
    simulateOutage(m, sc, ev, out);
    expect(out.shutdown).toBe(false);
    expect(out.unservedKwh).toBe(0);
    expect(out.servedKwh).toBeCloseTo(120 * 3, 9);
  });
});

describe('a failure that leaves no imbalance', () => {
  it('runs no frequency event for PV failing at night', () => {
    const night = inventedCase(
      [
        { id: 'g', bus: 'main', kind: 'genset', ratingKw: 100, inertiaS: 1 },
        {
          id: 'pv',
          bus: 'main',
          kind: 'pv',
          ratingKw: 100,
          resource: { kind: 'parametric', latitudeDeg: 20 },
        },
      ],
      [load('ward', 'critical', 50)],
    );
    const dark = constantConditions([50], [100, 0]);
    const hooks = new FakeHooks(night, 0, dark);
    const sc = scenarioFor(night, 0, 10, dark);
    sc.timeToFailureH[1] = 4;
    const out = new OutageResult(2, 1);
    simulateOutage(buildOutageModel(night, hooks), sc, new FakeEvent(2, 1), out);
    expect(hooks.ops.length).toBe(0);
    expect(out.contingencies).toBe(0);
    expect(out.unservedKwh).toBe(0);
  });
});
