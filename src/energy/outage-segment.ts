/**
 * One segment of the outage energy balance: the failures due at its start (contingencies through
 * the frequency engine, contingency.ts), shutdown and black start, the dispatch (dispatch.ts), the
 * end of the segment where a state limit is reached, and the integration of state of charge,
 * fuel and the energy accounts over it. The equations and the conservation check are in the
 * header of outage.ts; the conventions in docs/outage-energy.md.
 */

import type { Scenario } from '../sample/scenario.js';
import { hoursToFloor, hoursToFull, socAfter } from './battery-energy.js';
import { fillContingencyPoint, recordContingency } from './contingency.js';
import { dispatchSegment, SOC_MARGIN } from './dispatch.js';
import { fuelRateLPerH } from './genset-fuel.js';
import {
  KIND_BATTERY,
  KIND_FUELCELL,
  KIND_GENSET,
  type OutageModel,
  TIER_CRITICAL,
} from './outage-model.js';
import type { OutageResult } from './outage-result.js';

/** Time tolerance of step and segment ends, h (3.6 microseconds). */
export const TIME_EPS_H = 1e-9;
/** Load counts as unserved when more than this fraction of the demand is shed. */
export const SHED_REL_TOL = 1e-9;

/** Healthy units tripped by protection (not failed, fuel left) are back online. */
export function returnHealthyUnits(m: OutageModel): void {
  for (let i = 0; i < m.sourceCount; i++)
    m.running[i] = m.failed[i] === 0 && m.fuelLeft[i]! > 0 ? 1 : 0;
}

export function loseCritical(out: OutageResult, tH: number): void {
  if (out.criticalLost) return;
  out.criticalLost = true;
  out.survivedH = tH;
}

export function shutDown(m: OutageModel, out: OutageResult, tH: number, criticalKw: number): void {
  m.down = true;
  m.downSinceH = tH;
  m.running.fill(0);
  m.outKw.fill(0);
  if (!out.shutdown) {
    out.shutdown = true;
    out.shutdownHour = tH;
  }
  if (criticalKw > 0) loseCritical(out, tH);
}

/** A grid-forming source could restart the island: a healthy genset with fuel or a charged battery. */
function canBlackStart(m: OutageModel): boolean {
  for (let i = 0; i < m.sourceCount; i++) {
    if (m.failed[i] === 1) continue;
    if (m.kind[i] === KIND_GENSET && m.fuelLeft[i]! > 0) return true;
    if (
      m.kind[i] === KIND_BATTERY &&
      m.gridForming[i] === 1 &&
      m.soc[i]! > m.socMin[i]! + SOC_MARGIN
    )
      return true;
  }
  return false;
}

function criticalDemandKw(m: OutageModel): number {
  let kw = 0;
  for (let j = 0; j < m.loadCount; j++) if (m.loadTier[j] === TIER_CRITICAL) kw += m.hourLoadKw[j]!;
  return kw;
}

/** Failures due at tH: each running unit's failure triggers one frequency event. */
function processFailures(m: OutageModel, sc: Scenario, out: OutageResult, tH: number): void {
  for (let k = 0; k < m.sourceCount; k++) {
    if (m.failed[k] === 1 || sc.timeToFailureH[k]! > tH + TIME_EPS_H) continue;
    const wasRunning = m.running[k] === 1 && !m.down;
    if (!wasRunning) {
      m.failed[k] = 1;
      m.running[k] = 0;
      continue;
    }
    dispatchSegment(m);
    m.failed[k] = 1;
    const kind = m.kind[k];
    const formsGrid = kind === KIND_GENSET || (kind === KIND_BATTERY && m.gridForming[k] === 1);
    if (!formsGrid && m.outKw[k] === 0) {
      // A grid-following unit at zero output (PV at night, an idle battery) leaves no imbalance
      // and no inertia behind: no frequency event.
      m.running[k] = 0;
      continue;
    }
    fillContingencyPoint(m, sc, k, tH);
    m.running[k] = 0;
    const ev = m.hooks.runContingency(m.op);
    out.contingencies++;
    if (ev.status === 'failed') {
      // The event diverged: the unit is lost, nothing else is known to change.
      out.contingencyEventsFailed++;
      continue;
    }
    recordContingency(m, ev, k, tH);
    if (ev.shutdown) {
      shutDown(m, out, tH, criticalDemandKw(m));
      continue;
    }
    for (let i = 0; i < m.sourceCount; i++) {
      m.running[i] = m.running[i] === 1 && ev.runningAtEnd[i] === 1 ? 1 : 0;
      if (m.kind[i] === KIND_BATTERY && m.running[i] === 1) {
        const s = ev.socAtEnd[i]!;
        if (Number.isFinite(s)) m.soc[i] = s;
      }
    }
    for (let j = 0; j < m.loadCount; j++) {
      const served = ev.loadServedFraction[j]!;
      if (served < m.loadCap[j]!) m.loadCap[j] = served;
    }
    if (ev.shedKwByTier[TIER_CRITICAL]! > 0) loseCritical(out, tH);
  }
}

