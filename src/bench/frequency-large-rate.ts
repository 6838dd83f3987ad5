/**
 * The 50-source island's rate alone (issue 3's 800 events/s target), with the cost counters
 * behind it: derivative evaluations, accepted and rejected steps per event, and the accuracy
 * against the tight-tolerance reference on the same seeded operating points as benchFrequency.
 * `npm run build && node dist/bench/frequency-large-rate.js [events] [accuracyScenarios]`.
 * Speed belongs here, never in a test.
 */
import { fileURLToPath } from 'node:url';
import type { Case } from '../case/schema.js';
import { EventResult } from '../grid/frequency/event-result.js';
import { compileIsland } from '../grid/frequency/island.js';
import { type EventOptions, simulateEvent } from '../grid/frequency/simulate.js';
import { accuracy, SEED } from './frequency-accuracy.js';
import { fiftySourceCase } from './frequency-large-case.js';
import { benchScenario, makeBenchScenario } from './frequency-operating-points.js';

export interface LargeRate {
  eventsPerS: number;
  evaluationsPerEvent: number;
  stepsPerEvent: number;
  rejectedPerEvent: number;
  nadirErrorP99Hz: number;
  nadirErrorMaxHz: number;
  outcomeMismatches: number;
}

/** Rate over `count` events (after a 200-event warm-up), best of `repeats` passes. */
export function largeRate(
  c: Case,
  count: number,
  accuracyCount: number,
  opts: EventOptions,
  repeats = 3,
): LargeRate {
  const isl = compileIsland(c);
  const op = makeBenchScenario(c);
  const out = new EventResult(c.sources.length, c.loads.length);
  for (let id = 0; id < Math.min(200, count); id++) {
    benchScenario(c, SEED, id, op);
    simulateEvent(isl, op, opts, out);
  }
  let best = 0;
  let evals = 0;
  let steps = 0;
  let rejected = 0;
  for (let r = 0; r < repeats; r++) {
    let simMs = 0;
    evals = 0;
    steps = 0;
    rejected = 0;
    for (let id = 0; id < count; id++) {
      benchScenario(c, SEED, id, op);
      const t0 = performance.now();
      simulateEvent(isl, op, opts, out);
      simMs += performance.now() - t0;
      evals += out.rhsEvaluations;
      steps += out.steps;
      rejected += out.rejectedSteps;
    }
    best = Math.max(best, count / (simMs / 1000));
  }
  const acc = accuracy(c, accuracyCount, opts);
  return {
    eventsPerS: best,
    evaluationsPerEvent: evals / count,
    stepsPerEvent: steps / count,
    rejectedPerEvent: rejected / count,
    nadirErrorP99Hz: acc.p99,
    nadirErrorMaxHz: acc.max,
    outcomeMismatches: Math.round(acc.mismatchShare * accuracyCount),
  };
}

// Direct run: `node dist/bench/frequency-large-rate.js [events] [accuracyScenarios]`.
if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const count = Number(process.argv[2] ?? 500);
  const accuracyCount = Number(process.argv[3] ?? 200);
  const r = largeRate(fiftySourceCase(), count, accuracyCount, { horizonS: 60, rocofWindowS: 0.1 });
  console.log(JSON.stringify(r, null, 2));
}
