/**
 * The island compiled for the frequency engine: every parameter of the case that the equations
 * need, in per-unit on the island's power base S_b = `system.baseKva`, in typed arrays, plus the
 * preallocated work arrays of one event. Compiled once per case (and per worker thread); the
 * engine then reuses it scenario after scenario without allocating.
 *
 * State vector x (compact: only the states a source really has): x[0] = frequency deviation
 * dw = (f - f0)/f0 in pu; then, in case order, the states the equations read: the power p
 * (genset, grid-following battery, PV, fuel cell), the auxiliary state (genset order 2: dp/dt;
 * wind with synthetic inertia: rotor energy drawn dE) and the genset's isochronous integral z
 * (only when its gain is above 0); then the pure integrals: the battery's state of charge (its
 * auxiliary state) and every source's delivered energy, in pu s. The indices are in `powerState`, `auxState`, `integralState`,
 * `energyState` (-1 where the source has no such state). Powers are pu of S_b.
 */
import type { Case } from '../../case/schema.js';
import { CaseError } from '../../errors.js';
import {
  islandMonitors,
  MonitorAction,
  type MonitorSpec,
  sourceTripMonitors,
} from './protection.js';

export const SourceKind = { genset: 0, battery: 1, pv: 2, wind: 3, fuelcell: 4 } as const;
export const LoadTierCode = { critical: 0, essential: 1, sheddable: 2 } as const;

/** Genset motoring limit: friction and pumping losses, fraction of rating (common practice, no source). */
const GENSET_MOTORING_FRACTION = 0.15;
/** 90 % response time to first-order time constant: t90 = ln(10) tau. */
const LN10 = Math.log(10);

/** Where each source's states sit in the state vector; -1 where a source has no such state. */
export interface StateLayout {
  stateCount: number;
  /** States 0..readStateCount-1 are read by the equations; the rest are pure integrals. */
  readStateCount: number;
  powerState: Int32Array;
  auxState: Int32Array;
  integralState: Int32Array;
  energyState: Int32Array;
}

/**
 * The compact state layout of a case (see the header). The states the equations read come
 * first (frequency, powers, genset dp/dt and integral, wind rotor energy); the pure integrals
 * (battery state of charge, delivered energy) follow from `readStateCount` on, so that the
 * integrator forms no stage values for them (DormandPrince `readCount`).
 */
export function stateLayout(c: Case): StateLayout {
  const n = c.sources.length;
  const powerState = new Int32Array(n).fill(-1);
  const auxState = new Int32Array(n).fill(-1);
  const integralState = new Int32Array(n).fill(-1);
  const energyState = new Int32Array(n).fill(-1);
  let next = 1;
  c.sources.forEach((s, i) => {
    switch (s.kind) {
      case 'genset':
        powerState[i] = next++;
        if (s.governor.order === 2) auxState[i] = next++;
        if (s.isochronousGainPuPerS > 0) integralState[i] = next++;
        break;
      case 'battery':
        if (s.control === 'grid-following') powerState[i] = next++;
        break;
      case 'pv':
      case 'fuelcell':
        powerState[i] = next++;
        break;
      case 'wind':
        if (s.syntheticInertia) auxState[i] = next++;
        break;
    }
  });
  const readStateCount = next;
  c.sources.forEach((s, i) => {
    if (s.kind === 'battery') auxState[i] = next++;
    energyState[i] = next++;
  });
  return { stateCount: next, readStateCount, powerState, auxState, integralState, energyState };
}

export class Island {
  readonly f0Hz: number;
  readonly baseKw: number;
  readonly sourceCount: number;
  readonly loadCount: number;
  readonly stateCount: number;
  /** States the equations read (the first ones); the rest are integrals of them (StateLayout). */
  readonly readStateCount: number;
  readonly sourceIds: readonly string[];
  /** State indices per source (StateLayout); -1 where the source has no such state. */
  readonly powerState: Int32Array;
  readonly auxState: Int32Array;
  readonly integralState: Int32Array;
  readonly energyState: Int32Array;

