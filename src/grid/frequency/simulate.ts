/**
 * The frequency engine's driver: one separation event from the operating point `op` to the
 * horizon (or to a shutdown), with every threshold crossing located in time.
 *
 * Method (see docs/frequency-engine.md for the measurements behind it): adaptive Dormand-Prince
 * 5(4) (src/numeric/dormand-prince.ts). After each accepted step every monitor (protection.ts)
 * is tested for a change of state between the step's ends and, for frequency monitors, at an
 * extremum inside the step; the earliest crossing is located by Illinois root finding on the
 * dense output, the step is cut there and the integrator restarted. Timed actions (relay delays,
 * breaker times, a standby unit's start, the end of momentary cessation) are landed on exactly by
 * limiting the step. The windowed RoCoF is checked at its samples (every window / 5), so a RoCoF
 * trip is late by at most one sample interval.
 *
 * The engine never draws random numbers; everything random is in `op` (the sampler's Scenario).
 * A run whose integration fails (step-size underflow, non-finite state) ends with status
 * 'failed' and finite metrics up to that time, never NaN.
 */
import { DormandPrince, type StepControl } from '../../numeric/dormand-prince.js';
import { illinoisRoot, type ScalarFunction } from '../../numeric/root.js';
import type { Scenario } from '../../sample/scenario.js';
import type { EventResult } from './event-result.js';
import { type Island, SourceKind } from './island.js';
import { refreshLoadTotals } from './loads.js';
import { OutcomeTracker } from './outcome.js';
import { FREQUENCY_QUANTITY, MonitorAction, ROCOF_QUANTITY } from './protection.js';
import { shedStage } from './shedding.js';
import { IslandEquations } from './swing.js';

export interface EventOptions {
  horizonS: number;
  rocofWindowS: number;
  /** Integrator tolerances; defaults below were chosen from the benchmark (docs). */
  relTol?: number;
  absTol?: number;
  maxStepS?: number;
  /**
   * Grid-following battery power loops with a time constant at or below this are treated as
   * instantaneous (quasi-steady state), s. Default 0: every lag is kept as a state. Such lags
   * are the stiffest modes and set the cost of an explicit method (docs/frequency-engine.md).
   */
  quasiSteadyLagS?: number;
}

export interface TraceSink {
  intervalS: number;
  record(
    tS: number,
    fHz: number,
    rocofHzPerS: number,
    pKw: Float64Array,
    loadKw: number,
    shedKw: number,
  ): void;
}

/** Default tolerances: relative 1e-4 and absolute 1e-6 pu (60 uHz at 60 Hz), from the benchmark's accuracy figures. */
export const DEFAULT_REL_TOL = 1e-4;
export const DEFAULT_ABS_TOL = 1e-6;
/** Largest step, s: keeps RoCoF samples and relay timing dense enough. */
export const DEFAULT_MAX_STEP_S = 2;
/** Smallest step before the run is declared failed, s. */
const MIN_STEP_S = 1e-10;
/** Accepted steps after which a run is declared failed (a chattering or runaway model). */
const MAX_STEPS = 200_000;
/** Time tolerance of located crossings, s. */
const CROSSING_TOL_S = 1e-9;

/** One monitored quantity on the dense output minus its level, for root finding. */
class MonitorGap implements ScalarFunction {
  integ: DormandPrince | null = null;
  index = 0;
  level = 0;
  value(theta: number): number {
    return this.integ!.interpolateComponent(this.index, theta) - this.level;
  }
}

