/**
 * Deterministic conditions at a later hour of an outage, for the hour-by-hour energy balance:
 * the expected demand of each load (no forecast error) and the resource-limited power each source
 * could deliver (PV and wind: their expected output over the clearness / wind-speed distribution
 * of that hour's month; gensets, fuel cells and batteries: their rating). Availability, failures
 * and state of charge are the scenario's and the energy balance's business, not this function's.
 * Hours past 8759 (an outage running over the year's end) wrap to the start of the same model
 * year, as do negative hours.
 */
import { wrapHour } from './calendar.js';
import type { SamplerContext } from './sampler.js';

export function conditionsAtHour(
  ctx: SamplerContext,
  hourOfYear: number,
  outLoadKw: Float64Array,
  outAvailableKw: Float64Array,
): void {
  const h = wrapHour(Math.floor(hourOfYear));
  for (let i = 0; i < ctx.loadCount; i++) outLoadKw[i] = ctx.expectedLoadKw[i]![h]!;
  const sources = ctx.case.sources;
  for (let i = 0; i < ctx.sourceCount; i++) {
    const s = sources[i]!;
    switch (s.kind) {
      case 'pv':
        outAvailableKw[i] = ctx.pv[i]!.expectedKw[h]!;
        break;
      case 'wind':
        outAvailableKw[i] = ctx.wind[i]!.expectedKw(h);
        break;
      default:
        outAvailableKw[i] = s.ratingKw;
    }
  }
}
