/**
 * Position of the sun and angle of incidence on a tilted plane.
 *
 *   declination (Cooper 1969):  delta = 23.45 deg * sin(360 deg (284 + n) / 365)
 *   equation of time (Spencer 1971, D&B eq. 1.5.3), minutes:
 *     E = 229.2 (0.000075 + 0.001868 cos B - 0.032077 sin B - 0.014615 cos 2B - 0.04089 sin 2B),
 *     B = 360 deg (n - 1) / 365
 *   solar time = standard time + 4 min/deg (longitudeEast - 15 deg * timeZoneHours) + E
 *   hour angle omega = 15 deg/h (solar time - 12 h), morning negative
 *   cos(zenith) = cos phi cos delta cos omega + sin phi sin delta             (D&B eq. 1.6.5)
 *   cos(theta)  = sin d sin p cos b - sin d cos p sin b cos g + cos d cos p cos b cos w
 *               + cos d sin p sin b cos g cos w + cos d sin b sin g sin w     (D&B eq. 1.6.2)
 * Notation: phi = latitude, delta = declination, beta = tilt, gamma = surface azimuth
 * (0 = south, west positive, D&B convention), omega = hour angle, n = day of year.
 * Source: J. A. Duffie and W. A. Beckman, Solar Engineering of Thermal Processes, 4th ed.,
 * Wiley 2013, sec. 1.5-1.6; P. I. Cooper, Solar Energy 12:333, 1969; J. W. Spencer, Search
 * 2(5):172, 1971 (citations from memory; the declination formula is confirmed, REFERENCES 8.1).
 */

const deg = Math.PI / 180;

/** Solar declination by Cooper's formula, degrees, for day of year n (1..365). */
export function declinationCooperDeg(n: number): number {
  return 23.45 * Math.sin(((360 * (284 + n)) / 365) * deg);
}

/** Solar declination by Spencer's Fourier series, degrees. */
export function declinationSpencerDeg(n: number): number {
  const b = (2 * Math.PI * (n - 1)) / 365;
  const rad =
    0.006918 -
    0.399912 * Math.cos(b) +
    0.070257 * Math.sin(b) -
    0.006758 * Math.cos(2 * b) +
    0.000907 * Math.sin(2 * b) -
    0.002697 * Math.cos(3 * b) +
    0.00148 * Math.sin(3 * b);
  return rad / deg;
}

/** Equation of time, minutes (Spencer, as in D&B eq. 1.5.3). */
export function equationOfTimeMin(n: number): number {
  const b = (2 * Math.PI * (n - 1)) / 365;
  return (
    229.2 *
    (0.000075 +
      0.001868 * Math.cos(b) -
      0.032077 * Math.sin(b) -
      0.014615 * Math.cos(2 * b) -
      0.04089 * Math.sin(2 * b))
  );
}

/** Hour angle, degrees, from local standard clock time in hours (0..24). */
export function hourAngleDeg(
  n: number,
  clockHours: number,
  longitudeEastDeg: number,
  timeZoneHours: number,
): number {
  const solarHours =
    clockHours + (4 * (longitudeEastDeg - 15 * timeZoneHours) + equationOfTimeMin(n)) / 60;
  return 15 * (solarHours - 12);
}

/** Cosine of the solar zenith angle (D&B eq. 1.6.5). */
export function cosZenith(latitudeDeg: number, declinationDeg: number, hourAngle: number): number {
  const p = latitudeDeg * deg;
  const d = declinationDeg * deg;
  return Math.cos(p) * Math.cos(d) * Math.cos(hourAngle * deg) + Math.sin(p) * Math.sin(d);
}

/** Cosine of the angle of incidence on a plane of tilt beta and azimuth gamma (D&B eq. 1.6.2). */
export function cosIncidence(
  latitudeDeg: number,
  declinationDeg: number,
  hourAngle: number,
  tiltDeg: number,
  surfaceAzimuthDeg: number,
): number {
  const p = latitudeDeg * deg;
  const d = declinationDeg * deg;
  const b = tiltDeg * deg;
  const g = surfaceAzimuthDeg * deg;
  const w = hourAngle * deg;
  const sd = Math.sin(d);
  const cd = Math.cos(d);
  const sp = Math.sin(p);
  const cp = Math.cos(p);
  const sb = Math.sin(b);
  const cb = Math.cos(b);
  return (
    sd * sp * cb -
    sd * cp * sb * Math.cos(g) +
    cd * cp * cb * Math.cos(w) +
    cd * sp * sb * Math.cos(g) * Math.cos(w) +
    cd * sb * Math.sin(g) * Math.sin(w)
  );
}

/**
 * Converts the schema's azimuth (0 = facing the equator, west positive) to D&B's gamma
 * (0 = facing south, west positive): unchanged north of the equator, 180 - a south of it.
 */
export function surfaceAzimuthDb(latitudeDeg: number, azimuthFromEquatorDeg: number): number {
  return latitudeDeg >= 0 ? azimuthFromEquatorDeg : 180 - azimuthFromEquatorDeg;
}
