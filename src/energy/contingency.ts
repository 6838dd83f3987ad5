/**
 * A unit failure during the outage: the operating point handed to the frequency engine and
 * what its outcome does to the outage.
 *
 * The operating point is the segment's dispatch just before the failure: load = the load being
 * served, each source at its output (a genset surplus dumped at minimum loading is taken off the
 * gensets so the pre-failure balance is exact), no grid import, the failing unit flagged
 * `trippedAtSeparation` so its output is lost at t = 0. Units not online are marked as failing
 * to start so the engine does not start them. One event per failure (constant hazard, drawn by the
 * sampler as `timeToFailureH`; Billinton & Allan, Reliability Evaluation of Power Systems, 2nd ed.,
 * 1996, the exponential distribution of times to failure).
 */

import type { Scenario } from '../sample/scenario.js';
import {
  type EventOutcome,
  KIND_BATTERY,
  KIND_GENSET,
  KIND_PV,
  KIND_WIND,
  type OutageModel,
  TIER_CRITICAL,
} from './outage-model.js';

/** Hours in a (non-leap) year: profiles wrap around after hour 8759. */
export const HOURS_PER_YEAR = 8760;

/** Fills m.op for the failure of source `k` at `tH` hours after separation (dispatch is current). */
export function fillContingencyPoint(m: OutageModel, sc: Scenario, k: number, tH: number): void {
  const op = m.op;
  const f = m.flows;
  op.scenarioId = sc.scenarioId;
  op.weight = sc.weight;
  op.hourOfYear = (sc.hourOfYear + Math.floor(tH + 1e-9)) % HOURS_PER_YEAR;
  op.gridImportKw = 0;
  op.dipRetainedPu = 1;
  op.dipDurationS = 0;
  op.outageDurationH = Math.max(0, sc.outageDurationH - tH);
  const td = m.tierDemandKw;
  const ts = m.tierShedKw;
  for (let j = 0; j < m.loadCount; j++) {
    const tier = m.loadTier[j]!;
    const demand = td[tier]!;
    const servedShare = demand > 0 ? 1 - ts[tier]! / demand : 0;
    op.loadKw[j] = m.hourLoadKw[j]! * m.loadCap[j]! * servedShare;
  }
  const dumpShare = f.gensetKw > 0 ? f.dumpKw / f.gensetKw : 0;
  for (let i = 0; i < m.sourceCount; i++) {
    const on = m.running[i] === 1 ? 1 : 0;
    const kind = m.kind[i];
    op.available[i] = m.failed[i] === 1 && i !== k ? 0 : 1;
    op.running[i] = on;
    op.failsToStart[i] = on === 1 ? 0 : 1;
    op.trippedAtSeparation[i] = i === k ? 1 : 0;
    op.cessationS[i] = 0;
    op.timeToFailureH[i] = sc.timeToFailureH[i]!;
    op.socFraction[i] = kind === KIND_BATTERY ? m.soc[i]! : 0;
    let p = m.outKw[i]!;
    if (kind === KIND_GENSET) p -= p * dumpShare;
    op.dispatchKw[i] = on === 1 ? p : 0;
    if (on === 0) op.availableKw[i] = 0;
    else if (kind === KIND_PV || kind === KIND_WIND) op.availableKw[i] = m.hourAvailableKw[i]!;
    else if (kind === KIND_BATTERY)
      op.availableKw[i] = m.soc[i]! > m.socMin[i]! ? m.ratingKw[i]! : 0;
    else op.availableKw[i] = m.fuelLeft[i]! > 0 ? m.ratingKw[i]! : 0;
  }
}

/** 3 shutdown, 2 critical load shed, 1 load shed, 0 ridden through. */
export function contingencySeverity(ev: EventOutcome): number {
  if (ev.shutdown) return 3;
  if (ev.shedKwByTier[TIER_CRITICAL]! > 0) return 2;
  return ev.shedKw > 0 ? 1 : 0;
}

/** Keeps the worst contingency seen (severity first, then shed power). */
export function recordContingency(m: OutageModel, ev: EventOutcome, k: number, tH: number): void {
  const severity = contingencySeverity(ev);
  if (severity > m.worstSeverity || (severity === m.worstSeverity && ev.shedKw > m.worstShedKw)) {
    m.worstSeverity = severity;
    m.worstShedKw = ev.shedKw;
    m.worstSource = k;
    m.worstAtH = tH;
    m.worstCause = ev.shutdownCause;
  }
}

/** The worst contingency in words: `<source id> at <h> h: <outcome>`; '' when none. */
export function describeWorstContingency(m: OutageModel): string {
  if (m.worstSource < 0) return '';
  const head = `${m.sourceIds[m.worstSource]} at ${m.worstAtH.toFixed(2)} h: `;
  switch (m.worstSeverity) {
    case 3:
      return `${head}shutdown${m.worstCause ? ` (${m.worstCause})` : ''}`;
    case 2:
      return `${head}critical load shed, ${m.worstShedKw.toFixed(1)} kW shed`;
    case 1:
      return `${head}${m.worstShedKw.toFixed(1)} kW shed`;
    default:
      return `${head}ridden through`;
  }
}
