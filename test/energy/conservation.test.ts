import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { buildOutageModel, OutageResult, simulateOutage } from '../../src/energy/outage.js';
import { FakeEvent, FakeHooks, inventedCase, load, scenarioFor } from './fixture.js';

/**
 * Invariants of the energy balance over random invented islands (fast-check, fixed seed):
 * - conservation every segment: sources = served + charging + curtailment + losses, to 1e-9
 *   relative (first law; the acceptance figure);
 * - served + unserved = the demand integrated over the outage, computed here independently from
 *   the hourly conditions (tolerance 1e-9 relative: sums of a few hundred products);
 * - bounds: 0 <= survivedH <= outageH, lolH <= outageH, SoC within its window, unserved critical
 *   <= unserved.
 */
/** Uniform on [min, max] in a million steps (fc.double favours extremes such as subnormals). */
const num = (min: number, max: number) =>
  fc.integer({ min: 0, max: 1_000_000 }).map((k) => min + ((max - min) * k) / 1_000_000);

const islandArb = fc.record({
  gensetKw: num(20, 400),
  gensetMin: num(0, 0.5),
  tankL: fc.option(num(5, 500), { nil: undefined }),
  batteryKw: num(10, 300),
  batteryKwh: num(10, 1000),
  followerKwh: num(10, 500),
  rte: num(0.6, 1),
  pvKw: num(0, 600),
  windKw: num(0, 300),
  fuelCellKwh: num(1, 400),
  loadKw: fc.tuple(num(0, 200), num(0, 200), num(0, 200)),
  soc0: num(0.1, 0.95),
  outageH: num(0, 120),
  stepH: fc.constantFrom(1, 0.5, 0.25, 0.3),
  eventHour: fc.integer({ min: 0, max: 8759 }),
  failuresH: fc.array(num(0, 150), { minLength: 5, maxLength: 5 }),
  shutdownEvery: fc.integer({ min: 2, max: 7 }),
  blackStart: fc.boolean(),
});

type Island = typeof islandArb extends fc.Arbitrary<infer T> ? T : never;

/**
 * Runs one random island. `eventsBite`: the fake contingency events shed load or shut the island
 * down (every `shutdownEvery`-th); otherwise they are ridden through with nothing shed.
 */
function simulateIsland(p: Island, stepH: number, eventsBite: boolean) {
  const c = inventedCase(
    [
      {
        id: 'gen',
        bus: 'main',
        kind: 'genset',
        ratingKw: p.gensetKw,
        inertiaS: 1,
        minLoadingFraction: p.gensetMin,
        fuelNoLoadLPerH: 0.03 * p.gensetKw,
        fuelFullLoadLPerH: 0.28 * p.gensetKw,
        ...(p.tankL === undefined ? {} : { fuelTankL: p.tankL }),
      },
      {
        id: 'bess',
        bus: 'main',
        kind: 'battery',
        ratingKw: p.batteryKw,
        energyKwh: p.batteryKwh,
        roundTripEfficiency: p.rte,
      },
      {
        id: 'bess2',
        bus: 'main',
        kind: 'battery',
        control: 'grid-following',
        ratingKw: p.batteryKw / 2,
        energyKwh: p.followerKwh,
      },
      {
        id: 'pv',
        bus: 'main',
        kind: 'pv',
        ratingKw: Math.max(p.pvKw, 1),
        resource: { kind: 'parametric', latitudeDeg: 30 },
      },
      {
        id: 'wt',
        bus: 'main',
        kind: 'wind',
        ratingKw: Math.max(p.windKw, 1),
        resource: { kind: 'parametric', weibullScaleMPerSByMonth: Array(12).fill(7) },
      },
      {
        id: 'fc',
        bus: 'main',
        kind: 'fuelcell',
        ratingKw: 50,
        fuelKwh: p.fuelCellKwh,
      },
    ],
    [load('a', 'critical', 200), load('b', 'essential', 200), load('c', 'sheddable', 200)],
    { energyStepH: stepH, blackStartAllowed: p.blackStart },
  );
  // Invented hourly conditions: a daily swing of load, PV by day only, wind varying.
  const demandAt = (h: number, j: number) =>
    p.loadKw[j as 0 | 1 | 2] * (0.7 + 0.3 * Math.sin((2 * Math.PI * (h + j)) / 24));
  const cond = (h: number, outLoad: Float64Array, outAvail: Float64Array) => {
    for (let j = 0; j < 3; j++) outLoad[j] = demandAt(h, j);
    const hourOfDay = (p.eventHour + h) % 24;
    outAvail[0] = p.gensetKw;
    outAvail[1] = p.batteryKw;
    outAvail[2] = p.batteryKw / 2;
    outAvail[3] = p.pvKw * Math.max(0, Math.sin((Math.PI * (hourOfDay - 6)) / 12));
    outAvail[4] = p.windKw * (0.5 + 0.5 * Math.cos(h / 5));
    outAvail[5] = 50;
  };
  let events = 0;
  const hooks = new FakeHooks(c, p.eventHour, cond, (_op, ev) => {
    events++;
    if (!eventsBite) return;
    if (events % p.shutdownEvery === 0) {
      ev.shutdown = true;
      ev.runningAtEnd.fill(0);
    } else {
      ev.loadServedFraction[2] = 0.5;
      ev.shedKwByTier[2] = 1;
      ev.shedKw = 1;
    }
  });
  const m = buildOutageModel(c, hooks);
  const sc = scenarioFor(c, p.eventHour, p.outageH, cond);
  sc.timeToFailureH.set([
    p.failuresH[0]!,
    p.failuresH[1]!,
    p.failuresH[2]!,
    p.failuresH[3]!,
    p.failuresH[4]!,
    Number.POSITIVE_INFINITY,
  ]);
  const ev = new FakeEvent(6, 3);
  ev.socAtEnd[1] = p.soc0;
  ev.socAtEnd[2] = p.soc0;
  const out = new OutageResult(6, 3);
  simulateOutage(m, sc, ev, out);
  return { out, events, demandAt };
}