/** Integrator, equations and scratch of one island (one per island, reused). */
class Engine {
  readonly integ: DormandPrince;
  readonly eq: IslandEquations;
  readonly x: Float64Array;
  readonly xTrace: Float64Array;
  readonly dxScratch: Float64Array;
  readonly pKw: Float64Array;
  readonly tracker = new OutcomeTracker();
  readonly gap = new MonitorGap();
  /** Monitors on a state (quantity >= 1) and on the frequency, by index. */
  readonly stateMonitors: Int32Array;
  readonly frequencyMonitors: Int32Array;
  /**
   * Frequency band (pu) inside which no enabled frequency monitor changes state: every
   * frequency monitor is skipped for a step whose end and interior extremum lie strictly inside.
   * Recomputed when a monitor's state or enabling changed (`bandDirty`).
   */
  bandLoPu = 0;
  bandHiPu = 0;
  bandDirty = true;
  constructor(readonly isl: Island) {
    const state: number[] = [];
    const freq: number[] = [];
    for (let k = 0; k < isl.monitorCount; k++) {
      const q = isl.monQuantity[k]!;
      if (q === FREQUENCY_QUANTITY) freq.push(k);
      else if (q !== ROCOF_QUANTITY) state.push(k);
    }
    this.stateMonitors = Int32Array.from(state);
    this.frequencyMonitors = Int32Array.from(freq);
    this.integ = new DormandPrince(isl.stateCount, isl.readStateCount);
    this.eq = new IslandEquations(isl);
    this.x = new Float64Array(isl.stateCount);
    this.xTrace = new Float64Array(isl.stateCount);
    this.dxScratch = new Float64Array(isl.stateCount);
    this.pKw = new Float64Array(isl.sourceCount);
  }
}

const engines = new WeakMap<Island, Engine>();

function engineFor(isl: Island): Engine {
  let e = engines.get(isl);
  if (!e) {
    e = new Engine(isl);
    engines.set(isl, e);
  }
  return e;
}

/** Value of monitor k's quantity in state x (frequency monitors read x[0]). */
function monitorValue(isl: Island, k: number, x: Float64Array): number {
  const q = isl.monQuantity[k]!;
  return x[q === FREQUENCY_QUANTITY ? 0 : q]!;
}

function isActive(isl: Island, k: number, v: number): boolean {
  return isl.monBelow[k] === 1 ? v < isl.monLevel[k]! : v > isl.monLevel[k]!;
}

function hasFormingSource(isl: Island): boolean {
  for (let i = 0; i < isl.sourceCount; i++) {
    if (isl.online[i] === 0 || isl.ceased[i] === 1) continue;
    if (isl.kind[i] === SourceKind.genset) return true;
    if (isl.kind[i] === SourceKind.battery && isl.gridForming[i] === 1 && isl.socEmpty[i] === 0)
      return true;
  }
  return false;
}

/** Sets up the work arrays and the state at t = 0+ from the operating point. */
function initialise(e: Engine, op: Scenario, out: EventResult, quasiSteadyLagS: number): void {
  const isl = e.isl;
  const sb = isl.baseKw;
  const x = e.x;
  x.fill(0);
  let loadKw = 0;
  for (let j = 0; j < isl.loadCount; j++) {
    const kw = op.loadKw[j]!;
    isl.loadKwAtEvent[j] = kw;
    isl.loadServedPu[j] = kw / sb;
    loadKw += kw;
  }
  let onlineKw = 0;
  for (let i = 0; i < isl.sourceCount; i++) {
    const ip = isl.powerState[i]!;
    const running = op.available[i] === 1 && op.running[i] === 1;
    const lost = running && op.trippedAtSeparation[i] === 1;
    const online = running && !lost;
    isl.online[i] = online ? 1 : 0;
    out.tripped[i] = lost ? 1 : 0;
    isl.dispatchPu[i] = online ? op.dispatchKw[i]! / sb : 0;
    isl.availablePu[i] = op.availableKw[i]! / sb;
    const ceased = online && op.cessationS[i]! > 0;
    isl.ceased[i] = ceased ? 1 : 0;
    isl.cessationEndS[i] = ceased ? op.cessationS[i]! : Number.POSITIVE_INFINITY;
    isl.startAtS[i] =
      isl.standby[i] === 1 && op.available[i] === 1 && !running && op.failsToStart[i] === 0
        ? isl.startDelayS[i]!
        : Number.POSITIVE_INFINITY;
    isl.socEmpty[i] = 0;
    isl.socFull[i] = 0;
    isl.rotorRecovering[i] = 0;
    isl.algState[i] = 0;
    isl.quasiSteady[i] =
      isl.kind[i] === SourceKind.battery &&
      isl.gridForming[i] === 0 &&
      isl.lagTimeS[i]! <= quasiSteadyLagS
        ? 1
        : 0;
    const kind = isl.kind[i];
    if (kind === SourceKind.battery) {
      const soc = op.socFraction[i]!;
      x[isl.auxState[i]!] = soc;
      if (soc <= isl.socMinFraction[i]!) isl.socEmpty[i] = 1;
      if (soc >= isl.socMaxFraction[i]!) isl.socFull[i] = 1;
      if (isl.gridForming[i] === 0) x[ip] = ceased ? 0 : isl.dispatchPu[i]!;
      // (a quasi-steady grid-following unit ignores its power state: its output is algebraic)
    } else if (kind !== SourceKind.wind) x[ip] = ceased ? 0 : isl.dispatchPu[i]!;
    if (online && !ceased) onlineKw += op.dispatchKw[i]!;
  }
  out.deficitKw = loadKw - onlineKw;
  isl.modesChanged = true;
  e.bandDirty = true;
  refreshLoadTotals(isl);
  isl.timersDirty = true;
  for (let k = 0; k < isl.monitorCount; k++) {
    isl.monEnabled[k] = 1;
    isl.monTimerS[k] = Number.POSITIVE_INFINITY;
    isl.monActionTimerS[k] = Number.POSITIVE_INFINITY;
    const q = isl.monQuantity[k]!;
    const active = q === ROCOF_QUANTITY ? false : isActive(isl, k, monitorValue(isl, k, x));
    isl.monActive[k] = active ? 1 : 0;
    const a = isl.monAction[k];
    if ((a === MonitorAction.batteryEmpty || a === MonitorAction.batteryFull) && active)
      isl.monEnabled[k] = 0; // already latched above
    else if (active) isl.monTimerS[k] = isl.monDelayS[k]!;
  }
}

