/**
 * The partitions of the scenarios that "what drives the risk" conditions on: month, hour of
 * day, battery state-of-charge band, which sources were out, and the size of the deficit at
 * separation. Each is a partition (every scenario in exactly one stratum), which is what makes
 * the stratified conditional probabilities add back, with their weight shares, to the overall
 * estimate (law of total probability). Sources out give one two-way partition per source.
 *
 * Calendar: hour 0 = 1 January 00:00-01:00, a 365-day year (scenario.ts), months of
 * 31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31 days.
 */
import type { ScenarioFrame } from './scenarioFrame.js';

export interface Partition {
  /** Driver name as written in drivers.arrow (`month`, `hour_of_day`, ...). */
  driver: string;
  /** Plain words for the table ("month", "hour of day"). */
  label: string;
  /** Stratum labels; code k labels stratum k. */
  strata: string[];
  /** Stratum code of each row of the frame. */
  codes: Int32Array;
}

const monthDays = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31] as const;
const monthNames = [
  'January',
  'February',
  'March',
  'April',
  'May',
  'June',
  'July',
  'August',
  'September',
  'October',
  'November',
  'December',
] as const;

/** First hour of each month, and 8760 at the end. */
const monthStartHour: readonly number[] = (() => {
  const starts = [0];
  for (const d of monthDays) starts.push(starts[starts.length - 1]! + d * 24);
  return starts;
})();

/** Month index 0-11 of an hour of the year 0-8759. */
export function monthOfHour(hourOfYear: number): number {
  let m = 0;
  while (m < 11 && hourOfYear >= monthStartHour[m + 1]!) m++;
  return m;
}

export function monthPartition(frame: ScenarioFrame): Partition | undefined {
  const hour = frame.numeric('hour_of_year');
  if (!hour) return undefined;
  const codes = new Int32Array(frame.n);
  for (let i = 0; i < frame.n; i++) codes[i] = monthOfHour(hour[i]!);
  return { driver: 'month', label: 'month', strata: [...monthNames], codes };
}

export function hourOfDayPartition(frame: ScenarioFrame): Partition | undefined {
  const hour = frame.numeric('hour_of_year');
  if (!hour) return undefined;
  const codes = new Int32Array(frame.n);
  for (let i = 0; i < frame.n; i++) codes[i] = hour[i]! % 24;
  const strata = Array.from(
    { length: 24 },
    (_, h) => `${String(h).padStart(2, '0')}:00-${String(h + 1).padStart(2, '0')}:00`,
  );
  return { driver: 'hour_of_day', label: 'hour of day', strata, codes };
}

/**
 * State-of-charge bands of 20 points: 0-20 %, ..., 80-100 % (a full battery falls in the last),
 * and a stratum of its own for scenarios with no battery available (battery_soc NaN).
 */
export function socBandPartition(frame: ScenarioFrame): Partition | undefined {
  const soc = frame.numeric('battery_soc');
  if (!soc) return undefined;
  const bands = 5;
  const codes = new Int32Array(frame.n);
  for (let i = 0; i < frame.n; i++) {
    const x = soc[i]!;
    codes[i] = Number.isNaN(x) ? bands : Math.min(bands - 1, Math.max(0, Math.floor(x * bands)));
  }
  const strata = Array.from(
    { length: bands },
    (_, k) => `state of charge ${(k * 100) / bands}-${((k + 1) * 100) / bands} %`,
  );
  strata.push('no battery available');
  return { driver: 'soc_band', label: 'battery state of charge', strata, codes };
}

/** A "nice" step (1, 2 or 5 times a power of ten) that cuts `range` into about `parts` bands. */
export function niceStep(range: number, parts: number): number {
  const raw = range / parts;
  const power = 10 ** Math.floor(Math.log10(raw));
  for (const m of [1, 2, 5]) if (m * power >= raw) return m * power;
  return 10 * power;
}

/**
 * Deficit bands: a surplus-or-balanced stratum (deficit below 1 W), then bands of a nice width
 * cutting the largest deficit into about five (e.g. 0-200, 200-400, ... kW).
 */