  // Per source (pu on the island base unless the name says otherwise).
  readonly kind: Uint8Array;
  readonly ratingPu: Float64Array;
  /** H S / S_b of a running synchronous machine or the equivalent of a grid-forming inverter, s. */
  readonly kineticPuS: Float64Array;
  /** Droop gain S / (R S_b): pu power per pu frequency. */
  readonly droopGainPu: Float64Array;
  readonly lagTimeS: Float64Array;
  readonly rampPuPerS: Float64Array;
  readonly minPu: Float64Array;
  // Gensets.
  readonly governorOrder: Uint8Array;
  readonly naturalFrequencyRadPerS: Float64Array;
  readonly dampingRatio: Float64Array;
  /** Isochronous integral gain Ki S / S_b: pu power per pu frequency per s. */
  readonly isochronousGainPuPerS: Float64Array;
  readonly standby: Uint8Array;
  readonly startDelayS: Float64Array;
  // Batteries.
  readonly gridForming: Uint8Array;
  readonly energyPuS: Float64Array;
  /** Grid-following virtual inertia 2 H_v S / S_b: pu power per pu/s of RoCoF. */
  readonly virtualInertiaGainPuS: Float64Array;
  readonly socMinFraction: Float64Array;
  readonly socMaxFraction: Float64Array;
  readonly chargeEfficiency: Float64Array;
  // PV and wind: over-frequency droop of IEEE 1547-2018 (REFERENCES.md 2.6).
  readonly overFrequencyDeadbandPu: Float64Array;
  readonly overFrequencyGainPu: Float64Array;
  readonly curtailed: Uint8Array;
  // Wind synthetic inertia.
  readonly windSupport: Uint8Array;
  readonly windRocofGainPuS: Float64Array;
  readonly windDroopGainPu: Float64Array;
  readonly windDeadbandPu: Float64Array;
  readonly windCapPu: Float64Array;
  readonly rotorEnergyLimitPuS: Float64Array;
  readonly recoveryTimeConstantS: Float64Array;

  // Loads.
  readonly loadTier: Uint8Array;
  readonly loadDamping: Float64Array;
  // UFLS stages.
  readonly stageShare: Float64Array;

  // Monitors (protection.ts).
  readonly monitorCount: number;
  readonly monQuantity: Int32Array;
  readonly monLevel: Float64Array;
  readonly monBelow: Uint8Array;
  readonly monDelayS: Float64Array;
  readonly monActionDelayS: Float64Array;
  readonly monAction: Uint8Array;
  readonly monTarget: Int32Array;

  // ---- work arrays of one event (overwritten by simulateEvent) ----
  readonly online: Uint8Array;
  readonly ceased: Uint8Array;
  readonly cessationEndS: Float64Array;
  readonly startAtS: Float64Array;
  readonly socEmpty: Uint8Array;
  readonly socFull: Uint8Array;
  readonly rotorRecovering: Uint8Array;
  readonly dispatchPu: Float64Array;
  readonly availablePu: Float64Array;
  readonly outputPu: Float64Array;
  /** Units whose output is algebraic in the RoCoF: p = clamp(c - 2 k d(dw)/dt, lo, hi). */
  readonly algC: Float64Array;
  readonly algK: Float64Array;
  readonly algLo: Float64Array;
  readonly algHi: Float64Array;
  /** 1 while unit i is algebraic in the RoCoF in the current evaluation; 2 once clamped. */
  readonly algState: Uint8Array;
  /** 1 if the unit's power-loop lag is treated as instantaneous in this event (EventOptions.quasiSteadyLagS). */
  readonly quasiSteady: Uint8Array;
  readonly loadServedPu: Float64Array;
  readonly loadKwAtEvent: Float64Array;
  readonly monActive: Uint8Array;
  readonly monEnabled: Uint8Array;
  readonly monTimerS: Float64Array;
  readonly monActionTimerS: Float64Array;
  readonly monValue: Float64Array;
  /** Served load and its damping sum(P_j D_j), pu (loads.ts). */
  loadTotalPu = 0;
  loadDampingPu = 0;
  /** Earliest pending timer, s, and whether it must be recomputed (simulate.ts). */
  nextTimerS = Number.POSITIVE_INFINITY;
  timersDirty = true;
  /**
   * Set whenever `online`, `ceased` or `quasiSteady` change (simulate.ts): the equations then
   * rebuild their lists of active sources before the next evaluation.
   */
  modesChanged = true;
  /** Set by the equations when no unsaturated grid-forming source or machine holds frequency. */
  collapsed = false;
  /** RoCoF of the last derivative evaluation, pu/s. */
  lastRocofPuPerS = 0;

