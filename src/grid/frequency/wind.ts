/**
 * Wind turbine with synthetic inertia: extra power proportional to the RoCoF and to the frequency
 * deviation, capped, drawn from the rotor's kinetic energy; when the rotor reaches its minimum
 * speed the support ends and the output dips below the pre-event value while the rotor recovers.
 *
 *   support command  c = min(cap, Kr max(0, -d(dw)/dt) + Kd max(0, -dw - db))
 *   recovery command c = -min(dE / tau_r, cap)        (after the rotor reached w_min)
 *   converter lag    T ds/dt = c - s
 *   rotor energy     d(dE)/dt = s,  support ends when dE = H S (1 - w_min^2) / S_b
 *   output           p = max(0, p_0 + s - over-frequency curtailment)
 * The curtailment is the IEEE 1547-2018 frequency-watt droop (36 mHz, 5 %, pv.ts) applied by
 * pitch at once. The pre-event rotor speed is taken as 1 pu and the aerodynamic power as
 * unchanged by the speed excursion (screening simplifications). Support that ends because the
 * frequency recovered before w_min leaves the rotor energy unrecovered within the horizon.
 * Notation: Kr = rocofGainPuPerHzPerS, Kd = droopGainPuPerHz, cap = capFraction,
 * db = deadbandHz, H = rotorInertiaS, w_min = minRotorSpeedPu, tau_r = recoveryTimeS / 3.
 * Source: mechanism as in Kang et al., "Analysis and enhancement of HQT and ENTSO-E synthetic
 * inertia criteria", Energies 18(20):5359, 2025 (boost, rotor deceleration, recovery dip);
 * numbers from memory (REFERENCES.md 6).
 * State slots: [s, dE, -, energy].
 */
import { type Island, stateOffset } from './island.js';
import { frequencyWattReferencePu } from './pv.js';

export function windOutputPu(isl: Island, i: number, x: Float64Array, dwPu: number): number {
  const p0 = isl.dispatchPu[i]!;
  const curtailed = frequencyWattReferencePu(isl, i, dwPu, p0);
  const p = curtailed + x[stateOffset(i)]!;
  return Math.max(p, 0);
}

export function windDerivatives(
  isl: Island,
  i: number,
  x: Float64Array,
  dx: Float64Array,
  dwPu: number,
  rocofPuPerS: number,
  outputPu: number,
): void {
  const o = stateOffset(i);
  const cap = isl.windCapPu[i]!;
  let cmd = 0;
  if (isl.rotorRecovering[i] === 1) {
    const r = x[o + 1]! / isl.recoveryTimeConstantS[i]!;
    cmd = -Math.min(r, cap);
  } else if (isl.windSupport[i] === 1) {
    const fall = rocofPuPerS < 0 ? -rocofPuPerS : 0;
    const dev = -dwPu - isl.windDeadbandPu[i]!;
    const c = isl.windRocofGainPuS[i]! * fall + isl.windDroopGainPu[i]! * Math.max(dev, 0);
    cmd = Math.min(c, cap);
  }
  const s = x[o]!;
  dx[o] = (cmd - s) / isl.lagTimeS[i]!;
  dx[o + 1] = s;
  dx[o + 2] = 0;
  dx[o + 3] = outputPu;
}
