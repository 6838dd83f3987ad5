/**
 * `holdfast sweep` as a library function: one design parameter over several values, every value
 * run on the same seed and scenario ids (common random numbers, as in compare.ts), so the curve of
 * risk against the value is smooth where the physics is and its steps are not masked by sampling
 * noise. Every value's case is loaded and validated before the first run, so a bad value stops
 * the sweep with exit 2 before anything is written.
 *
 * Folder: <outDir>/<k>-<value>/ per value (complete run folders) and <outDir>/sweep.arrow.
 * Knee: see knee.ts; it is looked for in the headline metric (p_failure when the summary has it,
 * else p_shutdown), with the largest CI half-width along the curve as the noise floor.
 */
import { join } from 'node:path';
import { type LoadedCase, loadCase } from '../case/load.js';
import type { ShardSpec } from '../run/plan.js';
import { type RunOutcome, runAssessment } from '../run/run.js';
import { type SweepPoint, writeSweepArrow } from './designOutputs.js';
import { sweepText } from './designText.js';
import { findKnee, type KneeResult } from './knee.js';
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

export interface SweepOptions {
  outDir: string;
  scenarios?: number;
  seed?: number | string;
  workers?: number;
  shard?: ShardSpec;
  parquet?: boolean;
  signal?: AbortSignal;
  onProgress?: (valueIndex: number, done: number, total: number) => void;
}

export interface SweepOutcome {
  runs: RunOutcome[];
  points: SweepPoint[];
  knee: KneeResult | undefined;
  kneeMetric: string;
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
  const seed = opts.seed ?? first.monteCarlo.seed;
  const scenarios = opts.scenarios ?? first.monteCarlo.scenarios;
  for (let i = 0; i < cases.length; i++) {
    const c = cases[i]!;
    const run = await runAssessment(c.loaded, {
      outDir: join(opts.outDir, valueFolder(i, c.valueText)),
      seed,
      scenarios,
      workers: opts.workers,
      shard: opts.shard,
      parquet: opts.parquet,
      signal: opts.signal,
      onProgress: opts.onProgress && ((d, t) => opts.onProgress?.(i, d, t)),
    });
    runs.push(run);
    if (run.status === 'partial') break;
    points.push({ valueText: c.valueText, value: c.value, rows: run.summary });
  }
  const level = runs[0]?.manifest.confidenceLevel ?? first.monteCarlo.confidenceLevel;
  const complete = points.length === cases.length;
  const names = new Set(points.flatMap((p) => p.rows.map((r) => r.metric)));
  const kneeMetric = names.has('p_failure') ? 'p_failure' : 'p_shutdown';
  const curve = points.map((p) => ({
    x: p.value ?? Number.NaN,
    row: p.rows.find((r) => r.metric === kneeMetric),
  }));
  const noise = Math.max(
    0,
    ...curve.map((c) => (c.row ? (c.row.ciHigh - c.row.ciLow) / 2 : Number.POSITIVE_INFINITY)),
  );
  const knee =
    complete && curve.every((c) => c.row)
      ? findKnee(
          curve.map((c) => ({ x: c.x, y: c.row!.estimate })),
          { minChange: noise },
        )
      : undefined;
  const sweepPath = complete ? writeSweepArrow(opts.outDir, path, points, level) : undefined;
  const shown = ['p_load_shed', 'p_shutdown', 'p_failure_in_year'].filter((m) => names.has(m));
  const text = complete
    ? sweepText(path, points, { metrics: shown, knee, kneeMetric, level, dir: opts.outDir })
    : `Sweep stopped early at ${path} = ${cases[points.length]?.valueText}; the run folders are marked partial and sweep.arrow was not written.\n`;
  return { runs, points, knee, kneeMetric, sweepPath, confidenceLevel: level, text };
}
