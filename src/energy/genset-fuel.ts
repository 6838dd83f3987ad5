/**
 * Fuel use of an engine-generator set: the Willans line.
 *
 *   F(P) = F0 + (F1 - F0) * P / Pr          (L/h, or m3/h for gas)
 *
 * F0 = fuelNoLoadLPerH (intercept: fuel at zero electrical load), F1 = fuelFullLoadLPerH
 * (fuel at the rating Pr = ratingKw), P = electrical output, kW. A running set burns at least F0.
 * The linear fuel-versus-load line of internal-combustion engines is the Willans line (P. W.
 * Willans, steam-engine trials, 1888; Heywood, Internal Combustion Engine Fundamentals, 1988,
 * fuel-rate versus load at constant speed, from memory). Manufacturers' data sheets give F at
 * 25/50/75/100 % load, which a straight line fits closely (common practice, no source).
 */

/** Slope of the Willans line, L per kWh of electrical output. */
export function willansSlopeLPerKwh(
  fuelNoLoadLPerH: number,
  fuelFullLoadLPerH: number,
  ratingKw: number,
): number {
  return (fuelFullLoadLPerH - fuelNoLoadLPerH) / ratingKw;
}

/** Fuel rate at output `outputKw`, L/h (m3/h for gas). */
export function fuelRateLPerH(
  fuelNoLoadLPerH: number,
  slopeLPerKwh: number,
  outputKw: number,
): number {
  return fuelNoLoadLPerH + slopeLPerKwh * outputKw;
}
