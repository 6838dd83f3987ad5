/**
 * The per-scenario outcome behind each summary metric, as the paired comparison needs it: a 0/1
 * indicator for a probability, a value for a mean, and for a yearly metric the map from the
 * per-event figure to the yearly one (REFERENCES.md 9.6, Poisson thinning of the islanding events):
 *   failures_per_year  = lambda * p_failure          (expected failures per year)
 *   p_failure_in_year  = 1 - exp(-lambda * p_failure) (at least one failure in a year)
 *   eue_kwh_per_year   = lambda * E[unserved_kwh]     (expected unserved energy per year)
 * with lambda = events.islandingRatePerYear of the case, treated as known.
 *
 * Indicators read the contract columns of scenarios.arrow (CONTRACT.md). Where a summary metric
 * depends on case limits that the scenario table does not carry, the indicator column written by
 * the runner is used (`frequency_violation`, `failure`); a metric whose inputs are absent from the
 * table is left out of the comparison (listed in `missingOutcomes`), never guessed. The comparison
 * checks each per-design estimate built here against summary.arrow, so a definition that drifts
 * from the summary's is caught (comparison.ts).
 */
import type { ScenarioFrame } from './scenarioFrame.js';

export type OutcomeKind = 'proportion' | 'mean';

export interface OutcomeDefinition {
  metric: string;
  kind: OutcomeKind;
  /** Unit of the metric (of the yearly figure for yearly metrics). */
  unit: string;
  /** Plain words for tables: "shutdown probability". */
  label: string;
  /** The per-scenario value (0/1 for proportions), or undefined when the table lacks its inputs. */
  values(frame: ScenarioFrame): Float64Array | undefined;
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

/** Failure: the runner's `failure` column (the case's failureDefinition), else shutdown alone. */
const failure = (frame: ScenarioFrame): Float64Array | undefined =>
  frame.has('failure') ? indicator('failure')(frame) : indicator('shutdown')(frame);

/** Load shed: any shed power (shed_kw > 0), or any stage operated when shed_kw is absent. */
const loadShed = (frame: ScenarioFrame): Float64Array | undefined =>
  frame.has('shed_kw')
    ? indicator('shed_kw', (x) => x > 0)(frame)
    : indicator('shed_stages')(frame);

/** The summary metrics (CONTRACT.md summary.arrow, required metrics) and their outcomes. */
export const outcomeDefinitions: readonly OutcomeDefinition[] = [
  {
    metric: 'p_load_shed',
    kind: 'proportion',
    unit: '1',
    label: 'load-shedding probability',
    values: loadShed,
  },
  {
    metric: 'p_shutdown',
    kind: 'proportion',
    unit: '1',
    label: 'shutdown probability',
    values: indicator('shutdown'),
  },
  {
    metric: 'p_frequency_violation',
    kind: 'proportion',
    unit: '1',
    label: 'frequency-violation probability',
    values: indicator('frequency_violation'),
  },
  {
    metric: 'p_voltage_violation',
    kind: 'proportion',
    unit: '1',
    label: 'voltage-violation probability',
    values: indicator('voltage_violation'),
  },
  {
    metric: 'p_failure',
    kind: 'proportion',
    unit: '1',
    label: 'failure probability per event',
    values: failure,
  },
  {
    metric: 'expected_shed_kw',
    kind: 'mean',
    unit: 'kW',
    label: 'expected shed load',
    values: value('shed_kw'),
  },
  {
    metric: 'failures_per_year',
    kind: 'proportion',
    unit: '1/yr',
    label: 'failures per year',
    values: failure,
    yearly: 'per-year',
  },
  {
    metric: 'p_failure_in_year',
    kind: 'proportion',
    unit: '1',
    label: 'probability of a failure in a year',
    values: failure,
    yearly: 'in-year',
  },
  {
    metric: 'eue_kwh_per_year',
    kind: 'mean',
    unit: 'kWh/yr',
    label: 'expected unserved energy per year',
    values: value('unserved_kwh'),
    yearly: 'per-year',
  },
];

export function outcomeDefinition(metric: string): OutcomeDefinition | undefined {
  return outcomeDefinitions.find((d) => d.metric === metric);
}

/** The metrics whose per-scenario inputs the frame lacks. */
export function missingOutcomes(frame: ScenarioFrame): string[] {
  return outcomeDefinitions.filter((d) => d.values(frame) === undefined).map((d) => d.metric);
}
