/**
 * What one scenario's outage came to, from separation to the return of the grid: a reusable
 * struct (preallocated per worker, overwritten scenario after scenario, no allocation per
 * scenario except the `worstContingency` text when a contingency happened).
 *
 * Time is counted in hours since separation. The fields map onto the scenario columns
 * `outage_h`, `survived_h`, `unserved_kwh`, `unserved_critical_kwh`, `fuel_used_l`, `min_soc`,
 * `contingencies`, `critical_lost`, `lol_h` (see docs/outage-energy.md).
 */
export class OutageResult {
  /** How long the grid stayed away, h (the sampled outage duration). */
  outageH = 0;
  /** Hours the island kept its critical load: the time of the first loss of critical load, or outageH. */
  survivedH = 0;
  /** Energy served to the loads over the outage, kWh (served + unserved = demand). */
  servedKwh = 0;
  /** Energy demanded but not served over the outage, all tiers, kWh. */
  unservedKwh = 0;
  /** Of which critical load, kWh. */
  unservedCriticalKwh = 0;
  /** Hours with any load unserved (loss-of-load duration), h. */
  lolH = 0;
  /** Diesel burnt by gensets with a fuel curve (Willans line), L. */
  fuelUsedL = 0;
  /** Gas burnt by gas gensets with a fuel curve, m3 (the schema's fuel unit for gas). */
  fuelUsedGasM3 = 0;
  /** Electrical energy delivered by fuel cells, kWh. */
  fuelCellKwh = 0;
  /** Lowest state of charge of any battery over the outage, fraction; NaN without a battery. */
  minSoc = Number.NaN;
  /** Unit failures during the outage that triggered a frequency event. */
  contingencies = 0;
  /** Contingency events the frequency engine reported as failed (diverged); their unit is lost. */
  contingencyEventsFailed = 0;
  /** Critical load went unserved at some time (shutdown included). */
  criticalLost = false;
  /** The island shut down at some time, the first minute included. */
  shutdown = false;
  /** Hours since separation of the first shutdown (0 for one in the first minute); -1 if none. */
  shutdownHour = -1;
  /** Black starts after a shutdown (system.blackStartAllowed). */
  restarts = 0;
  /** The worst contingency: `<source id> at <h> h: <outcome>`; '' when none. */
  worstContingency = '';
  /** Surplus energy neither served nor stored (renewables curtailed, dump of genset minimum load), kWh. */
  curtailedKwh = 0;
  /** Energy lost in battery conversion (charge and discharge), kWh. */
  storageLossKwh = 0;
  /** Largest relative residual of sources = served + charging + curtailment + losses over the steps. */
  energyBalanceError = 0;
  /** Segments integrated (steps split at battery floor/full, tank empty and failure times). */
  segments = 0;

  constructor(
    readonly sourceCount: number,
    readonly loadCount: number,
  ) {}

  /** Back to the values of an outage not yet simulated. */
  reset(): void {
    this.outageH = 0;
    this.survivedH = 0;
    this.servedKwh = 0;
    this.unservedKwh = 0;
    this.unservedCriticalKwh = 0;
    this.lolH = 0;
    this.fuelUsedL = 0;
    this.fuelUsedGasM3 = 0;
    this.fuelCellKwh = 0;
    this.minSoc = Number.NaN;
    this.contingencies = 0;
    this.contingencyEventsFailed = 0;
    this.criticalLost = false;
    this.shutdown = false;
    this.shutdownHour = -1;
    this.restarts = 0;
    this.worstContingency = '';
    this.curtailedKwh = 0;
    this.storageLossKwh = 0;
    this.energyBalanceError = 0;
    this.segments = 0;
  }
}
