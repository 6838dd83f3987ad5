// Source: binomial counting per threshold with Wilson / Clopper-Pearson intervals (REFERENCES.md 9.1-9.2) and annualisation (9.6); seedrandom drives the synthetic rows.
import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';
import { RunError } from '../../src/errors.js';
import { ExceedanceAccumulator, exceedanceGrids } from '../../src/results/exceedance.js';
import { proportionInterval } from '../../src/stats/proportion.js';

const options = { confidenceLevel: 0.95, islandingRatePerYear: 1.5, nominalFrequencyHz: 50 };

/** Invented synthetic columns around a 50 Hz island. */
function columns(n: number, seed: string, weighted: boolean) {
  const rng = seedrandom.alea(seed);
  const c = {
    weight: new Float64Array(n),
    nadir_hz: new Float64Array(n),
    zenith_hz: new Float64Array(n),
    rocof_max_hz_per_s: new Float64Array(n),
    v_min_pu: new Float64Array(n),
  };
  for (let i = 0; i < n; i++) {
    c.weight[i] = weighted ? 0.5 + rng() : 1;
    // quantised to 0.05 Hz so that values land exactly on thresholds too (strictness)
    c.nadir_hz[i] = Math.round((50 - 4 * rng() ** 2) * 20) / 20;
    c.zenith_hz[i] = 50 + 1.5 * rng() ** 3;
    c.rocof_max_hz_per_s[i] = (rng() < 0.5 ? -1 : 1) * 6 * rng() ** 2;
    c.v_min_pu[i] = i % 97 === 0 ? Number.NaN : 0.6 + 0.4 * rng();
  }
  return c;
}
type Cols = ReturnType<typeof columns>;

function feed(acc: ExceedanceAccumulator, c: Cols, from: number, to: number, batch: number) {
  for (let b = from; b < to; b += batch) {
    const e = Math.min(to, b + batch);
    const s: Record<string, Float64Array> = {};
    for (const [k, v] of Object.entries(c)) s[k] = v.subarray(b, e);
    acc.addBatch(s, e - b);
  }
}

describe('the exceedance grid', () => {
  it('is the documented fixed grid', () => {
    const [nadir, zenith, rocof, vmin] = exceedanceGrids(60);
    expect(nadir!.thresholds.length).toBe(50);
    expect(nadir!.thresholds[0]).toBe(55);
    expect(nadir!.thresholds[49]).toBe(59.9);
    expect(zenith!.thresholds[0]).toBe(60.1);
    expect(zenith!.thresholds[49]).toBe(65);
    expect(rocof!.thresholds[0]).toBe(0.1);
    expect(rocof!.thresholds.at(-1)).toBe(20);
    expect(vmin!.thresholds[0]).toBe(0.5);
    expect(vmin!.thresholds[49]).toBe(0.99);
    expect(() => exceedanceGrids(55)).toThrow(RunError);
  });
});

describe('ExceedanceAccumulator', () => {
  const n = 3000;

  it('equals direct counting at every threshold, with the interval and the yearly rate lambda p', () => {
    const c = columns(n, 'exceedance-1', false);
    const acc = new ExceedanceAccumulator(options);
    feed(acc, c, 0, n, 500);
    const rows = acc.rows();
    expect(rows.length).toBe(50 + 50 + 24 + 50);
    for (const r of rows) {
      const values = c[r.quantity as keyof Cols];
      let rowsSeen = 0;
      let crossing = 0;
      for (let i = 0; i < n; i++) {
        let v = values[i]!;
        if (!Number.isFinite(v)) continue;
        if (r.quantity === 'rocof_max_hz_per_s') v = Math.abs(v);
        rowsSeen++;
        if (r.direction === 'below' ? v < r.thresholdValue : v > r.thresholdValue) crossing++;
      }
      const p = proportionInterval(crossing, rowsSeen, 0.95);
      expect(r.probability).toBe(crossing / rowsSeen);
      expect(r.ciLow).toBe(p.low);
      expect(r.ciHigh).toBe(p.high);
      expect(r.ratePerYear).toBe(1.5 * r.probability);
      expect(r.rateCiHigh).toBe(1.5 * r.ciHigh);
    }
  });

  it('lists each curve from the mildest threshold to the most severe, never rising', () => {
    const acc = new ExceedanceAccumulator(options);
    feed(acc, columns(n, 'exceedance-2', true), 0, n, 1000);
    const rows = acc.rows();
    for (const q of ['nadir_hz', 'zenith_hz', 'rocof_max_hz_per_s', 'v_min_pu']) {
      const curve = rows.filter((r) => r.quantity === q);
      expect(curve.length).toBeGreaterThan(0);
      for (let k = 1; k < curve.length; k++)
        expect(curve[k]!.probability).toBeLessThanOrEqual(curve[k - 1]!.probability);
    }
    expect(rows[0]!.thresholdValue).toBe(49.9); // nadir: mildest first
  });

  it('does not count a value equal to the threshold as crossing it', () => {
    const acc = new ExceedanceAccumulator(options);
    acc.addBatch({ nadir_hz: new Float64Array([49, 49, 50]) }, 3);
    const at49 = acc.rows().find((r) => r.quantity === 'nadir_hz' && r.thresholdValue === 49)!;
    const at491 = acc.rows().find((r) => r.quantity === 'nadir_hz' && r.thresholdValue === 49.1)!;
    expect(at49.probability).toBe(0);
    expect(at491.probability).toBeCloseTo(2 / 3, 15);
  });

  it('merges shards and round-trips its state bit for bit', () => {
    const c = columns(n, 'exceedance-3', true);
    const one = new ExceedanceAccumulator(options);
    feed(one, c, 0, n, n);
    const a = new ExceedanceAccumulator(options);
    const b = new ExceedanceAccumulator(options);
    feed(a, c, 0, 1111, 50);
    feed(b, c, 1111, n, 300);
    const merged = ExceedanceAccumulator.fromJSON(JSON.parse(JSON.stringify(b.toJSON())));
    merged.merge(a);
    expect(merged.rows()).toEqual(one.rows());
  });

  it('leaves out quantities that never arrived and refuses mismatched merges', () => {
    const acc = new ExceedanceAccumulator(options);
    acc.addBatch({ zenith_hz: new Float64Array([50.5]) }, 1);
    expect(new Set(acc.rows().map((r) => r.quantity))).toEqual(new Set(['zenith_hz']));
    expect(() =>
      acc.merge(new ExceedanceAccumulator({ ...options, nominalFrequencyHz: 60 })),
    ).toThrow(RunError);
    expect(() => ExceedanceAccumulator.fromJSON({ format: 'x' })).toThrow(RunError);
  });
});
