/**
 * The small per-metric tables: `summary.arrow` (CONTRACT.md: one row per metric with estimate,
 * interval, unit, scenarios behind it and estimator) and `exceedance.arrow` (one row per
 * quantity and threshold). Every field carries `unit` and `description` metadata.
 */
import { type Table, tableToIPC } from 'apache-arrow';
import type { ExceedanceRow } from './exceedance.js';
import { writeFileAtomic } from './manifest.js';
import { columnTable, type TableColumn } from './small-table.js';
import type { SummaryRow } from './summary.js';

/** One column of a small table: how to read it from a row object. */
export interface SmallColumn<R> {
  name: string;
  type: 'utf8' | 'float64' | 'int64';
  unit: string;
  description: string;
  value: (row: R) => string | number;
}

/** Row objects to a table: each column read from the rows, then the one column builder. */
export function smallTable<R>(columns: readonly SmallColumn<R>[], rows: readonly R[]): Table {
  return columnTable(
    columns.map((c): TableColumn => {
      const values = rows.map(c.value);
      return c.type === 'utf8'
        ? { ...meta(c), kind: 'utf8', values: values.map(String) }
        : { ...meta(c), kind: c.type, values: values.map(Number) };
    }),
  );
}

function meta(c: { name: string; unit: string; description: string }): {
  name: string;
  unit: string;
  description: string;
} {
  return { name: c.name, unit: c.unit, description: c.description };
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