export function deficitPartition(frame: ScenarioFrame): Partition | undefined {
  const deficit = frame.numeric('deficit_kw');
  if (!deficit) return undefined;
  let max = 0;
  for (let i = 0; i < frame.n; i++) if (deficit[i]! > max) max = deficit[i]!;
  // deficits below a watt are "balanced" for this purpose (and keep the step arithmetic finite)
  const step = max >= 1e-3 ? niceStep(max, 5) : 1;
  const bands = max >= 1e-3 ? Math.ceil(max / step) : 0;
  const strata = ['surplus or balanced (deficit below 1 W)'];
  for (let k = 0; k < bands; k++) strata.push(`deficit ${k * step}-${(k + 1) * step} kW`);
  const codes = new Int32Array(frame.n);
  for (let i = 0; i < frame.n; i++) {
    const d = deficit[i]!;
    // a deficit exactly on a band edge belongs to the lower band: (k*step, (k+1)*step]
    codes[i] =
      d < 1e-3 || bands === 0 ? 0 : 1 + Math.min(bands - 1, Math.max(0, Math.ceil(d / step) - 1));
  }
  return { driver: 'deficit_band', label: 'deficit at separation', strata, codes };
}

/**
 * Which sources were out (forced outage or maintenance), from the `sources_out` column: source
 * ids joined by '+', '' when none. Each source that is out in some scenario gets a two-way
 * partition of its own, "diesel-2 out" against "diesel-2 in service", so a source is judged by
 * every scenario it was out in, whatever else was out with it (a partition by combination would
 * scatter a source over many thin strata). The rows of this driver therefore add back source by
 * source: q(X out) p(X out) + q(X in service) p(X in service) = p for each X. With no source
 * ever out, one stratum "no source out". Without the column (files written before it), the
 * count of sources available at the event hour (`sources_available`) is the partition:
 * "5 sources available", "4 sources available", ...
 */
export function sourcesOutPartitions(frame: ScenarioFrame): Partition[] {
  const out = frame.text('sources_out');
  if (!out) {
    const byCount = sourcesAvailablePartition(frame);
    return byCount ? [byCount] : [];
  }
  // each source's rows, ids sorted so the partitions do not depend on row order
  const rowsOf = new Map<string, number[]>();
  for (let i = 0; i < frame.n; i++) {
    if (out[i] === '') continue;
    for (const id of out[i]!.split('+')) {
      const rows = rowsOf.get(id);
      if (rows) rows.push(i);
      else rowsOf.set(id, [i]);
    }
  }
  if (rowsOf.size === 0)
    return [
      {
        driver: 'sources_out',
        label: 'sources out',
        strata: ['no source out'],
        codes: new Int32Array(frame.n),
      },
    ];
  return [...rowsOf.keys()].sort().map((id) => {
    const codes = new Int32Array(frame.n).fill(1);
    for (const i of rowsOf.get(id)!) codes[i] = 0;
    return {
      driver: 'sources_out',
      label: `source ${id}`,
      strata: [`${id} out`, `${id} in service`],
      codes,
    };
  });
}

/** The partition by which sources were out: the first of `sourcesOutPartitions` (tests, tables). */
export function sourcesOutPartition(frame: ScenarioFrame): Partition | undefined {
  return sourcesOutPartitions(frame)[0];
}

function sourcesAvailablePartition(frame: ScenarioFrame): Partition | undefined {
  const available = frame.numeric('sources_available');
  if (!available) return undefined;
  const counts = [...new Set(available)].sort((a, b) => b - a);
  const index = new Map(counts.map((c, k) => [c, k]));
  const codes = new Int32Array(frame.n);
  for (let i = 0; i < frame.n; i++) codes[i] = index.get(available[i]!)!;
  const strata = counts.map((c) => `${c} source${c === 1 ? '' : 's'} available`);
  return { driver: 'sources_out', label: 'sources available', strata, codes };
}

/** Every partition the frame has the columns for, in the order the tables show them. */
export function driverPartitions(frame: ScenarioFrame): Partition[] {
  return [
    monthPartition(frame),
    hourOfDayPartition(frame),
    socBandPartition(frame),
    ...sourcesOutPartitions(frame),
    deficitPartition(frame),
  ].filter((p): p is Partition => p !== undefined);
}
