/**
 * The Monte Carlo run end to end: plans the ids (shard, batches, checkpoints), sends batches to a
 * piscina pool, writes the returned columns to `scenarios.arrow` in scenario-id order through a
 * bounded reorder window, feeds the summary in id order, and writes summary.arrow and run.json.
 *
 * Memory stays bounded whatever the count: at most `workers * tasksPerWorker` batches are
 * dispatched and not yet written. Stopping (SIGINT, the deterministic `stopAfterBatches` hook or
 * a failed batch) stops dispatching, waits for the batches in flight, writes the contiguous
 * prefix of rows and marks run.json partial; `resume` continues from there.
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Piscina } from 'piscina';
import type { LoadedCase } from '../case/load.js';
import { CaseError, RunError } from '../errors.js';
import { readRecordBatches, toColumnBatch } from '../results/arrow-reader.js';
import { ArrowFileSink, BatchEncoder } from '../results/arrow-writer.js';
import { type ColumnBatch, type ColumnSpec, columnsOf } from '../results/columns.js';
import {
  type RunManifest,
  readManifest,
  screeningCaution,
  toolVersion,
  writeManifest,
} from '../results/manifest.js';
import { copyArrowToParquet } from '../results/parquet.js';
import { exceedanceColumns, writeSmallTable, writeSummaryArrow } from '../results/summary-arrow.js';
import { compileKernel, type KernelFaults, kernelGroups } from './kernel.js';
import {
  alignBatchSize,
  checkpoints,
  defaultBatchSize,
  feedBlockOf,
  type ShardSpec,
  shardRange,
} from './plan.js';
import {
  createSummary,
  feedSummary,
  type SummaryRow,
  type SummarySink,
  summarySettings,
} from './summary-feed.js';
import { type BatchTask, compileFailurePrefix, type WorkerSetup } from './worker.js';

export interface RunOptions {
  /** Output folder (created if missing). */
  outDir: string;
  /** Overrides monteCarlo.scenarios (the cap under untilRelError). */
  scenarios?: number;
  /** Overrides monteCarlo.seed. */
  seed?: number | string;
  /** Worker threads; default the machine's cores. */
  workers?: number;
  shard?: ShardSpec;
  /** Continue a partial run in outDir. */
  resume?: boolean;
  /** Stop once the headline interval half-width is below this fraction of its estimate. */
  untilRelError?: number;
  /** First checkpoint of untilRelError (default 1000, rounded up to whole feed blocks). */
  firstCheckpoint?: number;
  /** Scenarios per task; rounded to a multiple of the feed block (100). */
  batchSize?: number;
  /** Also write Parquet copies (scenarios.parquet, summary.parquet). */
  parquet?: boolean;
  /** Called after each written batch. */
  onProgress?: (done: number, total: number) => void;
  /** Aborting stops the run gracefully (SIGINT/SIGTERM). */
  signal?: AbortSignal;
  /** Test hook: request a stop after this many batches have been written (a deterministic interrupt). */
  stopAfterBatches?: number;
  /** Test hook: make a scenario fail inside the worker. */
  faults?: KernelFaults;
}

export interface RunOutcome {
  status: 'complete' | 'partial';
  /** 'interrupted' when stopped by a signal or stopAfterBatches. */
  stopReason: string | null;
  summary: SummaryRow[];
  paths: { dir: string; scenarios: string; summary: string; exceedance: string; manifest: string };
  manifest: RunManifest;
}

/** The headline metric of the stopping rule: the failure probability when the summary has it. */
export function headlineMetric(sink: SummarySink): string {
  const names = sink.rows().map((r) => r.metric);
  return names.includes('p_failure') ? 'p_failure' : 'p_shutdown';
}

function workerFile(): { filename: string; execArgv: string[] } {
  const js = new URL('./worker.js', import.meta.url);
  if (existsSync(fileURLToPath(js))) return { filename: fileURLToPath(js), execArgv: [] };
  // under vitest/tsx the sources are .ts: load them through tsx in the worker (TOOLCHAIN.md 2)
  const ts = fileURLToPath(new URL('./worker.ts', import.meta.url));
  return { filename: ts, execArgv: [...process.execArgv, '--import', 'tsx'] };
}

/** SHA-256 of the validated case after overrides and defaults (what the scenarios depend on). */
export function caseContentSha256(loaded: LoadedCase): string {
  return createHash('sha256').update(JSON.stringify(loaded.case)).digest('hex');
}

/** Feeds a batch to the summary in feed blocks (batches start on the block grid). */
export function feedBatch(
  sink: SummarySink,
  specs: readonly ColumnSpec[],
  b: ColumnBatch,
  block: number,
) {
  for (let from = 0; from < b.count; from += block)
    feedSummary(sink, specs, b, from, Math.min(block, b.count - from));
}

