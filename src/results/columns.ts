/**
 * The columns of `scenarios.arrow` as one typed table: contract name (snake case), storage kind,
 * unit and description, grouped by the model that produces them. A group is written only when
 * its model is part of the build (`kernel.ts` decides), so a column is never a placeholder.
 *
 * Storage kinds and their Arrow types:
 *   int64 -> Int64 (held as BigInt64Array), int16 -> Int16, int8 -> Int8,
 *   bool -> Bool (held as Uint8Array 0/1, packed to a bitmap when written),
 *   category -> Dictionary<Utf8, Int8> (held as Int8Array codes into `categories`),
 *   float64 -> Float64,
 *   utf8 -> Utf8 (free text whose values are not known in advance, such as which sources were
 *     out; held as one Uint8Array per batch: count + 1 little-endian Int32 offsets, then the
 *     UTF-8 bytes, see `packUtf8`), so a batch stays a set of flat typed arrays (cheap to copy between threads).
 */

export type ColumnKind = 'int64' | 'int16' | 'int8' | 'bool' | 'category' | 'float64' | 'utf8';

/** The models, in kernel order; each contributes one group of columns. */
export const columnGroups = [
  'core',
  'sample',
  'ride-through',
  'frequency',
  'voltage',
  'outage',
] as const;
export type ColumnGroup = (typeof columnGroups)[number];

export interface ColumnSpec {
  readonly name: string;
  readonly kind: ColumnKind;
  readonly unit: string;
  readonly description: string;
  readonly group: ColumnGroup;
  /** `category` columns: the dictionary; code 0 is always the empty string ("none"). */
  readonly categories?: readonly string[];
}

export type ColumnArray =
  | BigInt64Array
  | Int16Array
  | Int8Array
  | Uint8Array
  | Float64Array
  | Int32Array;

/** Dictionary of `shutdown_cause` (the frequency engine's causes; unknown text maps to 'other'). */
export const shutdownCauses: readonly string[] = [
  '',
  'under-frequency',
  'over-frequency',
  'no grid-forming source',
  'battery exhausted',
  'grid-forming overload',
  'other',
];
export const eventStatuses: readonly string[] = ['ok', 'shutdown', 'failed'];
export const voltageStatuses: readonly string[] = [
  'ok',
  'voltage collapse',
  'no solution',
  'not assessed',
];

/** One column of the table (categories only for `category` columns). */
function column(
  group: ColumnGroup,
  kind: ColumnKind,
  name: string,
  unit: string,
  description: string,
  categories?: readonly string[],
): ColumnSpec {
  const spec = { name, kind, unit, description, group };
  return categories ? { ...spec, categories } : spec;
}

const f64 = (group: ColumnGroup, name: string, unit: string, description: string): ColumnSpec =>
  column(group, 'float64', name, unit, description);

