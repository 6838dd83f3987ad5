import { describe, expect, it } from 'vitest';
import {
  buildOutageModel,
  OutageResult,
  type OutageTraceSink,
  simulateOutage,
} from '../../src/energy/outage.js';
import { FakeEvent, FakeHooks, inventedCase, load, scenarioFor } from './fixture.js';

// The segment trace (for replay) must tile the outage from the event's horizon to its end and
// add up to the result's energies (bookkeeping identity; tolerance 1e-9 relative for sums of a
// few dozen products). Invented island: a genset, a battery and PV over a day.
describe('the outage trace', () => {
  it('tiles the outage and adds up to the served and spilled energy of the result', () => {
    const c = inventedCase(
      [
        { id: 'g', bus: 'main', kind: 'genset', ratingKw: 80, inertiaS: 1 },
        { id: 'b', bus: 'main', kind: 'battery', ratingKw: 60, energyKwh: 200 },
        {
          id: 'pv',
          bus: 'main',
          kind: 'pv',
          ratingKw: 150,
          resource: { kind: 'parametric', latitudeDeg: 25 },
        },
      ],
      [load('ward', 'critical', 60), load('pool', 'sheddable', 60)],
      { energyStepH: 0.5 },
    );
    const cond = (h: number, outLoad: Float64Array, outAvail: Float64Array) => {
      outLoad[0] = 40 + 10 * Math.cos(h / 3);
      outLoad[1] = 50;
      outAvail.set([80, 60, Math.max(0, 150 * Math.sin((Math.PI * (h - 4)) / 12))]);
    };
    const m = buildOutageModel(c, new FakeHooks(c, 6, cond));
    const sc = scenarioFor(c, 6, 30.5, cond);
    const ev = new FakeEvent(3, 2);
    ev.socAtEnd[1] = 0.6;
    const rows: { startH: number; durationH: number; servedKw: number; spilledKw: number }[] = [];
    const trace: OutageTraceSink = {
      record(startH, durationH, _demandKw, servedKw, spilledKw) {
        rows.push({ startH, durationH, servedKw, spilledKw });
      },
    };
    const out = new OutageResult(3, 2);
    simulateOutage(m, sc, ev, out, trace);
    const t0H = 60 / 3600;
    expect(rows[0]!.startH).toBe(t0H);
    for (let k = 1; k < rows.length; k++)
      expect(rows[k]!.startH).toBeCloseTo(rows[k - 1]!.startH + rows[k - 1]!.durationH, 12);
    const last = rows[rows.length - 1]!;
    expect(last.startH + last.durationH).toBeCloseTo(30.5, 12);
    const servedKwh = rows.reduce((a, r) => a + r.servedKw * r.durationH, 0);
    const spilledKwh = rows.reduce((a, r) => a + r.spilledKw * r.durationH, 0);
    const firstMinuteKwh = (sc.loadKw[0]! + sc.loadKw[1]!) * t0H;
    expect(servedKwh + firstMinuteKwh).toBeCloseTo(out.servedKwh, 9);
    expect(spilledKwh).toBeCloseTo(out.curtailedKwh, 9);
    expect(rows.length).toBe(out.segments);
  });
});