  constructor(c: Case, monitors: readonly MonitorSpec[], layout: StateLayout = stateLayout(c)) {
    const n = c.sources.length;
    const m = c.loads.length;
    this.f0Hz = c.system.frequencyHz;
    this.baseKw = c.system.baseKva;
    this.sourceCount = n;
    this.loadCount = m;
    this.stateCount = layout.stateCount;
    this.readStateCount = layout.readStateCount;
    this.powerState = layout.powerState;
    this.auxState = layout.auxState;
    this.integralState = layout.integralState;
    this.energyState = layout.energyState;
    this.sourceIds = c.sources.map((s) => s.id);
    const f64 = () => new Float64Array(n);
    const u8 = () => new Uint8Array(n);
    this.kind = u8();
    this.ratingPu = f64();
    this.kineticPuS = f64();
    this.droopGainPu = f64();
    this.lagTimeS = f64();
    this.rampPuPerS = f64().fill(Number.POSITIVE_INFINITY);
    this.minPu = f64();
    this.governorOrder = u8();
    this.naturalFrequencyRadPerS = f64();
    this.dampingRatio = f64();
    this.isochronousGainPuPerS = f64();
    this.standby = u8();
    this.startDelayS = f64();
    this.gridForming = u8();
    this.energyPuS = f64();
    this.virtualInertiaGainPuS = f64();
    this.socMinFraction = f64();
    this.socMaxFraction = f64();
    this.chargeEfficiency = f64();
    this.overFrequencyDeadbandPu = f64();
    this.overFrequencyGainPu = f64();
    this.curtailed = u8();
    this.windSupport = u8();
    this.windRocofGainPuS = f64();
    this.windDroopGainPu = f64();
    this.windDeadbandPu = f64();
    this.windCapPu = f64();
    this.rotorEnergyLimitPuS = f64();
    this.recoveryTimeConstantS = f64();
    this.online = u8();
    this.ceased = u8();
    this.cessationEndS = f64();
    this.startAtS = f64();
    this.socEmpty = u8();
    this.socFull = u8();
    this.rotorRecovering = u8();
    this.dispatchPu = f64();
    this.availablePu = f64();
    this.outputPu = f64();
    this.algC = f64();
    this.algK = f64();
    this.algLo = f64();
    this.algHi = f64();
    this.algState = u8();
    this.quasiSteady = u8();

    const sb = this.baseKw;
    const f0 = this.f0Hz;
    c.sources.forEach((s, i) => {
      const ratingPu = s.ratingKw / sb;
      this.ratingPu[i] = ratingPu;
      this.minPu[i] = 0;
      switch (s.kind) {
        case 'genset': {
          const kva = s.ratingKva ?? s.ratingKw / 0.8; // pf 0.8 default: schema description
          this.kind[i] = SourceKind.genset;
          this.kineticPuS[i] = (s.inertiaS * kva) / sb;
          this.droopGainPu[i] = ratingPu / s.droopPu;
          this.minPu[i] = -GENSET_MOTORING_FRACTION * ratingPu;
          if (s.governor.order === 1) {
            this.governorOrder[i] = 1;
            this.lagTimeS[i] = s.governor.timeConstantS;
          } else {
            this.governorOrder[i] = 2;
            this.naturalFrequencyRadPerS[i] = s.governor.naturalFrequencyRadPerS;
            this.dampingRatio[i] = s.governor.dampingRatio;
          }
          this.isochronousGainPuPerS[i] = s.isochronousGainPuPerS * ratingPu;
          if (s.rampKwPerS !== undefined) this.rampPuPerS[i] = s.rampKwPerS / sb;
          this.standby[i] = s.operation === 'standby' ? 1 : 0;
          this.startDelayS[i] = s.startDelayS;
          break;
        }
        case 'battery': {
          const kva = s.ratingKva ?? s.ratingKw;
          this.kind[i] = SourceKind.battery;
          this.minPu[i] = -ratingPu;
          this.droopGainPu[i] = ratingPu / s.droopPu;
          this.lagTimeS[i] = s.responseTimeConstantS;
          this.gridForming[i] = s.control === 'grid-forming' ? 1 : 0;
          if (s.control === 'grid-forming') {
            // Droop with a first-order power filter T equals a virtual synchronous machine with
            // H = T / (2 R) (D'Arco & Suul, IEEE Trans. Smart Grid 5(1):394-395, 2014); any
            // explicit virtual inertia adds to it.
            this.kineticPuS[i] =
              ((s.virtualInertiaS + s.responseTimeConstantS / (2 * s.droopPu)) * kva) / sb;
          } else {
            this.virtualInertiaGainPuS[i] = (2 * s.virtualInertiaS * kva) / sb;
          }
          this.energyPuS[i] = (s.energyKwh * 3600) / sb;
          this.socMinFraction[i] = s.socMinFraction;
          this.socMaxFraction[i] = s.socMaxFraction;
          this.chargeEfficiency[i] = s.roundTripEfficiency;
          break;
        }
        case 'pv': {
          this.kind[i] = SourceKind.pv;
          this.lagTimeS[i] = s.responseTimeS / LN10;
          this.curtailed[i] = s.operation === 'curtailed' ? 1 : 0;
          this.overFrequencyDeadbandPu[i] = s.overFrequencyDeadbandHz / f0;
          this.overFrequencyGainPu[i] = ratingPu / s.overFrequencyDroopPu;
          break;
        }
        case 'wind': {
          this.kind[i] = SourceKind.wind;
          // IEEE 1547-2018 default over-frequency droop (36 mHz, 5 %) applied to wind too.
          this.overFrequencyDeadbandPu[i] = 0.036 / f0;
          this.overFrequencyGainPu[i] = ratingPu / 0.05;
          const si = s.syntheticInertia;
          if (si) {
            this.windSupport[i] = 1;
            this.windRocofGainPuS[i] = si.rocofGainPuPerHzPerS * ratingPu * f0;
            this.windDroopGainPu[i] = si.droopGainPuPerHz * ratingPu * f0;
            this.windDeadbandPu[i] = si.deadbandHz / f0;
            this.windCapPu[i] = si.capFraction * ratingPu;
          }
          const kva = s.ratingKva ?? s.ratingKw;
          // Kinetic energy H S w^2 (w in pu of the pre-event speed, taken as 1): usable down to w_min.
          this.rotorEnergyLimitPuS[i] =
            ((s.rotorInertiaS * kva) / sb) * (1 - s.minRotorSpeedPu ** 2);
          // Recovery restores ~95 % of the rotor energy within recoveryTimeS: tau = T / 3.
          this.recoveryTimeConstantS[i] = s.recoveryTimeS / 3;
          break;
        }
        case 'fuelcell': {
          this.kind[i] = SourceKind.fuelcell;
          this.lagTimeS[i] = s.timeConstantS;
          this.droopGainPu[i] = ratingPu / s.droopPu;
          if (s.rampKwPerS !== undefined) this.rampPuPerS[i] = s.rampKwPerS / sb;
          break;
        }
      }
    });

    this.loadTier = new Uint8Array(m);
    this.loadDamping = new Float64Array(m);
    this.loadServedPu = new Float64Array(m);
    this.loadKwAtEvent = new Float64Array(m);
    c.loads.forEach((l, j) => {
      this.loadTier[j] = LoadTierCode[l.tier];
      this.loadDamping[j] = l.frequencySensitivityPu;
    });
    this.stageShare = Float64Array.from(c.protection.ufls.map((s) => s.shareOfLoad));

    const k = monitors.length;
    this.monitorCount = k;
    this.monQuantity = Int32Array.from(monitors.map((x) => x.quantity));
    this.monLevel = Float64Array.from(monitors.map((x) => x.level));
    this.monBelow = Uint8Array.from(monitors.map((x) => (x.below ? 1 : 0)));
    this.monDelayS = Float64Array.from(monitors.map((x) => x.delayS));
    this.monActionDelayS = Float64Array.from(monitors.map((x) => x.actionDelayS));
    this.monAction = Uint8Array.from(monitors.map((x) => x.action));
    this.monTarget = Int32Array.from(monitors.map((x) => x.target));
    this.monActive = new Uint8Array(k);
    this.monEnabled = new Uint8Array(k);
    this.monTimerS = new Float64Array(k);
    this.monActionTimerS = new Float64Array(k);
    this.monValue = new Float64Array(k);
  }
}

