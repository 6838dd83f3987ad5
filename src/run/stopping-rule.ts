/**
 * The stopping rule of `--until-rel-error X`: a pilot run, then a fixed-count main run.
 *
 * 1. Pilot. The same case on scenario ids 0, 1, ... but with the seed `${seed}/pilot`, so its
 *    random streams (keyed by (seed, id), src/numeric/random-stream.ts) share nothing with the
 *    main run's. It grows in doubling stages (first, 2 first, 4 first, ... whole feed blocks, up to
 *    the cap) until it has seen at least `pilotMinEvents` headline events, reached the cap, or
 *    its upper bound already plans the cap (`pilotHasEnough`). Its rows are summarised and
 *    dropped, never written.
 * 2. Planned size. The half-width of a proportion interval at n scenarios is about
 *    h = z sqrt(p (1 - p) / n); asking h <= X p gives
 *      N = z^2 (1 - p) / (X^2 p),
 *    evaluated at p = p_L, the pilot's lower confidence bound on p (the interval the summary
 *    reports, at the case's confidence level: Wilson, or Clopper-Pearson below 5 events). N falls
 *    as p grows, so the lower bound errs towards a larger run: the target is missed only when
 *    the pilot overestimated p beyond its own interval (probability about (1 - level) / 2) or the
 *    main sample is itself unlucky. N is rounded up to whole feed blocks and capped at
 *    `--scenarios`; with zero pilot events, N is the cap.
 * 3. Main run. An ordinary fixed-count run of N scenarios with the user's seed, never extended.
 *
 * Why the estimate is unbiased: N is a function of the pilot alone, and the pilot's streams are
 * independent of the main sample's. Conditional on N = n, the main estimate is that of a
 * fixed-count run of n, unbiased for every n, so it is unbiased overall (E[p^] = E[E[p^ | N]] = p).
 * This is the two-stage design of C. Stein, "A two-sample test for a linear hypothesis whose
 * power is independent of the variance", Annals of Mathematical Statistics 16:243-258, 1945
 * (a first sample fixes the size of the second); there the second-stage estimate pools both
 * stages, here the pilot is dropped so that the main estimate stays exactly unbiased
 * (citation from memory). The relative-precision sample size N = z^2 (1 - p) / (X^2 p) is the
 * usual normal-approximation sizing of a Bernoulli Monte Carlo estimate, for example
 * R. Y. Rubinstein and D. P. Kroese, Simulation and the Monte Carlo Method, 3rd ed., Wiley 2017,
 * sec. 4.2 (from memory).
 *
 * Notation: X = `relError` (target), z = `twoSidedZ(confidenceLevel)`, p_L = `lowerBound`,
 * N = `plannedScenarioCount`.
 */
import type { ColumnBatch } from '../results/columns.js';
import { twoSidedZ } from '../stats/normal.js';
import { doublingCounts } from './plan.js';
import type { BatchTask } from './worker.js';

/** The pilot stops growing once it has seen this many events: common practice, no source. */
export const pilotMinEvents = 10;

/** First pilot stage (rounded up to whole feed blocks). */
export const pilotFirstScenarios = 1000;

/** The pilot's seed: a string no user seed maps to the same streams as (streams hash the text). */
export function pilotSeed(seed: number | string): string {
  return `${seed}/pilot`;
}

/** What the pilot found about the headline metric. */
export interface PilotOutcome {
  seed: string;
  /** Pilot scenarios run (ids 0 to scenarios - 1). */
  scenarios: number;
  /** Scenarios in which the headline event happened (unweighted count). */
  events: number;
  /** The pilot's estimate of the headline probability (weighted as the summary weighs it). */
  estimate: number;
  /** Lower end of the pilot's interval for it, at the case's confidence level. */
  lowerBound: number;
  /** Upper end of that interval (it may end the pilot early: `pilotHasEnough`). */
  upperBound: number;
}

/** The stopping rule's record in run.json (`untilRelError`). */
export interface StoppingRecord {
  design: 'pilot-then-fixed';
  /** X: the wanted half-width as a fraction of the estimate. */
  target: number;
  headlineMetric: string;
  /** Null while the pilot has not finished (an interrupt during it: resume reruns it). */
  pilot: PilotOutcome | null;
  /** N, the main run's fixed size (null with the pilot). */
  plannedScenarios: number | null;
  /** Whether N was cut to `--scenarios` (zero pilot events, or a rarer event than the cap allows). */
  capped: boolean | null;
  /** The main run's headline half-width at the end (null while partial). */
  achievedHalfWidth: number | null;
  /** achievedHalfWidth <= target x estimate (null while partial). */
  targetMet: boolean | null;
}

/** The pilot's stage sizes: doubling from `first` (whole feed blocks) up to the cap. */
export function pilotStages(first: number, cap: number, block: number): number[] {
  return doublingCounts(first, cap, block);
}

/**
 * Whether the pilot may stop: `pilotMinEvents` seen, the cap reached, or the cap certain
 * enough: even the pilot's upper bound p_U plans at least the cap (N(p_U) >= cap), so N(p_L)
 * is the cap now and more pilot would move it below the cap only if p_L rose past p_U. The
 * last clause keeps a rare-event pilot from costing nearly the cap itself. Any pilot rule keeps
 * the main estimate unbiased, since it sees only pilot streams.
 */
