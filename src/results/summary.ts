/**
 * The summary of a run: per-event probabilities and means with confidence intervals, and yearly
 * risk, accumulated batch by batch from the scenario columns (contract names, CONTRACT.md).
 *
 * Every sum is exact (stats/exact-sum.ts), so the figures are the same bit for bit whatever the
 * order or grouping of the batches, and `merge` of shard accumulators equals one accumulator
 * over all rows. Estimators: stats/proportion.ts (weighted proportion, Wilson, or
 * Clopper-Pearson below 5 events), stats/mean.ts (weighted mean, normal interval),
 * stats/annualise.ts (lambda p and 1 - exp(-lambda p), intervals mapped through).
 * A metric whose column never arrived is left out of rows(); nothing is filled in.
 *
 * These are screening estimates for a model of the microgrid, not an engineering approval:
 * protection settings and interconnection are decided under local codes by licensed engineers.
 */
import { RunError } from '../errors.js';
import { type Interval, perYearInterval, probabilityInYearInterval } from '../stats/annualise.js';
import { ExactSum } from '../stats/exact-sum.js';
import { weightedMeanInterval } from '../stats/mean.js';
import { type ProportionMethod, weightedProportionInterval } from '../stats/proportion.js';

export interface SummaryRow {
  metric: string;
  estimate: number;
  ciLow: number;
  ciHigh: number;
  unit: string;
  nScenarios: number;
  method: string;
}

export type FailureDefinition = 'shutdown-or-critical-loss' | 'shutdown-only';

export interface SummaryOptions {
  confidenceLevel: number;
  islandingRatePerYear: number;
  failureDefinition: FailureDefinition;
}

/** How a column becomes a 0/1 indicator. */
type IndicatorTest = 'positive' | 'set';

/** Indicators and the column each comes from ('failure' is derived, see addFailure). */
const indicatorColumns = {
  load_shed: { column: 'shed_kw', test: 'positive' },
  shutdown: { column: 'shutdown', test: 'set' },
  frequency_violation: { column: 'frequency_violation', test: 'set' },
  voltage_violation: { column: 'voltage_violation', test: 'set' },
  critical_lost: { column: 'critical_lost', test: 'set' },
} as const satisfies Record<string, { column: string; test: IndicatorTest }>;
type IndicatorName = keyof typeof indicatorColumns | 'failure';

/** Quantities whose per-event mean is reported. */
const momentColumns = ['shed_kw', 'unserved_kwh', 'unserved_critical_kwh', 'lol_h'] as const;
type MomentName = (typeof momentColumns)[number];

const indicatorNames: readonly IndicatorName[] = [
  ...Object.keys(indicatorColumns),
  'failure',
] as IndicatorName[];

class IndicatorState {
  rows = 0;
  events = 0;
  readonly sumW = new ExactSum();
  readonly sumW2 = new ExactSum();
  readonly sumWEvent = new ExactSum();

  /** One row with the event, of weight w (a zero weight counts the row, adds no weight). */
  addEvent(w: number): void {
    this.events++;
    if (w !== 0) this.sumWEvent.add(w);
  }

  /** Closes a batch of `count` rows whose weight sums are batchW and batchW2. */
  addRows(count: number, batchW: ExactSum, batchW2: ExactSum): void {
    this.rows += count;
    this.sumW.addSum(batchW);
    this.sumW2.addSum(batchW2);
  }
}

class MomentState {
  rows = 0;
  nonzero = 0;
  readonly sumW = new ExactSum();
  readonly sumW2 = new ExactSum();
  readonly sumWY = new ExactSum();
  readonly sumW2Y = new ExactSum();
  readonly sumW2Y2 = new ExactSum();
}

const methodNames: Record<ProportionMethod, string> = {
  wilson: 'Wilson score interval',
  'wilson-cc': 'Wilson score interval with continuity correction',
  'clopper-pearson': 'Clopper-Pearson exact interval (fewer than 5 events or non-events)',
};

/** Format tag of toJSON(), checked by fromJSON(). */
const stateFormat = 'holdfast-summary-state';
const stateVersion = 1;

