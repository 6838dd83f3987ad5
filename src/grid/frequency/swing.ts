/**
 * The island's equations: the aggregated (centre-of-inertia) swing equation closing the source
 * and load models into one ODE system for the integrator.
 *
 *   2 (sum_k E_k) d(dw)/dt = sum_i p_i - P_load(dw),   E_k = H_k S_k / S_b
 * over the online synchronous machines, plus the units whose output is algebraic in the RoCoF,
 *   p_i = clamp(c_i - 2 k_i d(dw)/dt, lo_i, hi_i)
 * (grid-forming inverters, battery.ts; wind synthetic inertia, wind.ts): the balance is solved
 * for d(dw)/dt with every such unit in its linear range, units that would pass a limit are
 * clamped there (their k drops out) and it is solved again, at most once per unit.
 * Notation: dw = x[0] = (f - f0)/f0, H = inertia constant on the unit's kVA, S_b = system.baseKva,
 * P_load from loads.ts. Source: Kundur, Power System Stability and Control, McGraw-Hill 1994,
 * sec. 3.9 and 11.1 (swing equation, M = 2H); REFERENCES.md 1.1.
 * If nothing holds the frequency (no machine and every grid-forming unit clamped), `collapsed` is set and the
 * derivative is left at 0: the driver ends the run as a shutdown.
 */
import type { OdeSystem } from '../../numeric/dormand-prince.js';
import {
  batteryEnergyDerivatives,
  batteryFollowingDerivatives,
  batteryHighLimitPu,
  batteryLowLimitPu,
} from './battery.js';
import { fuelCellDerivatives } from './fuelcell.js';
import { gensetDerivatives, gensetOutputsPu } from './genset.js';
import { type Island, SourceKind } from './island.js';
import { loadDemandPu } from './loads.js';
import { pvDerivatives } from './pv.js';
import { windDerivatives, windOutputPu } from './wind.js';

/**
 * The assembled equations. The online sources are kept in lists by kind (rebuilt only when a
 * unit trips, starts or leaves momentary cessation: `Island.modesChanged`), so an evaluation
 * runs one branch-light loop per kind and never visits an offline unit; an offline unit's
 * states are held (derivative 0) through the list of held states.
 */
export class IslandEquations implements OdeSystem {
  private readonly algList: Int32Array;
  /** 1 for the algebraic units that count as grid-forming (batteries), 0 for wind. */
  private readonly algForming: Uint8Array;
  private readonly gensets: Int32Array;
  private readonly forming: Int32Array;
  private readonly quasiSteady: Int32Array;
  /** Batteries whose output is algebraic (forming and quasi-steady following). */
  private readonly algebraicBatteries: Int32Array;
  private readonly following: Int32Array;
  private readonly pv: Int32Array;
  private readonly wind: Int32Array;
  private readonly fuelCells: Int32Array;
  private readonly held: Int32Array;
  private gensetCount = 0;
  private formingCount = 0;
  private quasiSteadyCount = 0;
  private algebraicBatteryCount = 0;
  private followingCount = 0;
  private pvCount = 0;
  private windCount = 0;
  private fuelCellCount = 0;
  private heldCount = 0;
  /** Kinetic energy of the online machines, pu s (constant between mode changes). */
  private machineKineticPuS = 0;

  constructor(readonly isl: Island) {
    const n = isl.sourceCount;
    this.algList = new Int32Array(n);
    this.algForming = new Uint8Array(n);
    this.gensets = new Int32Array(n);
    this.forming = new Int32Array(n);
    this.quasiSteady = new Int32Array(n);
    this.algebraicBatteries = new Int32Array(n);
    this.following = new Int32Array(n);
    this.pv = new Int32Array(n);
    this.wind = new Int32Array(n);
    this.fuelCells = new Int32Array(n);
    this.held = new Int32Array(isl.stateCount);
  }

  /** Rebuilds the lists of online sources by kind after a mode change. */
  private rebuild(): void {
    const isl = this.isl;
    isl.modesChanged = false;
    this.gensetCount = 0;
    this.formingCount = 0;
    this.quasiSteadyCount = 0;
    this.algebraicBatteryCount = 0;
    this.followingCount = 0;
    this.pvCount = 0;
    this.windCount = 0;
    this.fuelCellCount = 0;
    this.heldCount = 0;
    this.machineKineticPuS = 0;
    for (let i = 0; i < isl.sourceCount; i++) {
      if (isl.online[i] === 0 || isl.ceased[i] === 1) {
        isl.outputPu[i] = 0;
        const ip = isl.powerState[i]!;
        const iv = isl.auxState[i]!;
        const iz = isl.integralState[i]!;
        if (ip >= 0) this.held[this.heldCount++] = ip;
        if (iv >= 0) this.held[this.heldCount++] = iv;
        if (iz >= 0) this.held[this.heldCount++] = iz;
        this.held[this.heldCount++] = isl.energyState[i]!;
        continue;
      }
      switch (isl.kind[i]) {
        case SourceKind.genset:
          this.gensets[this.gensetCount++] = i;
          this.machineKineticPuS += isl.kineticPuS[i]!;
          break;
        case SourceKind.battery:
          if (isl.gridForming[i] === 1) {
            this.forming[this.formingCount++] = i;
            this.algebraicBatteries[this.algebraicBatteryCount++] = i;
          } else if (isl.quasiSteady[i] === 1) {
            this.quasiSteady[this.quasiSteadyCount++] = i;
            this.algebraicBatteries[this.algebraicBatteryCount++] = i;
            // Its power state is not used while the lag is taken as instantaneous: held.
            this.held[this.heldCount++] = isl.powerState[i]!;
          } else this.following[this.followingCount++] = i;
          break;
        case SourceKind.pv:
          this.pv[this.pvCount++] = i;
          break;
        case SourceKind.wind:
          this.wind[this.windCount++] = i;
          break;
        case SourceKind.fuelcell:
          this.fuelCells[this.fuelCellCount++] = i;
          break;
      }
    }
  }

