import { tableFromArrays } from 'apache-arrow';
import { describe, expect, it } from 'vitest';
import {
  type CompareInput,
  compareDesigns,
  type SummaryLike,
} from '../../src/design/comparison.js';
import { ScenarioFrame } from '../../src/design/scenarioFrame.js';
import { RunError } from '../../src/errors.js';
import { wilsonInterval } from '../../src/stats/proportion.js';
import { reversedRows, toyScenarioTable } from './fixture.js';

/** Plain (unweighted) summary of a frame, computed independently of the design code. */
function plainSummary(frame: ScenarioFrame, lambda: number): SummaryLike[] {
  const mean = (name: string, f: (x: number) => number = (x) => x) => {
    const c = frame.numeric(name)!;
    let s = 0;
    for (let i = 0; i < frame.n; i++) s += f(c[i]!);
    return s / frame.n;
  };
  const row = (metric: string, estimate: number, unit = '1') => ({
    metric,
    estimate,
    ciLow: Number.NaN,
    ciHigh: Number.NaN,
    unit,
  });
  const pShutdown = mean('shutdown');
  return [
    row(
      'p_load_shed',
      mean('shed_kw', (x) => (x > 0 ? 1 : 0)),
    ),
    row('p_shutdown', pShutdown),
    row('p_voltage_violation', mean('voltage_violation')),
    row('expected_shed_kw', mean('shed_kw'), 'kW'),
    row('failures_per_year', lambda * pShutdown, '1/yr'),
    row('p_failure_in_year', 1 - Math.exp(-lambda * pShutdown)),
    row('eue_kwh_per_year', lambda * mean('unserved_kwh'), 'kWh/yr'),
  ];
}

function input(base: ScenarioFrame, variant: ScenarioFrame, identical = false): CompareInput {
  return {
    base,
    variant,
    baseSummary: plainSummary(base, 2),
    variantSummary: plainSummary(variant, 2),
    baseFailureDefinition: 'shutdown-only',
    variantFailureDefinition: 'shutdown-only',
    baseRatePerYear: 2,
    variantRatePerYear: 2,
    confidenceLevel: 0.95,
    identicalDesigns: identical,
  };
}

const frame = (batteryKwh: number, n = 2000) =>
  new ScenarioFrame(toyScenarioTable({ batteryKwh, n }), `toy ${batteryKwh} kWh`);

