/**
 * Clear-sky global horizontal irradiance by the Haurwitz model:
 *   GHI_cs = 1098 W/m2 * cos z * exp(-0.059 / cos z),  0 when the sun is below the horizon.
 * z = solar zenith angle. Source: B. Haurwitz, "Insolation in relation to cloudiness and cloud
 * density", J. Meteorology 2:154-166, 1945 and J. Meteorology 3:123-124, 1946, as given by
 * Reno, Hansen & Stein, SAND2012-2389, 2012 (REFERENCES 8.4, confirmed (quoted by a third party)).
 */

/** Haurwitz prefactor, W/m2 (REFERENCES 8.4; not the zenith value, see the cautions there). */
const haurwitzPrefactorWm2 = 1098;
/** Haurwitz extinction term (REFERENCES 8.4). */
const haurwitzExtinction = 0.059;

/** Clear-sky GHI in W/m2 for a given cosine of the zenith angle. */
export function haurwitzGhiWm2(cosZenith: number): number {
  if (cosZenith <= 0) return 0;
  return haurwitzPrefactorWm2 * cosZenith * Math.exp(-haurwitzExtinction / cosZenith);
}