function nextTimerS(isl: Island): number {
  if (!isl.timersDirty) return isl.nextTimerS;
  isl.timersDirty = false;
  let t = Number.POSITIVE_INFINITY;
  for (let k = 0; k < isl.monitorCount; k++) {
    if (isl.monEnabled[k] === 0) continue;
    const a = isl.monTimerS[k]!;
    const b = isl.monActionTimerS[k]!;
    if (a < t) t = a;
    if (b < t) t = b;
  }
  for (let i = 0; i < isl.sourceCount; i++) {
    const a = isl.startAtS[i]!;
    const b = isl.cessationEndS[i]!;
    if (a < t) t = a;
    if (b < t) t = b;
  }
  isl.nextTimerS = t;
  return t;
}

/** Performs monitor k's action at tS. Returns true if the equations changed. */
function act(e: Engine, k: number, tS: number, out: EventResult): boolean {
  const isl = e.isl;
  const i = isl.monTarget[k]!;
  switch (isl.monAction[k]) {
    case MonitorAction.tripUnit:
      if (isl.online[i] === 0) return false;
      isl.online[i] = 0;
      isl.modesChanged = true;
      out.tripped[i] = 1;
      if (!hasFormingSource(isl)) shutdown(out, 'no grid-forming source');
      return true;
    case MonitorAction.shedStage:
      isl.monEnabled[k] = 0;
      shedStage(isl, i, tS, out);
      return true;
    case MonitorAction.shutdownUnderFrequency:
      shutdown(out, 'under-frequency');
      return true;
    case MonitorAction.shutdownOverFrequency:
      shutdown(out, 'over-frequency');
      return true;
    case MonitorAction.batteryEmpty:
      isl.monEnabled[k] = 0;
      isl.socEmpty[i] = 1;
      if (isl.online[i] === 1 && isl.gridForming[i] === 1 && !hasFormingSource(isl))
        shutdown(out, 'battery exhausted');
      return true;
    case MonitorAction.batteryFull:
      isl.monEnabled[k] = 0;
      isl.socFull[i] = 1;
      return true;
    case MonitorAction.rotorAtMinimum:
      isl.monEnabled[k] = 0;
      isl.rotorRecovering[i] = 1;
      return true;
  }
  return false;
}

function shutdown(out: EventResult, cause: string): void {
  if (out.shutdown) return;
  out.shutdown = true;
  out.shutdownCause = cause;
  out.status = 'shutdown';
  out.message = `island shut down: ${cause}`;
}