export class SummaryAccumulator {
  private readonly options: SummaryOptions;
  private readonly indicators = new Map<IndicatorName, IndicatorState>();
  private readonly moments = new Map<MomentName, MomentState>();
  /** Rows whose failure had to be judged on shutdown alone (critical_lost absent). */
  private failureWithoutCriticalRows = 0;
  // Per-batch scratch sums of the weights, reused.
  private readonly batchW = new ExactSum();
  private readonly batchW2 = new ExactSum();

  constructor(opts: SummaryOptions) {
    if (!(opts.confidenceLevel > 0 && opts.confidenceLevel < 1))
      throw new RunError(`summary: confidenceLevel must be in (0, 1), got ${opts.confidenceLevel}`);
    if (!(opts.islandingRatePerYear >= 0 && Number.isFinite(opts.islandingRatePerYear)))
      throw new RunError(
        `summary: islandingRatePerYear must be >= 0, got ${opts.islandingRatePerYear}`,
      );
    this.options = { ...opts };
  }

  /** Adds rows [0, count) of a batch. `weight` defaults to 1; absent columns are skipped. */
  addBatch(columns: Record<string, ArrayLike<number>>, count: number): void {
    if (count <= 0) return;
    const weights = columns['weight'];
    this.batchW.reset();
    this.batchW2.reset();
    if (weights) {
      for (let i = 0; i < count; i++) {
        const w = weights[i]!;
        if (!(w >= 0 && Number.isFinite(w)))
          throw new RunError(`summary: weight of batch row ${i} must be finite and >= 0, got ${w}`);
        if (w === 0) continue;
        this.batchW.add(w);
        this.batchW2.add(w * w);
      }
    } else {
      this.batchW.add(count);
      this.batchW2.add(count);
    }
    for (const name of Object.keys(indicatorColumns) as (keyof typeof indicatorColumns)[]) {
      const spec = indicatorColumns[name];
      const values = columns[spec.column];
      if (values) this.addIndicator(name, values, spec.test === 'positive', weights, count);
    }
    this.addFailure(columns, weights, count);
    for (const name of momentColumns) {
      const values = columns[name];
      if (values) this.addMoment(name, values, weights, count);
    }
  }

  private indicator(name: IndicatorName): IndicatorState {
    let s = this.indicators.get(name);
    if (!s) {
      s = new IndicatorState();
      this.indicators.set(name, s);
    }
    return s;
  }

  private addIndicator(
    name: IndicatorName,
    values: ArrayLike<number>,
    positiveOnly: boolean,
    weights: ArrayLike<number> | undefined,
    count: number,
  ): void {
    const s = this.indicator(name);
    for (let i = 0; i < count; i++) {
      const v = values[i]!;
      if (positiveOnly ? v > 0 : v !== 0) s.addEvent(weights ? weights[i]! : 1);
    }
    s.addRows(count, this.batchW, this.batchW2);
  }

  /** failure = shutdown, or shutdown || critical_lost (per the failure definition). */
  private addFailure(
    columns: Record<string, ArrayLike<number>>,
    weights: ArrayLike<number> | undefined,
    count: number,
  ): void {
    const shutdown = columns['shutdown'];
    if (!shutdown) return;
    const wantsCritical = this.options.failureDefinition === 'shutdown-or-critical-loss';
    const critical = wantsCritical ? columns['critical_lost'] : undefined;
    if (wantsCritical && !critical) this.failureWithoutCriticalRows += count;
    const s = this.indicator('failure');
    for (let i = 0; i < count; i++) {
      if (shutdown[i]! !== 0 || (critical !== undefined && critical[i]! !== 0))
        s.addEvent(weights ? weights[i]! : 1);
    }
    s.addRows(count, this.batchW, this.batchW2);
  }

