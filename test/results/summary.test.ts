// Source: Wilson 1927 and Clopper & Pearson 1934 intervals (REFERENCES.md 9.1-9.3), annualisation 1 - exp(-lambda p) (REFERENCES.md 9.6).
import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';
import { RunError } from '../../src/errors.js';
import {
  SummaryAccumulator,
  type SummaryOptions,
  type SummaryRow,
} from '../../src/results/summary.js';
import { twoSidedZ } from '../../src/stats/normal.js';
import { clopperPearsonInterval, wilsonInterval } from '../../src/stats/proportion.js';

const options: SummaryOptions = {
  confidenceLevel: 0.95,
  islandingRatePerYear: 2,
  failureDefinition: 'shutdown-or-critical-loss',
};

type Columns = Record<string, Float64Array | Uint8Array>;

/** Invented synthetic scenario columns with the contract names, from a fixed seed. */
function syntheticColumns(n: number, seed: string, weighted = false): Columns {
  const rng = seedrandom.alea(seed);
  const c: Columns = {
    weight: new Float64Array(n),
    shutdown: new Uint8Array(n),
    voltage_violation: new Uint8Array(n),
    frequency_violation: new Uint8Array(n),
    critical_lost: new Uint8Array(n),
    shed_kw: new Float64Array(n),
    nadir_hz: new Float64Array(n),
    unserved_kwh: new Float64Array(n),
    unserved_critical_kwh: new Float64Array(n),
    lol_h: new Float64Array(n),
    outage_h: new Float64Array(n),
    survived_h: new Float64Array(n),
  };
  for (let i = 0; i < n; i++) {
    c.weight![i] = weighted ? 0.2 + 3 * rng() : 1;
    c.shutdown![i] = rng() < 0.03 ? 1 : 0;
    c.critical_lost![i] = rng() < 0.02 ? 1 : 0;
    c.voltage_violation![i] = rng() < 0.1 ? 1 : 0;
    c.frequency_violation![i] = rng() < 0.2 ? 1 : 0;
    c.shed_kw![i] = rng() < 0.15 ? 300 * rng() : 0;
    c.nadir_hz![i] = 60 - 2 * rng();
    const short = rng() < 0.05;
    c.unserved_kwh![i] = short ? 2000 * rng() : 0;
    c.unserved_critical_kwh![i] = short && rng() < 0.3 ? 100 * rng() : 0;
    c.lol_h![i] = short ? 6 * rng() : 0;
  }
  return c;
}

function slice(c: Columns, from: number, to: number): Columns {
  const out: Columns = {};
  for (const [k, v] of Object.entries(c)) out[k] = v.subarray(from, to);
  return out;
}

function feed(acc: SummaryAccumulator, c: Columns, from: number, to: number, batch: number) {
  for (let b = from; b < to; b += batch) {
    const e = Math.min(to, b + batch);
    acc.addBatch(slice(c, b, e), e - b);
  }
}

function metric(rows: SummaryRow[], name: string): SummaryRow {
  const r = rows.find((x) => x.metric === name);
  if (!r) throw new Error(`no ${name}`);
  return r;
}

