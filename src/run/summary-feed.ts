/**
 * The bridge from scenario columns to the stats engineer's `SummaryAccumulator`
 * (src/results/summary.ts): builds it from the case, feeds it one feed block at a time, in id
 * order, with the contract column names (bool columns as Uint8Array 0/1, `weight` Float64Array).
 */
import type { Case } from '../case/schema.js';
import type { ColumnBatch, ColumnSpec } from '../results/columns.js';

export interface SummaryRow {
  metric: string;
  estimate: number;
  ciLow: number;
  ciHigh: number;
  unit: string;
  nScenarios: number;
  method: string;
}

/** What the runner needs of a summary accumulator. */
export interface SummarySink {
  addBatch(columns: Record<string, ArrayLike<number>>, count: number): void;
  rows(): SummaryRow[];
  halfWidth(metric: string): { estimate: number; halfWidth: number };
}

/** What the summary needs to know of the case (also kept in run.json, for merge). */
export interface SummarySettings {
  confidenceLevel: number;
  islandingRatePerYear: number;
  failureDefinition: string;
}

export function summarySettings(c: Case): SummarySettings {
  return {
    confidenceLevel: c.monteCarlo.confidenceLevel,
    islandingRatePerYear: c.events.islandingRatePerYear,
    failureDefinition: c.monteCarlo.failureDefinition,
  };
}

/** The accumulator for this build, or undefined while the stats module has not landed. */
export function createSummary(settings: SummarySettings): SummarySink | undefined {
  void settings;
  return undefined;
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
    if (s.kind === 'int64') continue;
    const a = batch.columns[s.name]!;
    cols[s.name] = (a as Float64Array).subarray(from, from + count);
  }
  sink.addBatch(cols, count);
}
