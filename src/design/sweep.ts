/**
 * `holdfast sweep` as a library function: one design parameter over several values, every value
 * run on the same seed and scenario ids (common random numbers, as in compare.ts), so the curve of
 * risk against the value is smooth where the physics is and its steps are not masked by sampling
 * noise. Every value's case is loaded and validated before the first run, so a bad value stops
 * the sweep with exit 2 before anything is written.
 *
 * Folder: <outDir>/<k>-<value>/ per value (complete run folders) and <outDir>/sweep.arrow.
 * Knee: see knee.ts; it is looked for in the curves of p_load_shed, p_shutdown and p_failure,
 * each only when its paired end-to-end change is clear of zero (sweepKnees).
 */
import { join } from 'node:path';
import { type LoadedCase, loadCase } from '../case/load.js';
import { copyArrowToParquet } from '../results/parquet.js';
import type { RunOutcome } from '../run/run.js';
import { sameDesign } from './compare.js';
import type { ComparisonRow } from './comparison.js';
import { type SweepPoint, writeSweepArrow } from './designOutputs.js';
import { sweepText } from './designText.js';
import { findKnee, type KneeResult } from './knee.js';
import { compareSides, type PairedRunOptions, runStudyDesign } from './pairedRuns.js';
import { readScenarioFrame } from './scenarioFrame.js';
import type { SweepSpec } from './sweepValues.js';

export interface SweepCase {
  valueText: string;
  value: number | undefined;
  loaded: LoadedCase;
}

/** Loads the case once per swept value (fixed overrides first, then the swept one). */
export async function loadSweepCases(casePath: string, spec: SweepSpec): Promise<SweepCase[]> {
  const out: SweepCase[] = [];
  for (let i = 0; i < spec.texts.length; i++) {
    const valueText = spec.texts[i]!;
    const loaded = await loadCase(casePath, [...spec.fixed, `${spec.path}=${valueText}`]);
    out.push({ valueText, value: spec.numbers?.[i], loaded });
  }
  return out;
}

export interface SweepOptions extends PairedRunOptions {
  onProgress?: (valueIndex: number, done: number, total: number) => void;
}

export interface SweepOutcome {
  runs: RunOutcome[];
  points: SweepPoint[];
  /** The knee of each headline metric's curve (see sweepKnees). */
  knees: SweepKnee[];
  /** Paired differences between consecutive values (see sweepSteps). */
  steps: SweepStep[];
  /** Undefined when a run stopped early (the later values were not run). */
  sweepPath: string | undefined;
  confidenceLevel: number;
  text: string;
}

/** A folder name for a value: `03-1500`, `01-standby`. */
export function valueFolder(index: number, valueText: string): string {
  const safe = valueText.replace(/[^A-Za-z0-9_.+-]+/g, '_').slice(0, 40);
  return `${String(index + 1).padStart(2, '0')}-${safe}`;
}

export async function runSweep(
  path: string,
  cases: readonly SweepCase[],
  opts: SweepOptions,
): Promise<SweepOutcome> {
  const runs: RunOutcome[] = [];
  const points: SweepPoint[] = [];
  const first = cases[0]!.loaded.case;
  for (let i = 0; i < cases.length; i++) {
    const c = cases[i]!;
    const run = await runStudyDesign(
      c.loaded,
      cases[0]!.loaded,
      opts,
      valueFolder(i, c.valueText),
      opts.onProgress && ((d, t) => opts.onProgress?.(i, d, t)),
    );
    runs.push(run);
    if (run.status === 'partial') break;
    points.push({ valueText: c.valueText, value: c.value, rows: run.summary });
  }
  const level = runs[0]?.manifest.confidenceLevel ?? first.monteCarlo.confidenceLevel;
  const complete = points.length === cases.length;
  const names = new Set(points.flatMap((p) => p.rows.map((r) => r.metric)));
  const kneeMetrics = ['p_load_shed', 'p_shutdown', 'p_failure'].filter((m) => names.has(m));
  const knees = complete ? sweepKnees(kneeMetrics, points, cases, runs, level) : [];
  const steps = complete ? sweepSteps(kneeMetrics, points, cases, runs, level) : [];
  const sweepPath = complete ? writeSweepArrow(opts.outDir, path, points, level) : undefined;
  if (sweepPath && opts.parquet)
    await copyArrowToParquet(sweepPath, join(opts.outDir, 'sweep.parquet'));
  const shown = ['p_load_shed', 'p_shutdown', 'p_failure_in_year'].filter((m) => names.has(m));
  const text = complete
    ? sweepText(path, points, { metrics: shown, knees, steps, level, dir: opts.outDir })
    : `Sweep stopped early at ${path} = ${cases[points.length]?.valueText}; the run folders are marked partial and sweep.arrow was not written.\n`;
  return { runs, points, knees, steps, sweepPath, confidenceLevel: level, text };
}

