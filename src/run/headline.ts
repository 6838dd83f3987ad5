/**
 * The end-of-run text: the headline risks in plain words, the remaining summary rows, and the
 * one-line caution that these are screening estimates.
 */
import { screeningCaution } from '../results/manifest.js';
import { type StoppingRecord, stoppingRuleSentence } from './stopping-rule.js';
import type { SummaryRow } from './summary-feed.js';

function pct(x: number): string {
  const v = 100 * x;
  return `${v < 0.1 && v > 0 ? v.toPrecision(2) : v.toFixed(v < 10 ? 2 : 1)} %`;
}

function num(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  return Math.abs(x) >= 1e-3 && Math.abs(x) < 1e6
    ? String(Number(x.toPrecision(3)))
    : x.toExponential(2);
}

const sentences: Record<string, (r: SummaryRow, level: string) => string> = {
  p_shutdown: (r, l) =>
    `The island shuts down in ${pct(r.estimate)} of separations (${l} interval ${pct(r.ciLow)} to ${pct(r.ciHigh)}).`,
  p_failure: (r, l) =>
    `A separation ends in failure in ${pct(r.estimate)} of cases (${l} interval ${pct(r.ciLow)} to ${pct(r.ciHigh)}).`,
  p_load_shed: (r, l) =>
    `Load is shed in ${pct(r.estimate)} of separations (${l} interval ${pct(r.ciLow)} to ${pct(r.ciHigh)}).`,
  p_failure_in_year: (r, l) =>
    `The chance of at least one failure in a year is ${pct(r.estimate)} (${l} interval ${pct(r.ciLow)} to ${pct(r.ciHigh)}).`,
  failures_per_year: (r, l) =>
    `Expected failures per year: ${num(r.estimate)} (${l} interval ${num(r.ciLow)} to ${num(r.ciHigh)}).`,
  eue_kwh_per_year: (r, l) =>
    `Expected unserved energy: ${num(r.estimate)} kWh per year (${l} interval ${num(r.ciLow)} to ${num(r.ciHigh)}).`,
};

/** The plain-words report printed at the end of `holdfast run`. */
export function headlineText(
  rows: readonly SummaryRow[],
  info: {
    scenarios: number;
    confidenceLevel: number;
    status: string;
    dir: string;
    failureDefinition?: string;
    /** run.json's untilRelError: says whether the planned run met the target. */
    stoppingRule?: StoppingRecord | null;
  },
): string {
  const level = `${Math.round(info.confidenceLevel * 1000) / 10} %`;
  const lines = [
    `${info.scenarios.toLocaleString('en-US')} scenarios (${info.status}), results in ${info.dir}`,
  ];
  if (info.failureDefinition)
    lines.push(
      `Failure means: ${info.failureDefinition === 'shutdown-only' ? 'the island shuts down' : 'the island shuts down or critical load goes unserved'}.`,
    );
  const byMetric = new Map(rows.map((r) => [r.metric, r]));
  for (const [metric, say] of Object.entries(sentences)) {
    const r = byMetric.get(metric);
    if (r) lines.push(say(r, level));
  }
  if (info.stoppingRule) lines.push(stoppingRuleSentence(info.stoppingRule));
  if (rows.length === 0)
    lines.push('No summary metrics: the statistics module is not part of this build.');
  lines.push(screeningCaution);
  return `${lines.join('\n')}\n`;
}
