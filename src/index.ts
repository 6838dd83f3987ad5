/**
 * holdfast as a library: load and validate a case, run the Monte Carlo assessment, merge shards,
 * replay one scenario, compare two designs or sweep one parameter, find what drives the risk,
 * judge risk gates, and the interval estimators behind the summaries. Results are screening
 * estimates, not engineering approval (docs/runner.md).
 */

export type { LoadedCase } from './case/load.js';
export { loadCase } from './case/load.js';
export { applyOverrides } from './case/overrides.js';
export type { Case, CaseInput, Load, Source } from './case/schema.js';
export { caseSchema } from './case/schema.js';
export { validateCase } from './case/validate.js';
export {
  type CompareOptions,
  type CompareOutcome,
  compareRunFolders,
  runComparison,
} from './design/compare.js';
export {
  type CompareInput,
  type ComparisonResult,
  type ComparisonRow,
  compareDesigns,
} from './design/comparison.js';
export {
  computeDrivers,
  type DriverRow,
  type DriversOptions,
  type DriversResult,
  topDrivers,
} from './design/drivers.js';
export {
  evaluateRiskGates,
  type GateVerdict,
  parseRiskGate,
  type RiskGate,
} from './design/riskGate.js';
export { readScenarioFrame, ScenarioFrame } from './design/scenarioFrame.js';
export {
  loadSweepCases,
  runSweep,
  type SweepOptions,
  type SweepOutcome,
} from './design/sweep.js';
export { CaseError, RunError } from './errors.js';
export type { ColumnSpec } from './results/columns.js';
export { allColumns } from './results/columns.js';
export type { RunManifest } from './results/manifest.js';
export type { SummaryRow } from './results/summary.js';
export { type MergeOutcome, mergeShards } from './run/merge.js';
export { type ReplayOptions, type ReplayOutcome, replayScenario } from './run/replay.js';
export { type RunOptions, type RunOutcome, runAssessment } from './run/run.js';
export { Scenario } from './sample/scenario.js';
export {
  type DifferenceInterval,
  newcombePairedDifference,
  type PairedTable,
} from './stats/paired.js';
export {
  clopperPearsonInterval,
  type ProportionInterval,
  wilsonInterval,
} from './stats/proportion.js';
