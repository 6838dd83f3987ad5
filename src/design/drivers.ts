/**
 * What drives the risk: conditional probabilities of load shedding and of shutdown in each
 * stratum of month, hour of day, state-of-charge band, sources out and deficit size
 * (strata.ts), each with its interval and its risk ratio against the rest of the scenarios;
 * and the causes of shutdown ranked.
 *
 * Weighted estimators (weights w_i of the sampling plan, 1 for plain Monte Carlo):
 *   W_s = sum_{i in s} w_i,  p_s = sum_{i in s} w_i x_i / W_s,  q_s = W_s / W,
 * so sum_s q_s p_s = sum_i w_i x_i / W = p, the overall estimate (law of total probability):
 * the strata add back exactly, which the tests check. Intervals are the stats module's default
 * for a proportion (Wilson; Clopper-Pearson with fewer than 5 events, src/stats/proportion.ts)
 * at the Kish effective sample size n_eff = W_s^2 / sum w_i^2 and effective events p_s n_eff
 * (Kish, Survey Sampling, 1965, sec. 11.7, from memory), the plain counts when all weights are 1.
 *
 * The risk ratio compares a stratum with the rest of the scenarios (two disjoint samples), with
 * the Katz log interval (riskRatio.ts). Screening estimates: a high ratio points at conditions
 * worth a closer look, it is not a cause established.
 */
import { RunError } from '../errors.js';
import { twoSidedZ } from '../stats/normal.js';
import { proportionInterval } from '../stats/proportion.js';
import { katzRiskRatio } from './riskRatio.js';
import type { ScenarioFrame } from './scenarioFrame.js';
import { driverPartitions } from './strata.js';

export type DriverOutcome = 'load_shed' | 'shutdown';

export interface DriverRow {
  outcome: DriverOutcome;
  /** `month`, `hour_of_day`, `soc_band`, `sources_out`, `deficit_band` or `shutdown_cause`. */
  driver: string;
  stratum: string;
  nScenarios: number;
  /** q_s: the stratum's share of the total weight (NaN for cause rows, which split events). */
  weightShare: number;
  /** P(outcome | stratum); cause rows: P(shutdown with this cause). */
  probability: number;
  ciLow: number;
  ciHigh: number;
  /** Share of the outcome's (weighted) events that fall in the stratum. */
  shareOfEvents: number;
  /** P(outcome | stratum) / P(outcome | rest); NaN for cause rows. */
  riskRatio: number;
  rrCiLow: number;
  rrCiHigh: number;
  /** Lower limit of the risk ratio at the Bonferroni-adjusted level over all strata of the outcome. */
  rrCiLowFamily: number;
  /** Weighted events of the outcome in the stratum, as an effective count (Kish). */
  effectiveEvents: number;
}

export interface DriversResult {
  rows: DriverRow[];
  /** Overall weighted probability of each outcome (the rows add back to these). */
  overall: Record<DriverOutcome, number>;
  confidenceLevel: number;
  /** Drivers left out because the scenario table lacks their column. */
  missing: string[];
}

export interface DriversOptions {
  confidenceLevel: number;
}

/** The stats module's default interval (Wilson, Clopper-Pearson below 5 events) at effective counts. */
function interval(events: number, trials: number, level: number): { low: number; high: number } {
  if (!(trials > 0)) return { low: Number.NaN, high: Number.NaN };
  return proportionInterval(Math.min(trials, Math.max(0, events)), trials, level);
}

function outcomeIndicator(frame: ScenarioFrame, outcome: DriverOutcome): Float64Array {
  const out = new Float64Array(frame.n);
  if (outcome === 'shutdown') {
    const s = frame.numeric('shutdown');
    if (!s) throw new RunError(`${frame.origin}: no shutdown column`);
    for (let i = 0; i < frame.n; i++) out[i] = s[i] ? 1 : 0;
  } else {
    const shed = frame.numeric('shed_kw') ?? frame.numeric('shed_stages');
    if (!shed) throw new RunError(`${frame.origin}: no shed_kw column`);
    for (let i = 0; i < frame.n; i++) out[i] = shed[i]! > 0 ? 1 : 0;
  }
  return out;
}

interface Sums {
  count: Float64Array;
  w: Float64Array;
  w2: Float64Array;
  wx: Float64Array;
}

function sumsBy(codes: Int32Array, strata: number, weight: Float64Array, x: Float64Array): Sums {
  const s: Sums = {
    count: new Float64Array(strata),
    w: new Float64Array(strata),
    w2: new Float64Array(strata),
    wx: new Float64Array(strata),
  };
  for (let i = 0; i < codes.length; i++) {
    const k = codes[i]!;
    const wi = weight[i]!;
    s.count[k]! += 1;
    s.w[k]! += wi;
    s.w2[k]! += wi * wi;
    s.wx[k]! += wi * x[i]!;
  }
  return s;
}

/** Effective trials and events of a weighted group (Kish). */
function effective(w: number, w2: number, wx: number): { n: number; x: number } {
  if (!(w > 0)) return { n: 0, x: 0 };
  const n = (w * w) / w2;
  return { n, x: (wx / w) * n };
}