/** Fires every timer due at tS. Returns true if the equations changed. */
function fireTimers(e: Engine, tS: number, out: EventResult): boolean {
  const isl = e.isl;
  if (isl.nextTimerS > tS + CROSSING_TOL_S && !isl.timersDirty) return false;
  isl.timersDirty = true;
  e.bandDirty = true;
  const due = tS + CROSSING_TOL_S;
  let changed = false;
  for (let k = 0; k < isl.monitorCount && !out.shutdown; k++) {
    if (isl.monEnabled[k] === 0) continue;
    if (isl.monTimerS[k]! <= due) {
      isl.monTimerS[k] = Number.POSITIVE_INFINITY;
      const d = isl.monActionDelayS[k]!;
      if (d > 0) isl.monActionTimerS[k] = tS + d;
      else if (act(e, k, tS, out)) changed = true;
    }
    if (isl.monActionTimerS[k]! <= due && isl.monEnabled[k] === 1) {
      isl.monActionTimerS[k] = Number.POSITIVE_INFINITY;
      if (act(e, k, tS, out)) changed = true;
    }
  }
  for (let i = 0; i < isl.sourceCount; i++) {
    if (isl.startAtS[i]! <= due) {
      // Standby genset closes onto the island at zero load and follows its governor.
      isl.startAtS[i] = Number.POSITIVE_INFINITY;
      isl.online[i] = 1;
      isl.modesChanged = true;
      isl.dispatchPu[i] = 0;
      e.x[isl.powerState[i]!] = 0;
      const iv = isl.auxState[i]!;
      const iz = isl.integralState[i]!;
      if (iv >= 0) e.x[iv] = 0;
      if (iz >= 0) e.x[iz] = 0;
      changed = true;
    }
    if (isl.cessationEndS[i]! <= due) {
      isl.cessationEndS[i] = Number.POSITIVE_INFINITY;
      isl.ceased[i] = 0;
      isl.modesChanged = true;
      changed = true;
    }
  }
  return changed;
}

/** Toggles every state monitor whose condition changed at state x (after a cut step). */
function updateMonitorStates(e: Engine, x: Float64Array, tS: number): void {
  const isl = e.isl;
  e.bandDirty = true;
  for (let k = 0; k < isl.monitorCount; k++) {
    if (isl.monEnabled[k] === 0 || isl.monQuantity[k] === ROCOF_QUANTITY) continue;
    const active = isActive(isl, k, monitorValue(isl, k, x));
    if (active === (isl.monActive[k] === 1)) continue;
    isl.monActive[k] = active ? 1 : 0;
    isl.monTimerS[k] = active ? tS + isl.monDelayS[k]! : Number.POSITIVE_INFINITY;
    isl.timersDirty = true;
  }
}

/** RoCoF monitors, checked at the latest windowed RoCoF sample. */
function updateRocofMonitors(isl: Island, rocofHzPerS: number, tS: number): void {
  const a = rocofHzPerS < 0 ? -rocofHzPerS : rocofHzPerS;
  for (let k = 0; k < isl.monitorCount; k++) {
    if (isl.monEnabled[k] === 0 || isl.monQuantity[k] !== ROCOF_QUANTITY) continue;
    const active = a > isl.monLevel[k]!;
    if (active === (isl.monActive[k] === 1)) continue;
    isl.monActive[k] = active ? 1 : 0;
    isl.monTimerS[k] = active ? tS + isl.monDelayS[k]! : Number.POSITIVE_INFINITY;
    isl.timersDirty = true;
  }
}

/** The band of frequencies (pu) in which every enabled frequency monitor keeps its state. */
function refreshBand(e: Engine): void {
  const isl = e.isl;
  let lo = Number.NEGATIVE_INFINITY;
  let hi = Number.POSITIVE_INFINITY;
  const list = e.frequencyMonitors;
  for (let a = 0; a < list.length; a++) {
    const k = list[a]!;
    if (isl.monEnabled[k] === 0) continue;
    const level = isl.monLevel[k]!;
    // below: active while f < level, inactive while f >= level; above: the mirror image.
    // The band is taken open at every level (conservative at equality).
    const upperBound = (isl.monBelow[k] === 1) === (isl.monActive[k] === 1);
    if (upperBound) {
      if (level < hi) hi = level;
    } else if (level > lo) lo = level;
  }
  e.bandLoPu = lo;
  e.bandHiPu = hi;
  e.bandDirty = false;
}

