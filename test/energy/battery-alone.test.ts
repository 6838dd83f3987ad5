import fc from 'fast-check';
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

/**
 * Analytic check: a battery alone at constant terminal load P with usable energy
 * E_u = (SoC0 - SoC_min) * E and discharge efficiency eta_d = sqrt(eta_rt) lasts exactly
 * E_u * eta_d / P hours (dSoC/dt = -P / (eta_d E) integrated at constant P; derived, no
 * published source needed). The balance starts at the event horizon t0, so the critical load is
 * lost at t0 + E_u * eta_d / P. Tolerance 1e-9 h: the time is the sum of a few floating-point
 * step lengths plus one exact division (rounding ~1e-15 relative per step).
 */
function batteryIsland(
  energyKwh: number,
  ratingKw: number,
  rte: number,
  socMin: number,
  stepH: number,
) {
  return inventedCase(
    [
      {
        id: 'bess',
        bus: 'main',
        kind: 'battery',
        ratingKw,
        energyKwh,
        roundTripEfficiency: rte,
        socMinFraction: socMin,
        socMaxFraction: 1,
      },
    ],
    [load('ward', 'critical', 100)],
    { energyStepH: stepH },
  );
}

function run(
  energyKwh: number,
  loadKw: number,
  rte: number,
  soc0: number,
  socMin: number,
  stepH: number,
  outageH: number,
) {
  const c = batteryIsland(energyKwh, 2 * loadKw + 1, rte, socMin, stepH);
  const cond = constantConditions([loadKw], [2 * loadKw + 1]);
  const hooks = new FakeHooks(c, 100, cond);
  const m = buildOutageModel(c, hooks);
  const sc = scenarioFor(c, 100, outageH, cond);
  const ev = new FakeEvent(1, 1);
  ev.socAtEnd[0] = soc0;
  const out = new OutageResult(1, 1);
  simulateOutage(m, sc, ev, out);
  return { out, t0H: c.monteCarlo.horizonS / 3600 };
}

describe('a battery alone at constant load', () => {
  it('lasts E * eta / P hours, then the island shuts down and the critical load is lost', () => {
    const { out, t0H } = run(400, 50, 0.81, 0.9, 0.1, 1, 100);
    const expectedH = t0H + ((0.9 - 0.1) * 400 * Math.sqrt(0.81)) / 50; // 5.76 h after the event
    expect(out.survivedH).toBeCloseTo(expectedH, 9);
    expect(out.shutdown).toBe(true);
    expect(out.shutdownHour).toBeCloseTo(expectedH, 9);
    expect(out.criticalLost).toBe(true);
    expect(out.minSoc).toBe(0.1);
    expect(out.unservedCriticalKwh).toBeCloseTo(50 * (100 - expectedH), 6);
    expect(out.lolH).toBeCloseTo(100 - expectedH, 9);
    // The conversion loss is E_u * (1 - eta_d): what left the cells minus what reached the load.
    expect(out.storageLossKwh).toBeCloseTo(0.8 * 400 * (1 - 0.9), 9);
    expect(out.energyBalanceError).toBeLessThan(1e-9);
  });

  it('carries the load through an outage shorter than its endurance', () => {
    const { out } = run(400, 50, 0.81, 0.9, 0.1, 1, 3);
    expect(out.criticalLost).toBe(false);
    expect(out.survivedH).toBe(3);
    expect(out.unservedKwh).toBe(0);
    // SoC after (3 h - t0) at 50 kW: 0.9 - 50 (3 - t0) / (0.9 * 400).
    expect(out.minSoc).toBeCloseTo(0.9 - (50 * (3 - 60 / 3600)) / (0.9 * 400), 12);
  });

  it('gives the same endurance whatever the step, for any energy, load, efficiency and step', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 10, max: 5000, noNaN: true }),
        fc.double({ min: 10, max: 500, noNaN: true }),
        fc.double({ min: 0.5, max: 1, noNaN: true }),
        fc.double({ min: 0.3, max: 1, noNaN: true }),
        fc.constantFrom(1, 0.5, 0.25, 0.1),
        (energyKwh, loadKw, rte, soc0, stepH) => {
          const socMin = 0.1;
          const enduranceH = ((soc0 - socMin) * energyKwh * Math.sqrt(rte)) / loadKw;
          const { out, t0H } = run(energyKwh, loadKw, rte, soc0, socMin, stepH, enduranceH + 2);
          const expectedH = t0H + enduranceH;
          expect(Math.abs(out.survivedH - expectedH)).toBeLessThan(1e-9 * Math.max(1, expectedH));
          expect(out.energyBalanceError).toBeLessThan(1e-9);
        },
      ),
      { seed: 7, numRuns: 60 },
    );
  });
});

describe('a battery charged from a surplus', () => {
  it('stores P * eta_c per hour, eta_c = sqrt(eta_rt), until its ceiling', () => {
    // Invented: 100 kW of PV, 20 kW of load, a 200 kW / 400 kWh battery at 20 %, eta_rt = 0.81.
    const c = inventedCase(
      [
        {
          id: 'bess',
          bus: 'main',
          kind: 'battery',
          ratingKw: 200,
          energyKwh: 400,
          roundTripEfficiency: 0.81,
          socMaxFraction: 0.9,
        },
        {
          id: 'pv',
          bus: 'main',
          kind: 'pv',
          ratingKw: 100,
          resource: { kind: 'parametric', latitudeDeg: 10 },
        },
      ],
      [load('ward', 'critical', 20)],
    );
    const cond = constantConditions([20], [200, 100]);
    const m = buildOutageModel(c, new FakeHooks(c, 0, cond));
    const ev = new FakeEvent(2, 1);
    ev.socAtEnd[0] = 0.2;
    const out = new OutageResult(2, 1);
    const t0H = 60 / 3600;
    // 3 h: SoC = 0.2 + 80 * 0.9 * (3 - t0) / 400, below the ceiling.
    simulateOutage(m, scenarioFor(c, 0, 3, cond), ev, out);
    expect(m.soc[0]).toBeCloseTo(0.2 + (80 * 0.9 * (3 - t0H)) / 400, 12);
    expect(out.curtailedKwh).toBe(0);
    expect(out.storageLossKwh).toBeCloseTo(80 * 0.1 * (3 - t0H), 9);
    // 10 h: full at t0 + (0.9 - 0.2) * 400 / (80 * 0.9) h, then the surplus is curtailed.
    simulateOutage(m, scenarioFor(c, 0, 10, cond), ev, out);
    const fullAtH = t0H + (0.7 * 400) / (80 * 0.9);
    expect(m.soc[0]).toBe(0.9);
    expect(out.curtailedKwh).toBeCloseTo(80 * (10 - fullAtH), 9);
    expect(out.energyBalanceError).toBeLessThan(1e-9);
  });
});
