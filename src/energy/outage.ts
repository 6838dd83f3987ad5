/**
 * The outage hours: from the end of the frequency event to the return of the grid, an energy
 * balance in steps of monteCarlo.energyStepH (the first step partial, from the event's horizon;
 * the last one ends with the outage). Within a step the dispatch is constant (dispatch.ts) and the
 * step is split exactly where a battery reaches its floor or ceiling, a tank runs dry or a unit
 * fails, so durations such as a battery's E * eta / P come out exact instead of rounded to the step.
 *
 * Energy over a segment of length h (kWh):
 *   sources  = (PV + wind + gensets + fuel cells) * h + sum(E_i * max(0, -dSoC_i))
 *   sinks    = served * h + sum(E_i * max(0, dSoC_i)) + (curtailed + dumped) * h + losses
 *   losses   = sum(P_dis * h * (1/eta_d - 1)) + sum(P_ch * h * (1 - eta_c))
 * and |sources - sinks| / max(sources, sinks, floor) is recorded (energyBalanceError); it must
 * stay below 1e-9. The floor, 1 Wh + 1e-6 of the installed storage energy, keeps the round-off of
 * a state of charge (about 2e-16 * E) from counting when a segment's flows are practically nil.
 *
 * Shutdown: when no grid-forming source is left (dispatch.ts) or a contingency's frequency event
 * ends in shutdown. Restart only if system.blackStartAllowed, blackStartDelayH after the shutdown
 * (or at a later step start) with a grid-forming source available; restart is not simulated as a
 * frequency event. Healthy units tripped by protection return at the next step; failed units
 * (forced outage, failed start, failure during the outage) stay out until the grid returns.
 */
import type { Case } from '../case/schema.js';
import { RunError } from '../errors.js';
import { EventResult } from '../grid/frequency/event-result.js';
import type { Island } from '../grid/frequency/island.js';
import { type EventOptions, simulateEvent } from '../grid/frequency/simulate.js';
import { conditionsAtHour } from '../sample/conditions.js';
import type { SamplerContext } from '../sample/sampler.js';
import type { Scenario } from '../sample/scenario.js';
import { describeWorstContingency, HOURS_PER_YEAR } from './contingency.js';
import {
  buildOutageModel,
  type EventOutcome,
  KIND_BATTERY,
  type OutageModel,
  type OutageTraceSink,
  TIER_CRITICAL,
} from './outage-model.js';
import type { OutageResult } from './outage-result.js';
import {
  advanceSegment,
  loseCritical,
  returnHealthyUnits,
  SHED_REL_TOL,
  shutDown,
  TIME_EPS_H,
} from './outage-segment.js';

export type { EventOutcome, OutageHooks, OutageTraceSink } from './outage-model.js';
export { buildOutageModel, OutageModel } from './outage-model.js';
export { OutageResult } from './outage-result.js';

/** A guard against a segment loop that cannot advance (never reached by a consistent model). */
const MAX_SEGMENTS_PER_STEP = 64;

/**
 * The outage model of a case, wired to the sampler's hourly conditions and to the frequency
 * engine for contingencies (one preallocated EventResult and operating point per model: build
 * one model per worker). Throws CaseError for a fuel curve or battery window that cannot work.
 */
export function compileOutage(c: Case, sampler: SamplerContext, island: Island): OutageModel {
  const ev = new EventResult(c.sources.length, c.loads.length);
  const opts: EventOptions = {
    horizonS: c.monteCarlo.horizonS,
    rocofWindowS: c.monteCarlo.rocofWindowS,
  };
  return buildOutageModel(c, {
    conditionsAtHour: (hourOfYear, outLoadKw, outAvailableKw) =>
      conditionsAtHour(sampler, hourOfYear, outLoadKw, outAvailableKw),
    runContingency: (op) => {
      simulateEvent(island, op, opts, ev);
      return ev;
    },
  });
}

/**
 * Simulates the outage of scenario `sc` after its frequency event `ev`, into `out`; `trace`
 * receives every segment (for replay).
 */
