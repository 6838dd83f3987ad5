/**
 * What the paired design studies (compare.ts, sweep.ts) share: the run settings every design of
 * a study gets (one seed and scenario count for all, the first design's unless given, so the
 * designs meet common random numbers), and the comparison of two finished runs of loaded cases.
 */
import { join } from 'node:path';
import type { LoadedCase } from '../case/load.js';
import type { ShardSpec } from '../run/plan.js';
import { type RunOptions, type RunOutcome, runAssessment } from '../run/run.js';
import { type ComparisonResult, compareDesigns } from './comparison.js';
import type { ScenarioFrame } from './scenarioFrame.js';

/** The options of a paired study that reach every one of its runs. */
export interface PairedRunOptions {
  outDir: string;
  scenarios?: number;
  seed?: number | string;
  workers?: number;
  shard?: ShardSpec;
  parquet?: boolean;
  signal?: AbortSignal;
}

/**
 * Runs one design of a study into `outDir/folder`, with the study's common seed and scenario
 * count (from `first`, the study's first design, unless the options give them).
 */
export function runStudyDesign(
  loaded: LoadedCase,
  first: LoadedCase,
  opts: PairedRunOptions,
  folder: string,
  onProgress: RunOptions['onProgress'],
): Promise<RunOutcome> {
  return runAssessment(loaded, {
    outDir: join(opts.outDir, folder),
    seed: opts.seed ?? first.case.monteCarlo.seed,
    scenarios: opts.scenarios ?? first.case.monteCarlo.scenarios,
    workers: opts.workers,
    shard: opts.shard,
    parquet: opts.parquet,
    signal: opts.signal,
    onProgress,
  });
}

/** One side of a paired comparison: the loaded case, its run's rows and its summary. */
export interface PairedSide {
  loaded: LoadedCase;
  frame: ScenarioFrame;
  summary: RunOutcome['summary'];
}

/** Compares two runs of loaded cases on their common scenarios (comparison.ts). */
export function compareSides(
  base: PairedSide,
  variant: PairedSide,
  confidenceLevel: number,
  identicalDesigns: boolean,
): ComparisonResult {
  return compareDesigns({
    base: base.frame,
    variant: variant.frame,
    baseSummary: base.summary,
    variantSummary: variant.summary,
    baseFailureDefinition: base.loaded.case.monteCarlo.failureDefinition,
    variantFailureDefinition: variant.loaded.case.monteCarlo.failureDefinition,
    baseRatePerYear: base.loaded.case.events.islandingRatePerYear,
    variantRatePerYear: variant.loaded.case.events.islandingRatePerYear,
    confidenceLevel,
    identicalDesigns,
  });
}