/** Every column holdfast can write, in file order. */
export const allColumns: readonly ColumnSpec[] = [
  column(
    'core',
    'int64',
    'scenario_id',
    '1',
    'scenario number; with the seed it fixes every random draw of the scenario',
  ),
  f64('core', 'weight', '1', 'sampling weight of the scenario (1 for plain Monte Carlo)'),
  // sampler: the operating point just before separation
  column(
    'sample',
    'int16',
    'hour_of_year',
    'h',
    'hour of the separation event, 0-8759 (0 = 1 January 00:00, local standard time)',
  ),
  column('sample', 'int8', 'month', '1', 'month of the event, 1-12'),
  f64('sample', 'load_kw', 'kW', 'total demand of all loads at the event hour'),
  f64('sample', 'pv_kw', 'kW', 'PV output just before separation, all PV sources'),
  f64('sample', 'wind_kw', 'kW', 'wind output just before separation, all wind sources'),
  f64(
    'sample',
    'battery_soc',
    '1',
    'state of charge at separation, energy-weighted over available batteries (0-1; NaN if none)',
  ),
  f64(
    'sample',
    'grid_import_kw',
    'kW',
    'power from the utility just before separation (negative is export)',
  ),
  column(
    'sample',
    'int16',
    'sources_available',
    '1',
    'sources not on forced outage or maintenance at the event hour',
  ),
  column(
    'sample',
    'utf8',
    'sources_out',
    '1',
    "ids of the sources on forced outage or maintenance at the event hour, in case order, joined by '+' (empty when none)",
  ),
  f64('sample', 'dip_retained_pu', 'pu', 'retained voltage at the PCC during the fault'),
  f64('sample', 'dip_duration_s', 's', 'duration of the voltage dip before separation'),
  f64('sample', 'outage_duration_h', 'h', 'sampled duration of the utility outage'),
  // ride-through of the fault's voltage dip (src/grid/voltage/ride-through.ts)
  column(
    'ride-through',
    'int16',
    'units_tripped_by_dip',
    '1',
    'inverter sources lost to the voltage dip before separation (IEEE 1547-2018 ride-through)',
  ),
  column(
    'ride-through',
    'int16',
    'units_in_cessation',
    '1',
    'inverter sources in momentary cessation after the dip (return after a delay)',
  ),
  // frequency event (src/grid/frequency)
  f64(
    'frequency',
    'deficit_kw',
    'kW',
    'power imbalance at separation (load minus output of the sources still online, after ride-through trips)',
  ),
  f64('frequency', 'nadir_hz', 'Hz', 'lowest frequency of the event'),
  f64('frequency', 'nadir_time_s', 's', 'time of the nadir after separation'),
  f64('frequency', 'zenith_hz', 'Hz', 'highest frequency of the event'),
  f64(
    'frequency',
    'rocof_max_hz_per_s',
    'Hz/s',
    'largest rate of change of frequency over the RoCoF window (monteCarlo.rocofWindowS)',
  ),
  f64('frequency', 'f_settled_hz', 'Hz', 'frequency at the horizon (or at shutdown)'),
  f64('frequency', 'shed_kw', 'kW', 'load shed by under-frequency load shedding'),
  column('frequency', 'int8', 'shed_stages', '1', 'UFLS stages that operated'),
  column('frequency', 'bool', 'shutdown', '1', 'the island collapsed during the frequency event'),
  column(
    'frequency',
    'category',
    'shutdown_cause',
    '1',
    'why the island shut down; empty when it did not',
    shutdownCauses,
  ),
  column(
    'frequency',
    'int16',
    'units_tripped',
    '1',
    'sources lost during the event (protection or the voltage dip)',
  ),
  column(
    'frequency',
    'category',
    'event_status',
    '1',
    "frequency simulation status: 'ok', 'shutdown', or 'failed' (the integrator gave up; the row's figures are those reached)",
    eventStatuses,
  ),
  // island voltage, damping and limits after the event (src/grid/voltage/island-voltage.ts)
  column(
    'voltage',
    'bool',
    'frequency_violation',
    '1',
    'nadir below or zenith above the frequency limits (limits.frequencyMinHz/MaxHz or their default band), or RoCoF above limits.rocofMaxHzPerS when set',
  ),
  f64(
    'voltage',
    'v_min_pu',
    'pu',
    'lowest bus voltage of the settled island (NaN when not assessed)',
  ),
  column(
    'voltage',
    'int16',
    'v_min_bus',
    '1',
    'index of the lowest-voltage bus in case.network.buses (-1 when not assessed)',
  ),
  f64(
    'voltage',
    'v_max_pu',
    'pu',
    'highest bus voltage of the settled island (NaN when not assessed)',
  ),
  column(
    'voltage',
    'bool',
    'voltage_violation',
    '1',
    'a bus voltage outside the limits band, or no power-flow solution',
  ),
  f64(
    'voltage',
    'min_damping_ratio',
    '1',
    'damping ratio of the least damped electromechanical mode (NaN when not assessed)',
  ),
  f64(
    'voltage',
    'loading_margin',
    '1',
    'load factor at the nose point of the island (loadability; NaN when not assessed)',
  ),
  column(
    'voltage',
    'category',
    'voltage_status',
    '1',
    "power-flow status: 'ok', 'voltage collapse', 'no solution' or 'not assessed' (shut down)",
    voltageStatuses,
  ),
  // outage hours (src/energy/outage.ts)
  f64('outage', 'outage_h', 'h', 'how long the grid stayed away'),
  f64(
    'outage',
    'survived_h',
    'h',
    'hours the island kept its critical load (outage_h if never lost)',
  ),
  f64('outage', 'unserved_kwh', 'kWh', 'energy demanded but not served over the outage, all tiers'),
  f64('outage', 'unserved_critical_kwh', 'kWh', 'of which critical load'),
  f64('outage', 'lol_h', 'h', 'hours with any load unserved (loss-of-load duration)'),
  f64('outage', 'fuel_used_l', 'L', 'diesel burnt by gensets with a fuel curve'),
  f64(
    'outage',
    'min_soc',
    '1',
    'lowest battery state of charge over the outage (NaN without a battery)',
  ),
  column(
    'outage',
    'int16',
    'contingencies',
    '1',
    'unit failures during the outage that triggered a frequency event',
  ),
  column(
    'outage',
    'bool',
    'critical_lost',
    '1',
    'critical load went unserved at some time (shutdown included)',
  ),
  column(
    'outage',
    'bool',
    'shutdown_any_time',
    '1',
    'the island shut down at some time of the outage, the frequency event included',
  ),
];

