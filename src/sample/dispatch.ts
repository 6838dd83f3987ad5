/**
 * Grid-connected dispatch just before separation (a documented screening policy, no source):
 * - genset, running: gridConnectedLoadingFraction x rating; standby: off (0).
 * - fuel cell: gridConnectedLoadingFraction x rating.
 * - PV: available output (mppt), or available x (1 - headroomFraction) (curtailed).
 * - wind: available output.
 * - battery, by gridConnectedMode, with net = load - the dispatch of all other sources:
 *     idle: 0;
 *     charge-to-max: -rating while soc < socMax, else 0;
 *     peak-shave: discharge min(rating, net - 0.8 P) while net > 0.8 P and soc > socReserve;
 *                 charge min(rating, 0.6 P - net) while net < 0.6 P and soc < socMax;
 *                 P = the yearly peak of the expected total load (thresholds: common practice,
 *                 no source);
 *     self-consume: charge the surplus (net < 0) while soc < socMax, discharge the deficit
 *                 (net > 0) while soc > socReserve, both up to the rating.
 *   Several batteries act in case order, each on the net left by the previous ones.
 * - the grid covers the rest: gridImportKw = sum(loadKw) - sum(dispatchKw) (negative = export).
 * Unavailable sources dispatch 0.
 */
import type { Battery } from '../case/schema.js';

/** Peak-shaving discharge threshold, fraction of the yearly expected peak (no source). */
export const peakShaveDischargeFraction = 0.8;
/** Peak-shaving recharge threshold, fraction of the yearly expected peak (no source). */
export const peakShaveChargeFraction = 0.6;

/** Battery output before separation, kW (positive discharging), for the net load it sees. */
export function batteryDispatchKw(
  b: Battery,
  socFraction: number,
  netLoadKw: number,
  yearlyPeakKw: number,
): number {
  const rating = b.ratingKw;
  const canCharge = socFraction < b.socMaxFraction;
  const canDischarge = socFraction > b.socReserveFraction;
  switch (b.gridConnectedMode) {
    case 'idle':
      return 0;
    case 'charge-to-max':
      return canCharge ? -rating : 0;
    case 'peak-shave': {
      const high = peakShaveDischargeFraction * yearlyPeakKw;
      const low = peakShaveChargeFraction * yearlyPeakKw;
      if (netLoadKw > high && canDischarge) return Math.min(rating, netLoadKw - high);
      if (netLoadKw < low && canCharge) return -Math.min(rating, low - netLoadKw);
      return 0;
    }
    case 'self-consume':
      if (netLoadKw < 0 && canCharge) return -Math.min(rating, -netLoadKw);
      if (netLoadKw > 0 && canDischarge) return Math.min(rating, netLoadKw);
      return 0;
  }
}
