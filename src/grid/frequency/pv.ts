/**
 * PV inverter: at maximum power point it cannot raise its output (no upward reserve); curtailed
 * with headroom it can, up to the available power; over-frequency droop down.
 *
 * Frequency-watt characteristic, IEEE 1547-2018 clause 6.5.2.7 (REFERENCES.md 2.6), pu of rating:
 *   f > f0 + db:  p_ref = max(0, p_0 - (df/f0 - db/f0) / k)
 *   f < f0 - db:  p_ref = min(p_avail, p_0 + (-df/f0 - db/f0) / k)
 *   otherwise     p_ref = p_0
 * with db = 36 mHz and k = 5 % by default, and the open-loop response time t90 = 5 s realised as
 * a first-order lag tau = t90 / ln 10:  tau dp/dt = p_ref - p.
 * At MPPT p_avail = p_0 (the panel already gives all it can), so the min() removes any upward
 * response: the tool's "PV has no upward reserve" assumption.
 * Notation: db = overFrequencyDeadbandHz, k = overFrequencyDroopPu, t90 = responseTimeS.
 * States: p (powerState), energy.
 */
import type { Island } from './island.js';

/** Frequency-watt reference; shared with wind for the over-frequency side. */
export function frequencyWattReferencePu(
  isl: Island,
  i: number,
  dwPu: number,
  availablePu: number,
): number {
  const p0 = isl.dispatchPu[i]!;
  const db = isl.overFrequencyDeadbandPu[i]!;
  const gain = isl.overFrequencyGainPu[i]!;
  if (dwPu > db) {
    const p = p0 - gain * (dwPu - db);
    return Math.max(p, 0);
  }
  if (dwPu < -db) {
    const p = p0 + gain * (-db - dwPu);
    return Math.min(p, availablePu);
  }
  return p0;
}

/** Frequency-watt lag and delivered energy of the online PV units in `list` (output = p). */
export function pvDerivatives(
  isl: Island,
  list: Int32Array,
  count: number,
  x: Float64Array,
  dx: Float64Array,
  dwPu: number,
): void {
  const power = isl.powerState;
  const energy = isl.energyState;
  const dispatch = isl.dispatchPu;
  const curtailed = isl.curtailed;
  const available = isl.availablePu;
  const lag = isl.lagTimeS;
  for (let a = 0; a < count; a++) {
    const i = list[a]!;
    const ip = power[i]!;
    const p0 = dispatch[i]!;
    // MPPT: nothing above the present output; curtailed: up to the available power.
    const avail = curtailed[i] === 1 ? Math.max(available[i]!, p0) : p0;
    const ref = frequencyWattReferencePu(isl, i, dwPu, avail);
    const p = x[ip]!;
    dx[ip] = (ref - p) / lag[i]!;
    dx[energy[i]!] = p;
  }
}