/** The paired comparison of runs i (base) and j (variant) of a sweep. */
function pairRuns(
  i: number,
  j: number,
  cases: readonly SweepCase[],
  runs: readonly RunOutcome[],
  level: number,
): ComparisonRow[] {
  const side = (k: number) => ({
    loaded: cases[k]!.loaded,
    frame: readScenarioFrame(runs[k]!.paths.scenarios),
    summary: runs[k]!.summary,
  });
  return compareSides(side(i), side(j), level, sameDesign(cases[i]!.loaded, cases[j]!.loaded)).rows;
}

/** The order in which the curve is walked: by value for numbers, as given otherwise. */
function walkOrder(points: readonly SweepPoint[]): number[] {
  const order = points.map((_, i) => i);
  if (points.every((p) => p.value !== undefined))
    order.sort((a, b) => points[a]!.value! - points[b]!.value!);
  return order;
}

export interface SweepStep {
  fromText: string;
  toText: string;
  /** Paired differences (to - from) of the headline metrics on the same scenarios. */
  rows: ComparisonRow[];
}

/**
 * What each step of the sweep buys: the paired difference of the headline metrics between
 * consecutive values (on the same scenarios), at most 20 steps.
 */
function sweepSteps(
  metrics: readonly string[],
  points: readonly SweepPoint[],
  cases: readonly SweepCase[],
  runs: readonly RunOutcome[],
  level: number,
): SweepStep[] {
  const order = walkOrder(points);
  if (order.length < 2 || order.length > 21) return [];
  const steps: SweepStep[] = [];
  for (let k = 1; k < order.length; k++) {
    const a = order[k - 1]!;
    const b = order[k]!;
    const rows = pairRuns(a, b, cases, runs, level).filter((r) => metrics.includes(r.metric));
    steps.push({ fromText: points[a]!.valueText, toText: points[b]!.valueText, rows });
  }
  return steps;
}

export interface SweepKnee {
  metric: string;
  /** Undefined when the curve has no knee (or the values are not numbers). */
  knee: KneeResult | undefined;
  /** The paired difference between the largest and the smallest value, variant = largest. */
  endToEnd: ComparisonRow | undefined;
  /** True when that paired interval excludes zero: the curve really moves. */
  trend: boolean;
}

/**
 * The knee of each metric's curve. A knee is only looked for when the curve really moves: the
 * paired interval of (metric at the largest value - metric at the smallest), on the same
 * scenarios, must exclude zero. That is where common random numbers pay: the end-to-end change
 * is judged on the discordant scenarios only, far more sharply than by the two separate
 * intervals.
 */
function sweepKnees(
  metrics: readonly string[],
  points: readonly SweepPoint[],
  cases: readonly SweepCase[],
  runs: readonly RunOutcome[],
  level: number,
): SweepKnee[] {
  if (points.length < 3 || points.some((p) => p.value === undefined))
    return metrics.map((metric) => ({
      metric,
      knee: undefined,
      endToEnd: undefined,
      trend: false,
    }));
  let lo = 0;
  let hi = 0;
  points.forEach((p, i) => {
    if (p.value! < points[lo]!.value!) lo = i;
    if (p.value! > points[hi]!.value!) hi = i;
  });
  const comparison = { rows: pairRuns(lo, hi, cases, runs, level) };
  return metrics.map((metric) => {
    const endToEnd = comparison.rows.find((r) => r.metric === metric);
    const trend = endToEnd !== undefined && (endToEnd.diffCiLow > 0 || endToEnd.diffCiHigh < 0);
    const curve = points.map((p) => ({
      x: p.value!,
      y: p.rows.find((r) => r.metric === metric)?.estimate ?? Number.NaN,
    }));
    return { metric, knee: trend ? findKnee(curve) : undefined, endToEnd, trend };
  });
}
