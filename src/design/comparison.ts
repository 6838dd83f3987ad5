/**
 * The paired comparison of two designs run on the same seed and scenario ids (common random
 * numbers): for every summary metric, base, variant, the difference variant - base and an
 * interval for it that uses the pairing.
 *
 *   probabilities: the paired 2x2 table of per-scenario indicators [[a, b], [c, d]]
 *     (a = both designs have the event, b = variant only, c = base only, d = neither) and
 *     Newcombe's square-and-add interval (Stat Med 17:2635-2650, 1998, method 10;
 *     src/stats/paired.ts); weighted plans scale the weight-sum cells to Kish's effective size;
 *   means: the normal interval of the weighted mean of per-scenario differences
 *     (src/stats/paired.ts pairedMeanDifference);
 *   yearly metrics (REFERENCES.md 9.6), lambda = the islanding rate, taken as known:
 *     lambda p and lambda E[x] map linearly: difference and limits times lambda;
 *     1 - exp(-lambda p) is mapped limit by limit with the base held at its estimate:
 *     [g(p_b + L) - g(p_b), g(p_b + U) - g(p_b)], g monotone (an approximation that ignores
 *     the base's own sampling error in the curvature of g; exact when g is linear);
 *     when the two designs have different islanding rates, the linear yearly metrics use the
 *     paired mean of the per-scenario values lambda_v x_v - lambda_b x_b, and the in-year
 *     probability gets no interval.
 *
 * Only discordant scenarios carry information about a difference, which is why the paired
 * interval is much narrower than one treating the two runs as independent samples.
 *
 * When the two designs are identical (same resolved case, same seed and scenarios), every
 * per-scenario outcome is the same deterministic function of the same draws, so the difference
 * is exactly zero with a zero-width interval; this is stated from the designs, not inferred from
 * the data (no discordant pairs in a sample does not prove a zero difference).
 */
import { RunError } from '../errors.js';
import { probabilityInYear } from '../stats/annualise.js';
import {
  mcnemarTest,
  newcombePairedDifference,
  type PairedTable,
  pairedMeanDifference,
  scaleTableToEffectiveSize,
} from '../stats/paired.js';
import { levelText } from './designText.js';
import { type OutcomeContext, type OutcomeDefinition, outcomeDefinitions } from './outcomes.js';
import { type Pairing, pairScenarios, type ScenarioFrame } from './scenarioFrame.js';

/** One summary row as the comparison reads it (summary.arrow, camel case). */
export interface SummaryLike {
  metric: string;
  estimate: number;
  ciLow: number;
  ciHigh: number;
  unit: string;
}

export interface ComparisonRow {
  metric: string;
  /** Plain words ("shutdown probability"); the metric name when unknown. */
  label: string;
  unit: string;
  kind: 'proportion' | 'mean' | 'other';
  base: number;
  variant: number;
  /** variant - base */
  difference: number;
  diffCiLow: number;
  diffCiHigh: number;
  method: string;
}

export interface CompareInput {
  base: ScenarioFrame;
  variant: ScenarioFrame;
  /** The summary rows of each run: the metrics to compare and the check of the outcomes. */
  baseSummary: readonly SummaryLike[];
  variantSummary: readonly SummaryLike[];
  /** monteCarlo.failureDefinition of each case. */
  baseFailureDefinition: OutcomeContext['failureDefinition'];
  variantFailureDefinition: OutcomeContext['failureDefinition'];
  /** events.islandingRatePerYear of each case. */
  baseRatePerYear: number;
  variantRatePerYear: number;
  confidenceLevel: number;
  /** True when the resolved cases are the same (see the header). */
  identicalDesigns: boolean;
}

export interface ComparisonResult {
  rows: ComparisonRow[];
  nPairs: number;
  /** Notes on metrics compared without a paired interval, for stderr. */
  warnings: string[];
}

/** Per-scenario values of a definition in pairing order (base or variant side). */
function pairedValues(
  def: OutcomeDefinition,
  frame: ScenarioFrame,
  rows: Int32Array,
  ctx: OutcomeContext,
): Float64Array | undefined {
  const values = def.values(frame, ctx);
  if (!values) return undefined;
  const out = new Float64Array(rows.length);
  for (let k = 0; k < rows.length; k++) out[k] = values[rows[k]!]!;
  return out;
}

