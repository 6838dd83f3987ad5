/**
 * The outage energy balance's view of a case: source and load parameters in typed arrays, the
 * working state of one outage (reused scenario after scenario) and the two calls into the other
 * models, the hourly conditions (sampler) and the contingency event (frequency engine), wired by
 * `compileOutage` in outage.ts. Built once per case and worker; no allocation per scenario.
 */
import type { Case } from '../case/schema.js';
import { CaseError } from '../errors.js';
import { Scenario } from '../sample/scenario.js';
import { oneWayEfficiency } from './battery-energy.js';
import { willansSlopeLPerKwh } from './genset-fuel.js';

export const KIND_GENSET = 0;
export const KIND_BATTERY = 1;
export const KIND_PV = 2;
export const KIND_WIND = 3;
export const KIND_FUELCELL = 4;

export const TIER_CRITICAL = 0;
export const TIER_ESSENTIAL = 1;
export const TIER_SHEDDABLE = 2;

/**
 * What the energy balance reads from a frequency event (a structural subset of the frequency
 * engine's EventResult, src/grid/frequency/event-result.ts).
 */
export interface EventOutcome {
  readonly status: string;
  readonly shutdown: boolean;
  readonly shutdownCause: string;
  readonly shedKw: number;
  /** critical, essential, sheddable, kW. */
  readonly shedKwByTier: Float64Array;
  /** Per load, 1 = all served. */
  readonly loadServedFraction: Float64Array;
  /** Per source, online at the end of the event. */
  readonly runningAtEnd: Uint8Array;
  /** Per source (batteries), fraction. */
  readonly socAtEnd: Float64Array;
}

/**
 * Receives every segment of an outage (replay and diagnostics; never used in a batch run).
 * Arrays are the model's own and are overwritten by the next segment: copy what you keep.
 */
export interface OutageTraceSink {
  record(
    startH: number,
    durationH: number,
    demandKw: number,
    servedKw: number,
    spilledKw: number,
    /** Per source, kW (battery: + discharging, - charging). */
    outputKw: Float64Array,
    /** Per source (batteries), state of charge at the end of the segment. */
    socFraction: Float64Array,
    down: boolean,
  ): void;
}

/** The two calls into other models that the outage needs. */
export interface OutageHooks {
  /** Expected load per load and resource-limited available power per source at an hour (0-8759). */
  conditionsAtHour(hourOfYear: number, outLoadKw: Float64Array, outAvailableKw: Float64Array): void;
  /** Simulates the frequency event of operating point `op`, returning the (reused) result. */
  runContingency(op: Scenario): EventOutcome;
}

/** Power flows of one segment of constant dispatch, kW (filled by dispatchSegment). */
export class SegmentFlows {
  /** PV and wind available from the units online. */
  renewableKw = 0;
  /** Renewable output curtailed for want of load or storage room. */
  curtailKw = 0;
  /** Surplus of gensets held at minimum loading that neither load nor battery could take (dump load). */
  dumpKw = 0;
  /** Battery terminal power: discharging and charging totals (both >= 0). */
  dischargeKw = 0;
  chargeKw = 0;
  gensetKw = 0;
  fuelCellKw = 0;
  /** Demand offered to the dispatch (loads still cut by a frequency event's shedding excluded). */
  demandKw = 0;
  /** Shed by the dispatch for want of supply. */
  shedKw = 0;
  /** Still cut by a frequency event's shedding until the next step. */
  cappedKw = 0;
  /** A grid-forming source holds the island in this segment. */
  gridFormed = false;
}

