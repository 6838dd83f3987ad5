/**
 * Benchmark of the outage energy balance: the cost it adds to a scenario for a 72-hour outage
 * (hourly steps, contingencies through the frequency engine included), on one thread, for the
 * demo case (cases/kestrel-island.yaml), next to the cost of the scenario's frequency event.
 * Speed belongs here, never in a test.
 */
import { fileURLToPath } from 'node:url';
import { loadCase } from '../case/load.js';
import { buildOutageModel, OutageResult, simulateOutage } from '../energy/outage.js';
import { EventResult } from '../grid/frequency/event-result.js';
import { compileIsland } from '../grid/frequency/island.js';
import { simulateEvent } from '../grid/frequency/simulate.js';
import { conditionsAtHour } from '../sample/conditions.js';
import { compileSampler, sampleScenario } from '../sample/sampler.js';
import { Scenario } from '../sample/scenario.js';

const demoCasePath = fileURLToPath(new URL('../../cases/kestrel-island.yaml', import.meta.url));

/** Outage length of the benchmark, h (the figure). */
const OUTAGE_H = 72;

export async function benchEnergy(
  casePath: string = demoCasePath,
  scenarios = 200,
  repeats = 10,
): Promise<Record<string, number>> {
  const loaded = await loadCase(casePath);
  const c = loaded.case;
  const ns = c.sources.length;
  const nl = c.loads.length;
  const sampler = compileSampler(c, loaded.dir);
  const island = compileIsland(c);
  const opts = { horizonS: c.monteCarlo.horizonS, rocofWindowS: c.monteCarlo.rocofWindowS };
  // The same wiring as compileOutage, with a clock around the contingency events so the balance's
  // own cost can be told from that of the frequency events it triggers.
  const contingencyEv = new EventResult(ns, nl);
  let contingencyMs = 0;
  const model = buildOutageModel(c, {
    conditionsAtHour: (h, loadKw, availableKw) => conditionsAtHour(sampler, h, loadKw, availableKw),
    runContingency: (op) => {
      const t = performance.now();
      simulateEvent(island, op, opts, contingencyEv);
      contingencyMs += performance.now() - t;
      return contingencyEv;
    },
  });

  // The scenarios and their frequency events, computed once (timed: the event cost).
  const scs: Scenario[] = [];
  const evs: EventResult[] = [];
  for (let k = 0; k < scenarios; k++) {
    scs.push(new Scenario(ns, nl));
    evs.push(new EventResult(ns, nl));
  }
  const warm = new EventResult(ns, nl);
  for (let k = 0; k < Math.min(50, scenarios); k++) {
    sampleScenario(sampler, c.monteCarlo.seed, k, scs[k]!);
    simulateEvent(island, scs[k]!, opts, warm);
  }
  const tEvent0 = performance.now();
  for (let k = 0; k < scenarios; k++) {
    const sc = scs[k]!;
    sampleScenario(sampler, c.monteCarlo.seed, k, sc);
    sc.outageDurationH = OUTAGE_H;
    simulateEvent(island, sc, opts, evs[k]!);
  }
  const eventUs = ((performance.now() - tEvent0) * 1000) / scenarios;

  const out = new OutageResult(ns, nl);
  for (let k = 0; k < scenarios; k++) simulateOutage(model, scs[k]!, evs[k]!, out); // warm-up
  let contingencies = 0;
  let segments = 0;
  let worstResidual = 0;
  contingencyMs = 0;
  const t0 = performance.now();
  for (let r = 0; r < repeats; r++) {
    for (let k = 0; k < scenarios; k++) {
      simulateOutage(model, scs[k]!, evs[k]!, out);
      contingencies += out.contingencies;
      segments += out.segments;
      if (out.energyBalanceError > worstResidual) worstResidual = out.energyBalanceError;
    }
  }
  const runs = scenarios * repeats;
  const outageUs = ((performance.now() - t0) * 1000) / runs;
  const contingencyUs = (contingencyMs * 1000) / runs;
  return {
    outage_72h_us_per_scenario: outageUs,
    outage_72h_per_s_thread: 1e6 / outageUs,
    outage_72h_balance_us_per_scenario: outageUs - contingencyUs,
    outage_72h_contingency_events_us_per_scenario: contingencyUs,
    outage_72h_contingencies_per_scenario: contingencies / runs,
    outage_72h_segments_per_scenario: segments / runs,
    outage_energy_balance_error_max: worstResidual,
    event_us_per_scenario: eventUs,
    outage_to_event_cost_ratio: outageUs / eventUs,
  };
}

// Run directly: `npx tsx src/bench/energy.ts [case.yaml]`.
if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  benchEnergy(process.argv[2] ?? demoCasePath).then((r) => console.log(JSON.stringify(r)));
}