function weightedMean(x: Float64Array, w: Float64Array): number {
  let sw = 0;
  let swx = 0;
  for (let i = 0; i < x.length; i++) {
    sw += w[i]!;
    swx += w[i]! * x[i]!;
  }
  return swx / sw;
}

function pairedTable(variant: Float64Array, base: Float64Array, w: Float64Array): PairedTable {
  const t: PairedTable = { both: 0, firstOnly: 0, secondOnly: 0, neither: 0 };
  let sw2 = 0;
  let unit = true;
  for (let i = 0; i < variant.length; i++) {
    const wi = w[i]!;
    if (wi !== 1) unit = false;
    sw2 += wi * wi;
    if (variant[i] && base[i]) t.both += wi;
    else if (variant[i]) t.firstOnly += wi;
    else if (base[i]) t.secondOnly += wi;
    else t.neither += wi;
  }
  return unit ? t : scaleTableToEffectiveSize(t, sw2);
}

interface PerEventDifference {
  base: number;
  variant: number;
  estimate: number;
  low: number;
  high: number;
  method: string;
}

function perEventDifference(
  def: OutcomeDefinition,
  v: Float64Array,
  b: Float64Array,
  pairing: Pairing,
  level: number,
): PerEventDifference {
  const w = pairing.weight;
  if (def.kind === 'proportion') {
    const t = pairedTable(v, b, w);
    const d = newcombePairedDifference(t, level);
    const mc = mcnemarTest(t.firstOnly, t.secondOnly);
    const pText = mc.pExact < 1e-4 ? mc.pExact.toExponential(1) : mc.pExact.toPrecision(2);
    return {
      base: d.second,
      variant: d.first,
      estimate: d.estimate,
      low: d.low,
      high: d.high,
      method: `Newcombe square-and-add paired interval (1998, method 10), ${levelText(level)}; discordant scenarios ${fmtCount(t.firstOnly)} variant only, ${fmtCount(t.secondOnly)} base only; McNemar exact P = ${pText}`,
    };
  }
  const m = pairedMeanDifference(v, b, level, w);
  return {
    base: weightedMean(b, w),
    variant: weightedMean(v, w),
    estimate: m.estimate,
    low: m.low,
    high: m.high,
    method: `paired normal interval on per-scenario differences, ${levelText(level)}`,
  };
}

const fmtCount = (x: number) => (Number.isInteger(x) ? String(x) : x.toFixed(1));

