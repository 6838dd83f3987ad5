/**
 * The Monte Carlo run end to end: plans the ids (the pilot of --until-rel-error, shard, batches),
 * sends batches to a piscina pool, writes the returned columns to `scenarios.arrow` in
 * scenario-id order through a bounded reorder window, feeds the summary in id order, and writes
 * summary.arrow and run.json.
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
  defaultBatchSize,
  feedBlockOf,
  type ShardSpec,
  shardRange,
} from './plan.js';
import {
  countHeadlineEvents,
  type PilotOutcome,
  pilotFirstScenarios,
  pilotSeed,
  plannedScenarioCount,
  runPilot,
  type StoppingRecord,
  targetMet,
} from './stopping-rule.js';
import {
  createSummary,
  feedSummary,
  type SummaryRow,
  type SummarySink,
  summaryMetricNames,
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
  /**
   * Size the run for a headline half-width of this fraction of its estimate: an independent
   * pilot fixes the scenario count, capped at `scenarios` (stopping-rule.ts).
   */
  untilRelError?: number;
  /** First pilot stage of untilRelError (default 1000, rounded up to whole feed blocks). */
  pilotFirstScenarios?: number;
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
export function headlineMetric(names: readonly string[]): string {
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

/** The untilRelError record of run.json: the pilot, the planned N and whether X was met. */
function stoppingRecord(
  relError: number,
  headline: string,
  pilot: PilotOutcome | null,
  end: number,
  cap: number,
  complete: boolean,
  sink: SummarySink,
): StoppingRecord {
  // a build without the headline metric has nothing to judge: recorded as null
  const row = complete ? sink.rows().find((r) => r.metric === headline) : undefined;
  const h = row ? { estimate: row.estimate, halfWidth: (row.ciHigh - row.ciLow) / 2 } : null;
  return {
    design: 'pilot-then-fixed',
    target: relError,
    headlineMetric: headline,
    pilot,
    plannedScenarios: pilot ? end : null,
    capped: pilot ? end === cap : null,
    achievedHalfWidth: h ? h.halfWidth : null,
    targetMet: h ? targetMet(h.estimate, h.halfWidth, relError) : null,
  };
}

/** Runs the assessment of a parsed case; see docs/runner.md for the pipeline. */
export async function runAssessment(input: LoadedCase, opts: RunOptions): Promise<RunOutcome> {
  const started = process.hrtime.bigint();
  const c = input.case;
  const seed = opts.seed ?? c.monteCarlo.seed;
  const total = opts.scenarios ?? c.monteCarlo.scenarios;
  const workers = Math.max(1, opts.workers ?? availableParallelism());
  const block = feedBlockOf(c.monteCarlo.plan);
  if (opts.untilRelError !== undefined && opts.shard && opts.shard.count > 1)
    throw CaseError.single(
      '--until-rel-error',
      'cannot be combined with --shard (the pilot sizes one run over ids from 0; shard a fixed --scenarios count instead)',
    );
  const { start, end: shardEnd } = shardRange(total, block, opts.shard);
  // under untilRelError the end is the planned count N of the pilot (or of the earlier run.json)
  let end = shardEnd;
  const groups = kernelGroups();
  const specs = columnsOf(groups);
  const settings = summarySettings(c);
  const headline = headlineMetric(summaryMetricNames(settings, specs));
  const contentSha = caseContentSha256(input);
  const dir = opts.outDir;
  const paths = {
    dir,
    scenarios: join(dir, 'scenarios.arrow'),
    summary: join(dir, 'summary.arrow'),
    manifest: join(dir, 'run.json'),
    exceedance: join(dir, 'exceedance.arrow'),
  };

  const sink = createSummary(settings);
  const encoder = new BatchEncoder(specs);

  // --resume: check the earlier manifest, then copy its rows (and summary updates) first
  let done = 0;
  const earlier = opts.resume && existsSync(paths.manifest) ? readManifest(paths.manifest) : null;
  if (opts.resume && !earlier)
    throw CaseError.single('--resume', `expected an earlier run in ${dir}, found no run.json`);
  if (earlier) {
    const mismatch: string[] = [];
    if (earlier.caseContentSha256 !== contentSha) mismatch.push('case (file or --set overrides)');
    if (String(earlier.seed) !== String(seed)) mismatch.push('seed');
    // a run sized by the stopping rule ends at its planned N (the pilot is not redone)
    const rule = earlier.untilRelError;
    if (rule && rule.design !== 'pilot-then-fixed')
      mismatch.push('stopping rule (run.json of an older version: start afresh)');
    const plannedEnd = rule?.plannedScenarios ?? null;
    if (earlier.idStart !== start || (plannedEnd === null && earlier.idEnd !== end))
      mismatch.push('scenario range or shard');
    if (opts.untilRelError !== undefined && earlier.scenariosRequested !== total)
      mismatch.push('--scenarios (the cap the planned count was fitted under)');
    if (earlier.columnGroups.join() !== groups.join()) mismatch.push('model set of this build');
    if ((earlier.untilRelError?.target ?? null) !== (opts.untilRelError ?? null))
      mismatch.push('--until-rel-error');
    if (mismatch.length > 0)
      throw CaseError.single(
        '--resume',
        `the earlier run in ${dir} differs in: ${mismatch.join(', ')}`,
      );
  }
  let pilot: PilotOutcome | null = earlier?.untilRelError?.pilot ?? null;
  if (pilot && earlier?.untilRelError?.plannedScenarios != null)
    end = earlier.untilRelError.plannedScenarios;

  // compile once here too: a case the models reject is bad input (exit 2) before anything is
  // written, rather than a failure in every worker
  compileKernel(c, input.dir, { seed });
  let failure: unknown = null;
  if (opts.untilRelError !== undefined && pilot === null) {
    try {
      pilot = await pilotRun(opts.untilRelError);
      // N depends on the pilot alone: the main sample cannot move it (stopping-rule.ts)
      if (pilot)
        end = plannedScenarioCount(pilot, {
          relError: opts.untilRelError,
          confidenceLevel: c.monteCarlo.confidenceLevel,
          cap: shardEnd,
          block,
        });
    } catch (err) {
      failure =
        err instanceof RunError ? err : new RunError(`pilot: ${String(err)}`, { cause: err });
    }
  }
  const batchSize = alignBatchSize(
    opts.batchSize ?? Math.min(defaultBatchSize, Math.ceil((end - start) / (16 * workers))),
    block,
  );
  mkdirSync(dir, { recursive: true });
  const scenarioSink = new ArrowFileSink(paths.scenarios, encoder.schema);
  let written = 0;
  let stopReason: string | null = null;

  /** The pilot (stopping-rule.ts): the same case and ids from 0 on the pilot seed, rows dropped. */
  async function pilotRun(relError: number): Promise<PilotOutcome | null> {
    const { filename, execArgv } = workerFile();
    const setup: WorkerSetup = { case: c, caseDir: input.dir, seed: pilotSeed(seed) };
    const pool = new Piscina({
      filename,
      execArgv,
      workerData: setup,
      minThreads: workers,
      maxThreads: workers,
    });
    const pilotSink = createSummary(settings);
    const first = opts.pilotFirstScenarios ?? pilotFirstScenarios;
    const runOnce = (task: BatchTask) => pool.run(task) as Promise<ColumnBatch>;
    try {
      const outcome = await runPilot({
        // retried once, as the main run's batches
        runBatch: (task) => runOnce(task).catch(() => runOnce(task)),
        feed: (b) => feedBatch(pilotSink, specs, b, block),
        countEvents: (b) => countHeadlineEvents(b, headline, settings.failureDefinition),
        headline: () => {
          const row = pilotSink.rows().find((r) => r.metric === headline);
          return {
            estimate: row?.estimate ?? 0,
            lowerBound: row?.ciLow ?? 0,
            upperBound: row?.ciHigh ?? 1,
          };
        },
        cap: shardEnd,
        relError,
        confidenceLevel: c.monteCarlo.confidenceLevel,
        block,
        first,
        batchSize: alignBatchSize(
          Math.min(defaultBatchSize, Math.ceil(first / (4 * workers))),
          block,
        ),
        window: workers * 4,
        seed: pilotSeed(seed),
        signal: opts.signal,
      });
      return outcome;
    } finally {
      await pool.destroy();
    }
  }

  try {
    if (failure !== null) throw failure;
    if (earlier) {
      for await (const rb of readRecordBatches(paths.scenarios)) {
        const b = toColumnBatch(rb, specs, paths.scenarios);
        await scenarioSink.write(encoder.encode(b));
        feedBatch(sink, specs, b, block);
        done += b.count;
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
          failure !== null || stopReason !== null || opts.signal?.aborted === true;
        const fill = () => {
          if (opts.signal?.aborted && stopReason === null) stopReason = 'interrupted';
          while (!stopping() && inFlight + ready.size < window && next < end) {
            const task: BatchTask = { firstId: next, count: Math.min(batchSize, end - next) };
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

  // an interrupt during the pilot leaves no plan: the run is partial and resume reruns the pilot
  const planned = opts.untilRelError === undefined || pilot !== null;
  const complete = failure === null && planned && start + written === end;
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
        : stoppingRecord(opts.untilRelError, headline, pilot, end, shardEnd, complete, sink),
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
