/**
 * The small per-metric tables: `summary.arrow` (CONTRACT.md: one row per metric with estimate,
 * interval, unit, scenarios behind it and estimator) and `exceedance.arrow` (one row per
 * quantity and threshold). Every field carries `unit` and `description` metadata.
 */
import {
  type DataType,
  Field,
  Float64,
  Int64,
  makeData,
  RecordBatch,
  Schema,
  Struct,
  Table,
  tableToIPC,
  Utf8,
  vectorFromArray,
} from 'apache-arrow';
import type { ExceedanceRow } from './exceedance.js';
import { writeFileAtomic } from './manifest.js';
import type { SummaryRow } from './summary.js';

/** One column of a small table: how to read it from a row object. */
export interface SmallColumn<R> {
  name: string;
  type: 'utf8' | 'float64' | 'int64';
  unit: string;
  description: string;
  value: (row: R) => string | number;
}

const arrowTypes: Record<SmallColumn<unknown>['type'], () => DataType> = {
  utf8: () => new Utf8(),
  float64: () => new Float64(),
  int64: () => new Int64(),
};

export function smallTable<R>(columns: readonly SmallColumn<R>[], rows: readonly R[]): Table {
  const fields = columns.map(
    (c) =>
      new Field(
        c.name,
        arrowTypes[c.type](),
        false,
        new Map([
          ['unit', c.unit],
          ['description', c.description],
        ]),
      ),
  );
  const schema = new Schema(fields);
  const children = columns.map((c, k) => {
    const values = rows.map((r) => {
      const v = c.value(r);
      return c.type === 'int64' ? BigInt(v) : v;
    });
    return vectorFromArray(values as never, fields[k]!.type).data[0]!;
  });
  const struct = makeData({ type: new Struct(fields), length: rows.length, children });
  return new Table([new RecordBatch(schema, struct)]);
}

export const summaryColumns: readonly SmallColumn<SummaryRow>[] = [
  {
    name: 'metric',
    type: 'utf8',
    unit: '1',
    description: 'metric name (docs/statistics.md)',
    value: (r) => r.metric,
  },
  {
    name: 'estimate',
    type: 'float64',
    unit: 'see unit column',
    description: 'point estimate',
    value: (r) => r.estimate,
  },
  {
    name: 'ci_low',
    type: 'float64',
    unit: 'see unit column',
    description: 'lower confidence bound (level in run.json)',
    value: (r) => r.ciLow,
  },
  {
    name: 'ci_high',
    type: 'float64',
    unit: 'see unit column',
    description: 'upper confidence bound (level in run.json)',
    value: (r) => r.ciHigh,
  },
  {
    name: 'unit',
    type: 'utf8',
    unit: '1',
    description: 'unit of estimate, ci_low and ci_high',
    value: (r) => r.unit,
  },
  {
    name: 'n_scenarios',
    type: 'int64',
    unit: '1',
    description: 'scenarios behind the estimate',
    value: (r) => r.nScenarios,
  },
  {
    name: 'method',
    type: 'utf8',
    unit: '1',
    description: 'estimator and interval method',
    value: (r) => r.method,
  },
];

export const exceedanceColumns: readonly SmallColumn<ExceedanceRow>[] = [
  {
    name: 'quantity',
    type: 'utf8',
    unit: '1',
    description: 'scenarios.arrow column the curve is about',
    value: (r) => r.quantity,
  },
  {
    name: 'threshold',
    type: 'float64',
    unit: 'see unit column',
    description: 'threshold crossed',
    value: (r) => r.thresholdValue,
  },
  {
    name: 'unit',
    type: 'utf8',
    unit: '1',
    description: 'unit of the threshold',
    value: (r) => r.unit,
  },
  {
    name: 'direction',
    type: 'utf8',
    unit: '1',
    description: "'below' (value < threshold) or 'above' (value > threshold)",
    value: (r) => r.direction,
  },
  {
    name: 'probability',
    type: 'float64',
    unit: '1',
    description: 'probability per islanding event of crossing the threshold',
    value: (r) => r.probability,
  },
  {
    name: 'ci_low',
    type: 'float64',
    unit: '1',
    description: 'lower confidence bound of the probability',
    value: (r) => r.ciLow,
  },
  {
    name: 'ci_high',
    type: 'float64',
    unit: '1',
    description: 'upper confidence bound of the probability',
    value: (r) => r.ciHigh,
  },
  {
    name: 'rate_per_year',
    type: 'float64',
    unit: '1/yr',
    description: 'yearly rate of crossings (islanding rate times probability)',
    value: (r) => r.ratePerYear,
  },
  {
    name: 'rate_ci_low',
    type: 'float64',
    unit: '1/yr',
    description: 'lower confidence bound of the yearly rate',
    value: (r) => r.rateCiLow,
  },
  {
    name: 'rate_ci_high',
    type: 'float64',
    unit: '1/yr',
    description: 'upper confidence bound of the yearly rate',
    value: (r) => r.rateCiHigh,
  },
];

export function writeSmallTable<R>(
  path: string,
  columns: readonly SmallColumn<R>[],
  rows: readonly R[],
): void {
  writeFileAtomic(path, tableToIPC(smallTable(columns, rows), 'file'));
}

export async function writeSummaryArrow(path: string, rows: readonly SummaryRow[]): Promise<void> {
  writeSmallTable(path, summaryColumns, rows);
}