  private addMoment(
    name: MomentName,
    values: ArrayLike<number>,
    weights: ArrayLike<number> | undefined,
    count: number,
  ): void {
    let s = this.moments.get(name);
    if (!s) {
      s = new MomentState();
      this.moments.set(name, s);
    }
    let allFinite = true;
    for (let i = 0; i < count; i++) {
      if (!Number.isFinite(values[i]!)) {
        allFinite = false;
        break;
      }
    }
    // A non-finite value means "not computed for this scenario": the row is left out of this
    // mean (and of its weight sums), never counted as zero.
    for (let i = 0; i < count; i++) {
      const y = values[i]!;
      if (!Number.isFinite(y)) continue;
      const w = weights ? weights[i]! : 1;
      const w2 = w * w;
      if (!allFinite) {
        s.rows++;
        if (w !== 0) {
          s.sumW.add(w);
          s.sumW2.add(w2);
        }
      }
      if (y === 0 || w === 0) continue;
      s.nonzero++;
      const w2y = w2 * y;
      s.sumWY.add(w * y);
      s.sumW2Y.add(w2y);
      s.sumW2Y2.add(w2y * y);
    }
    if (allFinite) {
      s.rows += count;
      s.sumW.addSum(this.batchW);
      s.sumW2.addSum(this.batchW2);
    }
  }

  /** Adds another accumulator's rows (exact: sums and counts). Options must match. */
  merge(other: SummaryAccumulator): void {
    const a = this.options;
    const b = other.options;
    if (
      a.confidenceLevel !== b.confidenceLevel ||
      a.islandingRatePerYear !== b.islandingRatePerYear ||
      a.failureDefinition !== b.failureDefinition
    )
      throw new RunError(
        'summary merge: the runs differ in confidence level, islanding rate or failure definition',
      );
    for (const [name, o] of other.indicators) {
      const s = this.indicator(name);
      s.rows += o.rows;
      s.events += o.events;
      s.sumW.addSum(o.sumW);
      s.sumW2.addSum(o.sumW2);
      s.sumWEvent.addSum(o.sumWEvent);
    }
    for (const [name, o] of other.moments) {
      let s = this.moments.get(name);
      if (!s) {
        s = new MomentState();
        this.moments.set(name, s);
      }
      s.rows += o.rows;
      s.nonzero += o.nonzero;
      for (const k of ['sumW', 'sumW2', 'sumWY', 'sumW2Y', 'sumW2Y2'] as const) s[k].addSum(o[k]);
    }
    this.failureWithoutCriticalRows += other.failureWithoutCriticalRows;
  }

  private proportion(name: IndicatorName) {
    const s = this.indicators.get(name);
    if (!s || s.rows === 0) return undefined;
    const sumWeights = s.sumW.value();
    if (!(sumWeights > 0)) return undefined;
    const sumSquaredWeights = s.sumW2.value();
    const interval = weightedProportionInterval(
      { sumWeights, sumSquaredWeights, sumEventWeights: s.sumWEvent.value() },
      this.options.confidenceLevel,
    );
    const weighted = interval.effectiveSize < s.rows * (1 - 1e-12);
    const method = `${weighted ? `weighted proportion (Kish n_eff ${interval.effectiveSize.toPrecision(6)} of ${s.rows} rows)` : 'proportion'}; ${methodNames[interval.method]}`;
    return { interval, rows: s.rows, method };
  }

  private mean(name: MomentName) {
    const s = this.moments.get(name);
    if (!s || s.rows === 0) return undefined;
    const sumWeights = s.sumW.value();
    if (!(sumWeights > 0)) return undefined;
    const interval = weightedMeanInterval(
      {
        rows: s.rows,
        sumWeights,
        sumSquaredWeights: s.sumW2.value(),
        sumWeightedValues: s.sumWY.value(),
        sumSquaredWeightedValues: s.sumW2Y.value(),
        sumSquaredWeightedSquares: s.sumW2Y2.value(),
      },
      this.options.confidenceLevel,
      { lowerBound: 0 },
    );
    let method = 'weighted mean; normal interval from the linearised variance, truncated at 0';
    if (s.nonzero < 5) method += '; fewer than 5 nonzero values, interval unreliable';
    return { interval, rows: s.rows, method };
  }

