/**
 * Accuracy of the frequency engine at its default tolerances against a tight-tolerance reference
 * (relTol 1e-11, absTol 1e-13, 50 ms largest step) on the benchmark's seeded operating points:
 * the nadir error p99 and maximum and the share of shedding/shutdown outcomes that differ. Shared
 * by the benchmark (frequency.ts) and the 50-source rate probe (frequency-large-rate.ts).
 */
import type { Case } from '../case/schema.js';
import { EventResult } from '../grid/frequency/event-result.js';
import { compileIsland } from '../grid/frequency/island.js';
import { type EventOptions, simulateEvent } from '../grid/frequency/simulate.js';
import { benchScenario, makeBenchScenario } from './frequency-operating-points.js';

/** Seed of the benchmark's operating points. */
export const SEED = 'bench-frequency';

/** Nadir error p99 and outcome mismatches against a tight-tolerance reference. */
export function accuracy(c: Case, count: number, opts: EventOptions) {
  const isl = compileIsland(c);
  const op = makeBenchScenario(c);
  const a = new EventResult(c.sources.length, c.loads.length);
  const b = new EventResult(c.sources.length, c.loads.length);
  const tight: EventOptions = { ...opts, relTol: 1e-11, absTol: 1e-13, maxStepS: 0.05 };
  const errors = new Float64Array(count);
  let mismatches = 0;
  let shedding = 0;
  let shutdowns = 0;
  for (let id = 0; id < count; id++) {
    benchScenario(c, SEED, id, op);
    simulateEvent(isl, op, opts, a);
    simulateEvent(isl, op, tight, b);
    errors[id] = Math.abs(a.nadirHz - b.nadirHz);
    if (
      a.shedStages !== b.shedStages ||
      a.shutdown !== b.shutdown ||
      a.shutdownCause !== b.shutdownCause
    )
      mismatches++;
    if (b.shedStages > 0) shedding++;
    if (b.shutdown) shutdowns++;
  }
  errors.sort();
  if (count === 0) return { p99: 0, max: 0, mismatchShare: 0, shedShare: 0, shutdownShare: 0 };
  return {
    p99: errors[Math.min(count - 1, Math.floor(0.99 * count))]!,
    max: errors[count - 1]!,
    mismatchShare: mismatches / count,
    shedShare: shedding / count,
    shutdownShare: shutdowns / count,
  };
}
