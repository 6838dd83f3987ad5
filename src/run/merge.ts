/**
 * `holdfast merge OUT DIR...`: combines the output folders of shards into one, exactly. Rows are
 * copied in scenario-id order and the summary is recomputed from them, fed block by block as in
 * an unsharded run (counts and sums, never averages of averages), so merging all N shards gives
 * the unsharded run's rows and summary figures. Refuses shards of different cases, seeds,
 * scenario counts or model sets, and overlapping ids (CaseError, exit 2).
 */
import { mkdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { CaseError } from '../errors.js';
import { readRecordBatches, toColumnBatch } from '../results/arrow-reader.js';
import { ArrowFileSink, BatchEncoder } from '../results/arrow-writer.js';
import { columnsOf } from '../results/columns.js';
import { type RunManifest, readManifest, writeManifest } from '../results/manifest.js';
import { exceedanceColumns, writeSmallTable, writeSummaryArrow } from '../results/summary-arrow.js';
import { feedBatch } from './run.js';
import { createSummary, type SummaryRow } from './summary-feed.js';

export interface MergeOutcome {
  status: 'complete' | 'partial';
  summary: SummaryRow[];
  paths: { dir: string; scenarios: string; summary: string; exceedance: string; manifest: string };
  manifest: RunManifest;
}

export async function mergeShards(
  outDir: string,
  shardDirs: readonly string[],
): Promise<MergeOutcome> {
  if (shardDirs.length === 0) throw CaseError.single('DIR', 'expected at least one shard folder');
  const shards = shardDirs.map((d) => ({ dir: d, m: readManifest(join(d, 'run.json')) }));
  const first = shards[0]!.m;
  const problems: { path: string; message: string }[] = [];
  for (const { dir, m } of shards) {
    const differs = (what: string, a: unknown, b: unknown) => {
      if (String(a) !== String(b))
        problems.push({
          path: join(dir, 'run.json'),
          message: `${what} ${String(b)} differs from ${String(a)} in ${shards[0]!.dir}`,
        });
    };
    differs('case SHA-256', first.caseContentSha256, m.caseContentSha256);
    differs('seed', first.seed, m.seed);
    differs('scenariosRequested', first.scenariosRequested, m.scenariosRequested);
    differs('columnGroups', first.columnGroups.join(), m.columnGroups.join());
    differs('confidenceLevel', first.confidenceLevel, m.confidenceLevel);
    differs('feedBlock', first.feedBlock, m.feedBlock);
    differs('nominalFrequencyHz', first.nominalFrequencyHz, m.nominalFrequencyHz);
  }
  shards.sort((a, b) => a.m.idStart - b.m.idStart);
  for (let k = 1; k < shards.length; k++) {
    const prev = shards[k - 1]!;
    const cur = shards[k]!;
    if (
      cur.m.idStart < prev.m.idStart + prev.m.scenarioCount ||
      resolve(cur.dir) === resolve(prev.dir)
    )
      problems.push({
        path: cur.dir,
        message: `scenario ids ${cur.m.idStart}.. overlap those of ${prev.dir} (${prev.m.idStart}-${prev.m.idStart + prev.m.scenarioCount - 1})`,
      });
  }
  if (problems.length > 0) throw new CaseError(problems);

  const specs = columnsOf(first.columnGroups);
  const encoder = new BatchEncoder(specs);
  mkdirSync(outDir, { recursive: true });
  const paths = {
    dir: outDir,
    scenarios: join(outDir, 'scenarios.arrow'),
    summary: join(outDir, 'summary.arrow'),
    manifest: join(outDir, 'run.json'),
    exceedance: join(outDir, 'exceedance.arrow'),
  };
  const sink = createSummary(first);
  const out = new ArrowFileSink(paths.scenarios, encoder.schema);
  let rows = 0;
  let contiguous = shards[0]!.m.idStart === 0;
  let expectedNext = shards[0]!.m.idStart;
  try {
    for (const { dir, m } of shards) {
      if (m.idStart !== expectedNext) contiguous = false;
      const file = join(dir, 'scenarios.arrow');
      for await (const rb of readRecordBatches(file)) {
        const b = toColumnBatch(rb, specs, file);
        await out.write(encoder.encode(b));
        feedBatch(sink, specs, b, first.feedBlock);
        rows += b.count;
      }
      if (rows !== m.idStart - shards[0]!.m.idStart + m.scenarioCount) contiguous = false;
      expectedNext = m.idStart + m.scenarioCount;
    }
  } catch (err) {
    await out.abort();
    throw err;
  }
  await out.close();
  const summary = sink.rows();
  await writeSummaryArrow(paths.summary, summary);
  writeSmallTable(paths.exceedance, exceedanceColumns, sink.exceedanceRows());
  const wallSeconds = shards.reduce((s, x) => s + x.m.wallSeconds, 0);
  const complete =
    contiguous &&
    shards.every((s) => s.m.status === 'complete') &&
    expectedNext === first.scenariosRequested;
  const manifest: RunManifest = {
    ...first,
    scenarioCount: rows,
    idStart: shards[0]!.m.idStart,
    idEnd: shards[shards.length - 1]!.m.idEnd,
    shard: null,
    wallSeconds,
    scenariosPerSecond: rows / Math.max(wallSeconds, 1e-9),
    status: complete ? 'complete' : 'partial',
    stopReason: complete ? null : 'merged shards do not cover every scenario id',
    mergedFrom: shards.map((s) => resolve(s.dir)),
  };
  writeManifest(paths.manifest, manifest);
  return {
    status: manifest.status,
    summary,
    paths,
    manifest,
  };
}