export function pilotHasEnough(
  pilot: Pick<PilotOutcome, 'events' | 'scenarios' | 'upperBound'>,
  rule: { relError: number; confidenceLevel: number; cap: number },
): boolean {
  if (pilot.events >= pilotMinEvents || pilot.scenarios >= rule.cap) return true;
  const z = twoSidedZ(rule.confidenceLevel);
  return pilot.upperBound > 0 && requiredScenarios(pilot.upperBound, rule.relError, z) >= rule.cap;
}

/** N = z^2 (1 - p) / (X^2 p): scenarios for a half-width of X p at probability p (not rounded). */
export function requiredScenarios(p: number, relError: number, z: number): number {
  return (z * z * (1 - p)) / (relError * relError * p);
}

/** The main run's size from the pilot: whole feed blocks, at least one, at most the cap. */
export function plannedScenarioCount(
  pilot: Pick<PilotOutcome, 'events' | 'lowerBound'>,
  rule: { relError: number; confidenceLevel: number; cap: number; block: number },
): number {
  if (pilot.events === 0 || !(pilot.lowerBound > 0)) return rule.cap;
  const n = requiredScenarios(pilot.lowerBound, rule.relError, twoSidedZ(rule.confidenceLevel));
  if (!(n < rule.cap)) return rule.cap; // also catches an infinite N
  return Math.min(rule.cap, Math.max(rule.block, Math.ceil(n / rule.block) * rule.block));
}

/** Whether the achieved half-width meets the target (a zero estimate never does). */
export function targetMet(estimate: number, halfWidth: number, relError: number): boolean {
  return estimate > 0 && halfWidth <= relError * estimate;
}

/** The line the CLI prints under the headline risks. */
export function stoppingRuleSentence(r: StoppingRecord): string {
  const pct = `${Math.round(r.target * 1000) / 10} %`;
  if (r.pilot === null || r.plannedScenarios === null)
    return `Stopping rule (--until-rel-error ${r.target}): interrupted during the pilot; --resume reruns it.`;
  const pilot = `a pilot of ${r.pilot.scenarios} scenarios saw ${r.pilot.events} events`;
  const plan = `${pilot} and fixed the run at ${r.plannedScenarios} scenarios${r.capped ? ' (the --scenarios cap)' : ''}`;
  if (r.targetMet === null) return `Stopping rule: ${plan}; the run is not complete yet.`;
  return r.targetMet
    ? `Stopping rule: ${plan}; the ${r.headlineMetric} interval is within ${pct} of its estimate, as asked.`
    : `Stopping rule: ${plan}; the ${r.headlineMetric} interval is NOT within ${pct} of its estimate (the run is not extended past its planned size: raise --scenarios or rerun with another seed).`;
}

/** The headline event of a batch row: the summary's failure definition, or shutdown alone. */
export function countHeadlineEvents(
  b: ColumnBatch,
  headlineMetric: string,
  failureDefinition: string,
): number {
  const shutdown = b.columns['shutdown'];
  if (!shutdown) return 0;
  const critical =
    headlineMetric === 'p_failure' && failureDefinition === 'shutdown-or-critical-loss'
      ? b.columns['critical_lost']
      : undefined;
  let events = 0;
  for (let i = 0; i < b.count; i++)
    if (shutdown[i]! !== 0 || (critical !== undefined && critical[i]! !== 0)) events++;
  return events;
}

/** What the pilot needs from the runner: a batch runner on the pilot seed and a summary sink. */
export interface PilotDriver {
  runBatch(task: BatchTask): Promise<ColumnBatch>;
  /** Feeds a batch (in id order) to the pilot's own summary. */
  feed(b: ColumnBatch): void;
  /** The pilot summary's headline estimate and interval. */
  headline(): { estimate: number; lowerBound: number; upperBound: number };
  countEvents(b: ColumnBatch): number;
  cap: number;
  relError: number;
  confidenceLevel: number;
  block: number;
  first: number;
  batchSize: number;
  /** Batches dispatched and not yet fed, at most (bounds memory as in the main run). */
  window: number;
  seed: string;
  signal?: AbortSignal;
}

/**
 * Runs the pilot stage by stage, feeding batches in id order; null when aborted (nothing of it
 * is kept). Throws what a batch throws (the caller reports it as a failed run).
 */
export async function runPilot(d: PilotDriver): Promise<PilotOutcome | null> {
  let done = 0;
  let events = 0;
  for (const stage of pilotStages(d.first, d.cap, d.block)) {
    const queue: Promise<ColumnBatch>[] = [];
    let next = done;
    let failed = false;
    const mark = (p: Promise<ColumnBatch>) => {
      // a rejection waiting in the queue is not unhandled: it is awaited (and thrown) in order
      p.catch(() => {
        failed = true;
      });
      return p;
    };
    while (done < stage) {
      while (!failed && queue.length < d.window && next < stage && !d.signal?.aborted) {
        const count = Math.min(d.batchSize, stage - next);
        queue.push(mark(d.runBatch({ firstId: next, count })));
        next += count;
      }
      const head = queue.shift();
      if (!head) return null; // aborted with nothing in flight
      const b = await head;
      d.feed(b);
      events += d.countEvents(b);
      done += b.count;
    }
    if (d.signal?.aborted) {
      await Promise.allSettled(queue);
      return null;
    }
    if (pilotHasEnough({ events, scenarios: done, ...d.headline() }, d)) break;
  }
  return { seed: d.seed, scenarios: done, events, ...d.headline() };
}
