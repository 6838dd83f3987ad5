/**
 * Under-frequency load shedding: a stage that picked up (frequency below its threshold for its
 * pickup delay, then the breaker time: protection.ts) disconnects `shareOfLoad` of the
 * non-critical load present at separation, sheddable loads first, then essential ones, in case
 * order within a tier. Critical load is never shed by UFLS.
 * Source: staged UFLS as in ERCOT Nodal Operating Guide sec. 2.6.1 / NOGRR247 (REFERENCES.md 4.1)
 * and NERC PRC-006; the priority order is the schema's tier rule.
 */
import type { EventResult } from './event-result.js';
import { type Island, LoadTierCode } from './island.js';
import { refreshLoadTotals } from './loads.js';

/** Sheds one stage at time tS; returns the kW actually shed. */
export function shedStage(isl: Island, stage: number, tS: number, out: EventResult): number {
  let nonCriticalKw = 0;
  for (let j = 0; j < isl.loadCount; j++)
    if (isl.loadTier[j] !== LoadTierCode.critical) nonCriticalKw += isl.loadKwAtEvent[j]!;
  let remainingKw = isl.stageShare[stage]! * nonCriticalKw;
  let shedKw = 0;
  for (const tier of [LoadTierCode.sheddable, LoadTierCode.essential]) {
    for (let j = 0; j < isl.loadCount && remainingKw > 0; j++) {
      if (isl.loadTier[j] !== tier) continue;
      const servedKw = isl.loadServedPu[j]! * isl.baseKw;
      const takeKw = Math.min(servedKw, remainingKw);
      if (takeKw <= 0) continue;
      isl.loadServedPu[j] = (servedKw - takeKw) / isl.baseKw;
      remainingKw -= takeKw;
      shedKw += takeKw;
      out.shedKwByTier[tier] = out.shedKwByTier[tier]! + takeKw;
      const atEvent = isl.loadKwAtEvent[j]!;
      out.loadServedFraction[j] = atEvent > 0 ? (isl.loadServedPu[j]! * isl.baseKw) / atEvent : 1;
    }
  }
  refreshLoadTotals(isl);
  out.shedKw += shedKw;
  out.shedStages++;
  if (tS < out.firstShedTimeS) out.firstShedTimeS = tS;
  return shedKw;
}
