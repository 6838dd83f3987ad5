import { tableFromArrays } from 'apache-arrow';
import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';
import { computeDrivers, topDrivers } from '../../src/design/drivers.js';
import { katzRiskRatio } from '../../src/design/riskRatio.js';
import { ScenarioFrame } from '../../src/design/scenarioFrame.js';
import {
  monthOfHour,
  niceStep,
  socBandPartition,
  sourcesOutPartition,
  sourcesOutPartitions,
} from '../../src/design/strata.js';
import { twoSidedZ } from '../../src/stats/normal.js';
import { toyScenarioTable } from './fixture.js';

const toy = (n = 3000) => new ScenarioFrame(toyScenarioTable({ batteryKwh: 200, n }), 'toy');

/** The toy table with uneven weights (as a stratified or importance plan would give). */
function weightedToy(n: number): ScenarioFrame {
  const t = toyScenarioTable({ batteryKwh: 200, n });
  const cols: Record<string, unknown> = {};
  for (const f of t.schema.fields) cols[f.name] = t.getChild(f.name)!.toArray();
  const rng = seedrandom.alea('weights');
  cols['weight'] = Float64Array.from({ length: n }, () => 0.2 + 3 * rng());
  cols['shutdown'] = [...t.getChild('shutdown')!].map(Boolean);
  cols['voltage_violation'] = [...t.getChild('voltage_violation')!].map(Boolean);
  cols['shutdown_cause'] = [...t.getChild('shutdown_cause')!].map(String);
  cols['sources_out'] = [...t.getChild('sources_out')!].map(String);
  return new ScenarioFrame(
    tableFromArrays(cols as Parameters<typeof tableFromArrays>[0]),
    'weighted toy',
  );
}

describe('strata', () => {
  it('maps hours to months of a 365-day year', () => {
    // 1 Feb 00:00 is hour 31 * 24 = 744; 1 Mar is hour 59 * 24 = 1416; 31 Dec 23:00 is 8759
    expect([0, 743, 744, 1415, 1416, 8759].map(monthOfHour)).toEqual([0, 0, 1, 1, 2, 11]);
  });

  it('gives scenarios without a battery their own band, and counts sources when ids are absent', () => {
    const frame = new ScenarioFrame(
      tableFromArrays({
        scenario_id: BigInt64Array.from([0n, 1n, 2n, 3n]),
        battery_soc: Float64Array.from([0.05, 0.5, Number.NaN, 1]),
        sources_available: Int16Array.from([5, 4, 5, 3]),
      }),
      'small',
    );
    const soc = socBandPartition(frame)!;
    expect([...soc.codes]).toEqual([0, 2, 5, 4]);
    expect(soc.strata[5]).toBe('no battery available');
    const out = sourcesOutPartition(frame)!;
    expect(out.strata).toEqual([
      '5 sources available',
      '4 sources available',
      '3 sources available',
    ]);
    expect([...out.codes]).toEqual([0, 1, 0, 2]);
  });

  it('gives each source out its own two-way partition, whatever else was out with it', () => {
    // invented rows: d1 out in rows 1 and 3, d2 out in rows 2 and 3 (together in row 3)
    const frame = new ScenarioFrame(
      tableFromArrays({
        scenario_id: BigInt64Array.from([0n, 1n, 2n, 3n, 4n]),
        weight: Float64Array.from([1, 2, 1, 0.5, 1.5]),
        shutdown: [false, true, false, true, false],
        shed_kw: Float64Array.from([0, 10, 0, 10, 0]),
        sources_out: ['', 'd1', 'd2', 'd1+d2', ''],
      }),
      'two sources',
    );
    const parts = sourcesOutPartitions(frame);
    expect(parts.map((p) => p.strata)).toEqual([
      ['d1 out', 'd1 in service'],
      ['d2 out', 'd2 in service'],
    ]);
    expect([...parts[0]!.codes]).toEqual([1, 0, 1, 0, 1]);
    expect([...parts[1]!.codes]).toEqual([1, 1, 0, 0, 1]);
    const result = computeDrivers(frame, { confidenceLevel: 0.95 });
    const row = (stratum: string) =>
      result.rows.find((r) => r.outcome === 'shutdown' && r.stratum === stratum)!;
    // weighted by hand: d1 out = rows 1, 3: (2 + 0.5) / (2 + 0.5) = 1; d2 out = rows 2, 3:
    // 0.5 / 1.5; d2 in service = rows 0, 1, 4: 2 / 4.5
    expect(row('d1 out').probability).toBe(1);
    expect(row('d2 out').probability).toBeCloseTo(0.5 / 1.5, 15);
    expect(row('d2 in service').probability).toBeCloseTo(2 / 4.5, 15);
    expect(row('d1 out').driver).toBe('sources_out');
    // each source's pair adds back to the overall 2.5 / 6 (law of total probability)
    for (const id of ['d1', 'd2']) {
      const pair = [row(`${id} out`), row(`${id} in service`)];
      const total = pair.reduce((sum, r) => sum + r.weightShare * r.probability, 0);
      expect(total).toBeCloseTo(2.5 / 6, 15);
    }
    expect(result.missing).not.toContain('sources_out');
  });

  it('has one stratum "no source out" when the column is there but nothing was out', () => {
    const frame = new ScenarioFrame(
      tableFromArrays({
        scenario_id: BigInt64Array.from([0n, 1n]),
        sources_available: Int16Array.from([2, 2]),
        sources_out: ['', ''],
      }),
      'none out',
    );
    expect(sourcesOutPartitions(frame).map((p) => p.strata)).toEqual([['no source out']]);
  });

  it('picks 1-2-5 steps', () => {
    expect(niceStep(830, 5)).toBe(200);
    expect(niceStep(90, 5)).toBe(20);
    expect(niceStep(1, 5)).toBe(0.2);
  });
});