  rows(): SummaryRow[] {
    const out: SummaryRow[] = [];
    const lambda = this.options.islandingRatePerYear;
    const push = (metric: string, i: Interval, unit: string, n: number, method: string) =>
      out.push({
        metric,
        estimate: i.estimate,
        ciLow: i.low,
        ciHigh: i.high,
        unit,
        nScenarios: n,
        method,
      });
    const perEvent = 'probability per event';
    const asInterval = (p: { estimate: number; low: number; high: number }): Interval => ({
      estimate: p.estimate,
      low: p.low,
      high: p.high,
    });

    const simple: [string, IndicatorName][] = [
      ['p_load_shed', 'load_shed'],
      ['p_shutdown', 'shutdown'],
      ['p_frequency_violation', 'frequency_violation'],
      ['p_voltage_violation', 'voltage_violation'],
    ];
    for (const [metric, name] of simple) {
      const p = this.proportion(name);
      if (p) push(metric, asInterval(p.interval), perEvent, p.rows, p.method);
    }
    const shed = this.mean('shed_kw');
    if (shed) push('expected_shed_kw', shed.interval, 'kW', shed.rows, shed.method);

    const failure = this.proportion('failure');
    if (failure) {
      const definition =
        this.options.failureDefinition === 'shutdown-only' || this.failureWithoutCriticalRows > 0
          ? 'failure = shutdown'
          : 'failure = shutdown or critical load lost';
      const caveat =
        this.failureWithoutCriticalRows > 0
          ? ` (critical_lost absent in ${this.failureWithoutCriticalRows} rows: judged on shutdown alone)`
          : '';
      const p = asInterval(failure.interval);
      push('p_failure', p, perEvent, failure.rows, `${definition}${caveat}; ${failure.method}`);
      const lambdaText = `lambda = ${lambda}/year`;
      push(
        'failures_per_year',
        perYearInterval(lambda, p),
        '1/year',
        failure.rows,
        `lambda * p_failure, ${lambdaText}; interval mapped from p_failure`,
      );
      push(
        'p_failure_in_year',
        probabilityInYearInterval(lambda, p),
        'probability per year',
        failure.rows,
        `1 - exp(-lambda * p_failure) (Poisson thinning), ${lambdaText}; interval mapped from p_failure`,
      );
    }
    const carried = this.proportion('critical_lost');
    if (carried) {
      const i = carried.interval;
      push(
        'p_critical_carried',
        { estimate: 1 - i.estimate, low: 1 - i.high, high: 1 - i.low },
        perEvent,
        carried.rows,
        `1 - P(critical load lost); ${carried.method}`,
      );
    }
    const unserved = this.mean('unserved_kwh');
    if (unserved) {
      push('eue_kwh_per_event', unserved.interval, 'kWh', unserved.rows, unserved.method);
      push(
        'eue_kwh_per_year',
        perYearInterval(lambda, unserved.interval),
        'kWh/year',
        unserved.rows,
        `lambda * eue_kwh_per_event, lambda = ${lambda}/year; ${unserved.method}`,
      );
    }
    const unservedCritical = this.mean('unserved_critical_kwh');
    if (unservedCritical)
      push(
        'eue_critical_kwh_per_year',
        perYearInterval(lambda, unservedCritical.interval),
        'kWh/year',
        unservedCritical.rows,
        `lambda * mean unserved critical energy per event; ${unservedCritical.method}`,
      );
    const lol = this.mean('lol_h');
    if (lol)
      push(
        'lole_h_per_year',
        perYearInterval(lambda, lol.interval),
        'h/year',
        lol.rows,
        `lambda * mean hours with load not served per event; ${lol.method}`,
      );
    return out;
  }

  /** Estimate and half-width (ciHigh - ciLow) / 2 of one metric, for the stopping rule. */
  halfWidth(metric: string): { estimate: number; halfWidth: number } {
    const rows = this.rows();
    const row = rows.find((r) => r.metric === metric);
    if (!row)
      throw new RunError(
        `summary: no metric "${metric}" (available: ${rows.map((r) => r.metric).join(', ') || 'none yet'})`,
      );
    return { estimate: row.estimate, halfWidth: 0.5 * (row.ciHigh - row.ciLow) };
  }