export class OutageModel {
  readonly sourceCount: number;
  readonly loadCount: number;
  readonly sourceIds: readonly string[];
  readonly kind: Uint8Array;
  readonly ratingKw: Float64Array;
  /** Gensets: minimum loading, kW. */
  readonly minLoadKw: Float64Array;
  /** Gensets: 1 if a Willans line is given (fuel counted, tank enforced). */
  readonly fuelTracked: Uint8Array;
  /** Gensets: 1 for gas (fuel in m3), 0 for diesel (L). */
  readonly gasFuel: Uint8Array;
  readonly fuelNoLoadLPerH: Float64Array;
  readonly fuelSlopeLPerKwh: Float64Array;
  /** Gensets: usable fuel at separation (Infinity if unlimited); fuel cells: fuelKwh. */
  readonly fuelStock: Float64Array;
  readonly energyKwh: Float64Array;
  readonly socMin: Float64Array;
  readonly socMax: Float64Array;
  readonly etaCharge: Float64Array;
  readonly etaDischarge: Float64Array;
  readonly gridForming: Uint8Array;
  readonly loadTier: Uint8Array;
  readonly hasBattery: boolean;
  /** Smallest energy the balance residual is measured against, kWh (see outage.ts). */
  readonly balanceFloorKwh: number;
  /** monteCarlo.energyStepH. */
  readonly stepH: number;
  /** The frequency event's horizon, h (where the energy balance starts). */
  readonly eventH: number;
  readonly blackStartAllowed: boolean;
  readonly blackStartDelayH: number;
  readonly hooks: OutageHooks;

  // Working state of one outage (overwritten by simulateOutage).
  readonly running: Uint8Array;
  readonly failed: Uint8Array;
  readonly soc: Float64Array;
  readonly fuelLeft: Float64Array;
  /** Hour's conditions: load per load and available power per source. */
  readonly hourLoadKw: Float64Array;
  readonly hourAvailableKw: Float64Array;
  /** Per load, served fraction allowed until the next step (UFLS shedding stays off until then). */
  readonly loadCap: Float64Array;
  /** Per source output of the current segment, kW (battery: + discharging, - charging). */
  readonly outKw: Float64Array;
  /** Per tier demand offered to the dispatch and shed by it in the current segment, kW. */
  readonly tierDemandKw: Float64Array;
  readonly tierShedKw: Float64Array;
  /** Per tier load still cut by a frequency event's shedding, kW. */
  readonly tierCappedKw: Float64Array;
  /** Operating point of a contingency (preallocated). */
  readonly op: Scenario;
  readonly flows = new SegmentFlows();
  /** Set by simulateOutage for the duration of one outage when a trace is asked for. */
  trace: OutageTraceSink | null = null;
  /** The island is down (shut down, not yet restarted), since downSinceH. */
  down = false;
  downSinceH = 0;
  // The worst contingency so far: severity 3 shutdown, 2 critical shed, 1 shed, 0 ridden through.
  worstSeverity = -1;
  worstShedKw = 0;
  worstSource = -1;
  worstAtH = 0;
  worstCause = '';

