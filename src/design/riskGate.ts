/**
 * The risk gate: `--fail-if METRIC>VALUE` or `--fail-if METRIC<VALUE` (repeatable) turns a
 * screening run into a pass/fail check a script or pipeline can act on (exit 1, CONTRACT.md).
 *
 * The gate is judged on the confidence bound, not the point estimate, so a design only passes
 * when the data show it is on the safe side:
 *   METRIC>VALUE is exceeded when the upper bound ci_high > VALUE (the risk may be above VALUE);
 *   METRIC<VALUE is exceeded when the lower bound ci_low  < VALUE (the metric may be below VALUE).
 * A bound exactly equal to VALUE passes (strict inequality, as written).
 */
import { CaseError, describeFound } from '../errors.js';
import { knownSummaryMetrics } from './outcomes.js';

export type GateDirection = '>' | '<';

export interface RiskGate {
  metric: string;
  threshold: number;
  /** '>' (fail when the upper bound is above) unless given; '<' fails when the lower bound is below. */
  direction?: GateDirection;
}

/** One row of a summary table, as much as a gate needs (summary.arrow's columns, camel case). */
export interface GateRow {
  metric: string;
  estimate: number;
  ciLow: number;
  ciHigh: number;
}

export interface GateVerdict {
  gate: Required<RiskGate>;
  /** The bound the gate looked at: ci_high for '>', ci_low for '<'. */
  bound: number;
  estimate: number;
  exceeded: boolean;
  /** One line in plain words, e.g. `p_shutdown: upper 95 % bound 0.0132 > 0.01: exceeded`. */
  text: string;
}

const METRIC = /^[a-z][a-z0-9_]*$/;
const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * Parses `metric>value` or `metric<value` (spaces allowed around the sign); undefined when
 * malformed. Which metrics exist is checked later, against the summary (`checkGateMetrics`).
 */
export function parseRiskGate(text: string): Required<RiskGate> | undefined {
  const m = /^\s*([^<>]+?)\s*([<>])\s*([^<>]+?)\s*$/.exec(text);
  if (!m) return undefined;
  const metric = m[1] ?? '';
  const value = m[3] ?? '';
  if (!METRIC.test(metric) || !NUMBER.test(value)) return undefined;
  return { metric, threshold: Number(value), direction: m[2] === '<' ? '<' : '>' };
}

/** Parses every `--fail-if` text; one CaseError (exit 2) listing all the malformed ones. */
export function parseRiskGates(texts: readonly string[]): Required<RiskGate>[] {
  const gates: Required<RiskGate>[] = [];
  const bad: string[] = [];
  for (const t of texts) {
    const g = parseRiskGate(t);
    if (g) gates.push(g);
    else bad.push(t);
  }
  if (bad.length > 0)
    throw new CaseError(
      bad.map((t) => ({
        path: '--fail-if',
        message: `expected METRIC>VALUE or METRIC<VALUE, e.g. p_shutdown>0.01, got ${describeFound(t)}`,
      })),
    );
  return gates;
}

/**
 * Checks that every gate names a metric of the summary; CaseError (exit 2) naming the metrics
 * that exist otherwise. Call it before the run, with the metric names the run will produce.
 */
export function checkGateMetrics(gates: readonly RiskGate[], metrics: readonly string[]): void {
  const known = new Set(metrics);
  const problems = gates
    .filter((g) => !known.has(g.metric))
    .map((g) => ({
      path: '--fail-if',
      message: `unknown metric ${describeFound(g.metric)}; expected one of ${metrics.join(', ')}`,
    }));
  if (problems.length > 0) throw new CaseError(problems);
}

/**
 * Judges each gate against the summary rows. A gate naming a metric that is neither in the rows
 * nor among the metrics a summary can report (`known`, default every summary metric) is a
 * CaseError naming them (exit 2). A known metric this run did not report (its model is not part
 * of the build, say) and a NaN bound (no scenarios) count as exceeded: an unmeasured risk does
 * not pass.
 */
export function evaluateRiskGates(
  rows: readonly GateRow[],
  gates: readonly RiskGate[],
  known: readonly string[] = knownSummaryMetrics,
): GateVerdict[] {
  const names = rows.map((r) => r.metric);
  checkGateMetrics(gates, [...names, ...known.filter((m) => !names.includes(m))]);
  const byMetric = new Map(rows.map((r) => [r.metric, r]));
  return gates.map((g) => {
    const gate: Required<RiskGate> = { direction: '>', ...g };
    const row = byMetric.get(gate.metric);
    if (!row)
      return {
        gate,
        bound: Number.NaN,
        estimate: Number.NaN,
        exceeded: true,
        text: `${gate.metric}: not reported by this run (its inputs are not in the scenario table): EXCEEDED`,
      };
    const upper = gate.direction === '>';
    const bound = upper ? row.ciHigh : row.ciLow;
    const exceeded =
      Number.isNaN(bound) || (upper ? bound > gate.threshold : bound < gate.threshold);
    const side = upper ? 'upper' : 'lower';
    const text = `${gate.metric}: ${side} confidence bound ${formatValue(bound)} ${gate.direction} ${formatValue(gate.threshold)}: ${exceeded ? 'EXCEEDED' : 'ok'}`;
    return { gate, bound, estimate: row.estimate, exceeded, text };
  });
}

/** True when any verdict is exceeded (the command then exits 1). */
export function anyGateExceeded(verdicts: readonly GateVerdict[]): boolean {
  return verdicts.some((v) => v.exceeded);
}

function formatValue(x: number): string {
  // 4 significant digits, JavaScript's own notation (0.0001, 1e-7, 0)
  return Number.isFinite(x) ? String(Number(x.toPrecision(4))) : String(x);
}