/** Cross-field checks the engine relies on; every problem is reported with its field path. */
function validateForFrequency(c: Case): void {
  const problems: { path: string; message: string }[] = [];
  const f0 = c.system.frequencyHz;
  const forming = c.sources.some(
    (s) => s.kind === 'genset' || (s.kind === 'battery' && s.control === 'grid-forming'),
  );
  if (!forming)
    problems.push({
      path: '/sources',
      message:
        'expected at least one grid-forming source (a genset, or a battery with control "grid-forming"): with only grid-following inverters the island has no inertia and no frequency reference',
    });
  c.sources.forEach((s, i) => {
    if (s.kind === 'battery' && !(s.socMinFraction < s.socMaxFraction))
      problems.push({
        path: `/sources/${i}/socMinFraction`,
        message: `expected below socMaxFraction (${s.socMaxFraction}), got ${s.socMinFraction}`,
      });
    if (s.kind === 'wind' && s.minRotorSpeedPu >= 1 && s.syntheticInertia)
      problems.push({
        path: `/sources/${i}/minRotorSpeedPu`,
        message: `expected below 1 pu when syntheticInertia is set, got ${s.minRotorSpeedPu}`,
      });
  });
  c.protection.ufls.forEach((st, k) => {
    if (!(st.thresholdHz < f0))
      problems.push({
        path: `/protection/ufls/${k}/thresholdHz`,
        message: `expected below the nominal ${f0} Hz, got ${st.thresholdHz}`,
      });
  });
  const uf = c.protection.shutdownUnderFrequencyHz;
  if (uf !== undefined && !(uf < f0))
    problems.push({
      path: '/protection/shutdownUnderFrequencyHz',
      message: `expected below the nominal ${f0} Hz, got ${uf}`,
    });
  const of = c.protection.shutdownOverFrequencyHz;
  if (of !== undefined && !(of > f0))
    problems.push({
      path: '/protection/shutdownOverFrequencyHz',
      message: `expected above the nominal ${f0} Hz, got ${of}`,
    });
  if (problems.length > 0) throw new CaseError(problems);
}

