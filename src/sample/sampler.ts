/**
 * The scenario sampler: from (case, seed, scenario id) alone, the operating point of the
 * microgrid at a separation event (see docs/sampler.md for the whole design).
 *
 * Draw layout (common random numbers: a design change moves no other draw):
 * - the scenario stream (seed, id, "scenario"): u0 hour, u1 dip retained voltage,
 *   u2 dip duration, u3 outage duration;
 * - one stream per load id (seed, id, "load", load id): u0 forecast error;
 * - one stream per source id (seed, id, "source", source id), always five uniforms whatever the
 *   kind: u0 forced outage, u1 failure to start, u2 time to failure, u3 resource (clearness index
 *   or wind speed), u4 state of charge.
 * Every continuous draw is an inverse-CDF transform of one uniform, so changing a parameter
 * moves that draw monotonically and nothing else.
 */
import type { Battery, Case, Source } from '../case/schema.js';
import {
  fnv1a32,
  StreamRng,
  seedHash,
  streamKey,
  streamPurpose,
} from '../numeric/random-stream.js';
import { CompiledDistribution } from '../stats/distributions.js';
import { normalQuantile } from '../stats/normal.js';
import { hoursPerYear } from './calendar.js';
import { type CsvCache, readCsvProfile } from './csv-profile.js';
import { batteryDispatchKw } from './dispatch.js';
import { csvLoadKw, parametricLoadKw } from './load-model.js';
import { dimensionHash, SamplingPlan } from './plan.js';
import { PvResource } from './pv-output.js';
import type { Scenario } from './scenario.js';
import { WindResource } from './wind-output.js';

/** Uniforms drawn from every source stream, whatever the kind (fixed layout). */
export const sourceSlots = 5;
/** Uniforms drawn from the scenario stream. */
export const scenarioSlots = 4;

/** Beta shape of the default state-of-charge spread above the reserve (no source). */
const defaultSocBeta = { alpha: 2, beta: 2 } as const;
/**
 * Default for charge-to-max batteries: full (at socMax) with this probability, else the beta
 * spread; a battery charging at rated power spends most hours full (screening assumption, no source).
 */
const chargeToMaxFullProbability = 0.9;

/** State of charge at the event from one uniform: a point mass at socMax plus a distribution. */
export class SocModel {
  constructor(
    readonly spread: CompiledDistribution,
    readonly fullProbability: number,
    readonly socMaxFraction: number,
  ) {}

  /** Monotone in u: the spread for u below 1 - fullProbability, socMax above. */
  quantile(u: number): number {
    const q = 1 - this.fullProbability;
    return u >= q ? this.socMaxFraction : this.spread.quantile(u / q);
  }

  /** Time-of-day pattern (24 values) when the case gives one; it replaces the distribution. */
  byHourOfDay: Float64Array | null = null;

  /** State of charge at hour of year h from the slot uniform u. */
  at(h: number, u: number): number {
    return this.byHourOfDay ? this.byHourOfDay[h % 24]! : this.quantile(u);
  }
}

/** Everything precomputed for one case in one worker; reused for every scenario. */
export interface SamplerContext {
  readonly case: Case;
  readonly sourceCount: number;
  readonly loadCount: number;
  readonly plan: SamplingPlan;
  /** FNV-1a hash of each source id and each load id (the stream keys). */
  readonly sourceKeys: Uint32Array;
  readonly loadKeys: Uint32Array;
  /** Expected demand per load and hour, kW. */
  readonly expectedLoadKw: readonly Float64Array[];
  readonly loadForecastSd: Float64Array;
  readonly pv: readonly (PvResource | null)[];
  readonly wind: readonly (WindResource | null)[];
  /** 1 inside a maintenance window, per source and hour (null if the source has none). */
  readonly maintenance: readonly (Uint8Array | null)[];
  /** State-of-charge distribution per source (batteries only). */
  readonly soc: readonly (SocModel | null)[];
  readonly outageDurationH: CompiledDistribution;
  readonly dipRetainedPu: CompiledDistribution;
  readonly dipDurationS: CompiledDistribution;
  /** Yearly peak of the expected total load, kW (peak-shaving thresholds). */
  readonly yearlyPeakLoadKw: number;
  /** Latin hypercube dimension indices (see plan.ts). */
  readonly dims: {
    readonly scenario: Int32Array;
    readonly load: Int32Array;
    readonly resource: Int32Array;
    readonly soc: Int32Array;
  };
  /** Scratch: the reusable generator and the uniforms of the current stream. */
  readonly rng: StreamRng;
  readonly scratch: Float64Array;
}

function socModel(b: Battery): SocModel {
  const m = socDistributionModel(b);
  if (b.socByHourOfDay) m.byHourOfDay = Float64Array.from(b.socByHourOfDay);
  return m;
}

