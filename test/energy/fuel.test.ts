import { describe, expect, it } from 'vitest';
import { buildOutageModel, OutageResult, simulateOutage } from '../../src/energy/outage.js';
import { FakeEvent, FakeHooks, inventedCase, load, scenarioFor } from './fixture.js';

/**
 * Willans line: fuel rate linear in output, F(P) = F0 + (F1 - F0) P / Pr (Willans' engine
 * trials, 1888; the linear fuel curve of engine-generator sets in Heywood, Internal Combustion
 * Engine Fundamentals, 1988, from memory). The expected litres below are that formula summed
 * by hand over a known load profile, independent of the code's segment loop.
 */
const ratingKw = 100;
const f0 = 3; // L/h at no load (invented)
const f1 = 30; // L/h at rating (invented)
const willans = (pKw: number) => f0 + ((f1 - f0) * pKw) / ratingKw;

function gensetIsland(fuelTankL?: number) {
  return inventedCase(
    [
      {
        id: 'g1',
        bus: 'main',
        kind: 'genset',
        ratingKw,
        inertiaS: 1,
        minLoadingFraction: 0.3,
        fuelNoLoadLPerH: f0,
        fuelFullLoadLPerH: f1,
        ...(fuelTankL === undefined ? {} : { fuelTankL }),
      },
    ],
    [load('plant', 'critical', 100)],
  );
}

describe('genset fuel over an outage', () => {
  it('burns the Willans-line fuel of a known hourly load profile, held at minimum loading', () => {
    const c = gensetIsland();
    const profileKw = [60, 50, 80, 20]; // hour 0 (the event hour), 1, 2, 3
    const cond = (h: number, outLoad: Float64Array, outAvail: Float64Array) => {
      outLoad[0] = profileKw[h] ?? 0;
      outAvail[0] = ratingKw;
    };
    const hooks = new FakeHooks(c, 8758, cond);
    const m = buildOutageModel(c, hooks);
    const sc = scenarioFor(c, 8758, 4, cond); // runs over the year's end: hours wrap to 0, 1
    const out = new OutageResult(1, 1);
    simulateOutage(m, sc, new FakeEvent(1, 1), out);
    const t0H = 60 / 3600;
    // Hour 3 is below the 30 kW minimum: the set runs at 30 kW and 10 kW go to the dump.
    const expectedL = willans(60) * (1 - t0H) + willans(50) + willans(80) + willans(30);
    expect(out.fuelUsedL).toBeCloseTo(expectedL, 9);
    expect(out.curtailedKwh).toBeCloseTo(10, 9);
    expect(out.unservedKwh).toBe(0);
    expect(out.criticalLost).toBe(false);
    expect(out.energyBalanceError).toBeLessThan(1e-9);
  });

  it('stops the set when the tank runs dry: tank / F(P) hours, then the island shuts down', () => {
    const c = gensetIsland(10);
    const cond = (_h: number, outLoad: Float64Array, outAvail: Float64Array) => {
      outLoad[0] = 50;
      outAvail[0] = ratingKw;
    };
    const m = buildOutageModel(c, new FakeHooks(c, 0, cond));
    const sc = scenarioFor(c, 0, 24, cond);
    const out = new OutageResult(1, 1);
    simulateOutage(m, sc, new FakeEvent(1, 1), out);
    const dryH = 60 / 3600 + 10 / willans(50);
    expect(out.fuelUsedL).toBeCloseTo(10, 9);
    expect(out.shutdown).toBe(true);
    expect(out.shutdownHour).toBeCloseTo(dryH, 9);
    expect(out.survivedH).toBeCloseTo(dryH, 9);
    expect(out.unservedCriticalKwh).toBeCloseTo(50 * (24 - dryH), 6);
  });

  it('burns the no-load fuel F0 of a set idling at zero output, down to a dry tank', () => {
    const c = inventedCase(
      [
        {
          id: 'g1',
          bus: 'main',
          kind: 'genset',
          ratingKw,
          inertiaS: 1,
          minLoadingFraction: 0,
          fuelNoLoadLPerH: f0,
          fuelFullLoadLPerH: f1,
          fuelTankL: 6,
        },
      ],
      [load('plant', 'sheddable', 100)],
    );
    const cond = (_h: number, outLoad: Float64Array, outAvail: Float64Array) => {
      outLoad[0] = 0;
      outAvail[0] = ratingKw;
    };
    const m = buildOutageModel(c, new FakeHooks(c, 0, cond));
    const out = new OutageResult(1, 1);
    simulateOutage(m, scenarioFor(c, 0, 5, cond), new FakeEvent(1, 1), out);
    expect(out.fuelUsedL).toBeCloseTo(6, 12); // F0 = 3 L/h: dry 2 h after the event
    expect(out.shutdownHour).toBeCloseTo(60 / 3600 + 6 / f0, 12);
  });

  it('rejects a tank without a fuel curve, naming the field', () => {
    expect(() =>
      buildOutageModel(
        inventedCase(
          [{ id: 'g1', bus: 'main', kind: 'genset', ratingKw, inertiaS: 1, fuelTankL: 100 }],
          [load('plant', 'critical', 100)],
        ),
        new FakeHooks(gensetIsland(), 0, () => {}),
      ),
    ).toThrow(/\/sources\/0\/fuelNoLoadLPerH: expected a number/);
  });
});
