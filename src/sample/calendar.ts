/**
 * The model year: 365 days, 8760 hours, hour 0 = 1 January 00:00-01:00 local standard time.
 * No leap day and no daylight saving. 1 January is taken to be a Monday (an assumption of the
 * tool, documented in docs/sampler.md), so days 6 and 7 of each week are the weekend.
 */

export const hoursPerYear = 8760;
export const daysPerYear = 365;

/** Days in each month of a common year (Gregorian calendar). */
export const monthDays: readonly number[] = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/** First hour of each month, and 8760 at index 12. */
export const monthStartHour: readonly number[] = (() => {
  const starts = [0];
  for (let m = 0; m < 12; m++) starts.push(starts[m]! + monthDays[m]! * 24);
  return starts;
})();

const monthOfHourTable = (() => {
  const t = new Uint8Array(hoursPerYear);
  for (let m = 0; m < 12; m++) t.fill(m, monthStartHour[m]!, monthStartHour[m + 1]!);
  return t;
})();

/** Brings any integer hour into 0..8759 (hours past the end of the year wrap to its start). */
export function wrapHour(hour: number): number {
  const h = hour % hoursPerYear;
  return h < 0 ? h + hoursPerYear : h;
}

/** Month 0..11 of an hour 0..8759. */
export function monthOfHour(hourOfYear: number): number {
  return monthOfHourTable[hourOfYear]!;
}

/** Day of the year 1..365 of an hour 0..8759 (the `n` of Duffie & Beckman). */
export function dayOfYear(hourOfYear: number): number {
  return Math.floor(hourOfYear / 24) + 1;
}

/** True on Saturdays and Sundays, with 1 January a Monday. */
export function isWeekend(hourOfYear: number): boolean {
  return Math.floor(hourOfYear / 24) % 7 >= 5;
}
