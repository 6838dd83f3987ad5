/**
 * Protection of the island as threshold monitors: unit trips (under/over-frequency, RoCoF,
 * reverse power), UFLS stage pickups and the island's shutdown limits, plus the state limits that
 * switch a device's mode (battery empty or full, wind rotor at minimum speed).
 *
 * A monitor watches one quantity q (the frequency deviation, one state, or the windowed RoCoF)
 * against a level L. It becomes active when q crosses L in its sense (below for under-frequency),
 * the crossing being located in time on the integrator's dense output. If it stays active for
 * `delayS` the action is armed; it then happens `actionDelayS` later (the breaker time) even if q
 * recovers meanwhile. Recovering before `delayS` resets the timer (definite-time relay,
 * IEEE C37.2 device 81 behaviour, common practice, no source).
 *
 * Default trip settings of inverter sources: IEEE 1547-2018 Table 18 (REFERENCES.md 2.1):
 * OF2 62.0 Hz / 0.16 s, OF1 61.2 Hz / 300 s, UF1 58.5 Hz / 300 s, UF2 56.5 Hz / 0.16 s, given for
 * 60 Hz. For 50 Hz systems they are scaled by f0/60 (OF2 51.67 Hz, UF2 47.08 Hz ...): a screening
 * assumption, since a 50 Hz island follows its national code (EN 50549 / RfG ranges).
 */
import type { Case, Source } from '../../case/schema.js';

export const MonitorAction = {
  tripUnit: 0,
  shedStage: 1,
  shutdownUnderFrequency: 2,
  shutdownOverFrequency: 3,
  batteryEmpty: 4,
  batteryFull: 5,
  rotorAtMinimum: 6,
} as const;

/** Quantity code of a monitor: frequency deviation (pu), windowed RoCoF (Hz/s), or a state index >= 1. */
export const FREQUENCY_QUANTITY = 0;
export const ROCOF_QUANTITY = -1;

/** One monitor before compilation into the island's typed arrays. */
export interface MonitorSpec {
  quantity: number;
  level: number;
  below: boolean;
  delayS: number;
  actionDelayS: number;
  action: number;
  target: number;
}

/** IEEE 1547-2018 Table 18 default trip points at 60 Hz: [Hz, clearing time s]. */
const IEEE1547_TABLE18_60HZ = {
  of2: [62.0, 0.16],
  of1: [61.2, 300],
  uf1: [58.5, 300],
  uf2: [56.5, 0.16],
} as const;

/** Shutdown limits when the case gives none: 57 / 62 Hz at 60 Hz, 47.5 / 52 Hz at 50 Hz. */
export function defaultShutdownLimitsHz(f0Hz: number): { underHz: number; overHz: number } {
  // 57 Hz and 47.5 Hz: the schema's stated defaults (small-genset under-frequency limits,
  // REFERENCES.md 4.6, from memory); 62 / 52 Hz likewise.
  return f0Hz === 50 ? { underHz: 47.5, overHz: 52 } : { underHz: 57, overHz: 62 };
}

const hzToPu = (hz: number, f0Hz: number) => hz / f0Hz - 1;

function pushTripSettings(
  out: MonitorSpec[],
  trips: NonNullable<Source['trips']>,
  f0Hz: number,
  source: number,
): void {
  if (trips.underFrequencyHz !== undefined)
    out.push({
      quantity: FREQUENCY_QUANTITY,
      level: hzToPu(trips.underFrequencyHz, f0Hz),
      below: true,
      delayS: trips.underFrequencyDelayS,
      actionDelayS: 0,
      action: MonitorAction.tripUnit,
      target: source,
    });
  if (trips.overFrequencyHz !== undefined)
    out.push({
      quantity: FREQUENCY_QUANTITY,
      level: hzToPu(trips.overFrequencyHz, f0Hz),
      below: false,
      delayS: trips.overFrequencyDelayS,
      actionDelayS: 0,
      action: MonitorAction.tripUnit,
      target: source,
    });
  if (trips.rocofHzPerS !== undefined)
    out.push({
      quantity: ROCOF_QUANTITY,
      level: trips.rocofHzPerS,
      below: false,
      delayS: trips.rocofDelayS,
      actionDelayS: 0,
      action: MonitorAction.tripUnit,
      target: source,
    });
}

/** The IEEE 1547-2018 Table 18 defaults (scaled by f0/60 for 50 Hz), as four monitors. */
export function pushIeee1547DefaultTrips(out: MonitorSpec[], f0Hz: number, source: number): void {
  const scale = f0Hz / 60;
  const t = IEEE1547_TABLE18_60HZ;
  for (const [hz, delayS, below] of [
    [t.uf2[0], t.uf2[1], true],
    [t.uf1[0], t.uf1[1], true],
    [t.of2[0], t.of2[1], false],
    [t.of1[0], t.of1[1], false],
  ] as const)
    out.push({
      quantity: FREQUENCY_QUANTITY,
      level: hzToPu(hz * scale, f0Hz),
      below,
      delayS,
      actionDelayS: 0,
      action: MonitorAction.tripUnit,
      target: source,
    });
}

/** Trip monitors of one source: its own settings, else the case's inverter default, else 1547. */
export function sourceTripMonitors(c: Case, i: number, out: MonitorSpec[]): void {
  const s = c.sources[i]!;
  const f0Hz = c.system.frequencyHz;
  if (s.kind === 'genset') {
    pushTripSettings(out, s.trips, f0Hz, i);
    return;
  }
  const own = s.trips ?? c.protection.inverterTrips;
  if (own) pushTripSettings(out, own, f0Hz, i);
  else pushIeee1547DefaultTrips(out, f0Hz, i);
}

/** UFLS stage pickups and the island's shutdown limits. */
export function islandMonitors(c: Case, out: MonitorSpec[]): void {
  const f0Hz = c.system.frequencyHz;
  c.protection.ufls.forEach((stage, k) => {
    out.push({
      quantity: FREQUENCY_QUANTITY,
      level: hzToPu(stage.thresholdHz, f0Hz),
      below: true,
      delayS: stage.pickupDelayS,
      actionDelayS: stage.breakerTimeS,
      action: MonitorAction.shedStage,
      target: k,
    });
  });
  const d = defaultShutdownLimitsHz(f0Hz);
  out.push({
    quantity: FREQUENCY_QUANTITY,
    level: hzToPu(c.protection.shutdownUnderFrequencyHz ?? d.underHz, f0Hz),
    below: true,
    delayS: c.protection.shutdownDelayS,
    actionDelayS: 0,
    action: MonitorAction.shutdownUnderFrequency,
    target: -1,
  });
  out.push({
    quantity: FREQUENCY_QUANTITY,
    level: hzToPu(c.protection.shutdownOverFrequencyHz ?? d.overHz, f0Hz),
    below: false,
    delayS: c.protection.shutdownDelayS,
    actionDelayS: 0,
    action: MonitorAction.shutdownOverFrequency,
    target: -1,
  });
}