export function simulateOutage(
  m: OutageModel,
  sc: Scenario,
  ev: EventOutcome,
  out: OutageResult,
  trace?: OutageTraceSink,
): void {
  out.reset();
  m.trace = trace ?? null;
  const n = m.sourceCount;
  const outageH = sc.outageDurationH;
  out.outageH = outageH;
  m.worstSeverity = -1;
  m.worstShedKw = 0;
  m.worstSource = -1;
  m.worstAtH = 0;
  m.worstCause = '';

  let minSoc = Number.POSITIVE_INFINITY;
  const eventFailed = ev.status === 'failed';
  for (let i = 0; i < n; i++) {
    const failed = sc.available[i] === 0 || sc.failsToStart[i] === 1 ? 1 : 0;
    m.failed[i] = failed;
    // A frequency event that failed numerically says nothing about who is online: keep the
    // pre-separation commitment (the runner reports the failed event separately).
    const online = eventFailed ? sc.running[i] === 1 : ev.runningAtEnd[i] === 1;
    m.running[i] = failed === 0 && online ? 1 : 0;
    m.fuelLeft[i] = m.fuelStock[i]!;
    if (m.kind[i] === KIND_BATTERY) {
      const s = ev.socAtEnd[i]!;
      m.soc[i] = !eventFailed && Number.isFinite(s) ? s : sc.socFraction[i]!;
      if (failed === 0 && m.soc[i]! < minSoc) minSoc = m.soc[i]!;
    } else m.soc[i] = 0;
  }
  if (Number.isFinite(minSoc)) out.minSoc = minSoc;
  for (let j = 0; j < m.loadCount; j++) m.loadCap[j] = eventFailed ? 1 : ev.loadServedFraction[j]!;

  // The first minute (the frequency event): the load shed at its end, or all load after a
  // shutdown, is counted unserved over the whole event (an upper bound of at most horizonS).
  const t0 = Math.min(m.eventH, outageH);
  let loadKw = 0;
  let criticalKw = 0;
  for (let j = 0; j < m.loadCount; j++) {
    loadKw += sc.loadKw[j]!;
    if (m.loadTier[j] === TIER_CRITICAL) criticalKw += sc.loadKw[j]!;
  }
  m.down = false;
  m.downSinceH = 0;
  if (eventFailed) {
    // Nothing known about the first minute: the balance starts from the pre-separation state.
    out.servedKwh += loadKw * t0;
  } else if (ev.shutdown) {
    shutDown(m, out, 0, criticalKw);
    out.unservedKwh += loadKw * t0;
    out.unservedCriticalKwh += criticalKw * t0;
    if (loadKw > 0) out.lolH += t0;
  } else {
    const shedKw = ev.shedKwByTier[0]! + ev.shedKwByTier[1]! + ev.shedKwByTier[2]!;
    out.unservedKwh += shedKw * t0;
    out.servedKwh += (loadKw - shedKw) * t0;
    out.unservedCriticalKwh += ev.shedKwByTier[TIER_CRITICAL]! * t0;
    if (shedKw > SHED_REL_TOL * loadKw) out.lolH += t0;
    let criticalCut = ev.shedKwByTier[TIER_CRITICAL]! > SHED_REL_TOL * criticalKw;
    for (let j = 0; j < m.loadCount; j++)
      if (m.loadTier[j] === TIER_CRITICAL && m.loadCap[j]! < 1 && sc.loadKw[j]! > 0)
        criticalCut = true;
    if (criticalCut) loseCritical(out, 0);
  }

  const stepH = m.stepH;
  let t = t0;
  let firstStep = true;
  let hourLoaded = -1;
  while (outageH - t > TIME_EPS_H) {
    const k = Math.floor(t / stepH + TIME_EPS_H);
    let stepEnd = (k + 1) * stepH;
    if (stepEnd - t <= TIME_EPS_H) stepEnd += stepH;
    // Steps also end on the hour, where the conditions change (a step that does not divide an
    // hour, e.g. 0.3 h, is cut there).
    const hourIndex = Math.floor(t + TIME_EPS_H);
    if (stepEnd > hourIndex + 1) stepEnd = hourIndex + 1;
    if (stepEnd > outageH) stepEnd = outageH;
    if (hourIndex !== hourLoaded) {
      loadConditions(m, sc, hourIndex);
      hourLoaded = hourIndex;
    }
    if (!firstStep) {
      m.loadCap.fill(1);
      if (!m.down) returnHealthyUnits(m);
    }
    firstStep = false;
    let guard = 0;
    while (stepEnd - t > TIME_EPS_H) {
      t = advanceSegment(m, sc, out, t, stepEnd);
      if (++guard > MAX_SEGMENTS_PER_STEP + 4 * n)
        throw new RunError(
          `outage energy balance of scenario ${sc.scenarioId} did not advance at ${t} h`,
        );
    }
    t = stepEnd;
  }

  if (!out.criticalLost) out.survivedH = outageH;
  out.worstContingency = describeWorstContingency(m);
  m.trace = null;
}

/** The hour's load and available power: the scenario's own in the event hour, then the sampler's. */
function loadConditions(m: OutageModel, sc: Scenario, hourIndex: number): void {
  if (hourIndex === 0) {
    m.hourLoadKw.set(sc.loadKw);
    m.hourAvailableKw.set(sc.availableKw);
  } else {
    m.hooks.conditionsAtHour(
      (sc.hourOfYear + hourIndex) % HOURS_PER_YEAR,
      m.hourLoadKw,
      m.hourAvailableKw,
    );
  }
}