/** Runs the assessment of a parsed case; see docs/runner.md for the pipeline. */
export async function runAssessment(input: LoadedCase, opts: RunOptions): Promise<RunOutcome> {
  const started = process.hrtime.bigint();
  const c = input.case;
  const seed = opts.seed ?? c.monteCarlo.seed;
  const total = opts.scenarios ?? c.monteCarlo.scenarios;
  const workers = Math.max(1, opts.workers ?? availableParallelism());
  const block = feedBlockOf(c.monteCarlo.plan);
  const batchSize = alignBatchSize(
    opts.batchSize ?? Math.min(defaultBatchSize, Math.ceil(total / (16 * workers))),
    block,
  );
  if (opts.untilRelError !== undefined && opts.shard && opts.shard.count > 1)
    throw CaseError.single(
      '--until-rel-error',
      'cannot be combined with --shard (each shard would stop at its own count)',
    );
  const { start, end } = shardRange(total, block, opts.shard);
  const groups = kernelGroups();
  const specs = columnsOf(groups);
  const contentSha = caseContentSha256(input);
  const dir = opts.outDir;
  const paths = {
    dir,
    scenarios: join(dir, 'scenarios.arrow'),
    summary: join(dir, 'summary.arrow'),
    manifest: join(dir, 'run.json'),
    exceedance: join(dir, 'exceedance.arrow'),
  };

  const sink = createSummary(summarySettings(c));
  const encoder = new BatchEncoder(specs);
  let plannedChecks =
    opts.untilRelError === undefined
      ? [end]
      : checkpoints(opts.firstCheckpoint ?? 1000, end, block);

  // --resume: check the earlier manifest, then copy its rows (and summary updates) first
  let done = 0;
  let checkIndex = 0;
  let checks = 0;
  const earlier = opts.resume && existsSync(paths.manifest) ? readManifest(paths.manifest) : null;
  if (opts.resume && !earlier)
    throw CaseError.single('--resume', `expected an earlier run in ${dir}, found no run.json`);
  if (earlier) {
    const mismatch: string[] = [];
    if (earlier.caseContentSha256 !== contentSha) mismatch.push('case (file or --set overrides)');
    if (String(earlier.seed) !== String(seed)) mismatch.push('seed');
    if (earlier.idStart !== start || earlier.idEnd !== end)
      mismatch.push('scenario range or shard');
    if (earlier.columnGroups.join() !== groups.join()) mismatch.push('model set of this build');
    if ((earlier.untilRelError?.target ?? null) !== (opts.untilRelError ?? null))
      mismatch.push('--until-rel-error');
    if (mismatch.length > 0)
      throw CaseError.single(
        '--resume',
        `the earlier run in ${dir} differs in: ${mismatch.join(', ')}`,
      );
    // the looks of the stopping rule are those planned by the earlier run
    if (earlier.untilRelError) plannedChecks = earlier.untilRelError.checkpoints;
  }

  // compile once here too: a case the models reject is bad input (exit 2) before anything is
  // written, rather than a failure in every worker
  compileKernel(c, input.dir, { seed });
  mkdirSync(dir, { recursive: true });
  const scenarioSink = new ArrowFileSink(paths.scenarios, encoder.schema);
  let written = 0;
  let stopReason: string | null = null;
  let failure: unknown = null;
  let target = opts.untilRelError === undefined ? end : Math.min(end, plannedChecks[0]!);
  let satisfied = false;

  const checkRule = (): void => {
    // called when the rows written reach `target`, a checkpoint fixed before the run: the only
    // moments the stopping rule looks (untilRelError excludes shards, so ids start at 0)
    if (opts.untilRelError === undefined || satisfied) return;
    checks++;
    const h = sink.halfWidth(headlineMetric(sink));
    if (h.estimate > 0 && h.halfWidth <= opts.untilRelError * h.estimate) satisfied = true;
    else if (checkIndex + 1 < plannedChecks.length) {
      checkIndex++;
      target = Math.min(end, plannedChecks[checkIndex]!);
    }
  };

  try {
    if (earlier) {
      for await (const rb of readRecordBatches(paths.scenarios)) {
        const b = toColumnBatch(rb, specs, paths.scenarios);
        await scenarioSink.write(encoder.encode(b));
        feedBatch(sink, specs, b, block);
        done += b.count;
        if (start + done === target) checkRule(); // the same looks as the original run
      }
      written = done;
    }

    const { filename, execArgv } = workerFile();
    const setup: WorkerSetup = { case: c, caseDir: input.dir, seed, faults: opts.faults };
    const pool = new Piscina({
      filename,
      execArgv,
      workerData: setup,
      minThreads: workers,
      maxThreads: workers,
    });
    try {
      await pump();
    } finally {
      await pool.destroy();
    }

    async function runWithRetry(task: BatchTask): Promise<ColumnBatch> {
      try {
        return (await pool.run(task)) as ColumnBatch;
      } catch {
        // retried once: a transient worker death should not end a long study
        try {
          return (await pool.run(task)) as ColumnBatch;
        } catch (second) {
          throw await pinpoint(task, second);
        }
      }
    }

    async function pinpoint(task: BatchTask, err: unknown): Promise<RunError> {
      const message = err instanceof Error ? err.message : String(err);
      const named = /scenario (\d+)/.exec(message);
      if (named)
        return new RunError(`scenario ${named[1]} failed twice: ${message}`, { cause: err });
      if (message.startsWith(compileFailurePrefix)) return new RunError(message, { cause: err });
      // a worker that died names no id: rerun the batch one scenario at a time to find it
      for (let id = task.firstId; id < task.firstId + task.count; id++) {
        try {
          await pool.run({ firstId: id, count: 1 });
        } catch (one) {
          return new RunError(`scenario ${id} failed twice: ${message}`, { cause: one });
        }
      }
      return new RunError(
        `scenarios ${task.firstId}-${task.firstId + task.count - 1} failed twice: ${message}`,
        { cause: err },
      );
    }

    function pump(): Promise<void> {
      const window = workers * 4;
      const ready = new Map<number, ColumnBatch>();
      let next = start + done;
      let inFlight = 0;
      let flushing = false;
      let batchesWritten = 0;
      return new Promise<void>((resolve) => {
        const stopping = () =>
          failure !== null || stopReason !== null || satisfied || opts.signal?.aborted === true;
        const fill = () => {
          if (opts.signal?.aborted && stopReason === null) stopReason = 'interrupted';
          while (!stopping() && inFlight + ready.size < window && next < target) {
            const task: BatchTask = { firstId: next, count: Math.min(batchSize, target - next) };
            next += task.count;
            inFlight++;
            runWithRetry(task).then(
              (b) => {
                inFlight--;
                ready.set(b.firstId, b);
                if (!flushing) void flush();
              },
              (err: unknown) => {
                inFlight--;
                failure ??= err;
                fill();
              },
            );
          }
          if (inFlight === 0 && !flushing) resolve();
        };
        const flush = async () => {
          flushing = true;
          try {
            for (;;) {
              const b = ready.get(start + written);
              if (!b) break;
              ready.delete(b.firstId);
              await scenarioSink.write(encoder.encode(b));
              feedBatch(sink, specs, b, block);
              written += b.count;
              batchesWritten++;
              opts.onProgress?.(written, end - start);
              if (opts.stopAfterBatches !== undefined && batchesWritten >= opts.stopAfterBatches)
                stopReason ??= 'interrupted';
              if (start + written === target) checkRule();
            }
          } catch (err) {
            failure ??= err;
          }
          flushing = false;
          fill();
        };
        fill();
      });
    }
  } catch (err) {
    failure ??= err;
  }

  const complete = failure === null && (satisfied || start + written === end);
  // a failure after valid rows still leaves a readable, partial file
  await scenarioSink.close();
  const wallSeconds = Number(process.hrtime.bigint() - started) / 1e9;
  const summary = sink.rows();
  await writeSummaryArrow(paths.summary, summary);
  writeSmallTable(paths.exceedance, exceedanceColumns, sink.exceedanceRows());
  const manifest: RunManifest = {
    tool: 'holdfast',
    toolVersion: toolVersion(),
    caseName: c.name,
    caseSha256: input.sha256,
    caseContentSha256: contentSha,
    seed,
    scenariosRequested: total,
    scenarioCount: written,
    idStart: start,
    idEnd: end,
    shard: opts.shard ?? null,
    workers,
    batchSize,
    feedBlock: block,
    wallSeconds,
    scenariosPerSecond: (written - done) / Math.max(wallSeconds, 1e-9),
    status: complete ? 'complete' : 'partial',
    stopReason:
      failure !== null ? `failed: ${(failure as Error).message ?? String(failure)}` : stopReason,
    confidenceLevel: c.monteCarlo.confidenceLevel,
    failureDefinition: c.monteCarlo.failureDefinition,
    islandingRatePerYear: c.events.islandingRatePerYear,
    nominalFrequencyHz: c.system.frequencyHz,
    plan: c.monteCarlo.plan,
    columnGroups: [...groups],
    untilRelError:
      opts.untilRelError === undefined
        ? null
        : {
            target: opts.untilRelError,
            headlineMetric: headlineMetric(sink),
            checks,
            checkpoints: plannedChecks,
          },
    caution: screeningCaution,
  };
  if (opts.parquet && failure === null) {
    await copyArrowToParquet(paths.scenarios, join(dir, 'scenarios.parquet'));
    await copyArrowToParquet(paths.summary, join(dir, 'summary.parquet'));
    await copyArrowToParquet(paths.exceedance, join(dir, 'exceedance.parquet'));
  }
  writeManifest(paths.manifest, manifest);
  if (failure !== null) {
    if (failure instanceof RunError || failure instanceof CaseError) throw failure;
    throw new RunError(String((failure as Error).message ?? failure), { cause: failure });
  }
  return {
    status: manifest.status,
    stopReason: manifest.stopReason,
    summary,
    paths,
    manifest,
  };
}
