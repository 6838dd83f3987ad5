/**
 * Child process of the memory benchmarks (pool.ts); prints `{"peakRssMb": ...}` from the
 * process's max-RSS counter, which covers its worker threads.
 * - `rss-child.js CASE N DIR`: a full N-scenario run of CASE into DIR;
 * - `rss-child.js --writer N DIR`: the main-thread half alone at N rows (column batches of the
 *   full column set, filled by a cheap formula, through the Arrow writer and the summary), to
 *   show that memory stays flat at counts the real kernel would need hours for.
 */
import { join } from 'node:path';
import { loadCase } from '../case/load.js';
import { ArrowFileSink, BatchEncoder } from '../results/arrow-writer.js';
import { allColumns, allocateBatch, setInt64 } from '../results/columns.js';
import { feedBatch, runAssessment } from '../run/run.js';
import { createSummary } from '../run/summary-feed.js';

const [first, n, outDir] = process.argv.slice(2);
if (first === '--writer') {
  const rows = Number(n);
  const specs = allColumns;
  const enc = new BatchEncoder(specs);
  const sink = new ArrowFileSink(join(outDir!, 'scenarios.arrow'), enc.schema);
  const summary = createSummary({
    confidenceLevel: 0.95,
    islandingRatePerYear: 2,
    failureDefinition: 'shutdown-or-critical-loss',
    nominalFrequencyHz: 60,
  });
  const batchRows = 1000;
  for (let id = 0; id < rows; id += batchRows) {
    const count = Math.min(batchRows, rows - id);
    const b = allocateBatch(specs, id, count);
    const words = new Int32Array(b.columns['scenario_id']!.buffer);
    for (const s of specs) {
      const col = b.columns[s.name]!;
      for (let r = 0; r < count; r++) {
        if (s.kind === 'int64') setInt64(words, r, id + r);
        else if (s.kind === 'bool' || s.kind === 'category') col[r] = (id + r) % 7 === 0 ? 1 : 0;
        else if (s.name === 'weight') col[r] = 1;
        else col[r] = ((id + r) % 1000) / 10;
      }
    }
    await sink.write(enc.encode(b));
    feedBatch(summary, specs, b, 100);
  }
  await sink.close();
  summary.rows();
} else {
  const loaded = await loadCase(first!);
  await runAssessment(loaded, { outDir: outDir!, scenarios: Number(n) });
}
// resourceUsage().maxRSS is in kilobytes (Node docs, process.resourceUsage)
process.stdout.write(`${JSON.stringify({ peakRssMb: process.resourceUsage().maxRSS / 1024 })}\n`);
