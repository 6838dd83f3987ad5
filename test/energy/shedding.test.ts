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

// Priority shedding (sheddable, then essential, then critical) and the rule that an island
// without a grid-forming source shuts down: common practice, no source. Numbers are invented.
const loads = [
  load('icu', 'critical', 40),
  load('offices', 'essential', 40),
  load('pool', 'sheddable', 60),
];
const t0H = 60 / 3600;

function gensetIsland(ratingKw: number, blackStart = false) {
  return inventedCase(
    [
      { id: 'g1', bus: 'main', kind: 'genset', ratingKw, inertiaS: 1, minLoadingFraction: 0 },
      { id: 'g2', bus: 'main', kind: 'genset', ratingKw, inertiaS: 1, minLoadingFraction: 0 },
    ],
    loads,
    { blackStartAllowed: blackStart, blackStartDelayH: 2 },
  );
}

function run(
  c: ReturnType<typeof gensetIsland>,
  outageH: number,
  prepare?: (sc: ReturnType<typeof scenarioFor>) => void,
) {
  const cond = constantConditions(
    [40, 40, 60],
    c.sources.map((s) => s.ratingKw),
  );
  const hooks = new FakeHooks(c, 10, cond, (_op, ev) => {
    ev.shutdown = true;
    ev.shutdownCause = 'under-frequency';
    ev.runningAtEnd.fill(0);
  });
  const m = buildOutageModel(c, hooks);
  const sc = scenarioFor(c, 10, outageH, cond);
  prepare?.(sc);
  const out = new OutageResult(c.sources.length, c.loads.length);
  simulateOutage(m, sc, new FakeEvent(c.sources.length, c.loads.length), out);
  return { out, hooks };
}

describe('shedding by priority over the outage', () => {
  it('sheds the sheddable load first', () => {
    const { out } = run(gensetIsland(50), 10); // 100 kW for 140 kW of load
    expect(out.unservedKwh).toBeCloseTo(40 * (10 - t0H), 9);
    expect(out.unservedCriticalKwh).toBe(0);
    expect(out.criticalLost).toBe(false);
    expect(out.survivedH).toBe(10);
    expect(out.lolH).toBeCloseTo(10 - t0H, 9);
  });

  it('then the essential load, keeping the critical load', () => {
    const { out } = run(gensetIsland(30), 10); // 60 kW: all 60 sheddable and 20 essential shed
    expect(out.unservedKwh).toBeCloseTo(80 * (10 - t0H), 9);
    expect(out.criticalLost).toBe(false);
  });

  it('counts the loss of critical load as the failure, from the hour it happens', () => {
    const { out } = run(gensetIsland(15), 10); // 30 kW for 40 kW of critical load
    expect(out.criticalLost).toBe(true);
    expect(out.survivedH).toBeCloseTo(t0H, 12);
    expect(out.unservedCriticalKwh).toBeCloseTo(10 * (10 - t0H), 9);
    expect(out.shutdown).toBe(false);
  });
});

describe('shutdown and black start', () => {
  it('shuts down at once when no grid-forming source is online (PV alone)', () => {
    const c = inventedCase(
      [
        {
          id: 'pv',
          bus: 'main',
          kind: 'pv',
          ratingKw: 500,
          resource: { kind: 'parametric', latitudeDeg: 40 },
        },
      ],
      loads,
    );
    const cond = constantConditions([40, 40, 60], [300]);
    const m = buildOutageModel(c, new FakeHooks(c, 12, cond));
    const sc = scenarioFor(c, 12, 5, cond);
    const out = new OutageResult(1, 3);
    simulateOutage(m, sc, new FakeEvent(1, 3), out);
    expect(out.shutdown).toBe(true);
    expect(out.shutdownHour).toBeCloseTo(t0H, 12);
    expect(out.unservedKwh).toBeCloseTo(140 * (5 - t0H), 9);
  });

  it('does not restart after a shutdown unless the case allows a black start', () => {
    const { out, hooks } = run(gensetIsland(100), 10, (sc) => {
      sc.timeToFailureH[0] = 3.5;
    });
    expect(hooks.ops.length).toBe(1);
    expect(out.shutdown).toBe(true);
    expect(out.shutdownHour).toBe(3.5);
    expect(out.restarts).toBe(0);
    expect(out.survivedH).toBe(3.5);
    expect(out.unservedKwh).toBeCloseTo(140 * (10 - 3.5), 9);
  });

  it('restarts blackStartDelayH after the shutdown on the remaining genset', () => {
    const { out } = run(gensetIsland(100, true), 10, (sc) => {
      sc.timeToFailureH[0] = 3.5;
    });
    expect(out.shutdown).toBe(true);
    expect(out.restarts).toBe(1);
    // Down from 3.5 h to 5.5 h; then g2 (100 kW) alone sheds 40 kW of sheddable load to the end.
    expect(out.unservedKwh).toBeCloseTo(140 * 2 + 40 * (10 - 5.5), 9);
    expect(out.criticalLost).toBe(true);
    expect(out.survivedH).toBe(3.5);
    expect(out.worstContingency).toBe('g1 at 3.50 h: shutdown (under-frequency)');
  });
});
