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

/**
 * Online grid-following units with a power-loop lag (`list`): lag toward the droop-and-inertia
 * reference, state of charge and delivered energy. Their output (the power state) is in `out`.
 */
export function batteryFollowingDerivatives(
  isl: Island,
  list: Int32Array,
  count: number,
  x: Float64Array,
  dx: Float64Array,
  dwPu: number,
  rocofPuPerS: number,
): void {
  const power = isl.powerState;
  const dispatch = isl.dispatchPu;
  const droop = isl.droopGainPu;
  const inertia = isl.virtualInertiaGainPuS;
  const lag = isl.lagTimeS;
  for (let a = 0; a < count; a++) {
    const i = list[a]!;
    const ip = power[i]!;
    const hi = batteryHighLimitPu(isl, i);
    const lo = batteryLowLimitPu(isl, i);
    let ref = dispatch[i]! - droop[i]! * dwPu - inertia[i]! * rocofPuPerS;
    ref = ref > hi ? hi : Math.max(ref, lo);
    dx[ip] = (ref - x[ip]!) / lag[i]!;
  }
  batteryEnergyDerivatives(isl, list, count, dx);
}

/**
 * State of charge and delivered energy of the online batteries in `list` from their outputs
 * `isl.outputPu` (both control modes); a power state that the unit does not use (grid-following
 * taken as quasi-steady) is held.
 */
export function batteryEnergyDerivatives(
  isl: Island,
  list: Int32Array,
  count: number,
  dx: Float64Array,
): void {
  const out = isl.outputPu;
  const eta = isl.chargeEfficiency;
  const capacity = isl.energyPuS;
  const soc = isl.auxState;
  const energy = isl.energyState;
  for (let a = 0; a < count; a++) {
    const i = list[a]!;
    const p = out[i]!;
    const drawn = p > 0 ? p : eta[i]! * p;
    dx[soc[i]!] = -drawn / capacity[i]!;
    dx[energy[i]!] = p;
  }
}
