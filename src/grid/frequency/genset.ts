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

/**
 * Electrical outputs of the online gensets `list[0..count)` into `out`, pu; returns their sum.
 * Order 2 is clamped to [p_min, S/S_b] (its state is not rate-limited).
 */
export function gensetOutputsPu(
  isl: Island,
  list: Int32Array,
  count: number,
  x: Float64Array,
  out: Float64Array,
): number {
  const power = isl.powerState;
  const order = isl.governorOrder;
  const rating = isl.ratingPu;
  const minPu = isl.minPu;
  let sum = 0;
  for (let a = 0; a < count; a++) {
    const i = list[a]!;
    let p = x[power[i]!]!;
    if (order[i] === 2) {
      const max = rating[i]!;
      p = p > max ? max : Math.max(p, minPu[i]!);
    }
    out[i] = p;
    sum += p;
  }
  return sum;
}

/** Governor, isochronous integral and delivered-energy derivatives of the online gensets in `list`. */
export function gensetDerivatives(
  isl: Island,
  list: Int32Array,
  count: number,
  x: Float64Array,
  dx: Float64Array,
  dwPu: number,
): void {
  const power = isl.powerState;
  const aux = isl.auxState;
  const integral = isl.integralState;
  const energy = isl.energyState;
  const rating = isl.ratingPu;
  const minPu = isl.minPu;
  const dispatch = isl.dispatchPu;
  const droop = isl.droopGainPu;
  const ki = isl.isochronousGainPuPerS;
  const order = isl.governorOrder;
  const lag = isl.lagTimeS;
  const rampPu = isl.rampPuPerS;
  const wnRad = isl.naturalFrequencyRadPerS;
  const zeta = isl.dampingRatio;
  const out = isl.outputPu;
  for (let a = 0; a < count; a++) {
    const i = list[a]!;
    const ip = power[i]!;
    const iz = integral[i]!;
    const max = rating[i]!;
    const min = minPu[i]!;
    const raw = dispatch[i]! - droop[i]! * dwPu + (iz >= 0 ? x[iz]! : 0);
    const ref = raw > max ? max : Math.max(raw, min);
    if (iz >= 0) {
      let dz = -ki[i]! * dwPu;
      if ((raw >= max && dz > 0) || (raw <= min && dz < 0)) dz = 0;
      dx[iz] = dz;
    }
    const p = x[ip]!;
    if (order[i] === 1) {
      let dp = (ref - p) / lag[i]!;
      const ramp = rampPu[i]!;
      if (dp > ramp) dp = ramp;
      dx[ip] = dp;
    } else {
      const wn = wnRad[i]!;
      const iv = aux[i]!;
      const v = x[iv]!;
      dx[ip] = v;
      dx[iv] = wn * wn * (ref - p) - 2 * zeta[i]! * wn * v;
    }
    dx[energy[i]!] = out[i]!;
  }
}
