/**
 * The outcome of one simulated separation event: a preallocated struct of typed arrays that the
 * engine overwrites scenario after scenario (no allocation per scenario). Per-source arrays follow
 * `case.sources`, per-load arrays `case.loads`. These are screening estimates of the island's
 * dynamic response, not protection settings or an interconnection study.
 */

export type EventStatus = 'ok' | 'shutdown' | 'failed';

export class EventResult {
  status: EventStatus = 'ok';
  /** Why the run failed or shut down; '' when ok. */
  message = '';
  /** Power imbalance at t = 0+: load minus output of the sources still online, kW. */
  deficitKw = 0;
  nadirHz = 0;
  nadirTimeS = 0;
  zenithHz = 0;
  zenithTimeS = 0;
  /** Largest |f(t) - f(t - W)| / W over the run, W = the RoCoF window, Hz/s. */
  rocofMaxHzPerS = 0;
  /** Frequency at the horizon (or at shutdown), Hz. */
  fSettledHz = 0;
  /** Simulated time reached, s (the horizon unless the island shut down or the run failed). */
  endTimeS = 0;
  shedKw = 0;
  shedStages = 0;
  /** Time the first UFLS stage opened its breaker, s; Infinity if none. */
  firstShedTimeS = Number.POSITIVE_INFINITY;
  /** Shed kW by tier: critical, essential, sheddable. */
  readonly shedKwByTier = new Float64Array(3);
  /** Per load, the fraction still served after shedding (1 = all served). */
  readonly loadServedFraction: Float64Array;
  shutdown = false;
  /** '' when none: 'under-frequency', 'over-frequency', 'no grid-forming source', 'battery exhausted', 'grid-forming overload'. */
  shutdownCause = '';
  /** Per source: lost during the event (protection or the voltage dip). */
  readonly tripped: Uint8Array;
  /** Per source: online at the end (including started standby units). */
  readonly runningAtEnd: Uint8Array;
  /** Per source: output at the end, kW. */
  readonly outputKwAtEnd: Float64Array;
  /** Per source (batteries): state of charge at the end, fraction. */
  readonly socAtEnd: Float64Array;
  /** Per source: energy delivered during the event, kWh (negative when absorbed). */
  readonly energyDeliveredKwh: Float64Array;
  unitsTripped = 0;
  /** Accepted integrator steps and right-hand-side evaluations (cost counters). */
  steps = 0;
  rhsEvaluations = 0;
  /** Steps rejected by the error test (retried smaller). */
  rejectedSteps = 0;

  constructor(
    readonly sourceCount: number,
    readonly loadCount: number,
  ) {
    this.loadServedFraction = new Float64Array(loadCount);
    this.tripped = new Uint8Array(sourceCount);
    this.runningAtEnd = new Uint8Array(sourceCount);
    this.outputKwAtEnd = new Float64Array(sourceCount);
    this.socAtEnd = new Float64Array(sourceCount);
    this.energyDeliveredKwh = new Float64Array(sourceCount);
  }

  /** Clears every field before a new event. */
  reset(): void {
    this.status = 'ok';
    this.message = '';
    this.deficitKw = 0;
    this.nadirHz = 0;
    this.nadirTimeS = 0;
    this.zenithHz = 0;
    this.zenithTimeS = 0;
    this.rocofMaxHzPerS = 0;
    this.fSettledHz = 0;
    this.endTimeS = 0;
    this.shedKw = 0;
    this.shedStages = 0;
    this.firstShedTimeS = Number.POSITIVE_INFINITY;
    this.shedKwByTier.fill(0);
    this.loadServedFraction.fill(1);
    this.shutdown = false;
    this.shutdownCause = '';
    this.tripped.fill(0);
    this.runningAtEnd.fill(0);
    this.outputKwAtEnd.fill(0);
    this.socAtEnd.fill(0);
    this.energyDeliveredKwh.fill(0);
    this.unitsTripped = 0;
    this.steps = 0;
    this.rhsEvaluations = 0;
    this.rejectedSteps = 0;
  }
}
