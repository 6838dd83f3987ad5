/**
 * The bridge from scenario columns to the stats engineer's `SummaryAccumulator`
 * (src/results/summary.ts): builds it from the case, feeds it one feed block at a time, in id
 * order, with the contract column names (bool columns as Uint8Array 0/1, `weight` Float64Array).
 */
import type { Case } from '../case/schema.js';
import { allocateBatch, type ColumnBatch, type ColumnSpec } from '../results/columns.js';
import { ExceedanceAccumulator, type ExceedanceRow } from '../results/exceedance.js';
import { type FailureDefinition, SummaryAccumulator, type SummaryRow } from '../results/summary.js';

export type { SummaryRow };

/** What the runner needs of a summary accumulator. */
export interface SummarySink {
  addBatch(columns: Record<string, ArrayLike<number>>, count: number): void;
  rows(): SummaryRow[];
  halfWidth(metric: string): { estimate: number; halfWidth: number };
  exceedanceRows(): ExceedanceRow[];
}

/** The summary metrics and the exceedance curves of one run, fed together. */
class RunSummary implements SummarySink {
  private readonly summary: SummaryAccumulator;
  private readonly exceedance: ExceedanceAccumulator;
  constructor(s: SummarySettings) {
    this.summary = new SummaryAccumulator({
      confidenceLevel: s.confidenceLevel,
      islandingRatePerYear: s.islandingRatePerYear,
      failureDefinition: s.failureDefinition as FailureDefinition,
    });
    this.exceedance = new ExceedanceAccumulator({
      confidenceLevel: s.confidenceLevel,
      islandingRatePerYear: s.islandingRatePerYear,
      nominalFrequencyHz: s.nominalFrequencyHz,
    });
  }
  addBatch(columns: Record<string, ArrayLike<number>>, count: number): void {
    this.summary.addBatch(columns, count);
    this.exceedance.addBatch(columns, count);
  }
  rows(): SummaryRow[] {
    return this.summary.rows();
  }
  halfWidth(metric: string): { estimate: number; halfWidth: number } {
    return this.summary.halfWidth(metric);
  }
  exceedanceRows(): ExceedanceRow[] {
    return this.exceedance.rows();
  }
}

/** What the summary needs to know of the case (also kept in run.json, for merge). */
export interface SummarySettings {
  confidenceLevel: number;
  islandingRatePerYear: number;
  failureDefinition: string;
  nominalFrequencyHz: number;
}

export function summarySettings(c: Case): SummarySettings {
  return {
    confidenceLevel: c.monteCarlo.confidenceLevel,
    islandingRatePerYear: c.events.islandingRatePerYear,
    failureDefinition: c.monteCarlo.failureDefinition,
    nominalFrequencyHz: c.system.frequencyHz,
  };
}

/** The accumulators of the stats module (exact sums: order and grouping do not matter). */
export function createSummary(settings: SummarySettings): SummarySink {
  return new RunSummary(settings);
}

/** Feeds rows [from, from + count) of a batch to the summary (numeric columns only). */
export function feedSummary(
  sink: SummarySink,
  specs: readonly ColumnSpec[],
  batch: ColumnBatch,
  from: number,
  count: number,
): void {
  const cols: Record<string, ArrayLike<number>> = {};
  for (const s of specs) {
    if (s.kind === 'int64' || s.kind === 'utf8') continue;
    const a = batch.columns[s.name]!;
    cols[s.name] = (a as Float64Array).subarray(from, from + count);
  }
  sink.addBatch(cols, count);
}

/**
 * The metric names a run of these columns will report (for checking `--fail-if` gates before
 * the run): the accumulator reports a metric once its column has been seen, so one row of zeros
 * (weight 1) fed to a throwaway accumulator names them all.
 */
export function summaryMetricNames(
  settings: SummarySettings,
  specs: readonly ColumnSpec[],
): string[] {
  const probe = createSummary(settings);
  const row = allocateBatch(specs, 0, 1);
  (row.columns['weight'] as Float64Array)[0] = 1;
  feedSummary(probe, specs, row, 0, 1);
  return probe.rows().map((r) => r.metric);
}