function compareMetric(
  def: OutcomeDefinition,
  input: CompareInput,
  pairing: Pairing,
): ComparisonRow | undefined {
  const v = pairedValues(def, input.variant, pairing.variantRow, {
    failureDefinition: input.variantFailureDefinition,
  });
  const b = pairedValues(def, input.base, pairing.baseRow, {
    failureDefinition: input.baseFailureDefinition,
  });
  if (!v || !b) return undefined;
  const level = input.confidenceLevel;
  const head = { metric: def.metric, label: def.label, unit: '', kind: def.kind };
  const lambdaB = input.baseRatePerYear;
  const lambdaV = input.variantRatePerYear;
  if (input.identicalDesigns) {
    const perEvent = weightedMean(b, pairing.weight);
    const value =
      def.yearly === 'per-year'
        ? lambdaB * perEvent
        : def.yearly === 'in-year'
          ? probabilityInYear(lambdaB, perEvent)
          : perEvent;
    return {
      ...head,
      base: value,
      variant: value,
      difference: 0,
      diffCiLow: 0,
      diffCiHigh: 0,
      method: 'identical designs on the same scenarios: the difference is exactly zero',
    };
  }
  if (def.yearly && lambdaB !== lambdaV) {
    if (def.yearly === 'in-year') {
      const pb = weightedMean(b, pairing.weight);
      const pv = weightedMean(v, pairing.weight);
      const base = probabilityInYear(lambdaB, pb);
      const variant = probabilityInYear(lambdaV, pv);
      return {
        ...head,
        base,
        variant,
        difference: variant - base,
        diffCiLow: Number.NaN,
        diffCiHigh: Number.NaN,
        method:
          'islanding rates differ between the designs: no paired interval for this yearly probability',
      };
    }
    const sv = v.map((x) => lambdaV * x);
    const sb = b.map((x) => lambdaB * x);
    const m = pairedMeanDifference(sv, sb, level, pairing.weight);
    return {
      ...head,
      base: weightedMean(sb, pairing.weight),
      variant: weightedMean(sv, pairing.weight),
      difference: m.estimate,
      diffCiLow: m.low,
      diffCiHigh: m.high,
      method: `paired normal interval on per-scenario differences of lambda x (islanding rates ${lambdaB} and ${lambdaV} per year), ${levelText(level)}`,
    };
  }
  const d = perEventDifference(def, v, b, pairing, level);
  if (def.yearly === 'per-year') {
    return {
      ...head,
      base: lambdaB * d.base,
      variant: lambdaB * d.variant,
      difference: lambdaB * d.estimate,
      diffCiLow: lambdaB * d.low,
      diffCiHigh: lambdaB * d.high,
      method: `${d.method}; times the islanding rate ${lambdaB} per year`,
    };
  }
  if (def.yearly === 'in-year') {
    const g = (p: number) => probabilityInYear(lambdaB, Math.min(1, Math.max(0, p)));
    const base = g(d.base);
    return {
      ...head,
      base,
      variant: g(d.variant),
      difference: g(d.variant) - base,
      diffCiLow: g(d.base + d.low) - base,
      diffCiHigh: g(d.base + d.high) - base,
      method: `${d.method}; mapped through 1 - exp(-${lambdaB} p) with the base at its estimate`,
    };
  }
  return {
    ...head,
    base: d.base,
    variant: d.variant,
    difference: d.estimate,
    diffCiLow: d.low,
    diffCiHigh: d.high,
    method: d.method,
  };
}

/** Relative agreement of a recomputed estimate with the summary's (floating sums in other orders). */
const agrees = (a: number, b: number) =>
  (Number.isNaN(a) && Number.isNaN(b)) || Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(b));

/**
 * Compares two runs metric by metric, in the order of the base summary. A summary metric with no
 * per-scenario outcome here, or whose recomputed estimate does not reproduce the summary, is
 * reported with its difference of estimates and no interval (and a warning), never a made-up one.
 */
export function compareDesigns(input: CompareInput): ComparisonResult {
  const pairing = pairScenarios(input.base, input.variant);
  if (pairing.n === 0) throw new RunError('no scenarios to compare');
  const rows: ComparisonRow[] = [];
  const warnings: string[] = [];
  const variantByMetric = new Map(input.variantSummary.map((r) => [r.metric, r]));
  for (const sb of input.baseSummary) {
    const sv = variantByMetric.get(sb.metric);
    if (!sv) {
      warnings.push(`${sb.metric}: only in the base summary, not compared`);
      continue;
    }
    const def = outcomeDefinitions.find((d) => d.metric === sb.metric);
    const row = def ? compareMetric(def, input, pairing) : undefined;
    if (row && agrees(row.base, sb.estimate) && agrees(row.variant, sv.estimate)) {
      rows.push({ ...row, unit: sb.unit });
      continue;
    }
    const reason = !def
      ? 'no per-scenario outcome is defined for it'
      : !row
        ? 'the scenario table lacks its per-scenario column'
        : `its per-scenario outcome gives ${row.base} and ${row.variant}, the summaries ${sb.estimate} and ${sv.estimate}`;
    warnings.push(`${sb.metric}: no paired interval (${reason})`);
    rows.push({
      metric: sb.metric,
      label: def?.label ?? sb.metric.replaceAll('_', ' '),
      unit: sb.unit,
      kind: def?.kind ?? 'other',
      base: sb.estimate,
      variant: sv.estimate,
      difference: sv.estimate - sb.estimate,
      diffCiLow: Number.NaN,
      diffCiHigh: Number.NaN,
      method: `difference of the summary estimates; no paired interval: ${reason}`,
    });
  }
  return { rows, nPairs: pairing.n, warnings };
}