  constructor(c: Case, hooks: OutageHooks) {
    const n = c.sources.length;
    const nl = c.loads.length;
    this.sourceCount = n;
    this.loadCount = nl;
    this.sourceIds = c.sources.map((s) => s.id);
    this.kind = new Uint8Array(n);
    this.ratingKw = new Float64Array(n);
    this.minLoadKw = new Float64Array(n);
    this.fuelTracked = new Uint8Array(n);
    this.gasFuel = new Uint8Array(n);
    this.fuelNoLoadLPerH = new Float64Array(n);
    this.fuelSlopeLPerKwh = new Float64Array(n);
    this.fuelStock = new Float64Array(n).fill(Number.POSITIVE_INFINITY);
    this.energyKwh = new Float64Array(n);
    this.socMin = new Float64Array(n);
    this.socMax = new Float64Array(n);
    this.etaCharge = new Float64Array(n);
    this.etaDischarge = new Float64Array(n);
    this.gridForming = new Uint8Array(n);
    let hasBattery = false;
    const problems: { path: string; message: string }[] = [];
    c.sources.forEach((s, i) => {
      this.ratingKw[i] = s.ratingKw;
      const path = `/sources/${i}`;
      switch (s.kind) {
        case 'genset': {
          this.kind[i] = KIND_GENSET;
          this.gridForming[i] = 1;
          this.minLoadKw[i] = s.minLoadingFraction * s.ratingKw;
          this.gasFuel[i] = s.fuel === 'gas' ? 1 : 0;
          const f0 = s.fuelNoLoadLPerH;
          const f1 = s.fuelFullLoadLPerH;
          if (f0 !== undefined && f1 !== undefined) {
            if (f1 < f0)
              problems.push({
                path: `${path}/fuelFullLoadLPerH`,
                message: `expected at least fuelNoLoadLPerH (${f0}), got ${f1}`,
              });
            this.fuelTracked[i] = 1;
            this.fuelNoLoadLPerH[i] = f0;
            this.fuelSlopeLPerKwh[i] = willansSlopeLPerKwh(f0, f1, s.ratingKw);
          } else if (f0 !== undefined || f1 !== undefined || s.fuelTankL !== undefined) {
            const missing = f0 === undefined ? 'fuelNoLoadLPerH' : 'fuelFullLoadLPerH';
            problems.push({
              path: `${path}/${missing}`,
              message:
                'expected a number: the fuel curve needs both fuelNoLoadLPerH and fuelFullLoadLPerH (and a tank needs the curve)',
            });
          }
          if (s.fuelTankL !== undefined) this.fuelStock[i] = s.fuelTankL;
          break;
        }
        case 'battery':
          hasBattery = true;
          this.kind[i] = KIND_BATTERY;
          this.gridForming[i] = s.control === 'grid-forming' ? 1 : 0;
          this.energyKwh[i] = s.energyKwh;
          this.socMin[i] = s.socMinFraction;
          this.socMax[i] = s.socMaxFraction;
          this.etaCharge[i] = oneWayEfficiency(s.roundTripEfficiency);
          this.etaDischarge[i] = oneWayEfficiency(s.roundTripEfficiency);
          if (s.socMaxFraction <= s.socMinFraction)
            problems.push({
              path: `${path}/socMaxFraction`,
              message: `expected more than socMinFraction (${s.socMinFraction}), got ${s.socMaxFraction}`,
            });
          break;
        case 'pv':
          this.kind[i] = KIND_PV;
          break;
        case 'wind':
          this.kind[i] = KIND_WIND;
          break;
        case 'fuelcell':
          this.kind[i] = KIND_FUELCELL;
          if (s.fuelKwh !== undefined) this.fuelStock[i] = s.fuelKwh;
          break;
      }
    });
    if (problems.length > 0) throw new CaseError(problems);
    this.hasBattery = hasBattery;
    let storageKwh = 0;
    for (let i = 0; i < n; i++) storageKwh += this.energyKwh[i]!;
    this.balanceFloorKwh = 1e-3 + 1e-6 * storageKwh;
    this.loadTier = new Uint8Array(nl);
    c.loads.forEach((l, j) => {
      this.loadTier[j] =
        l.tier === 'critical'
          ? TIER_CRITICAL
          : l.tier === 'essential'
            ? TIER_ESSENTIAL
            : TIER_SHEDDABLE;
    });
    this.stepH = c.monteCarlo.energyStepH;
    this.eventH = c.monteCarlo.horizonS / 3600;
    this.blackStartAllowed = c.system.blackStartAllowed;
    this.blackStartDelayH = c.system.blackStartDelayH;
    this.hooks = hooks;

    this.running = new Uint8Array(n);
    this.failed = new Uint8Array(n);
    this.soc = new Float64Array(n);
    this.fuelLeft = new Float64Array(n);
    this.hourLoadKw = new Float64Array(nl);
    this.hourAvailableKw = new Float64Array(n);
    this.loadCap = new Float64Array(nl);
    this.outKw = new Float64Array(n);
    this.tierDemandKw = new Float64Array(3);
    this.tierShedKw = new Float64Array(3);
    this.tierCappedKw = new Float64Array(3);
    this.op = new Scenario(n, nl);
  }
}

/** Builds the outage model of a case with the given hooks (tests pass their own). */
export function buildOutageModel(c: Case, hooks: OutageHooks): OutageModel {
  return new OutageModel(c, hooks);
}