/** Compiles a validated case into the engine's typed arrays (once per case). */
export function compileIsland(c: Case): Island {
  validateForFrequency(c);
  const monitors: MonitorSpec[] = [];
  const layout = stateLayout(c);
  islandMonitors(c, monitors);
  c.sources.forEach((s, i) => {
    sourceTripMonitors(c, i, monitors);
    if (s.kind === 'genset')
      monitors.push({
        quantity: layout.powerState[i]!,
        level: (-s.reversePowerFraction * s.ratingKw) / c.system.baseKva,
        below: true,
        delayS: s.reversePowerDelayS,
        actionDelayS: 0,
        action: MonitorAction.tripUnit,
        target: i,
      });
    if (s.kind === 'battery') {
      monitors.push({
        quantity: layout.auxState[i]!,
        level: s.socMinFraction,
        below: true,
        delayS: 0,
        actionDelayS: 0,
        action: MonitorAction.batteryEmpty,
        target: i,
      });
      monitors.push({
        quantity: layout.auxState[i]!,
        level: s.socMaxFraction,
        below: false,
        delayS: 0,
        actionDelayS: 0,
        action: MonitorAction.batteryFull,
        target: i,
      });
    }
    if (s.kind === 'wind' && s.syntheticInertia)
      monitors.push({
        quantity: layout.auxState[i]!,
        level: 0, // set per island below: the rotor energy limit
        below: false,
        delayS: 0,
        actionDelayS: 0,
        action: MonitorAction.rotorAtMinimum,
        target: i,
      });
  });
  const island = new Island(c, monitors, layout);
  for (let k = 0; k < island.monitorCount; k++)
    if (island.monAction[k] === MonitorAction.rotorAtMinimum)
      island.monLevel[k] = island.rotorEnergyLimitPuS[island.monTarget[k]!]!;
  return island;
}