describe('SummaryAccumulator', () => {
  const n = 5000;
  const cols = syntheticColumns(n, 'summary-1');

  it('reports every contract metric, and the outage metrics when their columns are there', () => {
    const acc = new SummaryAccumulator(options);
    feed(acc, cols, 0, n, 1000);
    const names = acc.rows().map((r) => r.metric);
    // CONTRACT.md, summary.arrow required metrics
    for (const m of [
      'p_load_shed',
      'p_shutdown',
      'p_frequency_violation',
      'p_voltage_violation',
      'expected_shed_kw',
      'failures_per_year',
      'p_failure_in_year',
      'eue_kwh_per_year',
      'p_critical_carried',
      'eue_kwh_per_event',
      'lole_h_per_year',
    ])
      expect(names).toContain(m);
    for (const r of acc.rows()) {
      expect(r.nScenarios).toBe(n);
      expect(r.ciLow).toBeLessThanOrEqual(r.estimate);
      expect(r.estimate).toBeLessThanOrEqual(r.ciHigh);
      expect(r.method.length).toBeGreaterThan(0);
    }
  });

  it('leaves out the metrics whose columns are absent (no placeholders)', () => {
    const partial: Columns = {
      weight: cols.weight!,
      shutdown: cols.shutdown!,
      shed_kw: cols.shed_kw!,
    };
    const acc = new SummaryAccumulator(options);
    feed(acc, partial, 0, n, 1000);
    const names = acc.rows().map((r) => r.metric);
    expect(names).toEqual([
      'p_load_shed',
      'p_shutdown',
      'expected_shed_kw',
      'p_failure',
      'failures_per_year',
      'p_failure_in_year',
    ]);
    // failure then rests on shutdown alone, and says so
    expect(metric(acc.rows(), 'p_failure').method).toContain('critical_lost absent');
  });

  it('with plain weights, recomputes p_shutdown, its Wilson interval and the shed mean from the raw rows', () => {
    const acc = new SummaryAccumulator(options);
    feed(acc, cols, 0, n, 700);
    const rows = acc.rows();
    let x = 0;
    for (let i = 0; i < n; i++) x += cols.shutdown![i]!;
    const w = wilsonInterval(x, n, 0.95);
    const s = metric(rows, 'p_shutdown');
    expect(s.estimate).toBe(x / n);
    expect(s.ciLow).toBe(w.low);
    expect(s.ciHigh).toBe(w.high);
    // mean +/- z s / sqrt(n) by two passes (textbook), to rounding 1e-10 relative
    const shed = Array.from(cols.shed_kw!);
    const mean = shed.reduce((a, b) => a + b) / n;
    const sd = Math.sqrt(shed.reduce((a, y) => a + (y - mean) ** 2, 0) / (n - 1));
    const e = metric(rows, 'expected_shed_kw');
    expect(e.estimate).toBeCloseTo(mean, 10);
    expect(e.ciHigh - e.estimate).toBeCloseTo((twoSidedZ(0.95) * sd) / Math.sqrt(n), 10);
  });

  it('annualises p_failure as 1 - exp(-lambda p), not lambda p (REFERENCES.md 9.6)', () => {
    const heavy = new SummaryAccumulator({ ...options, islandingRatePerYear: 10 });
    // p_failure = 0.05 exactly: 50 of 1000 rows shut down
    const shutdown = new Uint8Array(1000);
    for (let i = 0; i < 50; i++) shutdown[i * 20] = 1;
    heavy.addBatch({ shutdown, critical_lost: new Uint8Array(1000) }, 1000);
    const rows = heavy.rows();
    expect(metric(rows, 'p_failure').estimate).toBe(0.05);
    expect(metric(rows, 'failures_per_year').estimate).toBeCloseTo(0.5, 14);
    expect(metric(rows, 'p_failure_in_year').estimate).toBeCloseTo(0.393469, 6);
    const p = metric(rows, 'p_failure');
    expect(metric(rows, 'p_failure_in_year').ciHigh).toBeCloseTo(-Math.expm1(-10 * p.ciHigh), 15);
  });

  it('switches to Clopper-Pearson when events are few', () => {
    const shutdown = new Uint8Array(2000);
    shutdown[17] = 1;
    shutdown[1800] = 1;
    const acc = new SummaryAccumulator(options);
    acc.addBatch({ shutdown }, 2000);
    const s = metric(acc.rows(), 'p_shutdown');
    const cp = clopperPearsonInterval(2, 2000, 0.95);
    expect(s.ciLow).toBe(cp.low);
    expect(s.ciHigh).toBe(cp.high);
    expect(s.method).toContain('Clopper-Pearson');
  });

  it('counts failure as shutdown or critical loss, or shutdown only, per the case', () => {
    const both = new SummaryAccumulator(options);
    const only = new SummaryAccumulator({ ...options, failureDefinition: 'shutdown-only' });
    feed(both, cols, 0, n, 1000);
    feed(only, cols, 0, n, 1000);
    let either = 0;
    let sd = 0;
    for (let i = 0; i < n; i++) {
      if (cols.shutdown![i] || cols.critical_lost![i]) either++;
      if (cols.shutdown![i]) sd++;
    }
    expect(metric(both.rows(), 'p_failure').estimate).toBe(either / n);
    expect(metric(only.rows(), 'p_failure').estimate).toBe(sd / n);
  });

  it('gives the same figures bit for bit for any batch size, shard split and merge order', () => {
    for (const weighted of [false, true]) {
      const c = syntheticColumns(n, 'summary-merge', weighted);
      const one = new SummaryAccumulator(options);
      feed(one, c, 0, n, n);
      const small = new SummaryAccumulator(options);
      feed(small, c, 0, n, 37);
      const shards = [0, 1234, 3000, n].slice(0, -1).map((from, k, a) => {
        const acc = new SummaryAccumulator(options);
        feed(acc, c, from, k + 1 < a.length ? a[k + 1]! : n, 100);
        return acc;
      });
      const merged = new SummaryAccumulator(options);
      for (const s of [shards[2]!, shards[0]!, shards[1]!]) merged.merge(s);
      // toEqual on numbers uses Object.is: bit for bit
      expect(small.rows()).toEqual(one.rows());
      expect(merged.rows()).toEqual(one.rows());
    }
  });

  it('round-trips through toJSON / fromJSON exactly, and merges afterwards (--resume)', () => {
    const first = new SummaryAccumulator(options);
    feed(first, cols, 0, 2500, 500);
    const restored = SummaryAccumulator.fromJSON(JSON.parse(JSON.stringify(first.toJSON())));
    expect(restored.rows()).toEqual(first.rows());
    feed(restored, cols, 2500, n, 500);
    const whole = new SummaryAccumulator(options);
    feed(whole, cols, 0, n, 1000);
    expect(restored.rows()).toEqual(whole.rows());
  });

  it('treats equal weights like plain sampling', () => {
    const plain = new SummaryAccumulator(options);
    feed(plain, cols, 0, n, 1000);
    const scaled = { ...cols, weight: new Float64Array(n).fill(0.3) };
    const same = new SummaryAccumulator(options);
    feed(same, scaled, 0, n, 1000);
    const a = plain.rows();
    const b = same.rows();
    for (let i = 0; i < a.length; i++) {
      expect(b[i]!.metric).toBe(a[i]!.metric);
      // n_eff = (0.3 n)^2 / (0.09 n) = n up to rounding: 1e-10
      expect(b[i]!.estimate).toBeCloseTo(a[i]!.estimate, 10);
      expect(b[i]!.ciLow).toBeCloseTo(a[i]!.ciLow, 10);
      expect(b[i]!.ciHigh).toBeCloseTo(a[i]!.ciHigh, 10);
    }
  });

  it('weights the proportions sum w y / sum w and reports Kish n_eff in the method', () => {
    const c = syntheticColumns(n, 'summary-weighted', true);
    const acc = new SummaryAccumulator(options);
    feed(acc, c, 0, n, 1000);
    let sw = 0;
    let swy = 0;
    for (let i = 0; i < n; i++) {
      sw += c.weight![i]!;
      swy += c.weight![i]! * c.shutdown![i]!;
    }
    const s = metric(acc.rows(), 'p_shutdown');
    expect(s.estimate).toBeCloseTo(swy / sw, 12);
    expect(s.method).toContain('Kish n_eff');
  });

  it('gives the half-width for the stopping rule and names the metrics on a wrong name', () => {
    const acc = new SummaryAccumulator(options);
    feed(acc, cols, 0, n, 1000);
    const r = metric(acc.rows(), 'p_failure');
    expect(acc.halfWidth('p_failure')).toEqual({
      estimate: r.estimate,
      halfWidth: (r.ciHigh - r.ciLow) / 2,
    });
    expect(() => acc.halfWidth('p_nothing')).toThrow(/available: p_load_shed/);
  });

  it('rejects bad weights and malformed saved state with a RunError', () => {
    const acc = new SummaryAccumulator(options);
    expect(() =>
      acc.addBatch({ weight: new Float64Array([1, -2]), shutdown: new Uint8Array(2) }, 2),
    ).toThrow(RunError);
    expect(() => SummaryAccumulator.fromJSON({ format: 'something else' })).toThrow(RunError);
    const j = acc.toJSON() as Record<string, unknown>;
    expect(() =>
      SummaryAccumulator.fromJSON({ ...j, indicators: { shutdown: { rows: -1 } } }),
    ).toThrow(RunError);
    expect(() => new SummaryAccumulator({ ...options, confidenceLevel: 95 })).toThrow(RunError);
    const other = new SummaryAccumulator({ ...options, islandingRatePerYear: 3 });
    expect(() => acc.merge(other)).toThrow(RunError);
  });
});
