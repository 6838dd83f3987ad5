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
import type { DriversResult } from './drivers.js';

const perRow = 'per row: see the unit column';

export function writeComparisonArrow(
  dir: string,
  rows: readonly ComparisonRow[],
  level: number,
): string {
  const pct = `${Number((level * 100).toPrecision(4))} %`;
  const f = (name: string, description: string, values: number[]): DesignColumn => ({
    name,
    kind: 'float64',
    unit: perRow,
    description,
    values,
  });
  const table = designTable([
    {
      name: 'metric',
      kind: 'utf8',
      unit: '1',
      description: 'summary metric (summary.arrow)',
      values: rows.map((r) => r.metric),
    },
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
    {
      name: 'method',
      kind: 'utf8',
      unit: '1',
      description: 'estimator and interval of the difference',
      values: rows.map((r) => r.method),
    },
    {
      name: 'unit',
      kind: 'utf8',
      unit: '1',
      description: 'unit of base, variant and difference in this row',
      values: rows.map((r) => r.unit),
    },
    {
      name: 'label',
      kind: 'utf8',
      unit: '1',
      description: 'the metric in plain words',
      values: rows.map((r) => r.label),
    },
  ]);
  const path = join(dir, 'comparison.arrow');
  writeDesignTable(path, table);
  return path;
}

export function writeDriversArrow(dir: string, result: DriversResult): string {
  const pct = `${Number((result.confidenceLevel * 100).toPrecision(4))} %`;
  const r = result.rows;
  const f = (name: string, unit: string, description: string, values: number[]): DesignColumn => ({
    name,
    kind: 'float64',
    unit,
    description,
    values,
  });
  const table = designTable([
    {
      name: 'outcome',
      kind: 'utf8',
      unit: '1',
      description: 'load_shed or shutdown',
      values: r.map((x) => x.outcome),
    },
    {
      name: 'driver',
      kind: 'utf8',
      unit: '1',
      description:
        'month, hour_of_day, soc_band, sources_out (one out / in service pair per source), deficit_band or shutdown_cause',
      values: r.map((x) => x.driver),
    },
    {
      name: 'stratum',
      kind: 'utf8',
      unit: '1',
      description: 'the stratum (or the cause of shutdown)',
      values: r.map((x) => x.stratum),
    },
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

export interface SweepPoint {
  valueText: string;
  value: number | undefined;
  rows: readonly {
    metric: string;
    estimate: number;
    ciLow: number;
    ciHigh: number;
    unit: string;
  }[];
}

export function writeSweepArrow(
  dir: string,
  parameter: string,
  points: readonly SweepPoint[],
  level: number,
): string {
  const pct = `${Number((level * 100).toPrecision(4))} %`;
  const numeric = points.every((p) => p.value !== undefined);
  const columns: DesignColumn[] = [
    {
      name: 'parameter',
      kind: 'utf8',
      unit: '1',
      description: 'the swept case field (override path)',
      values: points.map(() => parameter),
    },
    numeric
      ? {
          name: 'value',
          kind: 'float64',
          unit: 'unit of the case field',
          description: 'value of the swept field',
          values: points.map((p) => p.value!),
        }
      : {
          name: 'value',
          kind: 'utf8',
          unit: '1',
          description: 'value of the swept field',
          values: points.map((p) => p.valueText),
        },
  ];
  const metrics: { metric: string; unit: string }[] = [];
  for (const p of points)
    for (const r of p.rows) if (!metrics.some((m) => m.metric === r.metric)) metrics.push(r);
  for (const { metric, unit } of metrics) {
    const get = (p: SweepPoint, k: 'estimate' | 'ciLow' | 'ciHigh') =>
      p.rows.find((r) => r.metric === metric)?.[k] ?? Number.NaN;
    columns.push(
      {
        name: metric,
        kind: 'float64',
        unit,
        description: `${metric} estimate (summary.arrow)`,
        values: points.map((p) => get(p, 'estimate')),
      },
      {
        name: `${metric}_ci_low`,
        kind: 'float64',
        unit,
        description: `lower ${pct} confidence limit of ${metric}`,
        values: points.map((p) => get(p, 'ciLow')),
      },
      {
        name: `${metric}_ci_high`,
        kind: 'float64',
        unit,
        description: `upper ${pct} confidence limit of ${metric}`,
        values: points.map((p) => get(p, 'ciHigh')),
      },
    );
  }
  const path = join(dir, 'sweep.arrow');
  writeDesignTable(path, designTable(columns));
  return path;
}
