/**
 * holdfast as a library: load a case, run the Monte Carlo assessment, merge shards, replay one
 * scenario. Results are screening estimates, not engineering approval (docs/runner.md).
 */

export type { LoadedCase } from './case/load.js';
export { loadCase } from './case/load.js';
export type { Case, CaseInput, Load, Source } from './case/schema.js';
export { caseSchema } from './case/schema.js';
export { CaseError, RunError } from './errors.js';
export type { ColumnSpec } from './results/columns.js';
export { allColumns } from './results/columns.js';
export type { RunManifest } from './results/manifest.js';
export type { SummaryRow } from './results/summary.js';
export { type MergeOutcome, mergeShards } from './run/merge.js';
export { type ReplayOptions, type ReplayOutcome, replayScenario } from './run/replay.js';
export { type RunOptions, type RunOutcome, runAssessment } from './run/run.js';
export { Scenario } from './sample/scenario.js';
