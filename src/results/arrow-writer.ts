/**
 * Streams record batches into an Arrow IPC *file* with bounded memory, under a temporary name,
 * then fsyncs and renames it into place so a reader never sees half a file.
 *
 * Bounded memory (TOOLCHAIN.md 3): each batch is handed to the writer and the writer's byte
 * chunks are drained concurrently to a file descriptor, so at most a batch or two is held.
 * Every field carries `unit` and `description` metadata (the data dictionary a BI tool shows).
 */
import { closeSync, fsyncSync, openSync, renameSync, rmSync, writeSync } from 'node:fs';
import {
  Bool,
  type DataType,
  Dictionary,
  Field,
  Float64,
  Int8,
  Int16,
  Int64,
  makeData,
  RecordBatch,
  RecordBatchFileWriter,
  Schema,
  Struct,
  Utf8,
  type Vector,
  vectorFromArray,
} from 'apache-arrow';
import { type ColumnBatch, type ColumnSpec, unpackUtf8 } from './columns.js';

function arrowType(spec: ColumnSpec, dictionaryId: number): DataType {
  switch (spec.kind) {
    case 'int64':
      return new Int64();
    case 'int16':
      return new Int16();
    case 'int8':
      return new Int8();
    case 'bool':
      return new Bool();
    case 'category':
      return new Dictionary(new Utf8(), new Int8(), dictionaryId);
    case 'float64':
      return new Float64();
    case 'utf8':
      return new Utf8();
  }
}

export function fieldOf(spec: ColumnSpec, dictionaryId = 0): Field {
  return new Field(
    spec.name,
    arrowType(spec, dictionaryId),
    false,
    new Map([
      ['unit', spec.unit],
      ['description', spec.description],
    ]),
  );
}

/** Packs 0/1 bytes into an Arrow validity-style bitmap (LSB first). */
export function packBits(bytes: Uint8Array, count: number): Uint8Array {
  const out = new Uint8Array(((count + 63) >> 6) << 3); // 8-byte aligned, as Arrow pads buffers
  for (let i = 0; i < count; i++) if (bytes[i]) out[i >> 3]! |= 1 << (i & 7);
  return out;
}

/** Plans the Arrow schema of a set of column specs and turns column batches into record batches. */
export class BatchEncoder {
  readonly schema: Schema;
  private readonly dictionaries = new Map<string, Vector<Utf8>>();

  constructor(readonly specs: readonly ColumnSpec[]) {
    let dictId = 0;
    const fields = specs.map((s) => fieldOf(s, s.kind === 'category' ? dictId++ : 0));
    this.schema = new Schema(fields);
    for (const s of specs)
      if (s.kind === 'category')
        this.dictionaries.set(s.name, vectorFromArray([...(s.categories ?? [''])], new Utf8()));
  }

  encode(batch: ColumnBatch): RecordBatch {
    const n = batch.count;
    const children = this.specs.map((spec, k) => {
      const type = this.schema.fields[k]!.type;
      const data = batch.columns[spec.name];
      if (!data) throw new Error(`batch at id ${batch.firstId} lacks column ${spec.name}`);
      if (spec.kind === 'bool')
        return makeData({ type, length: n, data: packBits(data as Uint8Array, n) });
      if (spec.kind === 'utf8') {
        const { offsets, bytes } = unpackUtf8(data as Uint8Array, n);
        return makeData({ type, length: n, valueOffsets: offsets, data: bytes } as never);
      }
      if (spec.kind === 'category')
        return makeData({
          type,
          length: n,
          data: (data as Int8Array).subarray(0, n),
          dictionary: this.dictionaries.get(spec.name)!,
        });
      return makeData({ type, length: n, data: data.subarray(0, n) } as never);
    });
    const struct = makeData({ type: new Struct(this.schema.fields), length: n, children });
    return new RecordBatch(this.schema, struct);
  }
}

/** Writes an Arrow IPC file batch by batch: `await write(b)` ... `await close()`, or `abort()`. */
export class ArrowFileSink {
  private readonly writer: RecordBatchFileWriter;
  private readonly fd: number;
  private readonly tmpPath: string;
  private readonly drained: Promise<void>;
  private closed = false;
  rows = 0;

  constructor(
    readonly path: string,
    schema: Schema,
  ) {
    this.tmpPath = `${path}.tmp-${process.pid}`;
    this.fd = openSync(this.tmpPath, 'w');
    this.writer = new RecordBatchFileWriter();
    this.writer.reset(undefined, schema);
    this.drained = this.drain();
  }

  private async drain(): Promise<void> {
    for await (const chunk of this.writer) writeSync(this.fd, chunk);
  }

  async write(batch: RecordBatch): Promise<void> {
    this.writer.write(batch);
    this.rows += batch.numRows;
    // let the drain loop move the bytes to the file before the next batch arrives
    await new Promise<void>((resolve) => setImmediate(resolve));
  }

  /** Finishes the file: footer, fsync, rename into place. */
  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    this.writer.finish();
    this.writer.close();
    await this.drained;
    fsyncSync(this.fd);
    closeSync(this.fd);
    renameSync(this.tmpPath, this.path);
  }

  /** Drops the temporary file (a failed run leaves no half file behind). */
  async abort(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    this.writer.abort();
    await this.drained.catch(() => undefined);
    closeSync(this.fd);
    rmSync(this.tmpPath, { force: true });
  }
}

/** Writes a small table (one batch) to an Arrow IPC file, atomically. */
export async function writeSmallArrowFile(
  path: string,
  specs: readonly ColumnSpec[],
  batch: ColumnBatch,
): Promise<void> {
  const enc = new BatchEncoder(specs);
  const sink = new ArrowFileSink(path, enc.schema);
  await sink.write(enc.encode(batch));
  await sink.close();
}