  /** The exact state (counts and sum components), for --resume and merge. */
  toJSON(): unknown {
    const indicators: Record<string, unknown> = {};
    for (const [name, s] of this.indicators)
      indicators[name] = {
        rows: s.rows,
        events: s.events,
        sumW: s.sumW.components(),
        sumW2: s.sumW2.components(),
        sumWEvent: s.sumWEvent.components(),
      };
    const moments: Record<string, unknown> = {};
    for (const [name, s] of this.moments)
      moments[name] = {
        rows: s.rows,
        nonzero: s.nonzero,
        sumW: s.sumW.components(),
        sumW2: s.sumW2.components(),
        sumWY: s.sumWY.components(),
        sumW2Y: s.sumW2Y.components(),
        sumW2Y2: s.sumW2Y2.components(),
      };
    return {
      format: stateFormat,
      version: stateVersion,
      options: this.options,
      failureWithoutCriticalRows: this.failureWithoutCriticalRows,
      indicators,
      moments,
    };
  }

  static fromJSON(j: unknown): SummaryAccumulator {
    const o = record(j, 'summary state');
    if (o['format'] !== stateFormat || o['version'] !== stateVersion)
      throw new RunError(`summary state: expected format "${stateFormat}" version ${stateVersion}`);
    const opts = record(o['options'], 'summary state options');
    const failureDefinition = opts['failureDefinition'];
    if (failureDefinition !== 'shutdown-or-critical-loss' && failureDefinition !== 'shutdown-only')
      throw new RunError('summary state: options.failureDefinition is not a known definition');
    const acc = new SummaryAccumulator({
      confidenceLevel: count(opts['confidenceLevel'], 'options.confidenceLevel', false),
      islandingRatePerYear: count(
        opts['islandingRatePerYear'],
        'options.islandingRatePerYear',
        false,
      ),
      failureDefinition,
    });
    acc.failureWithoutCriticalRows = count(
      o['failureWithoutCriticalRows'],
      'failureWithoutCriticalRows',
    );
    for (const [name, raw] of Object.entries(record(o['indicators'], 'summary state indicators'))) {
      if (!indicatorNames.includes(name as IndicatorName))
        throw new RunError(`summary state: unknown indicator "${name}"`);
      const r = record(raw, `indicator ${name}`);
      const s = acc.indicator(name as IndicatorName);
      s.rows = count(r['rows'], `${name}.rows`);
      s.events = count(r['events'], `${name}.events`);
      for (const k of ['sumW', 'sumW2', 'sumWEvent'] as const)
        s[k].addSum(components(r[k], `${name}.${k}`));
    }
    for (const [name, raw] of Object.entries(record(o['moments'], 'summary state moments'))) {
      if (!(momentColumns as readonly string[]).includes(name))
        throw new RunError(`summary state: unknown mean "${name}"`);
      const r = record(raw, `mean ${name}`);
      const s = new MomentState();
      s.rows = count(r['rows'], `${name}.rows`);
      s.nonzero = count(r['nonzero'], `${name}.nonzero`);
      for (const k of ['sumW', 'sumW2', 'sumWY', 'sumW2Y', 'sumW2Y2'] as const)
        s[k].addSum(components(r[k], `${name}.${k}`));
      acc.moments.set(name as MomentName, s);
    }
    return acc;
  }
}

function record(v: unknown, what: string): Record<string, unknown> {
  if (typeof v !== 'object' || v === null || Array.isArray(v))
    throw new RunError(`${what}: expected an object`);
  return v as Record<string, unknown>;
}

function count(v: unknown, what: string, integer = true): number {
  if (typeof v !== 'number' || !Number.isFinite(v) || v < 0 || (integer && !Number.isInteger(v)))
    throw new RunError(`summary state: ${what} must be a ${integer ? 'count' : 'number >= 0'}`);
  return v;
}

function components(v: unknown, what: string): ExactSum {
  if (!Array.isArray(v) || !v.every((x) => typeof x === 'number' && Number.isFinite(x)))
    throw new RunError(`summary state: ${what} must be a list of finite numbers`);
  return ExactSum.fromComponents(v as number[]);
}
