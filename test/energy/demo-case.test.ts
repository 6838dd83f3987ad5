// Source: none beyond the invariants checked here (energy conservation, limits of the demo case); common practice, no source.
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { loadCase } from '../../src/case/load.js';
import { compileOutage, OutageResult, simulateOutage } from '../../src/energy/outage.js';
import { EventResult } from '../../src/grid/frequency/event-result.js';
import { compileIsland } from '../../src/grid/frequency/island.js';
import { simulateEvent } from '../../src/grid/frequency/simulate.js';
import { compileSampler, sampleScenario } from '../../src/sample/sampler.js';
import { Scenario } from '../../src/sample/scenario.js';

// The whole chain on the invented Kestrel Island demo case: sampler -> frequency event ->
// outage hours with real contingencies through the frequency engine. Invariants only (first
// law to 1e-9, bounds); the closed-form checks are in the other files. Kept small (2 cores).
const casePath = fileURLToPath(new URL('../../cases/kestrel-island.yaml', import.meta.url));

describe('the outage hours of the Kestrel Island demo case', () => {
  it('conserve energy and stay within bounds over 120 sampled scenarios', async () => {
    const loaded = await loadCase(casePath);
    const c = loaded.case;
    const sampler = compileSampler(c, loaded.dir);
    const island = compileIsland(c);
    const model = compileOutage(c, sampler, island);
    const sc = new Scenario(c.sources.length, c.loads.length);
    const ev = new EventResult(c.sources.length, c.loads.length);
    const out = new OutageResult(c.sources.length, c.loads.length);
    const opts = { horizonS: c.monteCarlo.horizonS, rocofWindowS: c.monteCarlo.rocofWindowS };
    let withFuel = 0;
    for (let id = 0; id < 120; id++) {
      sampleScenario(sampler, 1, id, sc);
      sc.outageDurationH = Math.min(sc.outageDurationH, 96); // keep the test quick
      simulateEvent(island, sc, opts, ev);
      simulateOutage(model, sc, ev, out);
      expect(out.energyBalanceError).toBeLessThan(1e-9);
      expect(out.outageH).toBe(sc.outageDurationH);
      expect(out.survivedH).toBeGreaterThanOrEqual(0);
      expect(out.survivedH).toBeLessThanOrEqual(out.outageH);
      expect(out.lolH).toBeLessThanOrEqual(out.outageH + 1e-9);
      expect(out.unservedCriticalKwh).toBeLessThanOrEqual(out.unservedKwh + 1e-9);
      expect(out.criticalLost).toBe(out.survivedH < out.outageH || out.unservedCriticalKwh > 0);
      if (!out.criticalLost) expect(out.unservedCriticalKwh).toBe(0);
      if (ev.shutdown) expect(out.shutdownHour).toBe(0);
      // The battery stays within its window (0.1-0.95 in the case).
      expect(out.minSoc).toBeGreaterThanOrEqual(0.1 - 1e-12);
      expect(out.minSoc).toBeLessThanOrEqual(0.95 + 1e-12);
      // Two 20 000 L tanks and one of 10 000 L.
      expect(out.fuelUsedL).toBeLessThanOrEqual(50_000 * (1 + 1e-12));
      if (out.fuelUsedL > 0) withFuel++;
    }
    expect(withFuel).toBeGreaterThan(0);
  });

  it('runs a real frequency event when a running genset fails mid-outage', async () => {
    const loaded = await loadCase(casePath);
    const c = loaded.case;
    const sampler = compileSampler(c, loaded.dir);
    const island = compileIsland(c);
    const model = compileOutage(c, sampler, island);
    const sc = new Scenario(c.sources.length, c.loads.length);
    const ev = new EventResult(c.sources.length, c.loads.length);
    const out = new OutageResult(c.sources.length, c.loads.length);
    const opts = { horizonS: c.monteCarlo.horizonS, rocofWindowS: c.monteCarlo.rocofWindowS };
    // The first sampled scenario whose event leaves diesel-1 running (0 = diesel-1 in the case).
    let id = 0;
    for (; id < 200; id++) {
      sampleScenario(sampler, 1, id, sc);
      simulateEvent(island, sc, opts, ev);
      if (!ev.shutdown && ev.runningAtEnd[0] === 1) break;
    }
    sc.outageDurationH = 10;
    sc.timeToFailureH.fill(Number.POSITIVE_INFINITY);
    sc.timeToFailureH[0] = 5;
    simulateOutage(model, sc, ev, out);
    expect(out.contingencies).toBe(1);
    expect(out.worstContingency.startsWith('diesel-1 at 5.00 h: ')).toBe(true);
    expect(out.energyBalanceError).toBeLessThan(1e-9);
    if (out.shutdown) expect(out.shutdownHour).toBe(5);
  });
});
