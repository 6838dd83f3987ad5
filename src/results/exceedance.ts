/**
 * Exceedance curves: for nadir, zenith, RoCoF and minimum voltage, the yearly rate at which each
 * threshold of a fixed grid is crossed (a curve over thresholds, like a hazard curve).
 *
 *   P_k = P(crossing threshold t_k | islanding event)   weighted proportion, Wilson or
 *         Clopper-Pearson (stats/proportion.ts)
 *   rate_k = lambda P_k per year, interval lambda [L_k, U_k] (stats/annualise.ts, Poisson
 *         thinning: REFERENCES.md 9.6)
 * Crossing is strict: nadir_hz < t and v_min_pu < t ("below"), zenith_hz > t and
 * |rocof_max_hz_per_s| > t ("above").
 *
 * Each row's value falls into one bin between consecutive thresholds; only bin weight sums are
 * kept (exact, stats/exact-sum.ts), so accumulators merge exactly across shards and the curve is
 * their cumulative sum. Rows whose value is not finite (not computed) are left out of that
 * quantity. These are screening estimates, not an engineering approval.
 *
 * The grid (fixed, documented in docs/statistics.md):
 *   nadir_hz  f0 - 0.1, f0 - 0.2, ..., f0 - 5.0 Hz      (50 thresholds, f0 = 50 or 60 Hz)
 *   zenith_hz f0 + 0.1, ..., f0 + 5.0 Hz                (50)
 *   rocof_max_hz_per_s 0.1 ... 20 Hz/s in a 1-1.25-1.5-2-2.5-3-4-5-6-8 series (24)
 *   v_min_pu  0.99, 0.98, ..., 0.50 pu                  (50)
 * The 0.1 Hz and 0.01 pu steps resolve the usual UFLS stage spacing and voltage bands
 * (common practice, no source).
 */
import { RunError } from '../errors.js';
import { ExactSum } from '../stats/exact-sum.js';
import { weightedProportionInterval } from '../stats/proportion.js';

export type ExceedanceDirection = 'below' | 'above';

export interface ExceedanceGrid {
  /** The scenarios.arrow column. */
  quantity: string;
  unit: string;
  direction: ExceedanceDirection;
  /** Compare |value| (RoCoF may be reported signed). */
  magnitude: boolean;
  /** Ascending. */
  thresholds: readonly number[];
}

export interface ExceedanceRow {
  quantity: string;
  thresholdValue: number;
  unit: string;
  direction: ExceedanceDirection;
  probability: number;
  ciLow: number;
  ciHigh: number;
  ratePerYear: number;
  rateCiLow: number;
  rateCiHigh: number;
}

export interface ExceedanceOptions {
  confidenceLevel: number;
  islandingRatePerYear: number;
  nominalFrequencyHz: number;
}

const rocofThresholdsHzPerS = [
  0.1, 0.125, 0.15, 0.2, 0.25, 0.3, 0.4, 0.5, 0.6, 0.8, 1, 1.25, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10,
  12.5, 15, 20,
] as const;

/** The fixed threshold grid for a nominal frequency (see the header). */
export function exceedanceGrids(nominalFrequencyHz: number): ExceedanceGrid[] {
  if (nominalFrequencyHz !== 50 && nominalFrequencyHz !== 60)
    throw new RunError(
      `exceedance: nominal frequency must be 50 or 60 Hz, got ${nominalFrequencyHz}`,
    );
  const steps = Array.from({ length: 50 }, (_, i) => i + 1); // 1..50 tenths of a hertz
  const tenths = nominalFrequencyHz * 10;
  return [
    {
      quantity: 'nadir_hz',
      unit: 'Hz',
      direction: 'below',
      magnitude: false,
      thresholds: steps.map((k) => (tenths - k) / 10).reverse(),
    },
    {
      quantity: 'zenith_hz',
      unit: 'Hz',
      direction: 'above',
      magnitude: false,
      thresholds: steps.map((k) => (tenths + k) / 10),
    },
    {
      quantity: 'rocof_max_hz_per_s',
      unit: 'Hz/s',
      direction: 'above',
      magnitude: true,
      thresholds: [...rocofThresholdsHzPerS],
    },
    {
      quantity: 'v_min_pu',
      unit: 'pu',
      direction: 'below',
      magnitude: false,
      thresholds: Array.from({ length: 50 }, (_, i) => (50 + i) / 100),
    },
  ];
}