export function computeDrivers(frame: ScenarioFrame, opts: DriversOptions): DriversResult {
  const partitions = driverPartitions(frame);
  const missing = ['month', 'hour_of_day', 'soc_band', 'sources_out', 'deficit_band'].filter(
    (d) => !partitions.some((p) => p.driver === d),
  );
  const z = twoSidedZ(opts.confidenceLevel);
  // Bonferroni over every stratum of one outcome (Dunn, JASA 56:52-64, 1961): the top-drivers
  // table picks the largest of many ratios, so its "clearly above 1" must hold for the family
  let strataCount = 0;
  for (const p of partitions) strataCount += p.strata.length;
  const zFamily = twoSidedZ(1 - (1 - opts.confidenceLevel) / Math.max(1, strataCount));
  const weight = frame.weight;
  let wAll = 0;
  let w2All = 0;
  for (let i = 0; i < frame.n; i++) {
    wAll += weight[i]!;
    w2All += weight[i]! * weight[i]!;
  }
  const rows: DriverRow[] = [];
  const overall = { load_shed: Number.NaN, shutdown: Number.NaN };
  for (const outcome of ['shutdown', 'load_shed'] as const) {
    const x = outcomeIndicator(frame, outcome);
    let wxAll = 0;
    for (let i = 0; i < frame.n; i++) wxAll += weight[i]! * x[i]!;
    overall[outcome] = wxAll / wAll;
    for (const part of partitions) {
      const s = sumsBy(part.codes, part.strata.length, weight, x);
      for (let k = 0; k < part.strata.length; k++) {
        if (s.count[k] === 0) continue;
        const inside = effective(s.w[k]!, s.w2[k]!, s.wx[k]!);
        const rest = effective(wAll - s.w[k]!, w2All - s.w2[k]!, wxAll - s.wx[k]!);
        const ci = interval(inside.x, inside.n, opts.confidenceLevel);
        const rr = katzRiskRatio(inside.x, inside.n, rest.x, rest.n, z);
        const rrFamily = katzRiskRatio(inside.x, inside.n, rest.x, rest.n, zFamily);
        rows.push({
          outcome,
          driver: part.driver,
          stratum: part.strata[k]!,
          nScenarios: s.count[k]!,
          weightShare: s.w[k]! / wAll,
          probability: s.wx[k]! / s.w[k]!,
          ciLow: ci.low,
          ciHigh: ci.high,
          shareOfEvents: wxAll > 0 ? s.wx[k]! / wxAll : Number.NaN,
          riskRatio: rr.ratio,
          rrCiLow: rr.low,
          rrCiHigh: rr.high,
          rrCiLowFamily: rrFamily.low,
          effectiveEvents: inside.x,
        });
      }
    }
    if (outcome === 'shutdown') rows.push(...causeRows(frame, x, wAll, w2All, wxAll, opts));
  }
  return { rows, overall, confidenceLevel: opts.confidenceLevel, missing };
}

/** Causes of shutdown ranked by their weighted share of the shutdowns. */
function causeRows(
  frame: ScenarioFrame,
  shutdown: Float64Array,
  wAll: number,
  w2All: number,
  wxAll: number,
  opts: DriversOptions,
): DriverRow[] {
  const causes = frame.text('shutdown_cause');
  if (!causes) return [];
  const byCause = new Map<string, { count: number; wx: number }>();
  for (let i = 0; i < frame.n; i++) {
    if (!shutdown[i]) continue;
    const c = causes[i] || 'unstated';
    const e = byCause.get(c) ?? { count: 0, wx: 0 };
    e.count += 1;
    e.wx += frame.weight[i]!;
    byCause.set(c, e);
  }
  const nEff = (wAll * wAll) / w2All;
  return [...byCause.entries()]
    .sort((a, b) => b[1].wx - a[1].wx || (a[0] < b[0] ? -1 : 1))
    .map(([cause, e]) => {
      const p = e.wx / wAll;
      const ci = interval(p * nEff, nEff, opts.confidenceLevel);
      return {
        outcome: 'shutdown' as const,
        driver: 'shutdown_cause',
        stratum: cause,
        nScenarios: e.count,
        weightShare: Number.NaN,
        probability: p,
        ciLow: ci.low,
        ciHigh: ci.high,
        shareOfEvents: wxAll > 0 ? e.wx / wxAll : Number.NaN,
        riskRatio: Number.NaN,
        rrCiLow: Number.NaN,
        rrCiHigh: Number.NaN,
        rrCiLowFamily: Number.NaN,
        effectiveEvents: p * nEff,
      };
    });
}

/** Fewest (effective) events in a stratum for it to be named a top driver (stats' threshold 5). */
export const minDriverEvents = 5;

/**
 * The top drivers of an outcome: strata with at least 5 events whose risk ratio stays above 1
 * at the family (Bonferroni) level over all strata, so picking the largest of many ratios does
 * not promote noise; largest ratio first.
 */
export function topDrivers(result: DriversResult, outcome: DriverOutcome, count = 5): DriverRow[] {
  return result.rows
    .filter(
      (r) =>
        r.outcome === outcome &&
        r.driver !== 'shutdown_cause' &&
        r.effectiveEvents >= minDriverEvents &&
        r.rrCiLowFamily > 1,
    )
    .sort((a, b) => b.riskRatio - a.riskRatio || b.shareOfEvents - a.shareOfEvents)
    .slice(0, count);
}
