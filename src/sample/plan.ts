/**
 * Sampling plans: how the event hour is chosen and what weight a scenario carries.
 *
 * Event-rate profile: the islanding rate is constant within a month and proportional to
 * `events.monthlyRateWeights[m]` (1 if omitted), so the event falls in month m with probability
 *   p_m = w_m H_m / sum_j w_j H_j          (H_m = hours in month m)
 * and uniformly on the hours of that month.
 *
 * Plans (all work on fixed blocks of consecutive ids, so any id is reproducible alone and any
 * run of whole blocks, however split into batches or shards, is a valid design):
 * - plain: hour by inversion of the hourly event CDF from one uniform; weight 1.
 * - stratified-month: block of 12 ids, id mod 12 = month; hour uniform in the month;
 *   weight = p_m * 12 (stratum probability x block size), so sum(weight * y) / N is unbiased
 *   over whole blocks.
 * - stratified-month-hour: block of 288 = 12 x 24 ids, stratum (month, hour of day) with
 *   probability p_m / 24; day uniform in the month; weight = 12 p_m.
 * - latin-hypercube: the continuous draws (hour, dip, outage duration, forecast errors, solar and
 *   wind resource, state of charge) are Latin-hypercube stratified over blocks of 256 ids:
 *   u' = (pi(i) + u) / 256 with i = id mod 256 and pi a permutation drawn from
 *   (seed, block, dimension) alone; each u' is still uniform, so the weight is 1.
 * Source: stratified sampling and Latin hypercube as in R. Y. Rubinstein and D. P. Kroese,
 * Simulation and the Monte Carlo Method, 3rd ed., Wiley 2017, sec. 5.5 and 5.7 (from memory);
 * M. D. McKay, R. J. Beckman and W. J. Conover, Technometrics 21:239-245, 1979.
 */
import type { Case } from '../case/schema.js';
import { fmix32, StreamRng, streamKey, streamPurpose } from '../numeric/random-stream.js';
import { hoursPerYear, monthDays, monthStartHour } from './calendar.js';

export type PlanKind = Case['monteCarlo']['plan'];

/** Block sizes of the plans (ids per block); 1 for plain Monte Carlo. */
export const planBlockSize: Readonly<Record<PlanKind, number>> = {
  plain: 1,
  'stratified-month': 12,
  'stratified-month-hour': 288,
  'latin-hypercube': 256,
};

const lhsBlock = 256;

/** Hour selection and weights of one case's plan, plus the Latin hypercube permutation cache. */
export class SamplingPlan {
  readonly kind: PlanKind;
  /** Probability of an event in each month. */
  readonly monthProbability = new Float64Array(12);
  private readonly cumulative = new Float64Array(13);
  // LHS cache: per dimension the (seed digest, block) of the stored permutation.
  private readonly dimHashes: number[] = [];
  private cacheSeed = new Float64Array(0);
  private cacheBlock = new Float64Array(0);
  private perms = new Int32Array(0);
  private readonly rng = new StreamRng(1);
  /** Weight of the last scenario placed by `eventHour`. */
  weight = 1;

  constructor(c: Case) {
    this.kind = c.monteCarlo.plan;
    const w = c.events.monthlyRateWeights;
    let total = 0;
    for (let m = 0; m < 12; m++) total += (w ? w[m]! : 1) * monthDays[m]! * 24;
    if (!(total > 0)) {
      // All-zero weights are refused by the case rules; fall back to uniform rather than NaN.
      for (let m = 0; m < 12; m++) this.monthProbability[m] = (monthDays[m]! * 24) / hoursPerYear;
    } else {
      for (let m = 0; m < 12; m++) {
        this.monthProbability[m] = ((w ? w[m]! : 1) * monthDays[m]! * 24) / total;
      }
    }
    for (let m = 0; m < 12; m++)
      this.cumulative[m + 1] = this.cumulative[m]! + this.monthProbability[m]!;
    this.cumulative[12] = 1;
  }

  /**
   * Registers a Latin hypercube dimension (at compile time) and returns its index.
   * `dimHash` identifies it across designs (purpose, source or load id, slot).
   */
  addDimension(dimHash: number): number {
    this.dimHashes.push(dimHash >>> 0);
    const n = this.dimHashes.length;
    this.cacheSeed = new Float64Array(n).fill(Number.NaN);
    this.cacheBlock = new Float64Array(n).fill(-1);
    this.perms = new Int32Array(n * lhsBlock);
    return n - 1;
  }

  /** Maps the scenario's own uniform u of dimension `dim` through the plan (identity unless LHS). */
  stratify(dim: number, seedDigest: number, scenarioId: number, u: number): number {
    if (this.kind !== 'latin-hypercube') return u;
    const block = Math.floor(scenarioId / lhsBlock);
    const base = dim * lhsBlock;
    if (this.cacheBlock[dim] !== block || this.cacheSeed[dim] !== seedDigest) {
      const p = this.perms;
      for (let i = 0; i < lhsBlock; i++) p[base + i] = i;
      this.rng.reseed(
        streamKey(seedDigest, block, streamPurpose.latinHypercube, this.dimHashes[dim]!),
      );
      // Fisher-Yates shuffle (Durstenfeld 1964; Knuth TAOCP vol. 2, 3rd ed., sec. 3.4.2, Algorithm P).
      for (let i = lhsBlock - 1; i > 0; i--) {
        const j = Math.floor(this.rng.uniform() * (i + 1));
        const t = p[base + i]!;
        p[base + i] = p[base + j]!;
        p[base + j] = t;
      }
      this.cacheBlock[dim] = block;
      this.cacheSeed[dim] = seedDigest;
    }
    return (this.perms[base + (scenarioId % lhsBlock)]! + u) / lhsBlock;
  }

  /** Hour of the event for scenario `scenarioId` from its (possibly stratified) uniform; sets `weight`. */
  eventHour(scenarioId: number, u: number): number {
    switch (this.kind) {
      case 'stratified-month': {
        const m = scenarioId % 12;
        this.weight = this.monthProbability[m]! * 12;
        return Math.min(
          monthStartHour[m]! + Math.floor(u * monthDays[m]! * 24),
          monthStartHour[m + 1]! - 1,
        );
      }
      case 'stratified-month-hour': {
        const s = scenarioId % 288;
        const m = Math.floor(s / 24);
        this.weight = this.monthProbability[m]! * 12;
        const day = Math.min(Math.floor(u * monthDays[m]!), monthDays[m]! - 1);
        return monthStartHour[m]! + 24 * day + (s % 24);
      }
      default: {
        this.weight = 1;
        const c = this.cumulative;
        let m = 0;
        while (m < 11 && u >= c[m + 1]!) m++;
        // Skip months of zero rate (u never lands inside them, but may sit on their boundary).
        while (m < 11 && this.monthProbability[m]! === 0) m++;
        const within = (u - c[m]!) / this.monthProbability[m]!;
        const hours = monthDays[m]! * 24;
        const k = Math.min(Math.max(Math.floor(within * hours), 0), hours - 1);
        return monthStartHour[m]! + k;
      }
    }
  }
}

/** Hash identifying a Latin hypercube dimension by purpose, key and slot. */
export function dimensionHash(purpose: number, keyHash: number, slot: number): number {
  return fmix32((fmix32((keyHash ^ Math.imul(purpose, 0x27d4eb2d)) >>> 0) ^ slot) >>> 0);
}
