/**
 * Fault ride-through at separation: which inverter sources are lost to the upstream fault's
 * voltage dip, and which only cease to energize for a moment.
 *
 * Terminal voltage. The dip (retained voltage V_pcc for T seconds, sampled per scenario) is
 * carried to each source's bus with the pre-fault voltage profile: V_k = V_pcc * |V_k0| / |V_pcc0|,
 * where V_0 comes from one grid-connected power flow of the case at peak load with the PCC held at
 * 1 pu and no local generation (radial-flow.ts). The load drop along the feeder thus deepens the
 * dip at remote buses; the reactive current the inverters inject during the fault, which would
 * lift it, is ignored (the screening leans towards more trips). If that flow has no solution the
 * ratio is 1.
 *
 * Decision for one source of category C at (V, T), IEEE 1547-2018 (ieee1547-tables.ts):
 *  1. shall trip: V below an under-voltage trip pickup of Tables 11-13 for at least its clearing
 *     time (V < UV2 and T >= 0.16 s for Category II, for example);
 *  2. otherwise the band of Tables 14-16 holding V decides:
 *     continuous -> rides through; mandatory with T <= the band's minimum time -> rides through;
 *     permissive or momentary-cessation with T <= the minimum time -> ceases to energize and
 *     returns MOMENTARY_CESSATION_RESTORE_S (0.4 s) after separation, sc.cessationS[k];
 *  3. everything else lies in the standard's "may ride through or may trip" zone (beyond the
 *     minimum time, or below the lowest ride-through band). The reading taken by default is that
 *     such a source trips (mayTrip: 'trip'): a screening study should not count on behaviour the
 *     standard leaves to the manufacturer. `mayTrip: 'ride-through'` takes the other reading.
 * Only inverter sources (battery, pv, wind, fuelcell) are checked, except a grid-forming battery
 * with `seamlessTransfer` (the default): it forms the island and holds voltage through the
 * separation by design (common practice, no source). Gensets ride through: a
 * synchronous machine has no IEEE 1547 ride-through category here and its undervoltage relay
 * (ANSI 27) is usually set with seconds of delay, longer than the sampled dips (common practice,
 * no source).
 */
import type { Case } from '../../case/schema.js';
import type { Scenario } from '../../sample/scenario.js';
import {
  MOMENTARY_CESSATION_RESTORE_S,
  minRideThroughTimeS,
  type RideThroughCategory,
  rideThroughBandAt,
  voltageRideThroughTables,
  voltageTripTables,
} from './ieee1547-tables.js';
import { compileNetworkData, type NetworkData } from './network.js';
import { FLOW_OK, RadialFlow } from './radial-flow.js';

export type MayTripReading = 'trip' | 'ride-through';

export interface RideThroughOptions {
  readonly mayTrip: MayTripReading;
}

export const RIDE_THROUGH_RIDES = 0;
export const RIDE_THROUGH_CEASES = 1;
export const RIDE_THROUGH_TRIPS = 2;
export type RideThroughOutcome =
  | typeof RIDE_THROUGH_RIDES
  | typeof RIDE_THROUGH_CEASES
  | typeof RIDE_THROUGH_TRIPS;

export interface RideThroughModel {
  readonly sourceCount: number;
  /** 1 for the inverter sources the standard applies to. */
  readonly checked: Uint8Array;
  /** Category of each checked source (undefined for gensets). */
  readonly category: readonly (RideThroughCategory | undefined)[];
  /** |V_bus| / |V_pcc| before the fault, per source. */
  readonly attenuation: Float64Array;
  readonly mayTrip: MayTripReading;
}

/** Sweep tolerance of the pre-fault profile, pu: far below the 0.01 pu table resolution. */
const PREFAULT_TOL_PU = 1e-9;

