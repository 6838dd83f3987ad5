/**
 * Small Arrow tables built whole in memory (summary, exceedance, comparison, sweep, drivers: a few
 * columns of at most some thousands of rows), every field with `unit` and `description` metadata
 * (CONTRACT.md "Every Arrow field carries metadata"). One builder, column by column.
 */
import {
  type Data,
  Field,
  Float64,
  Int64,
  makeData,
  RecordBatch,
  Schema,
  Struct,
  Table,
  Utf8,
  vectorFromArray,
} from 'apache-arrow';
import { RunError } from '../errors.js';

export type TableColumn =
  | { name: string; kind: 'utf8'; unit: string; description: string; values: readonly string[] }
  | { name: string; kind: 'float64'; unit: string; description: string; values: ArrayLike<number> }
  | { name: string; kind: 'int64'; unit: string; description: string; values: ArrayLike<number> };

/** Builds an Arrow table from equal-length columns, each field with its metadata. */
export function columnTable(columns: readonly TableColumn[]): Table {
  const length = columns[0]?.values.length ?? 0;
  const fields: Field[] = [];
  const children: Data[] = [];
  for (const c of columns) {
    if (c.values.length !== length)
      throw new RunError(`table column ${c.name}: ${c.values.length} rows, expected ${length}`);
    const metadata = new Map([
      ['unit', c.unit],
      ['description', c.description],
    ]);
    if (c.kind === 'utf8') {
      fields.push(new Field(c.name, new Utf8(), false, metadata));
      // one chunk: these tables hold a few hundred short strings at most
      const data = vectorFromArray([...c.values], new Utf8()).data;
      if (data.length !== 1) throw new RunError(`table column ${c.name}: split in chunks`);
      children.push(data[0]!);
    } else if (c.kind === 'float64') {
      fields.push(new Field(c.name, new Float64(), false, metadata));
      children.push(makeData({ type: new Float64(), data: Float64Array.from(c.values) }));
    } else {
      fields.push(new Field(c.name, new Int64(), false, metadata));
      const data = BigInt64Array.from(Array.from(c.values, (v) => BigInt(v)));
      children.push(makeData({ type: new Int64(), data }));
    }
  }
  const schema = new Schema(fields);
  const batch = new RecordBatch(
    schema,
    makeData({ type: new Struct(fields), length, nullCount: 0, children }),
  );
  return new Table(schema, [batch]);
}
