/**
 * The plain-words tables printed by compare, sweep and the drivers: short, one line per metric
 * or stratum, probabilities in percent and their differences in percentage points.
 */
import type { ComparisonRow } from './comparison.js';
import type { DriverRow, DriversResult } from './drivers.js';
import { minDriverEvents, topDrivers } from './drivers.js';
import { outcomeDefinition } from './outcomes.js';
import type { SweepKnee, SweepStep } from './sweep.js';

/** "4.1 %", "0.052 %", "12 %". */
export function percentText(x: number): string {
  if (!Number.isFinite(x)) return 'n/a';
  const v = 100 * x;
  const a = Math.abs(v);
  if (a === 0) return '0 %';
  return `${a < 0.1 ? v.toPrecision(2) : v.toFixed(a < 10 ? 2 : 1)} %`;
}

/** Percentage points of a difference of probabilities: "-2.9", "+0.31". */
function pointsText(x: number): string {
  if (!Number.isFinite(x)) return 'n/a';
  const v = 100 * x;
  const a = Math.abs(v);
  const s = a === 0 ? '0' : a < 0.1 ? v.toPrecision(2) : v.toFixed(a < 10 ? 2 : 1);
  return v > 0 ? `+${s}` : s;
}

/** A number to 3 significant digits, in exponent form outside 1e-3..1e6. */
export function numberText(x: number): string {
  if (!Number.isFinite(x)) return 'n/a';
  if (x === 0) return '0';
  return Math.abs(x) >= 1e-3 && Math.abs(x) < 1e6
    ? String(Number(x.toPrecision(3)))
    : x.toExponential(2);
}

/** " kW", " per year", " kWh per year"; nothing for dimensionless figures. */
function unitText(unit: string): string {
  if (unit === '1' || unit === '') return '';
  const perYear = /^(.*?)\s*\/\s*(year|yr)$/.exec(unit);
  if (perYear)
    return perYear[1] === '1' || perYear[1] === '' ? ' per year' : ` ${perYear[1]} per year`;
  return ` ${unit}`;
}

const signed = (x: number) => (x > 0 ? `+${numberText(x)}` : numberText(x));

const isProbability = (r: { metric: string }) => r.metric.startsWith('p_');

/** A confidence level as a percentage for labels: 0.95 -> '95 %'. */
export const levelText = (level: number) => `${Number((level * 100).toPrecision(4))} %`;

/** "shutdown probability 4.1 % -> 1.2 %, difference -2.9 points (95 % CI -3.4 to -2.4)". */
export function comparisonLine(r: ComparisonRow, level: number): string {
  const ci = Number.isNaN(r.diffCiLow) ? '(no paired interval)' : undefined;
  if (isProbability(r)) {
    const interval =
      ci ?? `(${levelText(level)} CI ${pointsText(r.diffCiLow)} to ${pointsText(r.diffCiHigh)})`;
    return `${r.label} ${percentText(r.base)} -> ${percentText(r.variant)}, difference ${pointsText(r.difference)} points ${interval}`;
  }
  const unit = unitText(r.unit);
  const interval =
    ci ?? `(${levelText(level)} CI ${signed(r.diffCiLow)} to ${signed(r.diffCiHigh)})`;
  return `${r.label} ${numberText(r.base)}${unit} -> ${numberText(r.variant)}${unit}, difference ${signed(r.difference)}${unit} ${interval}`;
}

export function comparisonText(
  rows: readonly ComparisonRow[],
  info: { nPairs: number; level: number; baseName: string; variantName: string; dir: string },
): string {
  const lines = [
    `Paired comparison on ${info.nPairs.toLocaleString('en-US')} common scenarios: ${info.baseName} -> ${info.variantName}`,
    ...rows.map((r) => `  ${comparisonLine(r, info.level)}`),
    `Tables in ${info.dir}`,
  ];
  return `${lines.join('\n')}\n`;
}

function driverLine(r: DriverRow, level: number): string {
  return `  ${r.stratum} (${r.driver.replaceAll('_', ' ')}): ${percentText(r.probability)} (${levelText(level)} CI ${percentText(r.ciLow)} to ${percentText(r.ciHigh)}), ${r.riskRatio === Number.POSITIVE_INFINITY ? 'no events in the rest, so no finite ratio' : `${numberText(r.riskRatio)} times the rest`} (CI ${numberText(r.rrCiLow)} to ${numberText(r.rrCiHigh)}), ${percentText(r.shareOfEvents)} of the events`;
}

