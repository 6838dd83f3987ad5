/**
 * The per-scenario outcome behind each summary metric, as the paired comparison needs it: a 0/1
 * indicator for a probability, a value for a mean, and for a yearly metric the map from the
 * per-event figure to the yearly one (REFERENCES.md 9.6, Poisson thinning of the islanding events):
 *   failures_per_year  = lambda * p_failure          (expected failures per year)
 *   p_failure_in_year  = 1 - exp(-lambda * p_failure) (at least one failure in a year)
 *   eue_kwh_per_year   = lambda * E[unserved_kwh]     (expected unserved energy per year)
 * with lambda = events.islandingRatePerYear of the case, treated as known.
 *
 * Indicators read the columns of scenarios.arrow (CONTRACT.md, src/results/columns.ts) exactly
 * as the summary does (src/results/summary.ts): shed_kw > 0, shutdown, frequency_violation,
 * voltage_violation, critical_lost; means of shed_kw, unserved_kwh, unserved_critical_kwh,
 * lol_h. A metric whose inputs are absent from the table gets no paired interval, never a
 * guessed one. The comparison
 * checks each per-design estimate built here against summary.arrow, so a definition that drifts
 * from the summary's is caught (comparison.ts).
 */
import type { ScenarioFrame } from './scenarioFrame.js';

export type OutcomeKind = 'proportion' | 'mean';

/** What the outcome of a scenario depends on besides its row. */
export interface OutcomeContext {
  /** monteCarlo.failureDefinition of the case. */
  failureDefinition: 'shutdown-or-critical-loss' | 'shutdown-only';
}

export interface OutcomeDefinition {
  metric: string;
  kind: OutcomeKind;
  /** Plain words for tables: "shutdown probability". */
  label: string;
  /** The per-scenario value (0/1 for proportions), or undefined when the table lacks its inputs. */
  values(frame: ScenarioFrame, ctx: OutcomeContext): Float64Array | undefined;
  /**
   * Yearly metrics: `per-year` is lambda times the per-event mean, `in-year` is
   * 1 - exp(-lambda p) (src/stats/annualise.ts).
   */
  yearly?: 'per-year' | 'in-year';
}

const indicator =
  (column: string, test: (x: number) => boolean = (x) => x !== 0) =>
  (frame: ScenarioFrame): Float64Array | undefined => {
    const col = frame.numeric(column);
    if (!col) return undefined;
    const out = new Float64Array(frame.n);
    for (let i = 0; i < frame.n; i++) out[i] = test(col[i]!) ? 1 : 0;
    return out;
  };

const value = (column: string) => (frame: ScenarioFrame) => frame.numeric(column);

/**
 * Failure: shutdown, or critical load lost (`critical_lost`) under the definition
 * 'shutdown-or-critical-loss' when the table has that column (as src/results/summary.ts).
 */
function failure(frame: ScenarioFrame, ctx: OutcomeContext): Float64Array | undefined {
  const shutdown = frame.numeric('shutdown');
  if (!shutdown) return undefined;
  const critical =
    ctx.failureDefinition === 'shutdown-or-critical-loss'
      ? frame.numeric('critical_lost')
      : undefined;
  const out = new Float64Array(frame.n);
  for (let i = 0; i < frame.n; i++)
    out[i] = shutdown[i] !== 0 || (critical !== undefined && critical[i] !== 0) ? 1 : 0;
  return out;
}

/** Critical load carried: 1 - critical_lost. */
const criticalCarried = indicator('critical_lost', (x) => x === 0);

/** The summary metrics (src/results/summary.ts rows()) and their per-scenario outcomes. */
export const outcomeDefinitions: readonly OutcomeDefinition[] = [
  {
    metric: 'p_load_shed',
    kind: 'proportion',
    label: 'load-shedding probability',
    values: indicator('shed_kw', (x) => x > 0),
  },
  {
    metric: 'p_shutdown',
    kind: 'proportion',
    label: 'shutdown probability',
    values: indicator('shutdown'),
  },
  {
    metric: 'p_frequency_violation',
    kind: 'proportion',
    label: 'frequency-violation probability',
    values: indicator('frequency_violation'),
  },
  {
    metric: 'p_voltage_violation',
    kind: 'proportion',
    label: 'voltage-violation probability',
    values: indicator('voltage_violation'),
  },
  {
    metric: 'expected_shed_kw',
    kind: 'mean',
    label: 'expected shed load',
    values: value('shed_kw'),
  },
  {
    metric: 'p_failure',
    kind: 'proportion',
    label: 'failure probability per separation',
    values: failure,
  },
  {
    metric: 'failures_per_year',
    kind: 'proportion',
    label: 'failures per year',
    values: failure,
    yearly: 'per-year',
  },
  {
    metric: 'p_failure_in_year',
    kind: 'proportion',
    label: 'probability of a failure in a year',
    values: failure,
    yearly: 'in-year',
  },
  {
    metric: 'p_critical_carried',
    kind: 'proportion',
    label: 'probability the critical load is carried',
    values: criticalCarried,
  },
  {
    metric: 'eue_kwh_per_event',
    kind: 'mean',
    label: 'expected unserved energy per separation',
    values: value('unserved_kwh'),
  },
  {
    metric: 'eue_kwh_per_year',
    kind: 'mean',
    label: 'expected unserved energy per year',
    values: value('unserved_kwh'),
    yearly: 'per-year',
  },
  {
    metric: 'eue_critical_kwh_per_year',
    kind: 'mean',
    label: 'expected unserved critical energy per year',
    values: value('unserved_critical_kwh'),
    yearly: 'per-year',
  },
  {
    metric: 'lole_h_per_year',
    kind: 'mean',
    label: 'expected hours of load not served per year',
    values: value('lol_h'),
    yearly: 'per-year',
  },
];

export function outcomeDefinition(metric: string): OutcomeDefinition | undefined {
  return outcomeDefinitions.find((d) => d.metric === metric);
}

/** Every metric the summary can report (src/results/summary.ts rows()): what --fail-if accepts. */
export const knownSummaryMetrics: readonly string[] = outcomeDefinitions.map((d) => d.metric);
