/**
 * Dispatch of one segment of the outage energy balance (constant conditions and states): who
 * serves the load, in a fixed merit order, and what is shed when supply falls short.
 *
 * Order (documented in docs/outage-energy.md):
 *   1. PV and wind at their available power (they are taken first; curtailed only on surplus);
 *   2. gensets online at least at minimum loading (must-run: P_min = minLoadingFraction * rating);
 *   3. batteries, discharging within their power rating and above their state-of-charge floor;
 *   4. gensets above minimum loading, up to their rating (while they have fuel);
 *   5. fuel cells up to their rating (while they have fuel);
 *   6. shedding: sheddable load first, then essential, then critical (the last is a failure).
 * A surplus (renewables plus genset minimum above the load) charges the batteries within their
 * power rating and below their ceiling; what remains is curtailed (renewables first, then a dump
 * of the genset minimum). Shares among units of one kind are proportional to their limits.
 *
 * Grid forming: the island holds while a genset runs or a grid-forming battery is above its floor.
 * A grid-forming battery at its floor still holds the island when the other sources carry the
 * critical load (it then sheds the rest and sits at zero power); otherwise the island shuts down.
 * Merit-order dispatch of an isolated system (common practice, no source).
 */
import {
  KIND_BATTERY,
  KIND_FUELCELL,
  KIND_GENSET,
  KIND_PV,
  KIND_WIND,
  type OutageModel,
  TIER_CRITICAL,
  TIER_ESSENTIAL,
  TIER_SHEDDABLE,
} from './outage-model.js';

/** A battery counts as above its floor / below its ceiling beyond this state-of-charge margin. */
export const SOC_MARGIN = 1e-12;

/** Fills m.outKw, m.tierDemandKw, m.tierShedKw and m.flows for the current state. */
export function dispatchSegment(m: OutageModel): void {
  const n = m.sourceCount;
  const f = m.flows;
  const td = m.tierDemandKw;
  const ts = m.tierShedKw;
  const tc = m.tierCappedKw;
  td[0] = 0;
  td[1] = 0;
  td[2] = 0;
  tc[0] = 0;
  tc[1] = 0;
  tc[2] = 0;
  let cappedKw = 0;
  for (let j = 0; j < m.loadCount; j++) {
    const tier = m.loadTier[j]!;
    const loadKw = m.hourLoadKw[j]!;
    const servedKw = loadKw * m.loadCap[j]!;
    td[tier] = td[tier]! + servedKw;
    tc[tier] = tc[tier]! + (loadKw - servedKw);
    cappedKw += loadKw - servedKw;
  }
  let renewableKw = 0;
  let genMinKw = 0;
  let genMaxKw = 0;
  let fuelCellMaxKw = 0;
  let dischargeMaxKw = 0;
  let chargeMaxKw = 0;
  let gensetsOnline = 0;
  let formingAboveFloor = false;
  let formingAtFloor = false;
  for (let i = 0; i < n; i++) {
    if (m.running[i] === 0) continue;
    const kind = m.kind[i];
    if (kind === KIND_PV || kind === KIND_WIND) {
      renewableKw += m.hourAvailableKw[i]!;
    } else if (kind === KIND_GENSET) {
      if (m.fuelLeft[i]! > 0) {
        genMinKw += m.minLoadKw[i]!;
        genMaxKw += m.ratingKw[i]!;
        gensetsOnline++;
      }
    } else if (kind === KIND_FUELCELL) {
      if (m.fuelLeft[i]! > 0) fuelCellMaxKw += m.ratingKw[i]!;
    } else if (kind === KIND_BATTERY) {
      const soc = m.soc[i]!;
      const above = soc > m.socMin[i]! + SOC_MARGIN;
      if (above) dischargeMaxKw += m.ratingKw[i]!;
      if (soc < m.socMax[i]! - SOC_MARGIN) chargeMaxKw += m.ratingKw[i]!;
      if (m.gridForming[i] === 1) {
        if (above) formingAboveFloor = true;
        else formingAtFloor = true;
      }
    }
  }
  const demandKw = td[0]! + td[1]! + td[2]!;
  let needKw = demandKw - renewableKw - genMinKw;
  let dischargeKw = 0;
  let genAboveKw = 0;
  let fuelCellKw = 0;
  let shortKw = 0;
  let chargeKw = 0;
  let surplusKw = 0;
  if (needKw > 0) {
    dischargeKw = Math.min(needKw, dischargeMaxKw);
    needKw -= dischargeKw;
    genAboveKw = Math.min(needKw, genMaxKw - genMinKw);
    needKw -= genAboveKw;
    fuelCellKw = Math.min(needKw, fuelCellMaxKw);
    shortKw = needKw - fuelCellKw;
  } else {
    surplusKw = -needKw;
    chargeKw = Math.min(surplusKw, chargeMaxKw);
    surplusKw -= chargeKw;
  }
  // Shed by priority; the short can never exceed the demand (needKw <= demandKw).
  let rest = shortKw;
  ts[TIER_SHEDDABLE] = Math.min(rest, td[TIER_SHEDDABLE]!);
  rest -= ts[TIER_SHEDDABLE]!;
  ts[TIER_ESSENTIAL] = Math.min(rest, td[TIER_ESSENTIAL]!);
  rest -= ts[TIER_ESSENTIAL]!;
  ts[TIER_CRITICAL] = Math.min(rest, td[TIER_CRITICAL]!);
  const curtailKw = Math.min(surplusKw, renewableKw);
  const dumpKw = surplusKw - curtailKw;

  f.renewableKw = renewableKw;
  f.curtailKw = curtailKw;
  f.dumpKw = dumpKw;
  f.dischargeKw = dischargeKw;
  f.chargeKw = chargeKw;
  f.gensetKw = genMinKw + genAboveKw;
  f.fuelCellKw = fuelCellKw;
  f.demandKw = demandKw;
  f.shedKw = ts[0]! + ts[1]! + ts[2]!;
  f.cappedKw = cappedKw;
  f.gridFormed =
    gensetsOnline > 0 ||
    formingAboveFloor ||
    (formingAtFloor && ts[TIER_CRITICAL]! <= 0 && renewableKw + fuelCellKw > 0);

  const renewableShare = renewableKw > 0 ? 1 - curtailKw / renewableKw : 0;
  const genHeadKw = genMaxKw - genMinKw;
  for (let i = 0; i < n; i++) {
    let p = 0;
    if (m.running[i] === 1) {
      const kind = m.kind[i];
      if (kind === KIND_PV || kind === KIND_WIND) {
        p = m.hourAvailableKw[i]! * renewableShare;
      } else if (kind === KIND_GENSET) {
        if (m.fuelLeft[i]! > 0) {
          const headKw = m.ratingKw[i]! - m.minLoadKw[i]!;
          p = m.minLoadKw[i]! + (genHeadKw > 0 ? (genAboveKw * headKw) / genHeadKw : 0);
        }
      } else if (kind === KIND_FUELCELL) {
        if (m.fuelLeft[i]! > 0 && fuelCellMaxKw > 0)
          p = (fuelCellKw * m.ratingKw[i]!) / fuelCellMaxKw;
      } else if (kind === KIND_BATTERY) {
        const soc = m.soc[i]!;
        if (dischargeKw > 0 && soc > m.socMin[i]! + SOC_MARGIN)
          p = (dischargeKw * m.ratingKw[i]!) / dischargeMaxKw;
        else if (chargeKw > 0 && soc < m.socMax[i]! - SOC_MARGIN)
          p = -(chargeKw * m.ratingKw[i]!) / chargeMaxKw;
      }
    }
    m.outKw[i] = p;
  }
}