/** Writes a non-negative integer below 2^53 into a BigInt64Array without allocating a BigInt. */
export function setInt64(words: Int32Array, row: number, value: number): void {
  // little-endian word order (x64 and arm64 Node builds)
  words[2 * row] = (value % 4294967296) | 0;
  words[2 * row + 1] = Math.floor(value / 4294967296);
}

/** The columns of the given groups, in file order. */
export function columnsOf(groups: readonly ColumnGroup[]): ColumnSpec[] {
  return allColumns.filter((c) => groups.includes(c.group));
}

/** Allocates one batch worth of storage for a column. */
export function allocateColumn(spec: ColumnSpec, count: number): ColumnArray {
  switch (spec.kind) {
    case 'int64':
      return new BigInt64Array(count);
    case 'int16':
      return new Int16Array(count);
    case 'int8':
    case 'category':
      return new Int8Array(count);
    case 'bool':
      return new Uint8Array(count);
    case 'float64':
      return new Float64Array(count);
    case 'utf8':
      // every row the empty string until the producer packs its text (offsets all 0)
      return new Uint8Array(4 * (count + 1));
  }
}

/**
 * Packs `count` strings into a utf8 column: offsets then bytes (the layout of `allocateColumn`).
 * `offsets` holds count + 1 byte offsets into `bytes`, offsets[0] = 0.
 */
export function packUtf8(offsets: Int32Array, bytes: Uint8Array, count: number): Uint8Array {
  const size = offsets[count]!;
  const out = new Uint8Array(4 * (count + 1) + size);
  new Int32Array(out.buffer, 0, count + 1).set(offsets.subarray(0, count + 1));
  out.set(bytes.subarray(0, size), 4 * (count + 1));
  return out;
}

/** The offsets and bytes of a utf8 column of `count` rows (views, no copy). */
export function unpackUtf8(
  column: Uint8Array,
  count: number,
): { offsets: Int32Array; bytes: Uint8Array } {
  const head = 4 * (count + 1);
  return {
    offsets: new Int32Array(column.buffer, column.byteOffset, count + 1),
    bytes: column.subarray(head),
  };
}

const utf8Decoder = new TextDecoder();

/** Row `row` of a utf8 column of `count` rows as a string. */
export function utf8At(column: Uint8Array, count: number, row: number): string {
  const { offsets, bytes } = unpackUtf8(column, count);
  return utf8Decoder.decode(bytes.subarray(offsets[row]!, offsets[row + 1]!));
}

/** One batch of consecutive scenarios as columns (what a worker returns). */
export interface ColumnBatch {
  /** First scenario id of the batch; rows are ids firstId, firstId + 1, ... */
  firstId: number;
  count: number;
  columns: Record<string, ColumnArray>;
}

function columnBytes(spec: ColumnSpec, count: number): number {
  switch (spec.kind) {
    case 'int64':
    case 'float64':
      return 8 * count;
    case 'int16':
      return 2 * count;
    case 'int8':
    case 'category':
    case 'bool':
      return count;
    case 'utf8':
      return 4 * (count + 1);
  }
}

function alignedBytes(spec: ColumnSpec, count: number): number {
  return Math.ceil(columnBytes(spec, count) / 8) * 8;
}

function columnOver(
  spec: ColumnSpec,
  count: number,
  buf: SharedArrayBuffer,
  at: number,
): ColumnArray {
  switch (spec.kind) {
    case 'int64':
      return new BigInt64Array(buf, at, count);
    case 'int16':
      return new Int16Array(buf, at, count);
    case 'int8':
    case 'category':
      return new Int8Array(buf, at, count);
    case 'bool':
      return new Uint8Array(buf, at, count);
    case 'float64':
      return new Float64Array(buf, at, count);
    case 'utf8':
      return new Uint8Array(buf, at, 4 * (count + 1));
  }
}

export function allocateBatch(
  specs: readonly ColumnSpec[],
  firstId: number,
  count: number,
): ColumnBatch {
  // One SharedArrayBuffer per batch, sliced per column (8-byte aligned): the worker returns the
  // batch by reference without detaching anything (detaching an ArrayBuffer slows every
  // typed-array access in that isolate, docs/runner.md "Pool overhead") and without a copy.
  let bytes = 0;
  for (const s of specs) bytes += alignedBytes(s, count);
  const shared = new SharedArrayBuffer(bytes);
  const columns: Record<string, ColumnArray> = {};
  let at = 0;
  for (const s of specs) {
    columns[s.name] = columnOver(s, count, shared, at);
    at += alignedBytes(s, count);
  }
  return { firstId, count, columns };
}