function socDistributionModel(b: Battery): SocModel {
  if (b.socAtEvent)
    return new SocModel(new CompiledDistribution(b.socAtEvent), 0, b.socMaxFraction);
  const lo = Math.max(b.socReserveFraction, b.socMinFraction);
  const hi = b.socMaxFraction;
  const full = b.gridConnectedMode === 'charge-to-max' ? chargeToMaxFullProbability : 0;
  if (!(hi > lo))
    return new SocModel(new CompiledDistribution({ kind: 'fixed', value: hi }), 0, hi);
  return new SocModel(
    new CompiledDistribution({ kind: 'beta', ...defaultSocBeta, min: lo, max: hi }),
    full,
    hi,
  );
}

function maintenanceMask(s: Source): Uint8Array | null {
  if (s.maintenance.length === 0) return null;
  const mask = new Uint8Array(hoursPerYear);
  for (const w of s.maintenance) {
    const hours = Math.min(Math.ceil(w.durationH), hoursPerYear);
    // Windows running past hour 8759 continue at the start of the (same model) year.
    for (let k = 0; k < hours; k++) mask[(w.startHour + k) % hoursPerYear] = 1;
  }
  return mask;
}

/**
 * Prepares a case for sampling: reads its CSV profiles (relative to caseDir) and precomputes the
 * tables. Throws CaseError for unreadable or malformed profiles.
 */
export function compileSampler(c: Case, caseDir: string): SamplerContext {
  const cache: CsvCache = new Map();
  const plan = new SamplingPlan(c);
  const sourceKeys = Uint32Array.from(c.sources, (s) => fnv1a32(s.id));
  const loadKeys = Uint32Array.from(c.loads, (l) => fnv1a32(l.id));

  const expectedLoadKw = c.loads.map((l, i) => {
    if (l.profile.kind === 'csv') {
      const ref = { file: l.profile.file, column: l.profile.column, path: `/loads/${i}/profile` };
      return csvLoadKw(l, readCsvProfile(ref, caseDir, cache));
    }
    return parametricLoadKw(l);
  });
  const loadForecastSd = Float64Array.from(c.loads, (l) =>
    l.profile.kind === 'parametric' ? l.profile.forecastErrorSd : 0,
  );
  let yearlyPeakLoadKw = 0;
  for (let h = 0; h < hoursPerYear; h++) {
    let sum = 0;
    for (const e of expectedLoadKw) sum += e[h]!;
    if (sum > yearlyPeakLoadKw) yearlyPeakLoadKw = sum;
  }

  // the hourly capacity-factor series of a PV or wind source given by CSV, else null
  const resourceCsv = (r: { kind: string; file?: string; column?: string | number }, i: number) =>
    r.kind === 'csv' && r.file !== undefined
      ? readCsvProfile(
          { file: r.file, column: r.column ?? 0, path: `/sources/${i}/resource` },
          caseDir,
          cache,
        )
      : null;
  const pv = c.sources.map((s, i) =>
    s.kind === 'pv' ? new PvResource(s, resourceCsv(s.resource, i)) : null,
  );
  const wind = c.sources.map((s, i) =>
    s.kind === 'wind' ? new WindResource(s, resourceCsv(s.resource, i)) : null,
  );

  const scenarioDims = new Int32Array(scenarioSlots);
  for (let k = 0; k < scenarioSlots; k++) {
    scenarioDims[k] = plan.addDimension(dimensionHash(streamPurpose.scenario, 0, k));
  }
  const loadDims = Int32Array.from(loadKeys, (key) =>
    plan.addDimension(dimensionHash(streamPurpose.load, key, 0)),
  );
  const resourceDims = Int32Array.from(sourceKeys, (key) =>
    plan.addDimension(dimensionHash(streamPurpose.source, key, 3)),
  );
  const socDims = Int32Array.from(sourceKeys, (key) =>
    plan.addDimension(dimensionHash(streamPurpose.source, key, 4)),
  );

  return {
    case: c,
    sourceCount: c.sources.length,
    loadCount: c.loads.length,
    plan,
    sourceKeys,
    loadKeys,
    expectedLoadKw,
    loadForecastSd,
    pv,
    wind,
    maintenance: c.sources.map(maintenanceMask),
    soc: c.sources.map((s) => (s.kind === 'battery' ? socModel(s) : null)),
    outageDurationH: new CompiledDistribution(c.events.outageDurationH),
    dipRetainedPu: new CompiledDistribution(c.events.dipRetainedPu),
    dipDurationS: new CompiledDistribution(c.events.dipDurationS),
    yearlyPeakLoadKw,
    dims: { scenario: scenarioDims, load: loadDims, resource: resourceDims, soc: socDims },
    rng: new StreamRng(1),
    scratch: new Float64Array(Math.max(sourceSlots, scenarioSlots)),
  };
}

function fillStream(ctx: SamplerContext, key: number, count: number): Float64Array {
  const rng = ctx.rng;
  rng.reseed(key);
  const u = ctx.scratch;
  for (let k = 0; k < count; k++) u[k] = rng.uniform();
  return u;
}

/**
 * Fills `out` with scenario `scenarioId` of the run seeded `seed`. Depends only on
 * (case, seed, id); zeroes trippedAtSeparation and cessationS (ride-through sets them).
 */
