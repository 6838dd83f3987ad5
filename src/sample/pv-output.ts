/**
 * Available AC output of a PV array at an hour, from the solar model or a CSV capacity factor.
 *
 * Parametric model, per hour h (sun position at the middle of the hour):
 *   GHI      = GHI_cs(z) * k / k_max                (Haurwitz clear sky scaled by the sampled
 *                                                    clearness index k; k = k_max is a clear sky)
 *   fd       = Erbs diffuse fraction of k            (Erbs, Klein & Duffie, Solar Energy 28:293,
 *                                                    1982; coefficients from memory, D&B eq. 2.10.1)
 *   G_T      = GHI (1 - fd) R_b + GHI fd (1 + cos b)/2 + GHI rho (1 - cos b)/2,
 *              R_b = max(cos theta, 0) / cos z        (isotropic sky, Liu & Jordan 1963; D&B 2.15)
 *   T_cell   = T_amb + (NOCT - 20 degC) G_T / 800 W/m2 (NOCT model, D&B sec. 23.3, from memory)
 *   P        = ratingKw * G_T / 1000 W/m2 * (1 + gamma (T_cell - 25 degC)), clipped to [0, rating]
 * T_amb is an invented seasonal cosine (20 degC +- 8 degC, warmest on day 200 north of the
 * equator, day 17 south of it): a screening assumption, there is no temperature input yet.
 * CSV model: P = ratingKw * capacity factor, clipped to the rating.
 * Notation: z zenith, theta incidence angle, b tilt, rho ground reflectance 0.2 (common practice,
 * no source), gamma = temperatureCoefficientPerC.
 */
import type { Pv } from '../case/schema.js';
import { dayOfYear, hoursPerYear, monthOfHour } from './calendar.js';
import { haurwitzGhiWm2 } from './clear-sky.js';
import { ClearnessTable, clearnessMaxDefault, defaultClearnessByMonth } from './clearness-index.js';
import {
  cosIncidence,
  cosZenith,
  declinationCooperDeg,
  hourAngleDeg,
  surfaceAzimuthDb,
} from './solar-position.js';

/** Ground reflectance (albedo) for the reflected term (0.2, common practice, no source). */
const groundReflectance = 0.2;
/** Nominal operating cell temperature, degC (45 degC typical, from memory). */
const noctC = 45;
/** Standard test conditions irradiance, W/m2 (IEC 60904-3 STC). */
const stcIrradianceWm2 = 1000;
/** Quantile points used to average PV output over the clearness distribution (midpoint rule). */
const expectationPoints = 16;

/** Erbs et al. (1982) hourly diffuse fraction of the clearness index (from memory). */
export function erbsDiffuseFraction(k: number): number {
  if (k <= 0.22) return 1 - 0.09 * k;
  if (k <= 0.8) return 0.9511 - 0.1604 * k + 4.388 * k ** 2 - 16.638 * k ** 3 + 12.336 * k ** 4;
  return 0.165;
}

/** Precomputed sun geometry and clearness tables of one PV array. */
export class PvResource {
  private readonly ratingKw: number;
  private readonly csvFactor: Float64Array | null;
  private readonly cosZ = new Float64Array(hoursPerYear);
  private readonly cosTheta = new Float64Array(hoursPerYear);
  private readonly ghiClearWm2 = new Float64Array(hoursPerYear);
  private readonly ambientC = new Float64Array(hoursPerYear);
  private readonly tables: ClearnessTable[] = [];
  private readonly tiltDiffuse: number;
  private readonly tiltGround: number;
  private readonly tempCoefPerC: number;
  /** Expected available output per hour, kW (mean over the clearness distribution). */
  readonly expectedKw = new Float64Array(hoursPerYear);

  constructor(pv: Pv, csvFactor: Float64Array | null) {
    this.ratingKw = pv.ratingKw;
    this.csvFactor = csvFactor;
    this.tiltDiffuse = 0;
    this.tiltGround = 0;
    this.tempCoefPerC = 0;
    if (csvFactor) {
      for (let h = 0; h < hoursPerYear; h++) {
        this.expectedKw[h] = Math.min(pv.ratingKw, pv.ratingKw * csvFactor[h]!);
      }
      return;
    }
    const r = pv.resource;
    if (r.kind !== 'parametric') return;
    const south = r.latitudeDeg < 0;
    const gamma = surfaceAzimuthDb(r.latitudeDeg, r.azimuthDeg);
    const tilt = (r.tiltDeg * Math.PI) / 180;
    this.tiltDiffuse = (1 + Math.cos(tilt)) / 2;
    this.tiltGround = (groundReflectance * (1 - Math.cos(tilt))) / 2;
    this.tempCoefPerC = r.temperatureCoefficientPerC;
    const means =
      r.clearnessByMonth ??
      defaultClearnessByMonth.map((_, m, a) => a[(m + (south ? 6 : 0)) % 12]!);
    for (let m = 0; m < 12; m++)
      this.tables.push(new ClearnessTable(means[m]!, clearnessMaxDefault));
    const warmestDay = south ? 17 : 200;
    for (let h = 0; h < hoursPerYear; h++) {
      const n = dayOfYear(h);
      const delta = declinationCooperDeg(n);
      const omega = hourAngleDeg(n, (h % 24) + 0.5, r.longitudeDeg, r.timeZoneHours);
      const cz = cosZenith(r.latitudeDeg, delta, omega);
      this.cosZ[h] = cz;
      this.cosTheta[h] = cosIncidence(r.latitudeDeg, delta, omega, r.tiltDeg, gamma);
      this.ghiClearWm2[h] = haurwitzGhiWm2(cz);
      this.ambientC[h] = 20 + 8 * Math.cos((2 * Math.PI * (n - warmestDay)) / 365);
    }
    for (let h = 0; h < hoursPerYear; h++) {
      if (this.ghiClearWm2[h]! <= 0) continue;
      const table = this.tables[monthOfHour(h)]!;
      let sum = 0;
      for (let j = 0; j < expectationPoints; j++) {
        sum += this.outputKw(h, table.quantile((j + 0.5) / expectationPoints));
      }
      this.expectedKw[h] = sum / expectationPoints;
    }
  }

  /** Output at hour h for a sampled clearness index k (parametric model only). */
  outputKw(h: number, k: number): number {
    const ghi = (this.ghiClearWm2[h]! * k) / clearnessMaxDefault;
    if (ghi <= 0) return 0;
    const fd = erbsDiffuseFraction(k);
    const cz = this.cosZ[h]!;
    const ct = this.cosTheta[h]!;
    const rb = ct > 0 ? ct / cz : 0;
    const gt = ghi * (1 - fd) * rb + ghi * fd * this.tiltDiffuse + ghi * this.tiltGround;
    const cellC = this.ambientC[h]! + ((noctC - 20) * gt) / 800;
    const p = ((this.ratingKw * gt) / stcIrradianceWm2) * (1 + this.tempCoefPerC * (cellC - 25));
    return p <= 0 ? 0 : Math.min(p, this.ratingKw);
  }

  /** Available output at hour h from one uniform u (the clearness quantile); CSV ignores u. */
  sampleKw(h: number, u: number): number {
    if (this.csvFactor) return this.expectedKw[h]!;
    if (this.ghiClearWm2[h]! <= 0) return 0;
    return this.outputKw(h, this.tables[monthOfHour(h)]!.quantile(u));
  }
}
