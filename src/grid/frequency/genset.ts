/**
 * Synchronous genset (diesel or gas engine) seen from the island frequency: droop governor with
 * an engine/actuator lag, optional isochronous (integral) secondary loop, headroom and ramp limits.
 *
 * Equations (pu on the island base, dw = frequency deviation in pu):
 *   reference      p_ref = clamp(p_0 - (S/(R S_b)) dw + z, p_min, S/S_b)
 *   secondary      dz/dt = -Ki (S/S_b) dw            (held while p_ref is at a limit: anti-windup)
 *   order 1        Tg dp/dt = p_ref - p,  dp/dt <= ramp
 *   order 2        d2p/dt2 + 2 zeta wn dp/dt + wn^2 p = wn^2 p_ref, output clamp(p, p_min, S/S_b)
 * The machine's kinetic energy H S enters the island's swing equation while it is online.
 * Notation: R = droopPu, Tg = governor.timeConstantS, wn = naturalFrequencyRadPerS,
 * zeta = dampingRatio, Ki = isochronousGainPuPerS, p_0 = dispatch before separation.
 * Sources: Kundur, Power System Stability and Control, McGraw-Hill 1994, sec. 11.1 (droop,
 * isochronous control) and sec. 9.1 (speed governing); the second-order engine response stands
 * for the engine plus actuator lags of small gensets (REFERENCES.md 6, structure only).
 * p_min is the motoring limit (friction and pumping losses), see island.ts.
 * States: p (powerState), dp/dt (auxState, order 2), z (integralState, when Ki > 0), energy.
 */
import type { Island } from './island.js';

/** Electrical output of an online genset, pu. */
export function gensetOutputPu(isl: Island, i: number, x: Float64Array): number {
  const p = x[isl.powerState[i]!]!;
  if (isl.governorOrder[i] === 2) {
    const max = isl.ratingPu[i]!;
    const min = isl.minPu[i]!;
    return p > max ? max : Math.max(p, min);
  }
  return p;
}

export function gensetDerivatives(
  isl: Island,
  i: number,
  x: Float64Array,
  dx: Float64Array,
  dwPu: number,
  outputPu: number,
): void {
  const ip = isl.powerState[i]!;
  const iz = isl.integralState[i]!;
  const max = isl.ratingPu[i]!;
  const min = isl.minPu[i]!;
  const raw = isl.dispatchPu[i]! - isl.droopGainPu[i]! * dwPu + (iz >= 0 ? x[iz]! : 0);
  const ref = raw > max ? max : Math.max(raw, min);
  if (iz >= 0) {
    let dz = -isl.isochronousGainPuPerS[i]! * dwPu;
    if ((raw >= max && dz > 0) || (raw <= min && dz < 0)) dz = 0;
    dx[iz] = dz;
  }
  const p = x[ip]!;
  if (isl.governorOrder[i] === 1) {
    let dp = (ref - p) / isl.lagTimeS[i]!;
    const ramp = isl.rampPuPerS[i]!;
    if (dp > ramp) dp = ramp;
    dx[ip] = dp;
  } else {
    const wn = isl.naturalFrequencyRadPerS[i]!;
    const iv = isl.auxState[i]!;
    const v = x[iv]!;
    dx[ip] = v;
    dx[iv] = wn * wn * (ref - p) - 2 * isl.dampingRatio[i]! * wn * v;
  }
  dx[isl.energyState[i]!] = outputPu;
}