export function compileRideThrough(
  c: Case,
  opts: RideThroughOptions = { mayTrip: 'trip' },
  net: NetworkData = compileNetworkData(c),
): RideThroughModel {
  const nS = c.sources.length;
  const checked = new Uint8Array(nS);
  const category: (RideThroughCategory | undefined)[] = [];
  for (const s of c.sources) {
    if (s.kind === 'genset') category.push(undefined);
    // the island's grid-forming battery rides the separation it is built for, unless the case says not
    else if (s.kind === 'battery' && s.control === 'grid-forming' && s.seamlessTransfer)
      category.push(undefined);
    else category.push(s.rideThrough);
  }
  category.forEach((cat, k) => {
    checked[k] = cat === undefined ? 0 : 1;
  });
  const attenuation = new Float64Array(nS).fill(1);
  const flow = new RadialFlow(net);
  c.loads.forEach((l, i) => {
    flow.loadP0[i] = l.peakKw / net.baseKva;
    flow.loadQ0[i] = (l.peakKw * net.loadTanPhi[i]!) / net.baseKva;
  });
  flow.resetInjections();
  flow.flatStart();
  const tree = net.trees[net.pccBus]!;
  if (flow.solve(tree, PREFAULT_TOL_PU, 200) === FLOW_OK) {
    const vPcc = flow.vPu[net.pccBus]!;
    for (let k = 0; k < nS; k++) attenuation[k] = flow.vPu[net.sourceBus[k]!]! / vPcc;
  }
  return { sourceCount: nS, checked, category, attenuation, mayTrip: opts.mayTrip };
}

/** The outcome for one category at terminal voltage vPu held for durationS. */
export function rideThroughOutcome(
  cat: RideThroughCategory,
  vPu: number,
  durationS: number,
  mayTrip: MayTripReading,
): RideThroughOutcome {
  for (const s of voltageTripTables[cat].settings) {
    if (s.side === 'under' && vPu < s.thresholdPu && durationS >= s.clearingTimeS)
      return RIDE_THROUGH_TRIPS;
    if (s.side === 'over' && vPu > s.thresholdPu && durationS >= s.clearingTimeS)
      return RIDE_THROUGH_TRIPS;
  }
  const band = rideThroughBandAt(voltageRideThroughTables[cat], vPu);
  const mayOutcome = mayTrip === 'trip' ? RIDE_THROUGH_TRIPS : RIDE_THROUGH_CEASES;
  if (band === undefined) return mayOutcome;
  switch (band.mode) {
    case 'continuous':
      return RIDE_THROUGH_RIDES;
    case 'mandatory':
      return durationS <= minRideThroughTimeS(band, vPu) ? RIDE_THROUGH_RIDES : mayOutcome;
    case 'permissive':
    case 'momentary-cessation':
      return durationS <= minRideThroughTimeS(band, vPu) ? RIDE_THROUGH_CEASES : mayOutcome;
    case 'cease-to-energize':
      return mayOutcome;
  }
}

/**
 * Marks the running inverter sources lost to the dip (sc.trippedAtSeparation[k] = 1) and those in
 * momentary cessation (sc.cessationS[k] = seconds after separation until they return).
 */
export function applyRideThrough(m: RideThroughModel, sc: Scenario): void {
  const vPcc = sc.dipRetainedPu;
  const t = sc.dipDurationS;
  for (let k = 0; k < m.sourceCount; k++) {
    const cat = m.category[k];
    if (cat === undefined || !sc.running[k] || !sc.available[k]) continue;
    const outcome = rideThroughOutcome(cat, vPcc * m.attenuation[k]!, t, m.mayTrip);
    if (outcome === RIDE_THROUGH_TRIPS) {
      sc.trippedAtSeparation[k] = 1;
      sc.cessationS[k] = 0;
    } else if (outcome === RIDE_THROUGH_CEASES) {
      sc.trippedAtSeparation[k] = 0;
      sc.cessationS[k] = MOMENTARY_CESSATION_RESTORE_S;
    } else {
      sc.trippedAtSeparation[k] = 0;
      sc.cessationS[k] = 0;
    }
  }
}
