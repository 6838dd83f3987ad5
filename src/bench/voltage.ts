/**
 * Benchmark of the voltage stage alone (one thread): per-scenario cost of the island assessment
 * (power flow, loading margin, damping) and of the ride-through check, for the demo case
 * (cases/kestrel-island.yaml) and the Baran & Wu 33-bus feeder (cases/reference/), with the
 * frequency event of the same scenarios timed alongside for comparison. Operating points come
 * from the real sampler and frequency engine; only the voltage calls are inside the timed spans.
 * Speed belongs here, never in a test.
 */
import { fileURLToPath } from 'node:url';
import { loadCase } from '../case/load.js';
import { EventResult } from '../grid/frequency/event-result.js';
import { compileIsland } from '../grid/frequency/island.js';
import { type EventOptions, simulateEvent } from '../grid/frequency/simulate.js';
import {
  assessIsland,
  compileNetwork,
  FLOW_MAX_ITER,
  FLOW_TOL_PU,
  VoltageResult,
} from '../grid/voltage/island-voltage.js';
import { applyRideThrough, compileRideThrough } from '../grid/voltage/ride-through.js';
import { compileSampler, sampleScenario } from '../sample/sampler.js';
import { Scenario } from '../sample/scenario.js';

const demoCasePath = fileURLToPath(new URL('../../cases/kestrel-island.yaml', import.meta.url));
const feederCasePath = fileURLToPath(
  new URL('../../cases/reference/baran-wu-33.yaml', import.meta.url),
);

interface StageCost {
  voltageUs: number;
  rideThroughUs: number;
  frequencyUs: number;
  flowOnlyUs: number;
  assessedFraction: number;
}

async function stageCost(casePath: string, scenarios: number): Promise<StageCost> {
  const loaded = await loadCase(casePath);
  const c = loaded.case;
  const ctx = compileSampler(c, loaded.dir);
  const island = compileIsland(c);
  const rt = compileRideThrough(c);
  const net = compileNetwork(c);
  const sc = new Scenario(c.sources.length, c.loads.length);
  const ev = new EventResult(c.sources.length, c.loads.length);
  const vr = new VoltageResult();
  const opts: EventOptions = {
    horizonS: c.monteCarlo.horizonS,
    rocofWindowS: c.monteCarlo.rocofWindowS,
  };
  const seed = 'bench-voltage';
  let vMs = 0;
  let rMs = 0;
  let fMs = 0;
  let flowMs = 0;
  let assessed = 0;
  const warm = Math.min(200, scenarios);
  for (let id = 0; id < warm + scenarios; id++) {
    sampleScenario(ctx, seed, id, sc);
    const t0 = performance.now();
    applyRideThrough(rt, sc);
    const t1 = performance.now();
    simulateEvent(island, sc, opts, ev);
    const t2 = performance.now();
    assessIsland(net, sc, ev, vr);
    const t3 = performance.now();
    let tFlow = 0;
    if (vr.assessed && vr.status === 'ok') {
      // the flow alone, re-solved from a flat start at the same operating point
      const root = net.data.sourceBus[largestRunningGridFormer(net, ev)]!;
      const f0 = performance.now();
      net.flow.flatStart();
      net.flow.solve(net.data.trees[root]!, FLOW_TOL_PU, FLOW_MAX_ITER);
      tFlow = performance.now() - f0;
    }
    if (id < warm) continue;
    rMs += t1 - t0;
    fMs += t2 - t1;
    vMs += t3 - t2;
    flowMs += tFlow;
    if (vr.assessed) assessed++;
  }
  const us = (ms: number, n: number) => (n > 0 ? (ms * 1000) / n : 0);
  return {
    voltageUs: us(vMs, scenarios),
    rideThroughUs: us(rMs, scenarios),
    frequencyUs: us(fMs, scenarios),
    flowOnlyUs: us(flowMs, assessed),
    assessedFraction: assessed / scenarios,
  };
}

function largestRunningGridFormer(net: ReturnType<typeof compileNetwork>, ev: EventResult): number {
  let best = -1;
  const d = net.data;
  for (let k = 0; k < d.sourceCount; k++)
    if (
      d.gridForming[k] &&
      ev.runningAtEnd[k] &&
      (best < 0 || d.sourceKva[k]! > d.sourceKva[best]!)
    )
      best = k;
  return Math.max(best, 0);
}

export async function benchVoltage(scenarios = 5000): Promise<Record<string, number>> {
  const demo = await stageCost(demoCasePath, scenarios);
  const feeder = await stageCost(feederCasePath, scenarios);
  return {
    voltage_us_per_scenario_demo: demo.voltageUs,
    voltage_flow_only_us_demo: demo.flowOnlyUs,
    ride_through_us_per_scenario_demo: demo.rideThroughUs,
    frequency_event_us_per_scenario_demo: demo.frequencyUs,
    voltage_assessed_fraction_demo: demo.assessedFraction,
    voltage_us_per_scenario_33bus: feeder.voltageUs,
    voltage_flow_only_us_33bus: feeder.flowOnlyUs,
    ride_through_us_per_scenario_33bus: feeder.rideThroughUs,
    frequency_event_us_per_scenario_33bus: feeder.frequencyUs,
    voltage_assessed_fraction_33bus: feeder.assessedFraction,
  };
}

// Run directly: `npx tsx src/bench/voltage.ts [scenarios]`.
if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  benchVoltage(Number(process.argv[2] ?? 5000)).then((r) =>
    console.log(JSON.stringify(r, null, 1)),
  );
}