function nextFailureH(m: OutageModel, sc: Scenario): number {
  let next = Number.POSITIVE_INFINITY;
  for (let i = 0; i < m.sourceCount; i++)
    if (m.failed[i] === 0 && sc.timeToFailureH[i]! < next) next = sc.timeToFailureH[i]!;
  return next;
}

/** Integrates one segment from tH (at most to stepEnd) and returns where it ended. */
export function advanceSegment(
  m: OutageModel,
  sc: Scenario,
  out: OutageResult,
  tH: number,
  stepEnd: number,
): number {
  processFailures(m, sc, out, tH);
  let segEnd = Math.min(stepEnd, nextFailureH(m, sc));

  if (m.down) {
    if (m.blackStartAllowed) {
      const restartAt = m.downSinceH + m.blackStartDelayH;
      if (tH >= restartAt - TIME_EPS_H) {
        if (canBlackStart(m)) {
          m.down = false;
          out.restarts++;
          m.loadCap.fill(1);
          returnHealthyUnits(m);
          return tH;
        }
      } else if (restartAt < segEnd) segEnd = restartAt;
    }
    const h = segEnd - tH;
    let demandKw = 0;
    let critKw = 0;
    for (let j = 0; j < m.loadCount; j++) {
      demandKw += m.hourLoadKw[j]!;
      if (m.loadTier[j] === TIER_CRITICAL) critKw += m.hourLoadKw[j]!;
    }
    out.unservedKwh += demandKw * h;
    out.unservedCriticalKwh += critKw * h;
    if (demandKw > 0) out.lolH += h;
    if (critKw > 0) loseCritical(out, tH);
    out.segments++;
    m.trace?.record(tH, h, demandKw, 0, 0, m.outKw, m.soc, true);
    return segEnd;
  }

  dispatchSegment(m);
  const f = m.flows;
  if (!f.gridFormed) {
    shutDown(m, out, tH, criticalDemandKw(m));
    return tH;
  }

  // Where the dispatch stops being valid: a battery at its floor or ceiling, a tank dry.
  let limiter = -1;
  let limiterH = 0;
  for (let i = 0; i < m.sourceCount; i++) {
    const p = m.outKw[i]!;
    const kind = m.kind[i];
    let dtH = Number.POSITIVE_INFINITY;
    if (kind === KIND_GENSET) {
      // A running set burns its no-load fuel even at zero output.
      if (m.fuelTracked[i] === 1 && m.running[i] === 1 && m.fuelLeft[i]! > 0)
        dtH = m.fuelLeft[i]! / fuelRateLPerH(m.fuelNoLoadLPerH[i]!, m.fuelSlopeLPerKwh[i]!, p);
    } else if (p === 0) {
      continue;
    } else if (kind === KIND_BATTERY) {
      dtH =
        p > 0
          ? hoursToFloor(m.soc[i]!, m.socMin[i]!, m.energyKwh[i]!, m.etaDischarge[i]!, p)
          : hoursToFull(m.soc[i]!, m.socMax[i]!, m.energyKwh[i]!, m.etaCharge[i]!, -p);
    } else if (kind === KIND_FUELCELL) {
      dtH = m.fuelLeft[i]! / p;
    }
    if (tH + dtH < segEnd) {
      segEnd = tH + dtH;
      limiter = i;
      limiterH = dtH;
    }
  }
  // The exact duration when a state limit ends the segment (a difference of absolute times would
  // lose digits for short segments late in a long outage).
  const h = limiter >= 0 ? limiterH : segEnd - tH;

  let sourcesKwh = (f.renewableKw + f.gensetKw + f.fuelCellKw) * h;
  let storedKwh = 0;
  let lossKwh = 0;
  for (let i = 0; i < m.sourceCount; i++) {
    const p = m.outKw[i]!;
    const kind = m.kind[i];
    if (kind === KIND_BATTERY) {
      if (p === 0) continue;
      const before = m.soc[i]!;
      let after = socAfter(before, m.energyKwh[i]!, m.etaCharge[i]!, m.etaDischarge[i]!, p, h);
      if (i === limiter) after = p > 0 ? m.socMin[i]! : m.socMax[i]!;
      m.soc[i] = after;
      const dKwh = m.energyKwh[i]! * (after - before);
      if (dKwh < 0) {
        sourcesKwh -= dKwh;
        lossKwh += p * h * (1 / m.etaDischarge[i]! - 1);
      } else {
        storedKwh += dKwh;
        lossKwh += -p * h * (1 - m.etaCharge[i]!);
      }
      if (!(after >= out.minSoc)) out.minSoc = after;
    } else if (kind === KIND_GENSET && m.running[i] === 1 && m.fuelLeft[i]! > 0) {
      if (m.fuelTracked[i] === 1) {
        const usedL = fuelRateLPerH(m.fuelNoLoadLPerH[i]!, m.fuelSlopeLPerKwh[i]!, p) * h;
        if (m.gasFuel[i] === 1) out.fuelUsedGasM3 += usedL;
        else out.fuelUsedL += usedL;
        m.fuelLeft[i] = i === limiter ? 0 : m.fuelLeft[i]! - usedL;
        if (m.fuelLeft[i]! <= 0) m.running[i] = 0;
      }
    } else if (kind === KIND_FUELCELL && p > 0) {
      out.fuelCellKwh += p * h;
      m.fuelLeft[i] = i === limiter ? 0 : m.fuelLeft[i]! - p * h;
      if (m.fuelLeft[i]! <= 0) m.running[i] = 0;
    }
  }
  const servedKwh = (f.demandKw - f.shedKw) * h;
  const spilledKwh = (f.curtailKw + f.dumpKw) * h;
  const sinksKwh = servedKwh + storedKwh + spilledKwh + lossKwh;
  const scaleKwh = Math.max(sourcesKwh, sinksKwh, m.balanceFloorKwh);
  const residual = Math.abs(sourcesKwh - sinksKwh) / scaleKwh;
  if (residual > out.energyBalanceError) out.energyBalanceError = residual;
  out.curtailedKwh += spilledKwh;
  out.storageLossKwh += lossKwh;
  const unservedKw = f.shedKw + f.cappedKw;
  const critUnservedKw = m.tierShedKw[TIER_CRITICAL]! + m.tierCappedKw[TIER_CRITICAL]!;
  out.servedKwh += servedKwh;
  out.unservedKwh += unservedKw * h;
  out.unservedCriticalKwh += critUnservedKw * h;
  if (unservedKw > SHED_REL_TOL * (f.demandKw + f.cappedKw)) out.lolH += h;
  const critDemandKw = m.tierDemandKw[TIER_CRITICAL]! + m.tierCappedKw[TIER_CRITICAL]!;
  if (critUnservedKw > SHED_REL_TOL * critDemandKw) loseCritical(out, tH);
  out.segments++;
  m.trace?.record(
    tH,
    h,
    f.demandKw + f.cappedKw,
    f.demandKw - f.shedKw,
    f.curtailKw + f.dumpKw,
    m.outKw,
    m.soc,
    false,
  );
  return segEnd;
}
