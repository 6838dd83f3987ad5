/**
 * Benchmark of the frequency engine alone (one thread): separation events per second for the
 * demo case and for an invented 50-source island at a 60 s horizon, the casual baseline of the
 * same model (naive-frequency.ts) in the same run, the nadir error against a tight-tolerance
 * reference and the share of shedding/shutdown outcomes that differ from it, over 2,000 seeded
 * operating points (frequency-operating-points.ts). Speed belongs here, never in a test.
 */
import { fileURLToPath } from 'node:url';
import { loadCase } from '../case/load.js';
import type { Case } from '../case/schema.js';
import { EventResult } from '../grid/frequency/event-result.js';
import { compileIsland } from '../grid/frequency/island.js';
import { type EventOptions, simulateEvent } from '../grid/frequency/simulate.js';
import { accuracy, SEED } from './frequency-accuracy.js';
import { fiftySourceCase } from './frequency-large-case.js';
import { benchScenario, makeBenchScenario } from './frequency-operating-points.js';
import { naiveSimulate } from './naive-frequency.js';

const demoCasePath = fileURLToPath(new URL('../../cases/kestrel-island.yaml', import.meta.url));

/** Events per second over `count` seeded scenarios (after a warm-up). */
function eventsPerSecond(
  c: Case,
  count: number,
  opts: EventOptions,
): { rate: number; evals: number } {
  const isl = compileIsland(c);
  const op = makeBenchScenario(c);
  const out = new EventResult(c.sources.length, c.loads.length);
  for (let id = 0; id < Math.min(200, count); id++) {
    benchScenario(c, SEED, id, op);
    simulateEvent(isl, op, opts, out);
  }
  let evals = 0;
  let buildMs = 0;
  const t0 = performance.now();
  for (let id = 0; id < count; id++) {
    const b0 = performance.now();
    benchScenario(c, SEED, id, op);
    buildMs += performance.now() - b0;
    simulateEvent(isl, op, opts, out);
    evals += out.rhsEvaluations;
  }
  const seconds = (performance.now() - t0 - buildMs) / 1000;
  return { rate: count / seconds, evals: evals / count };
}

/** p99 of |nadir(a) - nadir(b)| between two option sets (both at tight tolerance). */
function modelDifference(c: Case, count: number, a: EventOptions, b: EventOptions): number {
  const isl = compileIsland(c);
  const op = makeBenchScenario(c);
  const ra = new EventResult(c.sources.length, c.loads.length);
  const rb = new EventResult(c.sources.length, c.loads.length);
  const tight = { relTol: 1e-9, absTol: 1e-11 };
  const d = new Float64Array(count);
  for (let id = 0; id < count; id++) {
    benchScenario(c, SEED, id, op);
    simulateEvent(isl, op, { ...a, ...tight }, ra);
    simulateEvent(isl, op, { ...b, ...tight }, rb);
    d[id] = Math.abs(ra.nadirHz - rb.nadirHz);
  }
  d.sort();
  return d[Math.min(count - 1, Math.floor(0.99 * count))]!;
}

export async function benchFrequency(
  casePath: string = demoCasePath,
): Promise<Record<string, number>> {
  const demo = (await loadCase(casePath)).case;
  const large = fiftySourceCase();
  const largeFastLag = fiftySourceCase(0.05);
  const opts: EventOptions = { horizonS: 60, rocofWindowS: demo.monteCarlo.rocofWindowS };
  const demoRate = eventsPerSecond(demo, 2000, opts);
  const largeRate = eventsPerSecond(large, 500, opts);
  // The 50-source island with 50 ms grid-following lags: kept as states, and taken as instantaneous.
  const largeFast = eventsPerSecond(largeFastLag, 300, opts);
  const qss: EventOptions = { ...opts, quasiSteadyLagS: 0.1 };
  const largeQss = eventsPerSecond(largeFastLag, 300, qss);
  const qssModelError = modelDifference(largeFastLag, 200, opts, qss);
  const op = makeBenchScenario(demo);
  const naiveCount = 10;
  const t0 = performance.now();
  for (let id = 0; id < naiveCount; id++) {
    benchScenario(demo, SEED, id, op);
    naiveSimulate(demo, op, opts.horizonS);
  }
  const naiveRate = naiveCount / ((performance.now() - t0) / 1000);
  const acc = accuracy(demo, 2000, opts);
  const accLarge = accuracy(large, 200, opts);
  return {
    events_per_s_thread: demoRate.rate,
    events_per_s_thread_50_sources: largeRate.rate,
    naive_events_per_s: naiveRate,
    speedup_over_naive: demoRate.rate / naiveRate,
    rhs_evaluations_per_event: demoRate.evals,
    rhs_evaluations_per_event_50_sources: largeRate.evals,
    nadir_error_p99_hz: acc.p99,
    nadir_error_max_hz: acc.max,
    outcome_mismatch_share: acc.mismatchShare,
    reference_shed_share: acc.shedShare,
    reference_shutdown_share: acc.shutdownShare,
    nadir_error_p99_hz_50_sources: accLarge.p99,
    events_per_s_thread_50_sources_50ms_lags: largeFast.rate,
    rhs_evaluations_per_event_50_sources_50ms_lags: largeFast.evals,
    events_per_s_thread_50_sources_50ms_lags_quasi_steady: largeQss.rate,
    rhs_evaluations_per_event_50_sources_50ms_lags_quasi_steady: largeQss.evals,
    nadir_difference_p99_hz_quasi_steady_vs_lag: qssModelError,
    outcome_mismatch_share_50_sources: accLarge.mismatchShare,
  };
}

// Direct run: `npx tsx src/bench/frequency.ts`.
if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  benchFrequency().then((r) => console.log(JSON.stringify(r, null, 2)));
}
