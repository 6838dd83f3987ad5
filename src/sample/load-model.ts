/**
 * Expected hourly demand of one load over the model year.
 *
 * Parametric model (invented shape, no source claimed; a screening assumption):
 *   P(h) = peakKw * daily[hour of day] * weekend * seasonal(n)
 *   weekend = weekendFactor on Saturdays and Sundays, else 1
 *   seasonal(n) = 1 - A (1 - cos(2 pi (n - nPeak) / 365)),  A = seasonalSwingFraction
 * so the peak is reached on day nPeak at the hour where daily = 1, and the seasonal trough is
 * 1 - 2A of it half a year later (the temperature-like seasonality). At the event the sampler
 * multiplies by (1 + forecastErrorSd * z), z ~ N(0, 1), floored at 0.
 * CSV model: the column holds the demand as a fraction of peakKw for each of the 8760 hours.
 */
import type { Load } from '../case/schema.js';
import { dayOfYear, hoursPerYear, isWeekend } from './calendar.js';

/**
 * Default daily shape, multipliers of the peak for hours 0..23 local time: an invented mix of
 * offices and homes with a morning ramp and an evening peak (illustrative, no source).
 */
export const defaultDailyShape: readonly number[] = [
  0.55, 0.52, 0.5, 0.49, 0.5, 0.55, 0.65, 0.78, 0.86, 0.88, 0.89, 0.9, 0.9, 0.89, 0.88, 0.88, 0.9,
  0.95, 1.0, 0.98, 0.92, 0.82, 0.7, 0.6,
];

/** Expected demand for each hour of the year, kW, for a parametric load. */
export function parametricLoadKw(load: Load): Float64Array {
  const out = new Float64Array(hoursPerYear);
  if (load.profile.kind !== 'parametric') return out;
  const p = load.profile;
  const shape = p.dailyShape ?? defaultDailyShape;
  for (let h = 0; h < hoursPerYear; h++) {
    const n = dayOfYear(h);
    const seasonal =
      1 - p.seasonalSwingFraction * (1 - Math.cos((2 * Math.PI * (n - p.peakDayOfYear)) / 365));
    const weekend = isWeekend(h) ? p.weekendFactor : 1;
    out[h] = load.peakKw * shape[h % 24]! * weekend * seasonal;
  }
  return out;
}

/** Expected demand for each hour of the year, kW, from a CSV column of fractions of peakKw. */
export function csvLoadKw(load: Load, fractions: Float64Array): Float64Array {
  const out = new Float64Array(hoursPerYear);
  for (let h = 0; h < hoursPerYear; h++) out[h] = load.peakKw * fractions[h]!;
  return out;
}
