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

/** Lag, ramp limit and delivered energy of the online fuel cells in `list` (output = p). */
export function fuelCellDerivatives(
  isl: Island,
  list: Int32Array,
  count: number,
  x: Float64Array,
  dx: Float64Array,
  dwPu: number,
): void {
  const power = isl.powerState;
  const energy = isl.energyState;
  const rating = isl.ratingPu;
  const dispatch = isl.dispatchPu;
  const droop = isl.droopGainPu;
  const lag = isl.lagTimeS;
  const rampPu = isl.rampPuPerS;
  for (let a = 0; a < count; a++) {
    const i = list[a]!;
    const ip = power[i]!;
    const max = rating[i]!;
    let ref = dispatch[i]! - droop[i]! * dwPu;
    ref = ref > max ? max : Math.max(ref, 0);
    const p = x[ip]!;
    let dp = (ref - p) / lag[i]!;
    const ramp = rampPu[i]!;
    if (dp > ramp) dp = ramp;
    dx[ip] = dp;
    dx[energy[i]!] = p;
  }
}
