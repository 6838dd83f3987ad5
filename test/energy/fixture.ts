/**
 * Test helpers for the outage energy balance: invented islands built in code (parsed by the real
 * schema), and small fakes of the sampler's hourly conditions and of the frequency engine's event,
 * used in tests only so the balance can be checked against closed forms on its own.
 */
import { type Case, type CaseInput, caseSchema } from '../../src/case/schema.js';
import type { EventOutcome, OutageHooks } from '../../src/energy/outage-model.js';
import { Scenario } from '../../src/sample/scenario.js';

type SourceInput = CaseInput['sources'][number];
type LoadInput = CaseInput['loads'][number];

/** An invented island (made-up numbers) with the given sources and loads. */
export function inventedCase(
  sources: SourceInput[],
  loads: LoadInput[],
  extra: {
    energyStepH?: number;
    horizonS?: number;
    blackStartAllowed?: boolean;
    blackStartDelayH?: number;
  } = {},
): Case {
  return caseSchema.parse({
    name: 'invented test island',
    invented: true,
    system: {
      frequencyHz: 60,
      voltageKv: 0.48,
      baseKva: 1000,
      blackStartAllowed: extra.blackStartAllowed ?? false,
      blackStartDelayH: extra.blackStartDelayH ?? 1,
    },
    sources,
    loads,
    network: { buses: [{ id: 'main' }], pccBus: 'main' },
    events: { islandingRatePerYear: 1, outageDurationH: { kind: 'fixed', value: 10 } },
    monteCarlo: { energyStepH: extra.energyStepH ?? 1, horizonS: extra.horizonS ?? 60 },
  });
}

export function load(id: string, tier: 'critical' | 'essential' | 'sheddable', peakKw: number) {
  return { id, bus: 'main', tier, peakKw } satisfies LoadInput;
}

/** Hourly conditions as a function of the hour index since the event hour (tests only). */
export type ConditionsFn = (
  hoursSinceEvent: number,
  outLoadKw: Float64Array,
  outAvailableKw: Float64Array,
) => void;

/** A fake event outcome: nothing shed, everything running, given states of charge. */
export class FakeEvent implements EventOutcome {
  status = 'ok';
  shutdown = false;
  shutdownCause = '';
  shedKw = 0;
  readonly shedKwByTier = new Float64Array(3);
  readonly loadServedFraction: Float64Array;
  readonly runningAtEnd: Uint8Array;
  readonly socAtEnd: Float64Array;
  constructor(sourceCount: number, loadCount: number) {
    this.loadServedFraction = new Float64Array(loadCount).fill(1);
    this.runningAtEnd = new Uint8Array(sourceCount).fill(1);
    this.socAtEnd = new Float64Array(sourceCount);
  }
}

/** Records every contingency operating point; answers with `respond` (default: ridden through). */
export class FakeHooks implements OutageHooks {
  readonly ops: Scenario[] = [];
  readonly ev: FakeEvent;
  constructor(
    c: Case,
    private readonly eventHour: number,
    private readonly conditions: ConditionsFn,
    private readonly respond: (op: Scenario, ev: FakeEvent) => void = () => {},
  ) {
    this.ev = new FakeEvent(c.sources.length, c.loads.length);
  }
  conditionsAtHour(hourOfYear: number, outLoadKw: Float64Array, outAvailableKw: Float64Array) {
    const since = (hourOfYear - this.eventHour + 8760) % 8760;
    this.conditions(since, outLoadKw, outAvailableKw);
  }
  runContingency(op: Scenario): EventOutcome {
    const copy = new Scenario(op.sourceCount, op.loadCount);
    copy.loadKw.set(op.loadKw);
    copy.dispatchKw.set(op.dispatchKw);
    copy.running.set(op.running);
    copy.available.set(op.available);
    copy.failsToStart.set(op.failsToStart);
    copy.trippedAtSeparation.set(op.trippedAtSeparation);
    copy.socFraction.set(op.socFraction);
    copy.gridImportKw = op.gridImportKw;
    copy.hourOfYear = op.hourOfYear;
    this.ops.push(copy);
    const ev = this.ev;
    ev.status = 'ok';
    ev.shutdown = false;
    ev.shutdownCause = '';
    ev.shedKw = 0;
    ev.shedKwByTier.fill(0);
    ev.loadServedFraction.fill(1);
    ev.runningAtEnd.set(op.running);
    for (let i = 0; i < op.sourceCount; i++) if (op.trippedAtSeparation[i]) ev.runningAtEnd[i] = 0;
    ev.socAtEnd.set(op.socFraction);
    this.respond(op, ev);
    return ev;
  }
}

/** A scenario at `hourOfYear` with every source available and never failing. */
export function scenarioFor(
  c: Case,
  hourOfYear: number,
  outageDurationH: number,
  conditions: ConditionsFn,
): Scenario {
  const sc = new Scenario(c.sources.length, c.loads.length);
  sc.hourOfYear = hourOfYear;
  sc.outageDurationH = outageDurationH;
  sc.available.fill(1);
  sc.running.fill(1);
  sc.timeToFailureH.fill(Number.POSITIVE_INFINITY);
  conditions(0, sc.loadKw, sc.availableKw);
  return sc;
}

/** Constant conditions: the same load per load and available power per source every hour. */
export function constantConditions(loadKw: number[], availableKw: number[]): ConditionsFn {
  return (_h, outLoad, outAvail) => {
    outLoad.set(loadKw);
    outAvail.set(availableKw);
  };
}
