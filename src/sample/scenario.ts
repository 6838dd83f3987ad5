/**
 * One Monte Carlo scenario: a separation event at some hour of the year and the operating point
 * of the microgrid just before it. The sampler fills it from the scenario's own random stream
 * (seed, scenario id); ride-through (src/grid/voltage) marks sources lost to the voltage dip;
 * the frequency engine and the outage energy balance read it and never draw random numbers.
 *
 * It is a reusable struct of typed arrays, preallocated once per worker for a given case and
 * overwritten scenario after scenario (no allocation per scenario). Per-source arrays follow the
 * order of `case.sources`, per-load arrays the order of `case.loads`.
 */

export class Scenario {
  scenarioId = 0;
  /** Sampling weight (1 for plain Monte Carlo); estimators are weighted by it. */
  weight = 1;
  /** Hour of the event, 0..8759 (hour 0 = 1 January 00:00-01:00, local standard time). */
  hourOfYear = 0;

  /** Demand of each load at the event hour, kW. */
  readonly loadKw: Float64Array;

  /** 1 unless the source is on forced outage or in a maintenance window. */
  readonly available: Uint8Array;
  /** 1 if the source is online and synchronised when the grid is lost (standby gensets: 0). */
  readonly running: Uint8Array;
  /** Standby gensets: 1 if this start attempt fails (drawn here so the engine stays deterministic). */
  readonly failsToStart: Uint8Array;
  /**
   * Most the source could deliver at the event hour, kW: PV and wind from their resource,
   * gensets and fuel cells their rating, batteries their power rating (state of charge permitting).
   * 0 when unavailable.
   */
  readonly availableKw: Float64Array;
  /** Output just before separation, kW (battery: positive discharging, negative charging). */
  readonly dispatchKw: Float64Array;
  /** Battery state of charge at separation, fraction 0-1 (0 for other kinds). */
  readonly socFraction: Float64Array;
  /** Hours after separation at which a running source fails (constant hazard); Infinity if never. */
  readonly timeToFailureH: Float64Array;
  /** 1 if the source was lost to the fault's voltage dip (set by ride-through, issue 6). */
  readonly trippedAtSeparation: Uint8Array;
  /** Seconds of momentary cessation after separation before the source returns (0 if none). */
  readonly cessationS: Float64Array;

  /** Power from the utility just before separation, kW: sum(loadKw) - sum(dispatchKw); negative = export. */
  gridImportKw = 0;
  /** Retained voltage at the point of common coupling during the fault, pu. */
  dipRetainedPu = 1;
  /** How long the dip lasted before separation, s. */
  dipDurationS = 0;
  /** How long the grid stays away, h. */
  outageDurationH = 0;

  constructor(
    readonly sourceCount: number,
    readonly loadCount: number,
  ) {
    this.loadKw = new Float64Array(loadCount);
    this.available = new Uint8Array(sourceCount);
    this.running = new Uint8Array(sourceCount);
    this.failsToStart = new Uint8Array(sourceCount);
    this.availableKw = new Float64Array(sourceCount);
    this.dispatchKw = new Float64Array(sourceCount);
    this.socFraction = new Float64Array(sourceCount);
    this.timeToFailureH = new Float64Array(sourceCount);
    this.trippedAtSeparation = new Uint8Array(sourceCount);
    this.cessationS = new Float64Array(sourceCount);
  }
}