/** Earliest crossing of monitor k inside the last accepted step as theta, or `best` if none earlier. */
function monitorCrossing(e: Engine, k: number, best: number): number {
  const isl = e.isl;
  const integ = e.integ;
  const q = isl.monQuantity[k]!;
  const thetaExt = e.tracker.extremumTheta;
  const wasActive = isl.monActive[k] === 1;
  let a = 0;
  let b = 1;
  if (
    q === FREQUENCY_QUANTITY &&
    thetaExt >= 0 &&
    isActive(isl, k, e.tracker.extremumPu) !== wasActive
  )
    b = thetaExt;
  else if (isActive(isl, k, monitorValue(isl, k, integ.y1)) === wasActive) return best;
  else if (q === FREQUENCY_QUANTITY && thetaExt >= 0) a = thetaExt;
  if (a >= best) return best;
  const gap = e.gap;
  gap.integ = integ;
  gap.index = q === FREQUENCY_QUANTITY ? 0 : q;
  gap.level = isl.monLevel[k]!;
  const ga = gap.value(a);
  const gb = gap.value(b);
  const theta = illinoisRoot(gap, a, b, ga, gb, CROSSING_TOL_S / integ.hS);
  return Math.min(theta, best);
}

/**
 * Earliest monitor crossing inside the last accepted step, as theta in (0, 1]; 2 if none.
 * Frequency monitors are also tested at the step's interior extremum; they are skipped together
 * when the step's end and extremum stay inside the band where none of them changes state.
 */
function earliestCrossing(e: Engine): number {
  const isl = e.isl;
  let best = 2;
  const states = e.stateMonitors;
  for (let a = 0; a < states.length; a++) {
    const k = states[a]!;
    if (isl.monEnabled[k] === 1) best = monitorCrossing(e, k, best);
  }
  if (e.bandDirty) refreshBand(e);
  const f1 = e.integ.y1[0]!;
  const thetaExt = e.tracker.extremumTheta;
  const fExt = e.tracker.extremumPu;
  const inside =
    f1 > e.bandLoPu &&
    f1 < e.bandHiPu &&
    (thetaExt < 0 || (fExt > e.bandLoPu && fExt < e.bandHiPu));
  if (inside) return best;
  const freq = e.frequencyMonitors;
  for (let a = 0; a < freq.length; a++) {
    const k = freq[a]!;
    if (isl.monEnabled[k] === 1) best = monitorCrossing(e, k, best);
  }
  return best;
}

function traceSample(e: Engine, tS: number, x: Float64Array, trace: TraceSink, out: EventResult) {
  const isl = e.isl;
  e.eq.derivatives(tS, x, e.dxScratch);
  let loadKw = 0;
  for (let j = 0; j < isl.loadCount; j++) loadKw += isl.loadServedPu[j]! * isl.baseKw;
  for (let i = 0; i < isl.sourceCount; i++) e.pKw[i] = isl.outputPu[i]! * isl.baseKw;
  trace.record(tS, isl.f0Hz * (1 + x[0]!), isl.f0Hz * e.dxScratch[0]!, e.pKw, loadKw, out.shedKw);
}

