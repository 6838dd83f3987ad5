/**
 * The Arrow tables of the design questions (CONTRACT.md "Other outputs"):
 *   comparison.arrow: metric, base, variant, difference, diff_ci_low, diff_ci_high, method
 *     (and unit, label, the per-row unit of the figures);
 *   sweep.arrow: parameter, value, and per summary metric <metric>, <metric>_ci_low,
 *     <metric>_ci_high;
 *   drivers.arrow: one row per (outcome, driver, stratum) with conditional probability, interval,
 *     weight share, share of events and risk ratio against the rest.
 */
import { join } from 'node:path';
import type { ComparisonRow } from './comparison.js';
import { type DesignColumn, designTable, writeDesignTable } from './designTable.js';
import { levelText, type SweepLine } from './designText.js';
import type { DriversResult } from './drivers.js';

const perRow = 'per row: see the unit column';

/** A text column (unit 1). */
const textColumn = (
  name: string,
  description: string,
  values: readonly string[],
): DesignColumn => ({
  name,
  kind: 'utf8',
  unit: '1',
  description,
  values,
});

/** A float64 column. */
const numberColumn = (
  name: string,
  unit: string,
  description: string,
  values: ArrayLike<number>,
): DesignColumn => ({ name, kind: 'float64', unit, description, values });

export function writeComparisonArrow(
  dir: string,
  rows: readonly ComparisonRow[],
  level: number,
): string {
  const pct = levelText(level);
  const f = (name: string, description: string, values: number[]) =>
    numberColumn(name, perRow, description, values);
  const table = designTable([
    textColumn(
      'metric',
      'summary metric (summary.arrow)',
      rows.map((r) => r.metric),
    ),
    f(
      'base',
      'estimate for the base design',
      rows.map((r) => r.base),
    ),
    f(
      'variant',
      'estimate for the variant design',
      rows.map((r) => r.variant),
    ),
    f(
      'difference',
      'variant minus base, on the same scenarios',
      rows.map((r) => r.difference),
    ),
    f(
      'diff_ci_low',
      `lower ${pct} confidence limit of the paired difference (NaN: no paired interval)`,
      rows.map((r) => r.diffCiLow),
    ),
    f(
      'diff_ci_high',
      `upper ${pct} confidence limit of the paired difference (NaN: no paired interval)`,
      rows.map((r) => r.diffCiHigh),
    ),
    textColumn(
      'method',
      'estimator and interval of the difference',
      rows.map((r) => r.method),
    ),
    textColumn(
      'unit',
      'unit of base, variant and difference in this row',
      rows.map((r) => r.unit),
    ),
    textColumn(
      'label',
      'the metric in plain words',
      rows.map((r) => r.label),
    ),
  ]);
  const path = join(dir, 'comparison.arrow');
  writeDesignTable(path, table);
  return path;
}

export function writeDriversArrow(dir: string, result: DriversResult): string {
  const pct = levelText(result.confidenceLevel);
  const r = result.rows;
  const f = numberColumn;
  const table = designTable([
    textColumn(
      'outcome',
      'load_shed or shutdown',
      r.map((x) => x.outcome),
    ),
    textColumn(
      'driver',
      'month, hour_of_day, soc_band, sources_out (one out / in service pair per source), deficit_band or shutdown_cause',
      r.map((x) => x.driver),
    ),
    textColumn(
      'stratum',
      'the stratum (or the cause of shutdown)',
      r.map((x) => x.stratum),
    ),
    {
      name: 'n_scenarios',
      kind: 'int64',
      unit: '1',
      description: 'scenarios in the stratum (cause rows: shutdowns with that cause)',
      values: r.map((x) => x.nScenarios),
    },
    f(
      'weight_share',
      '1',
      'share of the total sampling weight in the stratum (NaN for cause rows)',
      r.map((x) => x.weightShare),
    ),
    f(
      'probability',
      '1',
      'P(outcome | stratum), weighted; cause rows: P(shutdown with that cause)',
      r.map((x) => x.probability),
    ),
    f(
      'ci_low',
      '1',
      `lower ${pct} confidence limit of probability`,
      r.map((x) => x.ciLow),
    ),
    f(
      'ci_high',
      '1',
      `upper ${pct} confidence limit of probability`,
      r.map((x) => x.ciHigh),
    ),
    f(
      'share_of_events',
      '1',
      "share of the outcome's weighted events in the stratum",
      r.map((x) => x.shareOfEvents),
    ),
    f(
      'risk_ratio',
      '1',
      'P(outcome | stratum) / P(outcome | rest of the scenarios) (NaN for cause rows)',
      r.map((x) => x.riskRatio),
    ),
    f(
      'rr_ci_low',
      '1',
      `lower ${pct} limit of the risk ratio (Katz log interval)`,
      r.map((x) => x.rrCiLow),
    ),
    f(
      'rr_ci_high',
      '1',
      `upper ${pct} limit of the risk ratio (Katz log interval)`,
      r.map((x) => x.rrCiHigh),
    ),
  ]);
  const path = join(dir, 'drivers.arrow');
  writeDesignTable(path, table);
  return path;
}

export interface SweepPoint extends SweepLine {
  value: number | undefined;
}

export function writeSweepArrow(
  dir: string,
  parameter: string,
  points: readonly SweepPoint[],
  level: number,
): string {
  const pct = levelText(level);
  const numeric = points.every((p) => p.value !== undefined);
  const columns: DesignColumn[] = [
    textColumn(
      'parameter',
      'the swept case field (override path)',
      points.map(() => parameter),
    ),
    numeric
      ? numberColumn(
          'value',
          'unit of the case field',
          'value of the swept field',
          points.map((p) => p.value!),
        )
      : textColumn(
          'value',
          'value of the swept field',
          points.map((p) => p.valueText),
        ),
  ];
  const metrics: { metric: string; unit: string }[] = [];
  for (const p of points)
    for (const r of p.rows) if (!metrics.some((m) => m.metric === r.metric)) metrics.push(r);
  for (const { metric, unit } of metrics) {
    const get = (p: SweepPoint, k: 'estimate' | 'ciLow' | 'ciHigh') =>
      p.rows.find((r) => r.metric === metric)?.[k] ?? Number.NaN;
    columns.push(
      numberColumn(
        metric,
        unit,
        `${metric} estimate (summary.arrow)`,
        points.map((p) => get(p, 'estimate')),
      ),
      numberColumn(
        `${metric}_ci_low`,
        unit,
        `lower ${pct} confidence limit of ${metric}`,
        points.map((p) => get(p, 'ciLow')),
      ),
      numberColumn(
        `${metric}_ci_high`,
        unit,
        `upper ${pct} confidence limit of ${metric}`,
        points.map((p) => get(p, 'ciHigh')),
      ),
    );
  }
  const path = join(dir, 'sweep.arrow');
  writeDesignTable(path, designTable(columns));
  return path;
}
