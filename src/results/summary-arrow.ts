/**
 * `summary.arrow` (CONTRACT.md): one row per metric with its estimate, interval, unit, the
 * scenarios behind it and the estimator; every field with `unit` and `description` metadata.
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
import type { SummaryRow } from '../run/summary-feed.js';
import { writeFileAtomic } from './manifest.js';

const summaryFields: readonly [string, DataType, string, string][] = [
  ['metric', new Utf8(), '1', 'metric name (see docs/runner.md and the README)'],
  ['estimate', new Float64(), 'see unit column', 'point estimate'],
  ['ci_low', new Float64(), 'see unit column', 'lower confidence bound (level in run.json)'],
  ['ci_high', new Float64(), 'see unit column', 'upper confidence bound (level in run.json)'],
  ['unit', new Utf8(), '1', 'unit of estimate, ci_low and ci_high'],
  ['n_scenarios', new Int64(), '1', 'scenarios behind the estimate'],
  ['method', new Utf8(), '1', 'estimator and interval method'],
];

function field(name: string, type: DataType, unit: string, description: string): Field {
  return new Field(
    name,
    type,
    false,
    new Map([
      ['unit', unit],
      ['description', description],
    ]),
  );
}

export function summaryTable(rows: readonly SummaryRow[]): Table {
  const schema = new Schema(summaryFields.map(([n, t, u, d]) => field(n, t, u, d)));
  const columns = {
    metric: vectorFromArray(
      rows.map((r) => r.metric),
      new Utf8(),
    ),
    estimate: vectorFromArray(
      rows.map((r) => r.estimate),
      new Float64(),
    ),
    ci_low: vectorFromArray(
      rows.map((r) => r.ciLow),
      new Float64(),
    ),
    ci_high: vectorFromArray(
      rows.map((r) => r.ciHigh),
      new Float64(),
    ),
    unit: vectorFromArray(
      rows.map((r) => r.unit),
      new Utf8(),
    ),
    n_scenarios: vectorFromArray(
      rows.map((r) => BigInt(r.nScenarios)),
      new Int64(),
    ),
    method: vectorFromArray(
      rows.map((r) => r.method),
      new Utf8(),
    ),
  };
  const children = schema.fields.map((f) => columns[f.name as keyof typeof columns].data[0]!);
  const struct = makeData({ type: new Struct(schema.fields), length: rows.length, children });
  return new Table([new RecordBatch(schema, struct)]);
}

export async function writeSummaryArrow(path: string, rows: readonly SummaryRow[]): Promise<void> {
  writeFileAtomic(path, tableToIPC(summaryTable(rows), 'file'));
}
