/**
 * Available output of a wind turbine at an hour, from a Weibull wind speed or a CSV capacity factor.
 *
 *   v_ref ~ Weibull(k_m, c_m) for the month m (k defaults to 2, the Rayleigh case)
 *   v_hub = v_ref (z_hub / z_ref)^alpha                 (power-law shear, REFERENCES 8.6)
 *   P(v)  = 0                                          v < v_ci or v >= v_co
 *         = P_r (v^3 - v_ci^3) / (v_r^3 - v_ci^3)      v_ci <= v < v_r
 *         = P_r                                        v_r <= v < v_co
 * (generic cubic power curve, REFERENCES 8.6, from memory). CSV model: P = ratingKw * capacity
 * factor, clipped to the rating. Notation: v_ci = cutInMPerS, v_r = ratedMPerS, v_co = cutOutMPerS,
 * P_r = ratingKw, alpha = shearExponent.
 */
import type { Wind } from '../case/schema.js';
import { weibullQuantile } from '../stats/distributions.js';
import { monthOfHour } from './calendar.js';

/** Weibull shape when the case gives none: 2, the Rayleigh distribution (common practice). */
const defaultWeibullShape = 2;
/** Quantile points used for the expected output per month (midpoint rule). */
const expectationPoints = 256;

/** Turbine power curve, kW, for a hub-height wind speed. */
export function powerCurveKw(
  vMPerS: number,
  ratingKw: number,
  cutInMPerS: number,
  ratedMPerS: number,
  cutOutMPerS: number,
): number {
  if (vMPerS < cutInMPerS || vMPerS >= cutOutMPerS) return 0;
  if (vMPerS >= ratedMPerS) return ratingKw;
  const ci3 = cutInMPerS ** 3;
  return (ratingKw * (vMPerS ** 3 - ci3)) / (ratedMPerS ** 3 - ci3);
}

/** Precomputed monthly wind statistics of one turbine. */
export class WindResource {
  private readonly csvFactor: Float64Array | null;
  private readonly shapeByMonth = new Float64Array(12);
  private readonly hubScaleByMonth = new Float64Array(12);
  private readonly expectedByMonthKw = new Float64Array(12);
  private readonly w: Wind;

  constructor(w: Wind, csvFactor: Float64Array | null) {
    this.w = w;
    this.csvFactor = csvFactor;
    const r = w.resource;
    if (csvFactor || r.kind !== 'parametric') return;
    const shear = (r.hubHeightM / r.referenceHeightM) ** r.shearExponent;
    for (let m = 0; m < 12; m++) {
      this.shapeByMonth[m] = r.weibullShapeByMonth?.[m] ?? defaultWeibullShape;
      // Scaling a Weibull variable by a constant scales its scale parameter c.
      this.hubScaleByMonth[m] = r.weibullScaleMPerSByMonth[m]! * shear;
      let sum = 0;
      for (let j = 0; j < expectationPoints; j++)
        sum += this.fromUniform(m, (j + 0.5) / expectationPoints);
      this.expectedByMonthKw[m] = sum / expectationPoints;
    }
  }

  /** Hub-height wind speed at cumulative probability u for month m, m/s. */
  hubSpeedMPerS(m: number, u: number): number {
    return weibullQuantile(u, this.shapeByMonth[m]!, this.hubScaleByMonth[m]!);
  }

  private fromUniform(m: number, u: number): number {
    const w = this.w;
    return powerCurveKw(
      this.hubSpeedMPerS(m, u),
      w.ratingKw,
      w.cutInMPerS,
      w.ratedMPerS,
      w.cutOutMPerS,
    );
  }

  /** Expected available output at hour h, kW. */
  expectedKw(h: number): number {
    if (this.csvFactor) return Math.min(this.w.ratingKw, this.w.ratingKw * this.csvFactor[h]!);
    return this.expectedByMonthKw[monthOfHour(h)]!;
  }

  /** Available output at hour h from one uniform u (the wind-speed quantile); CSV ignores u. */
  sampleKw(h: number, u: number): number {
    if (this.csvFactor) return this.expectedKw(h);
    return this.fromUniform(monthOfHour(h), u);
  }
}