export function sampleScenario(
  ctx: SamplerContext,
  seed: number | string,
  scenarioId: number,
  out: Scenario,
): void {
  const c = ctx.case;
  const plan = ctx.plan;
  const digest = seedHash(seed);
  out.scenarioId = scenarioId;

  // Scenario-level draws.
  let u = fillStream(ctx, streamKey(digest, scenarioId, streamPurpose.scenario, 0), scenarioSlots);
  const d = ctx.dims.scenario;
  const uHour = plan.stratify(d[0]!, digest, scenarioId, u[0]!);
  const uDip = plan.stratify(d[1]!, digest, scenarioId, u[1]!);
  const uDipDuration = plan.stratify(d[2]!, digest, scenarioId, u[2]!);
  const uOutage = plan.stratify(d[3]!, digest, scenarioId, u[3]!);
  const h = plan.eventHour(scenarioId, uHour);
  out.hourOfYear = h;
  out.weight = plan.weight;
  out.dipRetainedPu = ctx.dipRetainedPu.quantile(uDip);
  out.dipDurationS = ctx.dipDurationS.quantile(uDipDuration);
  out.outageDurationH = ctx.outageDurationH.quantile(uOutage);

  // Loads.
  let loadSumKw = 0;
  for (let i = 0; i < ctx.loadCount; i++) {
    const expected = ctx.expectedLoadKw[i]![h]!;
    const sd = ctx.loadForecastSd[i]!;
    let kw = expected;
    if (sd > 0) {
      u = fillStream(ctx, streamKey(digest, scenarioId, streamPurpose.load, ctx.loadKeys[i]!), 1);
      const z = normalQuantile(plan.stratify(ctx.dims.load[i]!, digest, scenarioId, u[0]!));
      kw = expected * (1 + sd * z);
      if (kw < 0) kw = 0;
    }
    out.loadKw[i] = kw;
    loadSumKw += kw;
  }

  // Sources: availability, resource, state of charge, non-battery dispatch.
  let dispatchSumKw = 0;
  for (let i = 0; i < ctx.sourceCount; i++) {
    const s = c.sources[i]!;
    u = fillStream(
      ctx,
      streamKey(digest, scenarioId, streamPurpose.source, ctx.sourceKeys[i]!),
      sourceSlots,
    );
    const mask = ctx.maintenance[i];
    const available = u[0]! >= s.forcedOutageRate && !(mask && mask[h] === 1);
    out.available[i] = available ? 1 : 0;
    out.failsToStart[i] = 0;
    out.timeToFailureH[i] =
      s.failurePerHour > 0 ? -Math.log(u[2]!) / s.failurePerHour : Number.POSITIVE_INFINITY;
    out.trippedAtSeparation[i] = 0;
    out.cessationS[i] = 0;
    out.socFraction[i] = 0;
    const uResource = plan.stratify(ctx.dims.resource[i]!, digest, scenarioId, u[3]!);
    let availableKw = 0;
    let dispatchKw = 0;
    let running = available;
    switch (s.kind) {
      case 'genset':
        availableKw = s.ratingKw;
        if (s.operation === 'standby') {
          running = false;
          out.failsToStart[i] = available && u[1]! < s.failToStartProbability ? 1 : 0;
        } else {
          dispatchKw = s.gridConnectedLoadingFraction * s.ratingKw;
        }
        break;
      case 'fuelcell':
        availableKw = s.ratingKw;
        dispatchKw = s.gridConnectedLoadingFraction * s.ratingKw;
        break;
      case 'pv':
        availableKw = ctx.pv[i]!.sampleKw(h, uResource);
        dispatchKw =
          s.operation === 'curtailed' ? availableKw * (1 - s.headroomFraction) : availableKw;
        break;
      case 'wind':
        availableKw = ctx.wind[i]!.sampleKw(h, uResource);
        dispatchKw = availableKw;
        break;
      case 'battery': {
        const q = ctx.soc[i]!.at(h, plan.stratify(ctx.dims.soc[i]!, digest, scenarioId, u[4]!));
        const soc = q < s.socMinFraction ? s.socMinFraction : Math.min(q, s.socMaxFraction);
        out.socFraction[i] = soc;
        availableKw = soc > s.socMinFraction ? s.ratingKw : 0;
        break;
      }
    }
    if (!available) {
      availableKw = 0;
      dispatchKw = 0;
    }
    out.running[i] = running ? 1 : 0;
    out.availableKw[i] = availableKw;
    out.dispatchKw[i] = dispatchKw;
    dispatchSumKw += dispatchKw;
  }

  // Batteries last: they respond to the net load left by everything else.
  for (let i = 0; i < ctx.sourceCount; i++) {
    const s = c.sources[i]!;
    if (s.kind !== 'battery' || out.available[i] === 0) continue;
    const kw = batteryDispatchKw(
      s,
      out.socFraction[i]!,
      loadSumKw - dispatchSumKw,
      ctx.yearlyPeakLoadKw,
    );
    out.dispatchKw[i] = kw;
    dispatchSumKw += kw;
  }
  out.gridImportKw = loadSumKw - dispatchSumKw;
}