describe('computeDrivers', () => {
  for (const [name, make] of [
    ['plain', () => toy()],
    ['weighted', () => weightedToy(3000)],
  ] as const) {
    it(`adds the stratified conditional probabilities back to the overall estimate (${name})`, () => {
      // law of total probability: sum_s q_s P(outcome | s) = P(outcome), for every partition
      const frame = make();
      const result = computeDrivers(frame, { confidenceLevel: 0.95 });
      const w = frame.weight;
      for (const outcome of ['shutdown', 'load_shed'] as const) {
        const x = outcome === 'shutdown' ? frame.numeric('shutdown')! : frame.numeric('shed_kw')!;
        let sw = 0;
        let swx = 0;
        for (let i = 0; i < frame.n; i++) {
          sw += w[i]!;
          swx += w[i]! * (x[i]! > 0 ? 1 : 0);
        }
        expect(result.overall[outcome]).toBeCloseTo(swx / sw, 13);
        for (const driver of ['month', 'hour_of_day', 'soc_band', 'sources_out', 'deficit_band']) {
          const rows = result.rows.filter((r) => r.outcome === outcome && r.driver === driver);
          expect(rows.length).toBeGreaterThan(1);
          const total = rows.reduce((s, r) => s + r.weightShare * r.probability, 0);
          const shares = rows.reduce((s, r) => s + r.weightShare, 0);
          const events = rows.reduce((s, r) => s + r.shareOfEvents, 0);
          // floating-point sums of a few thousand terms: 1e-12 relative
          expect(total).toBeCloseTo(swx / sw, 12);
          expect(shares).toBeCloseTo(1, 12);
          expect(events).toBeCloseTo(1, 12);
          for (const r of rows) {
            expect(r.ciLow).toBeLessThanOrEqual(r.probability);
            expect(r.ciHigh).toBeGreaterThanOrEqual(r.probability);
          }
        }
      }
      const causes = result.rows.filter((r) => r.driver === 'shutdown_cause');
      expect(causes.reduce((s, r) => s + r.probability, 0)).toBeCloseTo(
        result.overall.shutdown,
        12,
      );
      expect(causes[0]!.shareOfEvents).toBeGreaterThanOrEqual(causes[1]!.shareOfEvents);
    });
  }

  it('finds the driver built into the toy model', () => {
    // the toy adds 200 kW of deficit when gen1 is out, and the battery at low charge gives little
    const result = computeDrivers(toy(), { confidenceLevel: 0.95 });
    const top = topDrivers(result, 'shutdown', 8);
    expect(top.some((r) => r.driver === 'sources_out' && r.stratum === 'gen1 out')).toBe(true);
    const lowSoc = result.rows.find(
      (r) => r.outcome === 'shutdown' && r.driver === 'soc_band' && r.stratum.includes('0-20'),
    )!;
    expect(lowSoc.riskRatio).toBeGreaterThan(1);
    expect(lowSoc.rrCiLow).toBeGreaterThan(1);
  });
});

describe('katzRiskRatio', () => {
  it('covers the true risk ratio at about the nominal rate', () => {
    // Katz et al., Biometrics 34:469-474, 1978: the log interval is close to nominal for
    // moderate counts. 2000 simulated pairs of binomial samples with RR = 2; coverage within
    // 3 binomial standard errors of 0.95 (sqrt(0.95 * 0.05 / 2000) = 0.0049).
    const rng = seedrandom.alea('katz');
    const binomial = (n: number, p: number) => {
      let x = 0;
      for (let i = 0; i < n; i++) if (rng() < p) x++;
      return x;
    };
    const z = twoSidedZ(0.95);
    let covered = 0;
    const reps = 2000;
    for (let r = 0; r < reps; r++) {
      const rr = katzRiskRatio(binomial(400, 0.1), 400, binomial(800, 0.05), 800, z);
      if (rr.low <= 2 && 2 <= rr.high) covered++;
    }
    expect(Math.abs(covered / reps - 0.95)).toBeLessThan(3 * 0.0049);
  });

  it('handles zero counts with the half correction and refuses an undefined ratio', () => {
    const rr = katzRiskRatio(0, 100, 10, 100, 1.96);
    expect(rr.ratio).toBe(0);
    expect(rr.low).toBeGreaterThan(0);
    expect(rr.high).toBeLessThan(1);
    expect(Number.isNaN(katzRiskRatio(0, 100, 0, 100, 1.96).ratio)).toBe(true);
  });
});
