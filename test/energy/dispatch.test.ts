import { describe, expect, it } from 'vitest';
import { dispatchSegment } from '../../src/energy/dispatch.js';
import { buildOutageModel } from '../../src/energy/outage.js';
import { FakeHooks, inventedCase, load } from './fixture.js';

// The merit order of docs/outage-energy.md on one invented island (numbers made up): PV 100,
// wind 50, a 200 kW genset with 30 % minimum loading, a 100 kW grid-forming battery, a 40 kW fuel
// cell. Merit-order dispatch of an isolated system: common practice, no source. Hand-computed
// expectations; tolerance 1e-12 kW (a few additions).
const c = inventedCase(
  [
    {
      id: 'pv',
      bus: 'main',
      kind: 'pv',
      ratingKw: 100,
      resource: { kind: 'parametric', latitudeDeg: 20 },
    },
    {
      id: 'wt',
      bus: 'main',
      kind: 'wind',
      ratingKw: 50,
      resource: { kind: 'parametric', weibullScaleMPerSByMonth: Array(12).fill(7) },
    },
    { id: 'gen', bus: 'main', kind: 'genset', ratingKw: 200, inertiaS: 1, minLoadingFraction: 0.3 },
    { id: 'bess', bus: 'main', kind: 'battery', ratingKw: 100, energyKwh: 400 },
    { id: 'fc', bus: 'main', kind: 'fuelcell', ratingKw: 40 },
  ],
  [load('a', 'critical', 500), load('b', 'essential', 500), load('c', 'sheddable', 500)],
);

function setUp(loadKw: [number, number, number], soc = 0.5, running = [1, 1, 1, 1, 1]) {
  const m = buildOutageModel(c, new FakeHooks(c, 0, () => {}));
  m.hourLoadKw.set(loadKw);
  m.hourAvailableKw.set([100, 50, 200, 100, 40]);
  m.loadCap.fill(1);
  m.running.set(running);
  m.fuelLeft.fill(Number.POSITIVE_INFINITY);
  m.soc[3] = soc;
  dispatchSegment(m);
  return m;
}

describe('the merit order of the outage dispatch', () => {
  it('takes renewables first, then the genset minimum, then the battery', () => {
    const m = setUp([150, 100, 0]); // 250 kW = 150 renewables + 60 genset minimum + 40 battery
    expect(Array.from(m.outKw)).toEqual([100, 50, 60, 40, 0]);
    expect(m.flows.shedKw).toBe(0);
  });

  it('then the genset above its minimum, then the fuel cell, then sheds sheddable load', () => {
    const m = setUp([200, 200, 100]); // 500 kW; supply 150 + 200 + 100 + 40 = 490
    expect(m.outKw[2]).toBeCloseTo(200, 12);
    expect(m.outKw[3]).toBeCloseTo(100, 12);
    expect(m.outKw[4]).toBeCloseTo(40, 12);
    expect(m.tierShedKw[2]).toBeCloseTo(10, 12);
    expect(m.tierShedKw[1]).toBe(0);
    expect(m.tierShedKw[0]).toBe(0);
  });

  it('charges the battery from a surplus and curtails what it cannot take', () => {
    const m = setUp([20, 0, 0]); // 150 + 60 minimum = 210 for 20 kW: battery takes 100, 90 curtailed
    expect(m.outKw[3]).toBeCloseTo(-100, 12);
    expect(m.flows.curtailKw).toBeCloseTo(90, 12);
    expect(m.flows.dumpKw).toBe(0);
    expect(m.outKw[0]! + m.outKw[1]!).toBeCloseTo(60, 12);
  });

  it('dumps the genset minimum when there is no renewable left to curtail', () => {
    const m = setUp([20, 0, 0], 1, [0, 0, 1, 1, 1]); // battery full: 40 kW of the 60 kW minimum dumped
    expect(m.outKw[3]).toBe(0);
    expect(m.flows.dumpKw).toBeCloseTo(40, 12);
    expect(m.flows.gridFormed).toBe(true);
  });

  it('needs a grid-forming source: a battery at its floor only while the rest carries the critical load', () => {
    const atFloor = [1, 1, 0, 1, 0];
    expect(setUp([100, 50, 0], 0.1, atFloor).flows.gridFormed).toBe(true); // 150 renewables
    const short = setUp([200, 0, 0], 0.1, atFloor); // 150 for 200 kW of critical load
    expect(short.flows.gridFormed).toBe(false);
    expect(setUp([200, 0, 0], 0.5, atFloor).flows.gridFormed).toBe(true);
    expect(setUp([10, 0, 0], 0.5, [1, 1, 0, 0, 1]).flows.gridFormed).toBe(false); // PV, wind, fuel cell
  });
});
