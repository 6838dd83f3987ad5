/**
 * The island's equations: the aggregated (centre-of-inertia) swing equation closing the source
 * and load models into one ODE system for the integrator.
 *
 *   2 (sum_k E_k) d(dw)/dt = sum_i p_i - P_load(dw),   E_k = H_k S_k / S_b
 * over the online synchronous machines and the unsaturated grid-forming inverters (battery.ts),
 * whose output is algebraic in d(dw)/dt: the sum is solved for d(dw)/dt, units whose output would
 * pass a limit are clamped there (their inertia drops out) and it is solved again.
 * Notation: dw = x[0] = (f - f0)/f0, H = inertia constant on the unit's kVA, S_b = system.baseKva,
 * P_load from loads.ts. Source: Kundur, Power System Stability and Control, McGraw-Hill 1994,
 * sec. 3.9 and 11.1 (swing equation, M = 2H); REFERENCES.md 1.1.
 * If nothing holds the frequency (every grid-forming unit clamped), `collapsed` is set and the
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
import { type Island, SourceKind, STATES_PER_SOURCE, stateOffset } from './island.js';
import { loadDemandPu } from './loads.js';
import { pvDerivatives } from './pv.js';
import { windDerivatives, windOutputPu } from './wind.js';

export class IslandEquations implements OdeSystem {
  constructor(readonly isl: Island) {}

  derivatives(_tS: number, x: Float64Array, dx: Float64Array): void {
    const isl = this.isl;
    const n = isl.sourceCount;
    const dw = x[0]!;
    const out = isl.outputPu;
    let pSum = -loadDemandPu(isl, dw);
    let kinetic = 0;
    let gfCount = 0;
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
            isl.gfSaturated[i] = 0;
            gfCount++;
            continue;
          }
          p = x[stateOffset(i)]!;
          break;
        case SourceKind.wind:
          p = windOutputPu(isl, i, x, dw);
          break;
        default:
          p = x[stateOffset(i)]!;
      }
      out[i] = p;
      pSum += p;
    }
    let rocof = 0;
    isl.collapsed = false;
    // Grid-forming units: solve the swing equation with their algebraic outputs; clamp, repeat.
    for (let pass = 0; pass <= gfCount; pass++) {
      let num = pSum;
      let kin = kinetic;
      for (let i = 0; i < n && gfCount > 0; i++) {
        if (isl.kind[i] !== SourceKind.battery || isl.gridForming[i] === 0) continue;
        if (isl.online[i] === 0 || isl.ceased[i] === 1) continue;
        if (isl.gfSaturated[i] === 1) num += out[i]!;
        else {
          num += isl.dispatchPu[i]! - isl.droopGainPu[i]! * dw;
          kin += isl.kineticPuS[i]!;
        }
      }
      if (kin <= 0) {
        isl.collapsed = true;
        rocof = 0;
        break;
      }
      rocof = num / (2 * kin);
      let changed = false;
      for (let i = 0; i < n && gfCount > 0; i++) {
        if (isl.kind[i] !== SourceKind.battery || isl.gridForming[i] === 0) continue;
        if (isl.online[i] === 0 || isl.ceased[i] === 1 || isl.gfSaturated[i] === 1) continue;
        const p = isl.dispatchPu[i]! - isl.droopGainPu[i]! * dw - 2 * isl.kineticPuS[i]! * rocof;
        const hi = batteryHighLimitPu(isl, i);
        const lo = batteryLowLimitPu(isl, i);
        if (p > hi || p < lo) {
          out[i] = p > hi ? hi : lo;
          isl.gfSaturated[i] = 1;
          changed = true;
        } else out[i] = p;
      }
      if (!changed) break;
    }
    dx[0] = rocof;
    isl.lastRocofPuPerS = rocof;

    for (let i = 0; i < n; i++) {
      const o = stateOffset(i);
      if (isl.online[i] === 0 || isl.ceased[i] === 1) {
        for (let s = 0; s < STATES_PER_SOURCE; s++) dx[o + s] = 0;
        continue;
      }
      switch (isl.kind[i]) {
        case SourceKind.genset:
          gensetDerivatives(isl, i, x, dx, dw, out[i]!);
          break;
        case SourceKind.battery:
          if (isl.gridForming[i] === 1) {
            dx[o] = 0;
            batteryEnergyDerivatives(isl, i, dx, out[i]!);
          } else batteryFollowingDerivatives(isl, i, x, dx, dw, rocof);
          break;
        case SourceKind.pv:
          pvDerivatives(isl, i, x, dx, dw);
          break;
        case SourceKind.wind:
          windDerivatives(isl, i, x, dx, dw, rocof, out[i]!);
          break;
        case SourceKind.fuelcell:
          fuelCellDerivatives(isl, i, x, dx, dw);
          break;
      }
    }
  }
}