describe('compareDesigns', () => {
  it('gives exactly zero difference with a zero-width interval for a variant equal to the base', () => {
    const base = frame(200);
    const result = compareDesigns(input(base, frame(200), true));
    expect(result.rows.length).toBe(7);
    for (const r of result.rows) {
      expect(r.difference).toBe(0);
      expect(r.diffCiLow).toBe(0);
      expect(r.diffCiHigh).toBe(0);
      expect(r.base).toBe(r.variant);
    }
  });

  it('reproduces the Newcombe paired check value through the comparison path', () => {
    // REFERENCES.md 9.5: Cavo et al. (2012) table [[59, 6], [16, 80]] (a both, b first only,
    // c second only, d neither) -> -0.0621, 95 % CI -0.1186 to -0.0046 (Newcombe 1998, method 10;
    // confirmed, quoted by a third party). First = variant, second = base.
    const cells: [boolean, boolean, number][] = [
      [true, true, 59],
      [true, false, 6],
      [false, true, 16],
      [false, false, 80],
    ];
    const v: boolean[] = [];
    const b: boolean[] = [];
    for (const [inV, inB, count] of cells)
      for (let k = 0; k < count; k++) {
        v.push(inV);
        b.push(inB);
      }
    const n = v.length;
    const make = (shutdown: boolean[]) =>
      new ScenarioFrame(
        tableFromArrays({
          scenario_id: BigInt64Array.from({ length: n }, (_, i) => BigInt(i)),
          weight: new Float64Array(n).fill(1),
          shutdown,
        }),
        'table',
      );
    const summary = (shutdown: boolean[]): SummaryLike[] => [
      {
        metric: 'p_shutdown',
        estimate: shutdown.filter(Boolean).length / n,
        ciLow: 0,
        ciHigh: 1,
        unit: '1',
      },
    ];
    const result = compareDesigns({
      base: make(b),
      variant: make(v),
      baseSummary: summary(b),
      variantSummary: summary(v),
      baseFailureDefinition: 'shutdown-only',
      variantFailureDefinition: 'shutdown-only',
      baseRatePerYear: 1,
      variantRatePerYear: 1,
      confidenceLevel: 0.95,
      identicalDesigns: false,
    });
    const row = result.rows[0]!;
    // published to 4 decimals: tolerance half a unit in the 4th decimal
    expect(row.difference).toBeCloseTo(-0.0621, 4);
    expect(Math.abs(row.diffCiLow - -0.1186)).toBeLessThan(5e-5);
    expect(Math.abs(row.diffCiHigh - -0.0046)).toBeLessThan(5e-5);
    expect(row.method).toContain('Newcombe');
    // McNemar exact P = 0.0525 (REFERENCES.md 9.5, recomputed)
    expect(row.method).toContain('P = 0.052');
  });

  it('gives a paired interval much narrower than the unpaired one under common random numbers', () => {
    const base = frame(200);
    const variant = frame(300);
    const row = compareDesigns(input(base, variant)).rows.find((r) => r.metric === 'p_shutdown')!;
    // unpaired square-and-add interval for independent proportions (Newcombe, Stat Med
    // 17:873-890, 1998, method 10): Wilson limits of each, combined without the correlation term
    const n = base.n;
    const xb = Math.round(row.base * n);
    const xv = Math.round(row.variant * n);
    const wb = wilsonInterval(xb, n, 0.95);
    const wv = wilsonInterval(xv, n, 0.95);
    const unpairedWidth =
      Math.sqrt((row.variant - wv.low) ** 2 + (wb.high - row.base) ** 2) +
      Math.sqrt((row.base - wb.low) ** 2 + (wv.high - row.variant) ** 2);
    const pairedWidth = row.diffCiHigh - row.diffCiLow;
    expect(row.difference).toBeLessThan(0);
    expect(row.diffCiHigh).toBeLessThan(0);
    // in the toy model a bigger battery never turns a survived scenario into a shutdown, so only
    // base-only discordant pairs exist: the paired interval is at least twice as narrow
    expect(unpairedWidth / pairedWidth).toBeGreaterThan(2);
  });

  it('pairs rows by scenario id, not by position', () => {
    const base = frame(200, 500);
    const variant = frame(300, 500);
    const shuffled = new ScenarioFrame(
      reversedRows(toyScenarioTable({ batteryKwh: 300, n: 500 })),
      'reversed',
    );
    const a = compareDesigns(input(base, variant)).rows;
    const b = compareDesigns(input(base, shuffled)).rows;
    for (let i = 0; i < a.length; i++) {
      expect(b[i]?.difference).toBeCloseTo(a[i]!.difference, 12);
      expect(b[i]?.diffCiLow).toBeCloseTo(a[i]!.diffCiLow, 12);
    }
  });

  it('maps yearly metrics through the islanding rate', () => {
    const rows = compareDesigns(input(frame(200), frame(300))).rows;
    const p = rows.find((r) => r.metric === 'p_shutdown')!;
    const perYear = rows.find((r) => r.metric === 'failures_per_year')!;
    const inYear = rows.find((r) => r.metric === 'p_failure_in_year')!;
    // lambda p: linear (REFERENCES.md 9.6)
    expect(perYear.difference).toBeCloseTo(2 * p.difference, 12);
    expect(perYear.diffCiLow).toBeCloseTo(2 * p.diffCiLow, 12);
    // 1 - exp(-lambda p): monotone, so the limits keep their order and bracket the estimate
    const g = (x: number) => 1 - Math.exp(-2 * x);
    expect(inYear.difference).toBeCloseTo(g(p.variant) - g(p.base), 12);
    expect(inYear.diffCiLow).toBeLessThan(inYear.difference);
    expect(inYear.diffCiHigh).toBeGreaterThan(inYear.difference);
  });

  it('refuses runs on different scenarios and reports metrics without an outcome', () => {
    const other = new ScenarioFrame(
      toyScenarioTable({ batteryKwh: 300, n: 2000, firstId: 5 }),
      'shifted',
    );
    expect(() => compareDesigns(input(frame(200), other))).toThrow(RunError);
    const base = frame(200, 300);
    const variant = frame(300, 300);
    const extra = { metric: 'p_rocof_violation', estimate: 0.1, ciLow: 0, ciHigh: 1, unit: '1' };
    const result = compareDesigns({
      ...input(base, variant),
      baseSummary: [...plainSummary(base, 2), extra],
      variantSummary: [...plainSummary(variant, 2), { ...extra, estimate: 0.05 }],
    });
    const row = result.rows.find((r) => r.metric === 'p_rocof_violation')!;
    expect(row.difference).toBeCloseTo(-0.05, 12);
    expect(Number.isNaN(row.diffCiLow)).toBe(true);
    expect(result.warnings.some((w) => w.startsWith('p_rocof_violation'))).toBe(true);
  });
});
