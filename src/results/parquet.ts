/**
 * `--parquet`: Parquet copies of the Arrow files, for BI tools that prefer Parquet, through
 * parquet-wasm (the Rust arrow/parquet crates compiled to WebAssembly). The copy streams: the
 * Arrow file is read one record batch at a time (a file handle, TOOLCHAIN.md 3), each batch is
 * handed to parquet-wasm's streaming writer on demand (pull), and its bytes go straight to disk,
 * under a temporary name renamed when complete.
 */
import { closeSync, fsyncSync, openSync, renameSync, writeSync } from 'node:fs';
import { RecordBatchStreamWriter } from 'apache-arrow';
import * as parquet from 'parquet-wasm';
import { readRecordBatches } from './arrow-reader.js';

export async function copyArrowToParquet(arrowPath: string, parquetPath: string): Promise<void> {
  const batches = readRecordBatches(arrowPath);
  const source = new ReadableStream({
    async pull(ctl) {
      const next = await batches.next();
      if (next.done) {
        ctl.close();
        return;
      }
      const bytes = RecordBatchStreamWriter.writeAll([next.value]).toUint8Array(true);
      const table = parquet.Table.fromIPCStream(bytes);
      for (const rb of table.recordBatches()) ctl.enqueue(rb);
    },
  });
  const bytes = await parquet.transformParquetStream(source);
  const tmp = `${parquetPath}.tmp-${process.pid}`;
  const fd = openSync(tmp, 'w');
  try {
    for await (const chunk of bytes as unknown as AsyncIterable<Uint8Array>) writeSync(fd, chunk);
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
  renameSync(tmp, parquetPath);
}
