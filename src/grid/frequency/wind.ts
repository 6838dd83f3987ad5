/**
 * Wind turbine with synthetic inertia: extra power proportional to the RoCoF and to the frequency
 * deviation, capped, drawn from the rotor's kinetic energy; when the rotor reaches its minimum
 * speed the support ends and the output dips below the pre-event value while the rotor recovers.
 *
 *   base (pitch)     p_b = p_0 less the IEEE 1547-2018 over-frequency droop (36 mHz, 5 %, pv.ts)
 *   support          s = clamp(Kd max(0, -dw - db) - Kr d(dw)/dt, Kd-term, cap) while d(dw)/dt < 0
 *   recovery         s = -min(dE / tau_r, cap)                 (after the rotor reached w_min)
 *   rotor energy     d(dE)/dt = s,  support ends when dE = H S (1 - w_min^2) / S_b
 *   output           p = max(0, p_b + s)
 * The converter's power loop (tens of ms) is taken as instantaneous (quasi-steady state): its
 * lag is two orders faster than the rotor and island dynamics, and keeping it as a state made it
 * the stiffest mode of the whole system (docs/frequency-engine.md, measurements). The RoCoF
 * term is then algebraic in d(dw)/dt, like a virtual inertia of Kr / 2, and is solved with the
 * swing equation (swing.ts). The pre-event rotor speed is taken as 1 pu and the aerodynamic
 * power as unchanged by the speed excursion (screening simplifications); support that ends
 * because the frequency recovered before w_min leaves the rotor energy unrecovered.
 * Notation: Kr = rocofGainPuPerHzPerS, Kd = droopGainPuPerHz, cap = capFraction,
 * db = deadbandHz, H = rotorInertiaS, w_min = minRotorSpeedPu, tau_r = recoveryTimeS / 3.
 * Source: mechanism as in Kang et al., "Analysis and enhancement of HQT and ENTSO-E synthetic
 * inertia criteria", Energies 18(20):5359, 2025 (boost, rotor deceleration, recovery dip);
 * numbers from memory (REFERENCES.md 6).
 * States: dE (auxState, only with synthetic inertia), energy.
 */
import type { Island } from './island.js';
import { frequencyWattReferencePu } from './pv.js';

/** Output before support: the dispatch less the over-frequency curtailment, pu. */
export function windBasePu(isl: Island, i: number, dwPu: number): number {
  return frequencyWattReferencePu(isl, i, dwPu, isl.dispatchPu[i]!);
}

/**
 * Output that does not depend on the RoCoF (recovery, no support, or no RoCoF gain), pu; or
 * NaN when the unit's output is algebraic in the RoCoF, in which case `isl.algC/algK/algLo/algHi`
 * hold p = clamp(c - 2 k d(dw)/dt, lo, hi).
 */
export function windOutputPu(isl: Island, i: number, x: Float64Array, dwPu: number): number {
  const base = windBasePu(isl, i, dwPu);
  const cap = isl.windCapPu[i]!;
  if (isl.rotorRecovering[i] === 1) {
    const r = x[isl.auxState[i]!]! / isl.recoveryTimeConstantS[i]!;
    const p = base - Math.min(r, cap);
    return Math.max(p, 0);
  }
  if (isl.windSupport[i] === 0) return base;
  const dev = -dwPu - isl.windDeadbandPu[i]!;
  const dterm = isl.windDroopGainPu[i]! * Math.max(dev, 0);
  const floor = Math.min(dterm, cap);
  if (isl.windRocofGainPuS[i] === 0) return base + floor;
  isl.algC[i] = base + dterm;
  isl.algK[i] = 0.5 * isl.windRocofGainPuS[i]!;
  isl.algLo[i] = base + floor;
  isl.algHi[i] = base + cap;
  return Number.NaN;
}

/** Rotor energy drawn and delivered energy of the online wind units in `list` (outputs in `out`). */
export function windDerivatives(
  isl: Island,
  list: Int32Array,
  count: number,
  dx: Float64Array,
  dwPu: number,
): void {
  const out = isl.outputPu;
  const rotor = isl.auxState;
  const energy = isl.energyState;
  for (let a = 0; a < count; a++) {
    const i = list[a]!;
    const p = out[i]!;
    const ie = rotor[i]!;
    if (ie >= 0) dx[ie] = p - windBasePu(isl, i, dwPu);
    dx[energy[i]!] = p;
  }
}
