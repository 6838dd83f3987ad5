/**
 * Battery inverter: grid-forming (a voltage source that sets the frequency) or grid-following
 * (a current source that follows it), droop with optional virtual inertia, power and state-of-charge
 * limits, state of charge integrated.
 *
 * Grid-following (state p, first-order power loop T):
 *   p_ref = clamp(p_0 - (S/(R S_b)) dw - 2 H_v (S/S_b) d(dw)/dt, p_lo, p_hi),  T dp/dt = p_ref - p
 * Grid-forming: droop with a power filter T is a virtual synchronous machine with H = T/(2R)
 * (D'Arco & Suul, "Equivalence of virtual synchronous machines and frequency-droops for
 * converter-based microgrids", IEEE Trans. Smart Grid 5(1):394-395, 2014), so the unit adds
 * kinetic energy (H + H_v) S to the swing equation and delivers the algebraic output
 *   p = p_0 - (S/(R S_b)) dw - 2 (H + H_v)(S/S_b) d(dw)/dt,   clamped to [p_lo, p_hi]
 * (solved with the swing equation in swing.ts; a clamped unit stops contributing inertia).
 * Limits: p_hi = S/S_b (0 once the state of charge reached its minimum), p_lo = -S/S_b (0 at
 * its maximum). State of charge: d soc/dt = -p / E when discharging, -eta p / E when charging
 * (eta = round-trip efficiency, all losses booked on charging: a screening simplification).
 * Notation: R = droopPu, T = responseTimeConstantS, H_v = virtualInertiaS, E = energyKwh.
 * States: p (powerState, grid-following only), soc (auxState), energy.
 */
import type { Island } from './island.js';

export function batteryHighLimitPu(isl: Island, i: number): number {
  return isl.socEmpty[i] === 1 ? 0 : isl.ratingPu[i]!;
}

export function batteryLowLimitPu(isl: Island, i: number): number {
  return isl.socFull[i] === 1 ? 0 : -isl.ratingPu[i]!;
}

/** Grid-following unit: power-loop lag toward the droop-and-inertia reference. */
export function batteryFollowingDerivatives(
  isl: Island,
  i: number,
  x: Float64Array,
  dx: Float64Array,
  dwPu: number,
  rocofPuPerS: number,
): void {
  const ip = isl.powerState[i]!;
  const hi = batteryHighLimitPu(isl, i);
  const lo = batteryLowLimitPu(isl, i);
  let ref =
    isl.dispatchPu[i]! - isl.droopGainPu[i]! * dwPu - isl.virtualInertiaGainPuS[i]! * rocofPuPerS;
  ref = ref > hi ? hi : Math.max(ref, lo);
  const p = x[ip]!;
  dx[ip] = (ref - p) / isl.lagTimeS[i]!;
  batteryEnergyDerivatives(isl, i, dx, p);
}

/** State of charge and delivered energy from the output p (both control modes). */
export function batteryEnergyDerivatives(
  isl: Island,
  i: number,
  dx: Float64Array,
  outputPu: number,
): void {
  const drawn = outputPu > 0 ? outputPu : isl.chargeEfficiency[i]! * outputPu;
  dx[isl.auxState[i]!] = -drawn / isl.energyPuS[i]!;
  dx[isl.energyState[i]!] = outputPu;
}