/** Simulates one separation event into `out` (overwritten). Never throws for a diverging run. */
export function simulateEvent(
  island: Island,
  op: Scenario,
  opts: EventOptions,
  out: EventResult,
  trace?: TraceSink,
): void {
  const e = engineFor(island);
  const isl = island;
  const integ = e.integ;
  const f0 = isl.f0Hz;
  const ctl: StepControl = {
    relTol: opts.relTol ?? DEFAULT_REL_TOL,
    absTol: opts.absTol ?? DEFAULT_ABS_TOL,
    maxStepS: opts.maxStepS ?? DEFAULT_MAX_STEP_S,
    minStepS: MIN_STEP_S,
  };
  const horizonS = opts.horizonS;
  out.reset();
  integ.steps = 0;
  integ.rejected = 0;
  integ.evaluations = 0;
  initialise(e, op, out, opts.quasiSteadyLagS ?? 0);
  const x = e.x;
  let t = 0;
  const tracker = e.tracker;
  tracker.start(opts.rocofWindowS, 0);
  let nextTraceS = 0;
  if (trace) {
    traceSample(e, 0, x, trace, out);
    nextTraceS = trace.intervalS;
  }
  if (!hasFormingSource(isl)) shutdown(out, 'no grid-forming source');
  fireTimers(e, 0, out);
  integ.restart(e.eq, 0, x, 0);
  integ.nextHS = DormandPrince.initialStepS(x, integ.k7, ctl);
  while (!out.shutdown && t < horizonS) {
    if (isl.collapsed) {
      shutdown(out, 'grid-forming overload');
      break;
    }
    const tStop = Math.min(horizonS, nextTimerS(isl));
    const maxH = tStop - t;
    if (maxH > CROSSING_TOL_S) {
      if (integ.steps >= MAX_STEPS) {
        out.status = 'failed';
        out.message = `integration failed at t = ${t.toFixed(6)} s: more than ${MAX_STEPS} steps`;
        break;
      }
      if (integ.step(e.eq, maxH, ctl) === 'failed') {
        out.status = 'failed';
        out.message = `integration failed at t = ${t.toFixed(6)} s (step-size underflow or non-finite state)`;
        break;
      }
      tracker.findExtremum(integ);
      const theta = earliestCrossing(e);
      const cut = theta < 1;
      const thetaEnd = cut ? theta : 1;
      const sampled = tracker.segment(integ, thetaEnd);
      if (trace) {
        while (nextTraceS <= integ.t0 + thetaEnd * integ.hS) {
          integ.interpolate((nextTraceS - integ.t0) / integ.hS, e.xTrace);
          traceSample(e, nextTraceS, e.xTrace, trace, out);
          nextTraceS += trace.intervalS;
        }
      }
      if (cut) {
        integ.interpolate(theta, x);
        t = integ.t0 + theta * integ.hS;
      } else {
        x.set(integ.y1);
        t = integ.hS === maxH ? tStop : integ.t1;
      }
      if (sampled && tracker.rocofReady) updateRocofMonitors(isl, f0 * tracker.rocofNowPuPerS, t);
      if (theta <= 1) updateMonitorStates(e, x, t);
      if (cut) integ.restart(e.eq, t, x, 0);
      else integ.t1 = t;
    } else t = tStop;
    if (fireTimers(e, t, out) && !out.shutdown) integ.restart(e.eq, t, x, 0);
  }
  finish(e, t, out);
}

function finish(e: Engine, tS: number, out: EventResult): void {
  const isl = e.isl;
  const x = e.x;
  const f0 = isl.f0Hz;
  const tr = e.tracker;
  let dw = x[0]!;
  if (!Number.isFinite(dw)) dw = tr.nadirPu;
  if (!Number.isFinite(out.deficitKw)) out.deficitKw = 0;
  out.endTimeS = tS;
  out.fSettledHz = f0 * (1 + dw);
  out.nadirHz = f0 * (1 + Math.min(tr.nadirPu, dw));
  out.nadirTimeS = tr.nadirPu <= dw ? tr.nadirTimeS : tS;
  out.zenithHz = f0 * (1 + Math.max(tr.zenithPu, dw));
  out.zenithTimeS = tr.zenithPu >= dw ? tr.zenithTimeS : tS;
  out.rocofMaxHzPerS = f0 * tr.rocofMaxPuPerS;
  if (out.status !== 'failed') e.eq.derivatives(tS, x, e.dxScratch);
  let tripped = 0;
  for (let i = 0; i < isl.sourceCount; i++) {
    out.runningAtEnd[i] = isl.online[i]!;
    const p = isl.outputPu[i]! * isl.baseKw;
    out.outputKwAtEnd[i] = Number.isFinite(p) ? p : 0;
    out.socAtEnd[i] = isl.kind[i] === SourceKind.battery ? x[isl.auxState[i]!]! : 0;
    const ekwh = (x[isl.energyState[i]!]! * isl.baseKw) / 3600;
    out.energyDeliveredKwh[i] = Number.isFinite(ekwh) ? ekwh : 0;
    if (!Number.isFinite(out.socAtEnd[i]!)) out.socAtEnd[i] = 0;
    tripped += out.tripped[i]!;
  }
  out.unitsTripped = tripped;
  out.steps = e.integ.steps;
  out.rhsEvaluations = e.integ.evaluations;
  out.rejectedSteps = e.integ.rejected;
}