describe('the outage energy balance over random islands', () => {
  it('conserves energy every step and accounts for every kWh of demand', () => {
    fc.assert(
      fc.property(islandArb, (p) => {
        const { out, events, demandAt } = simulateIsland(p, p.stepH, true);
        expect(out.energyBalanceError).toBeLessThan(1e-9);
        let demandKwh = 0;
        for (let h = 0; h < Math.ceil(p.outageH) + 1; h++) {
          const overlapH = Math.max(0, Math.min(h + 1, p.outageH) - h);
          for (let j = 0; j < 3; j++) demandKwh += demandAt(h, j) * overlapH;
        }
        expect(Math.abs(out.servedKwh + out.unservedKwh - demandKwh)).toBeLessThanOrEqual(
          1e-9 * Math.max(1, demandKwh),
        );
        expect(out.survivedH).toBeGreaterThanOrEqual(0);
        expect(out.survivedH).toBeLessThanOrEqual(p.outageH);
        expect(out.lolH).toBeLessThanOrEqual(p.outageH + 1e-9);
        expect(out.unservedCriticalKwh).toBeLessThanOrEqual(out.unservedKwh + 1e-9);
        expect(out.minSoc).toBeGreaterThanOrEqual(0.1 - 1e-12);
        expect(out.minSoc).toBeLessThanOrEqual(0.95);
        expect(out.contingencies).toBe(events);
        expect(out.fuelCellKwh).toBeLessThanOrEqual(p.fuelCellKwh * (1 + 1e-12));
        if (p.tankL !== undefined) expect(out.fuelUsedL).toBeLessThanOrEqual(p.tankL * (1 + 1e-12));
      }),
      { seed: 20261201, numRuns: 300 },
    );
  });

  it('does not depend on the step when the conditions change hourly (steps are split exactly)', () => {
    // With nothing restored at step starts (events shed nothing, trip nothing), a finer step
    // only cuts segments in two: the results agree to round-off (1e-9 relative).
    fc.assert(
      fc.property(islandArb, fc.constantFrom(0.5, 0.25, 0.3), (p, fineStepH) => {
        const coarse = simulateIsland(p, 1, false).out;
        const fine = simulateIsland(p, fineStepH, false).out;
        const close = (a: number, b: number) =>
          expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(a)));
        close(fine.servedKwh, coarse.servedKwh);
        close(fine.unservedKwh, coarse.unservedKwh);
        close(fine.unservedCriticalKwh, coarse.unservedCriticalKwh);
        close(fine.fuelUsedL, coarse.fuelUsedL);
        close(fine.fuelCellKwh, coarse.fuelCellKwh);
        close(fine.curtailedKwh, coarse.curtailedKwh);
        close(fine.survivedH, coarse.survivedH);
        close(fine.lolH, coarse.lolH);
        if (p.outageH > 60 / 3600) close(fine.minSoc, coarse.minSoc);
        expect(fine.contingencies).toBe(coarse.contingencies);
        expect(fine.shutdown).toBe(coarse.shutdown);
      }),
      { seed: 4242, numRuns: 150 },
    );
  });
});