  derivatives(_tS: number, x: Float64Array, dx: Float64Array): void {
    const isl = this.isl;
    if (isl.modesChanged) this.rebuild();
    const dw = x[0]!;
    const out = isl.outputPu;
    const power = isl.powerState;
    const algList = this.algList;
    const algForming = this.algForming;
    const algC = isl.algC;
    const algK = isl.algK;
    const algLo = isl.algLo;
    const algHi = isl.algHi;
    const algState = isl.algState;
    const dispatch = isl.dispatchPu;
    const droop = isl.droopGainPu;
    let algCount = 0;
    let pSum = -loadDemandPu(isl, dw);
    pSum += gensetOutputsPu(isl, this.gensets, this.gensetCount, x, out);
    const kinetic = this.machineKineticPuS;
    for (let a = 0; a < this.formingCount; a++) {
      const i = this.forming[a]!;
      algC[i] = dispatch[i]! - droop[i]! * dw;
      algK[i] = isl.kineticPuS[i]!;
      algLo[i] = batteryLowLimitPu(isl, i);
      algHi[i] = batteryHighLimitPu(isl, i);
      algState[i] = 1;
      algForming[algCount] = 1;
      algList[algCount++] = i;
    }
    for (let a = 0; a < this.quasiSteadyCount; a++) {
      // Grid-following with its lag taken as instantaneous: droop now, virtual inertia
      // algebraic in the RoCoF (k = H_v S / S_b), inside the power and SoC limits.
      const i = this.quasiSteady[a]!;
      const lo = batteryLowLimitPu(isl, i);
      const hi = batteryHighLimitPu(isl, i);
      const c = dispatch[i]! - droop[i]! * dw;
      const k = 0.5 * isl.virtualInertiaGainPuS[i]!;
      if (k > 0) {
        algC[i] = c;
        algK[i] = k;
        algLo[i] = lo;
        algHi[i] = hi;
        algState[i] = 1;
        algForming[algCount] = 1;
        algList[algCount++] = i;
        continue;
      }
      const p = c > hi ? hi : Math.max(c, lo);
      out[i] = p;
      pSum += p;
    }
    for (let a = 0; a < this.followingCount; a++) {
      const i = this.following[a]!;
      const p = x[power[i]!]!;
      out[i] = p;
      pSum += p;
    }
    for (let a = 0; a < this.pvCount; a++) {
      const i = this.pv[a]!;
      const p = x[power[i]!]!;
      out[i] = p;
      pSum += p;
    }
    for (let a = 0; a < this.fuelCellCount; a++) {
      const i = this.fuelCells[a]!;
      const p = x[power[i]!]!;
      out[i] = p;
      pSum += p;
    }
    for (let a = 0; a < this.windCount; a++) {
      const i = this.wind[a]!;
      const p = windOutputPu(isl, i, x, dw);
      if (Number.isNaN(p)) {
        algState[i] = 1;
        algForming[algCount] = 0;
        algList[algCount++] = i;
        continue;
      }
      out[i] = p;
      pSum += p;
    }
    let rocof = 0;
    isl.collapsed = false;
    for (let pass = 0; pass <= algCount; pass++) {
      let num = pSum;
      let kin = kinetic;
      let kinForming = kinetic;
      for (let a = 0; a < algCount; a++) {
        const i = algList[a]!;
        if (algState[i] === 2) num += out[i]!;
        else {
          num += algC[i]!;
          kin += algK[i]!;
          if (algForming[a] === 1) kinForming += algK[i]!;
        }
      }
      if (kinForming <= 0) {
        isl.collapsed = true;
        rocof = 0;
        for (let a = 0; a < algCount; a++) {
          const i = algList[a]!;
          if (algState[i] === 1) out[i] = Math.max(algLo[i]!, 0);
        }
        break;
      }
      rocof = num / (2 * kin);
      let changed = false;
      for (let a = 0; a < algCount; a++) {
        const i = algList[a]!;
        if (algState[i] === 2) continue;
        const p = algC[i]! - 2 * algK[i]! * rocof;
        const hi = algHi[i]!;
        const lo = algLo[i]!;
        if (p > hi || p < lo) {
          out[i] = p > hi ? hi : lo;
          algState[i] = 2;
          changed = true;
        } else out[i] = p;
      }
      if (!changed) break;
    }
    dx[0] = rocof;
    isl.lastRocofPuPerS = rocof;

    gensetDerivatives(isl, this.gensets, this.gensetCount, x, dx, dw);
    batteryEnergyDerivatives(isl, this.algebraicBatteries, this.algebraicBatteryCount, dx);
    batteryFollowingDerivatives(isl, this.following, this.followingCount, x, dx, dw, rocof);
    pvDerivatives(isl, this.pv, this.pvCount, x, dx, dw);
    windDerivatives(isl, this.wind, this.windCount, dx, dw);
    fuelCellDerivatives(isl, this.fuelCells, this.fuelCellCount, x, dx, dw);
    const held = this.held;
    for (let a = 0; a < this.heldCount; a++) dx[held[a]!] = 0;
  }
}