/** Bin of v: below -> number of thresholds <= v; above -> number of thresholds < v. */
function binOf(thresholds: Float64Array, v: number, below: boolean): number {
  let lo = 0;
  let hi = thresholds.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    const t = thresholds[mid]!;
    if (below ? t <= v : t < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

class QuantityState {
  rows = 0;
  readonly sumW = new ExactSum();
  readonly sumW2 = new ExactSum();
  readonly bins: ExactSum[];
  readonly thresholds: Float64Array;
  constructor(readonly grid: ExceedanceGrid) {
    this.thresholds = Float64Array.from(grid.thresholds);
    this.bins = Array.from({ length: grid.thresholds.length + 1 }, () => new ExactSum());
  }
}

const stateFormat = 'holdfast-exceedance-state';
const stateVersion = 1;

export class ExceedanceAccumulator {
  private readonly options: ExceedanceOptions;
  private readonly states: QuantityState[];

  constructor(opts: ExceedanceOptions) {
    if (!(opts.confidenceLevel > 0 && opts.confidenceLevel < 1))
      throw new RunError(
        `exceedance: confidenceLevel must be in (0, 1), got ${opts.confidenceLevel}`,
      );
    if (!(opts.islandingRatePerYear >= 0 && Number.isFinite(opts.islandingRatePerYear)))
      throw new RunError(
        `exceedance: islandingRatePerYear must be >= 0, got ${opts.islandingRatePerYear}`,
      );
    this.options = { ...opts };
    this.states = exceedanceGrids(opts.nominalFrequencyHz).map((g) => new QuantityState(g));
  }

  /** Adds rows [0, count); `weight` defaults to 1; absent quantities are skipped. */
  addBatch(columns: Record<string, ArrayLike<number>>, count: number): void {
    const weights = columns['weight'];
    for (const s of this.states) {
      const values = columns[s.grid.quantity];
      if (!values) continue;
      const below = s.grid.direction === 'below';
      for (let i = 0; i < count; i++) {
        let v = values[i]!;
        if (!Number.isFinite(v)) continue;
        if (s.grid.magnitude) v = Math.abs(v);
        const w = weights ? weights[i]! : 1;
        if (!(w >= 0 && Number.isFinite(w)))
          throw new RunError(
            `exceedance: weight of batch row ${i} must be finite and >= 0, got ${w}`,
          );
        s.rows++;
        if (w === 0) continue;
        s.sumW.add(w);
        s.sumW2.add(w * w);
        s.bins[binOf(s.thresholds, v, below)]!.add(w);
      }
    }
  }

  merge(other: ExceedanceAccumulator): void {
    const a = this.options;
    const b = other.options;
    if (
      a.confidenceLevel !== b.confidenceLevel ||
      a.islandingRatePerYear !== b.islandingRatePerYear ||
      a.nominalFrequencyHz !== b.nominalFrequencyHz
    )
      throw new RunError(
        'exceedance merge: the runs differ in confidence level, rate or nominal frequency',
      );
    for (let q = 0; q < this.states.length; q++) {
      const s = this.states[q]!;
      const o = other.states[q]!;
      s.rows += o.rows;
      s.sumW.addSum(o.sumW);
      s.sumW2.addSum(o.sumW2);
      for (let k = 0; k < s.bins.length; k++) s.bins[k]!.addSum(o.bins[k]!);
    }
  }

  /** One row per quantity seen and threshold, from the mildest threshold to the most severe. */
  rows(): ExceedanceRow[] {
    const out: ExceedanceRow[] = [];
    const lambda = this.options.islandingRatePerYear;
    for (const s of this.states) {
      if (s.rows === 0) continue;
      const sumWeights = s.sumW.value();
      if (!(sumWeights > 0)) continue;
      const sumSquaredWeights = s.sumW2.value();
      const K = s.thresholds.length;
      // Crossing weight of threshold k: below -> bins 0..k; above -> bins k+1..K.
      const crossing = new Float64Array(K);
      const running = new ExactSum();
      if (s.grid.direction === 'below') {
        for (let k = 0; k < K; k++) {
          running.addSum(s.bins[k]!);
          crossing[k] = running.value();
        }
      } else {
        for (let k = K - 1; k >= 0; k--) {
          running.addSum(s.bins[k + 1]!);
          crossing[k] = running.value();
        }
      }
      const order = Array.from({ length: K }, (_, k) =>
        s.grid.direction === 'below' ? K - 1 - k : k,
      );
      for (const k of order) {
        const p = weightedProportionInterval(
          { sumWeights, sumSquaredWeights, sumEventWeights: crossing[k]! },
          this.options.confidenceLevel,
        );
        out.push({
          quantity: s.grid.quantity,
          thresholdValue: s.thresholds[k]!,
          unit: s.grid.unit,
          direction: s.grid.direction,
          probability: p.estimate,
          ciLow: p.low,
          ciHigh: p.high,
          ratePerYear: lambda * p.estimate,
          rateCiLow: lambda * p.low,
          rateCiHigh: lambda * p.high,
        });
      }
    }
    return out;
  }

  toJSON(): unknown {
    return {
      format: stateFormat,
      version: stateVersion,
      options: this.options,
      quantities: this.states.map((s) => ({
        quantity: s.grid.quantity,
        rows: s.rows,
        sumW: s.sumW.components(),
        sumW2: s.sumW2.components(),
        bins: s.bins.map((b) => b.components()),
      })),
    };
  }

  static fromJSON(j: unknown): ExceedanceAccumulator {
    const bad = (what: string) => new RunError(`exceedance state: ${what}`);
    if (typeof j !== 'object' || j === null) throw bad('expected an object');
    const o = j as Record<string, unknown>;
    if (o['format'] !== stateFormat || o['version'] !== stateVersion)
      throw bad(`expected format "${stateFormat}" version ${stateVersion}`);
    const opts = o['options'] as Partial<ExceedanceOptions> | undefined;
    if (
      !opts ||
      typeof opts.confidenceLevel !== 'number' ||
      typeof opts.islandingRatePerYear !== 'number' ||
      typeof opts.nominalFrequencyHz !== 'number'
    )
      throw bad('options must hold confidenceLevel, islandingRatePerYear and nominalFrequencyHz');
    const acc = new ExceedanceAccumulator(opts as ExceedanceOptions);
    const quantities = o['quantities'];
    if (!Array.isArray(quantities) || quantities.length !== acc.states.length)
      throw bad(`quantities must be a list of ${acc.states.length}`);
    const sum = (v: unknown, what: string): ExactSum => {
      if (!Array.isArray(v) || !v.every((x) => typeof x === 'number' && Number.isFinite(x)))
        throw bad(`${what} must be a list of finite numbers`);
      return ExactSum.fromComponents(v as number[]);
    };
    acc.states.forEach((s, q) => {
      const r = quantities[q] as Record<string, unknown>;
      if (!r || r['quantity'] !== s.grid.quantity)
        throw bad(`quantity ${q} must be ${s.grid.quantity}`);
      const rows = r['rows'];
      if (typeof rows !== 'number' || !Number.isInteger(rows) || rows < 0)
        throw bad(`${s.grid.quantity}.rows must be a count`);
      s.rows = rows;
      s.sumW.addSum(sum(r['sumW'], `${s.grid.quantity}.sumW`));
      s.sumW2.addSum(sum(r['sumW2'], `${s.grid.quantity}.sumW2`));
      const bins = r['bins'];
      if (!Array.isArray(bins) || bins.length !== s.bins.length)
        throw bad(`${s.grid.quantity}.bins must be a list of ${s.bins.length}`);
      for (let k = 0; k < bins.length; k++)
        s.bins[k]!.addSum(sum(bins[k], `${s.grid.quantity}.bins[${k}]`));
    });
    return acc;
  }
}
