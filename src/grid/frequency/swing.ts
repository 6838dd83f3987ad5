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
import { gensetDerivatives, gensetOutputPu } from './genset.js';
import { type Island, SourceKind } from './island.js';
import { loadDemandPu } from './loads.js';
import { pvDerivatives } from './pv.js';
import { windDerivatives, windOutputPu } from './wind.js';

export class IslandEquations implements OdeSystem {
  private readonly algList: Int32Array;
  constructor(readonly isl: Island) {
    this.algList = new Int32Array(isl.sourceCount);
  }

  derivatives(_tS: number, x: Float64Array, dx: Float64Array): void {
    const isl = this.isl;
    const n = isl.sourceCount;
    const dw = x[0]!;
    const out = isl.outputPu;
    const algList = this.algList;
    let algCount = 0;
    let pSum = -loadDemandPu(isl, dw);
    let kinetic = 0;
    for (let i = 0; i < n; i++) {
      out[i] = 0;
      if (isl.online[i] === 0 || isl.ceased[i] === 1) continue;
      let p = 0;
      switch (isl.kind[i]) {
        case SourceKind.genset:
          p = gensetOutputPu(isl, i, x);
          kinetic += isl.kineticPuS[i]!;
          break;
        case SourceKind.battery:
          if (isl.gridForming[i] === 1) {
            isl.algC[i] = isl.dispatchPu[i]! - isl.droopGainPu[i]! * dw;
            isl.algK[i] = isl.kineticPuS[i]!;
            isl.algLo[i] = batteryLowLimitPu(isl, i);
            isl.algHi[i] = batteryHighLimitPu(isl, i);
            isl.algState[i] = 1;
            algList[algCount++] = i;
            continue;
          }
          if (isl.quasiSteady[i] === 1) {
            // Grid-following with its lag taken as instantaneous: droop now, virtual inertia
            // algebraic in the RoCoF (k = H_v S / S_b), inside the power and SoC limits.
            const lo = batteryLowLimitPu(isl, i);
            const hi = batteryHighLimitPu(isl, i);
            const c = isl.dispatchPu[i]! - isl.droopGainPu[i]! * dw;
            const k = 0.5 * isl.virtualInertiaGainPuS[i]!;
            if (k > 0) {
              isl.algC[i] = c;
              isl.algK[i] = k;
              isl.algLo[i] = lo;
              isl.algHi[i] = hi;
              isl.algState[i] = 1;
              algList[algCount++] = i;
              continue;
            }
            p = c > hi ? hi : Math.max(c, lo);
            break;
          }
          p = x[isl.powerState[i]!]!;
          break;
        case SourceKind.wind:
          p = windOutputPu(isl, i, x, dw);
          if (Number.isNaN(p)) {
            isl.algState[i] = 1;
            algList[algCount++] = i;
            continue;
          }
          break;
        default:
          p = x[isl.powerState[i]!]!;
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
        if (isl.algState[i] === 2) num += out[i]!;
        else {
          num += isl.algC[i]!;
          kin += isl.algK[i]!;
          if (isl.kind[i] === SourceKind.battery) kinForming += isl.algK[i]!;
        }
      }
      if (kinForming <= 0) {
        isl.collapsed = true;
        rocof = 0;
        for (let a = 0; a < algCount; a++) {
          const i = algList[a]!;
          if (isl.algState[i] === 1) out[i] = Math.max(isl.algLo[i]!, 0);
        }
        break;
      }
      rocof = num / (2 * kin);
      let changed = false;
      for (let a = 0; a < algCount; a++) {
        const i = algList[a]!;
        if (isl.algState[i] === 2) continue;
        const p = isl.algC[i]! - 2 * isl.algK[i]! * rocof;
        const hi = isl.algHi[i]!;
        const lo = isl.algLo[i]!;
        if (p > hi || p < lo) {
          out[i] = p > hi ? hi : lo;
          isl.algState[i] = 2;
          changed = true;
        } else out[i] = p;
      }
      if (!changed) break;
    }
    dx[0] = rocof;
    isl.lastRocofPuPerS = rocof;

    for (let i = 0; i < n; i++) {
      if (isl.online[i] === 0 || isl.ceased[i] === 1) {
        // An offline or ceased source holds its states.
        const ip = isl.powerState[i]!;
        const iv = isl.auxState[i]!;
        const iz = isl.integralState[i]!;
        if (ip >= 0) dx[ip] = 0;
        if (iv >= 0) dx[iv] = 0;
        if (iz >= 0) dx[iz] = 0;
        dx[isl.energyState[i]!] = 0;
        continue;
      }
      switch (isl.kind[i]) {
        case SourceKind.genset:
          gensetDerivatives(isl, i, x, dx, dw, out[i]!);
          break;
        case SourceKind.battery:
          if (isl.gridForming[i] === 1 || isl.quasiSteady[i] === 1) {
            if (isl.powerState[i]! >= 0) dx[isl.powerState[i]!] = 0;
            batteryEnergyDerivatives(isl, i, dx, out[i]!);
          } else batteryFollowingDerivatives(isl, i, x, dx, dw, rocof);
          break;
        case SourceKind.pv:
          pvDerivatives(isl, i, x, dx, dw);
          break;
        case SourceKind.wind:
          windDerivatives(isl, i, dx, dw, out[i]!);
          break;
        case SourceKind.fuelcell:
          fuelCellDerivatives(isl, i, x, dx, dw);
          break;
      }
    }
  }
}
