/**
 * Fuel cell: slow first-order response (fuel processor) with a ramp limit, droop on frequency.
 * It does little in the first seconds after separation and mainly serves secondary control.
 *
 *   p_ref = clamp(p_0 - (S/(R S_b)) dw, 0, S/S_b),   T dp/dt = p_ref - p,   dp/dt <= ramp
 * Notation: T = timeConstantS, R = droopPu, ramp = rampKwPerS / S_b.
 * Source: the fuel-processor lag of Padulles, Ault and McDonald, "An integrated SOFC plant
 * dynamic model for power systems simulation", J. Power Sources 86:495-500, 2000 (from memory,
 * REFERENCES.md 6); the droop coupling is common practice, no source.
 * States: p (powerState), energy.
 */
import type { Island } from './island.js';

export function fuelCellDerivatives(
  isl: Island,
  i: number,
  x: Float64Array,
  dx: Float64Array,
  dwPu: number,
): void {
  const ip = isl.powerState[i]!;
  const max = isl.ratingPu[i]!;
  let ref = isl.dispatchPu[i]! - isl.droopGainPu[i]! * dwPu;
  ref = ref > max ? max : Math.max(ref, 0);
  const p = x[ip]!;
  let dp = (ref - p) / isl.lagTimeS[i]!;
  const ramp = isl.rampPuPerS[i]!;
  if (dp > ramp) dp = ramp;
  dx[ip] = dp;
  dx[isl.energyState[i]!] = p;
}
