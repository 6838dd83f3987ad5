/**
 * Stored energy of a battery over the outage hours (the slow state; the inverter's fast power
 * loop lives in src/grid/frequency/battery.ts).
 *
 *   discharging at terminal power P > 0:  dSoC/dt = -P / (eta_d * E)
 *   charging at terminal power P > 0:     dSoC/dt = +P * eta_c / E
 *   eta_d = eta_c = sqrt(eta_rt)
 *
 * SoC = socFraction, E = energyKwh, eta_rt = roundTripEfficiency. Splitting the round-trip
 * efficiency equally between charge and discharge is a modelling convention (common practice,
 * no source); the round-trip efficiency itself is the product eta_c * eta_d by definition. The
 * usable window is [socMinFraction, socMaxFraction]. With constant P the time to the floor is
 * exact, (SoC - SoC_min) * E * eta_d / P, which the energy balance uses to split a step where a
 * battery empties or fills, instead of clipping the state at the step's end.
 */

/** One-way efficiency from the round-trip efficiency: sqrt(eta_rt). */
export function oneWayEfficiency(roundTripEfficiency: number): number {
  return Math.sqrt(roundTripEfficiency);
}

/** Hours until the battery reaches `socMin` discharging at `dischargeKw` (> 0). */
export function hoursToFloor(
  socFraction: number,
  socMinFraction: number,
  energyKwh: number,
  dischargeEfficiency: number,
  dischargeKw: number,
): number {
  return ((socFraction - socMinFraction) * energyKwh * dischargeEfficiency) / dischargeKw;
}

/** Hours until the battery reaches `socMax` charging at `chargeKw` (> 0). */
export function hoursToFull(
  socFraction: number,
  socMaxFraction: number,
  energyKwh: number,
  chargeEfficiency: number,
  chargeKw: number,
): number {
  return ((socMaxFraction - socFraction) * energyKwh) / (chargeEfficiency * chargeKw);
}

/**
 * State of charge after `hours` at terminal power `powerKw` (positive discharging, negative
 * charging).
 */
export function socAfter(
  socFraction: number,
  energyKwh: number,
  chargeEfficiency: number,
  dischargeEfficiency: number,
  powerKw: number,
  hours: number,
): number {
  if (powerKw >= 0) return socFraction - (powerKw * hours) / (dischargeEfficiency * energyKwh);
  return socFraction - (powerKw * hours * chargeEfficiency) / energyKwh;
}