/** The short "top drivers" table: strata with a clear excess risk, and the causes of shutdown. */
export function driversText(result: DriversResult, count = 5): string {
  const level = result.confidenceLevel;
  const lines: string[] = [];
  for (const [outcome, words] of [
    ['shutdown', 'shutdown'],
    ['load_shed', 'load shedding'],
  ] as const) {
    const top = topDrivers(result, outcome, count);
    lines.push(
      `Top drivers of ${words} (overall ${percentText(result.overall[outcome])}; risk ratio against the rest of the scenarios, at least ${minDriverEvents} events, clear of 1 after a Bonferroni adjustment over all strata):`,
    );
    if (top.length === 0) lines.push('  none stands out beyond the statistical noise');
    for (const r of top) lines.push(driverLine(r, level));
  }
  const causes = result.rows.filter((r) => r.driver === 'shutdown_cause').slice(0, count);
  if (causes.length > 0) {
    lines.push('Causes of shutdown, most frequent first:');
    for (const r of causes)
      lines.push(
        `  ${r.stratum}: ${percentText(r.shareOfEvents)} of shutdowns, ${percentText(r.probability)} of separations (${levelText(level)} CI ${percentText(r.ciLow)} to ${percentText(r.ciHigh)})`,
      );
  }
  if (result.missing.length > 0)
    lines.push(`(not in the scenario table, so not analysed: ${result.missing.join(', ')})`);
  return `${lines.join('\n')}\n`;
}

export interface SweepLine {
  valueText: string;
  rows: readonly {
    metric: string;
    estimate: number;
    ciLow: number;
    ciHigh: number;
    unit: string;
  }[];
}

/** Risk against the swept value, the knee pointed out where there is one. */
export function sweepText(
  path: string,
  lines: readonly SweepLine[],
  info: {
    metrics: readonly string[];
    knees: readonly SweepKnee[];
    steps: readonly SweepStep[];
    level: number;
    dir: string;
  },
): string {
  const label = (m: string) => outcomeDefinition(m)?.label ?? m.replaceAll('_', ' ');
  const out = [`Sweep of ${path} (${levelText(info.level)} intervals, common random numbers):`];
  lines.forEach((l, i) => {
    const parts = info.metrics.map((m) => {
      const r = l.rows.find((x) => x.metric === m);
      if (!r) return `${label(m)} n/a`;
      const f = isProbability(r) ? percentText : numberText;
      return `${label(m)} ${f(r.estimate)} (${f(r.ciLow)} to ${f(r.ciHigh)})`;
    });
    const at = info.knees.filter((k) => k.knee?.index === i).map((k) => label(k.metric));
    const mark = at.length > 0 ? `   <- knee of ${at.join(', ')}` : '';
    out.push(`  ${path} = ${l.valueText}: ${parts.join(', ')}${mark}`);
  });
  if (info.steps.length > 0) {
    out.push('What each step buys (paired differences on the same scenarios, points):');
    for (const metric of info.steps[0]!.rows.map((r) => r.metric)) {
      const parts = info.steps.map((st) => {
        const r = st.rows.find((x) => x.metric === metric);
        if (!r) return `${st.fromText} -> ${st.toText} n/a`;
        const ci = Number.isNaN(r.diffCiLow)
          ? 'no paired interval'
          : `${pointsText(r.diffCiLow)} to ${pointsText(r.diffCiHigh)}`;
        return `${st.fromText} -> ${st.toText} ${pointsText(r.difference)} (${ci})`;
      });
      out.push(`  ${label(metric)}: ${parts.join('; ')}`);
    }
  }
  for (const k of info.knees) {
    const e = k.endToEnd;
    const change =
      e && !Number.isNaN(e.diffCiLow)
        ? `end to end ${pointsText(e.difference)} points (paired ${levelText(info.level)} CI ${pointsText(e.diffCiLow)} to ${pointsText(e.diffCiHigh)})`
        : 'end-to-end change without a paired interval';
    if (k.knee)
      out.push(
        `Knee of the ${label(k.metric)} at ${path} = ${numberText(k.knee.x)}: past it each step buys much less (${change}).`,
      );
    else
      out.push(
        `No knee in the ${label(k.metric)}: ${k.trend ? 'the curve is straight or concave' : 'no clear change from the smallest to the largest value'} (${change}).`,
      );
  }
  out.push(`Tables in ${info.dir}`);
  return `${out.join('\n')}\n`;
}
