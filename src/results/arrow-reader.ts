/**
 * Reads `scenarios.arrow` back batch by batch into the runner's column batches (for `--resume`,
 * `merge` and the Parquet copy). Opens the file through a file handle so only one record batch
 * is in memory at a time (TOOLCHAIN.md 3: a read stream would buffer the whole file).
 */
import { open } from 'node:fs/promises';
import { type RecordBatch, RecordBatchReader } from 'apache-arrow';
import { CaseError } from '../errors.js';
import { allocateBatch, type ColumnBatch, type ColumnSpec, packUtf8 } from './columns.js';

/** Yields the record batches of an Arrow IPC file. */
export async function* readRecordBatches(path: string): AsyncGenerator<RecordBatch> {
  const handle = await open(path, 'r');
  try {
    const reader = await RecordBatchReader.from(handle);
    await reader.open();
    for await (const batch of reader) yield batch;
  } finally {
    await handle.close();
  }
}

/** Copies one record batch into a column batch of the given specs. */
export function toColumnBatch(
  rb: RecordBatch,
  specs: readonly ColumnSpec[],
  path: string,
): ColumnBatch {
  const n = rb.numRows;
  const firstIdValue = rb.getChild('scenario_id')?.get(0) as bigint | undefined;
  const out = allocateBatch(specs, n === 0 ? 0 : Number(firstIdValue ?? 0), n);
  for (const spec of specs) {
    const child = rb.getChild(spec.name);
    if (!child)
      throw CaseError.single(path, `expected column ${spec.name} (as in run.json), not found`);
    if (spec.kind === 'utf8') {
      out.columns[spec.name] = utf8Column(child.data, n);
      continue;
    }
    const target = out.columns[spec.name]!;
    let offset = 0;
    for (const d of child.data) {
      if (spec.kind === 'bool') {
        const bytes = d.values as Uint8Array;
        for (let i = 0; i < d.length; i++) {
          const bit = d.offset + i;
          target[offset + i] = (bytes[bit >> 3]! >> (bit & 7)) & 1;
        }
      } else {
        (target as Float64Array).set(
          (d.values as Float64Array).subarray(d.offset, d.offset + d.length),
          offset,
        );
      }
      offset += d.length;
    }
  }
  return out;
}

/** Re-packs the chunks of a Utf8 column (each with its own offsets and slice) into one column. */
function utf8Column(
  chunks: readonly {
    offset: number;
    length: number;
    valueOffsets: Int32Array;
    values: Uint8Array;
  }[],
  count: number,
): Uint8Array {
  let size = 0;
  for (const d of chunks) size += d.valueOffsets[d.offset + d.length]! - d.valueOffsets[d.offset]!;
  const offsets = new Int32Array(count + 1);
  const bytes = new Uint8Array(size);
  let row = 0;
  let at = 0;
  for (const d of chunks) {
    const start = d.valueOffsets[d.offset]!;
    const end = d.valueOffsets[d.offset + d.length]!;
    bytes.set(d.values.subarray(start, end), at);
    for (let i = 0; i < d.length; i++)
      offsets[row + i + 1] = at + d.valueOffsets[d.offset + i + 1]! - start;
    at += end - start;
    row += d.length;
  }
  return packUtf8(offsets, bytes, count);
}
