/**
 * The one-screen summary `holdfast check` prints for a valid case: what the island has (sources
 * by kind with ratings), what it must carry (peak load by tier), and the static margins a
 * reviewer looks at first. These are screening figures from nameplate data, not a simulation:
 *
 *   spinning reserve at peak  R = sum(ratingKw of running gensets, fuel cells, batteries) - peak
 *                             (PV and wind are left out: they may be at zero at the peak hour)
 *   battery hours at critical load  t = sum((socReserve - socMin) * energyKwh) / critical peak
 *   system inertia on the base      H_sys = sum(H_i * S_i) / S_base   (REFERENCES 1.1, Kundur
 *                             1994 sec. 3.9, formula from memory; S_i the kVA rating of unit i)
 *   initial RoCoF for a step deficit of 0.1 pu of the base  df/dt = -dP * f0 / (2 H_sys)
 *                             (REFERENCES 1.2, Kundur 1994 ch. 11)
 *   mean outage  E[D] of the duration distribution; Weibull E = c * Gamma(1 + 1/k)
 *
 * "Peak" is the sum of the loads' peakKw (coincident peaks: an upper bound on the yearly peak).
 */
import { defaultShutdownLimitsHz } from '../grid/frequency/protection.js';
import { logGamma } from '../stats/log-gamma.js';
import { type Case, type Distribution, type LoadTier, loadTiers, type Source } from './schema.js';

// kVA = kW / 0.8 when a genset gives no kVA rating: the schema's stated default (common practice)
const defaultPowerFactor = 0.8;

export interface SourceLine {
  id: string;
  kind: Source['kind'];
  ratingKw: number;
  bus: string;
  /** running / standby (gensets), grid-forming / grid-following (batteries), mppt / curtailed (PV). */
  mode: string;
  energyKwh?: number;
}

export interface CaseSummary {
  name: string;
  invented: boolean;
  frequencyHz: number;
  voltageKv: number;
  baseKva: number;
  sources: SourceLine[];
  ratingByKindKw: Partial<Record<Source['kind'], number>>;
  totalRatingKw: number;
  /** Rating of sources that can carry load at will (gensets, batteries, fuel cells). */
  dispatchableRatingKw: number;
  peakByTierKw: Record<LoadTier, number>;
  peakKw: number;
  spinningAtSeparationKw: number;
  spinningReserveAtPeakKw: number;
  /** Reserve at peak once standby gensets have started: dispatchable rating - peak. */
  reserveAfterStandbyStartKw: number;
  batteryEnergyKwh: number;
  batteryReserveEnergyKwh: number;
  batteryHoursAtCriticalLoad: number;
  inertiaSynchronousS: number;
  inertiaEmulatedS: number;
  /** Initial RoCoF for a 0.1 pu step deficit, synchronous inertia only (Infinity when none). */
  rocofTenthPuHzPerS: number;
  /** The same with the emulated inertia of batteries and wind added. */
  rocofTenthPuWithEmulatedHzPerS: number;
  ufls: { thresholdHz: number; delayS: number; shareOfLoad: number; cumulativeShare: number }[];
  shutdownUnderFrequencyHz: number;
  shutdownOverFrequencyHz: number;
  shutdownDelayS: number;
  islandingRatePerYear: number;
  meanOutageH: number;
  outageHoursPerYear: number;
  /** Plain-words hints a reviewer should look at (not errors: the case is valid). */
  notes: string[];
}

// IEEE 1547-2018 Table 21 RoCoF ride-through, Category II: 2.0 Hz/s (REFERENCES 2.5)
const rocofRideThroughCatIIHzPerS = 2;

function notesFor(s: Omit<CaseSummary, 'notes'>): string[] {
  const notes: string[] = [];
  if (s.spinningReserveAtPeakKw < 0)
    notes.push(
      'at peak the units running at separation cannot carry the load: shedding or the battery must bridge until standby units start',
    );
  if (s.reserveAfterStandbyStartKw < 0)
    notes.push('even with every dispatchable source running, the peak load exceeds their rating');
  if (s.batteryEnergyKwh > 0 && s.batteryHoursAtCriticalLoad < 1)
    notes.push('the battery reserve covers less than one hour of the critical peak');
  if (s.rocofTenthPuWithEmulatedHzPerS > rocofRideThroughCatIIHzPerS)
    notes.push(
      `a 0.1 pu deficit exceeds ${rocofRideThroughCatIIHzPerS} Hz/s, the IEEE 1547-2018 Category II RoCoF ride-through: inverter sources may trip`,
    );
  if (s.ufls.length === 0) notes.push('no under-frequency load shedding stages');
  return notes;
}

/** The mean of a distribution (the unit of the key holding it). */
export function distributionMean(d: Distribution): number {
  switch (d.kind) {
    case 'fixed':
      return d.value;
    case 'uniform':
      return (d.min + d.max) / 2;
    case 'normal':
    case 'lognormal':
      return d.mean;
    case 'weibull':
      // E = c * Gamma(1 + 1/k) (any statistics handbook; e.g. Johnson, Kotz & Balakrishnan,
      // Continuous Univariate Distributions vol. 1, 2nd ed., ch. 21)
      return d.scale * Math.exp(logGamma(1 + 1 / d.shape));
    case 'beta':
      return d.min + ((d.max - d.min) * d.alpha) / (d.alpha + d.beta);
    case 'empirical': {
      let total = 0;
      let weighted = 0;
      d.values.forEach((v, i) => {
        const w = d.weights ? (d.weights[i] ?? 0) : 1;
        total += w;
        weighted += w * v;
      });
      return weighted / total;
    }
  }
}

function kva(s: Source): number {
  return s.ratingKva ?? (s.kind === 'genset' ? s.ratingKw / defaultPowerFactor : s.ratingKw);
}

function mode(s: Source): string {
  switch (s.kind) {
    case 'genset':
      return `${s.fuel}, ${s.operation}${s.operation === 'standby' ? ` (start ${s.startDelayS} s)` : ''}`;
    case 'battery':
      return s.control;
    case 'pv':
      return s.operation;
    case 'wind':
      return s.syntheticInertia ? 'synthetic inertia' : 'no frequency support';
    case 'fuelcell':
      return 'running';
  }
}

// a 0.1 pu step: a round screening size for comparing designs (common practice, no source)
const stepDeficitPu = 0.1;

/** Initial RoCoF magnitude df/dt = dP f0 / (2 H) (REFERENCES 1.2); Infinity without inertia. */
export function rocofHzPerS(deficitPu: number, f0Hz: number, inertiaS: number): number {
  return inertiaS > 0 ? (deficitPu * f0Hz) / (2 * inertiaS) : Number.POSITIVE_INFINITY;
}

export function summarizeCase(c: Case): CaseSummary {
  const ratingByKindKw: CaseSummary['ratingByKindKw'] = {};
  let spinning = 0;
  let dispatchable = 0;
  let batteryEnergy = 0;
  let batteryReserve = 0;
  let kineticKws = 0;
  let emulatedKws = 0;
  for (const s of c.sources) {
    ratingByKindKw[s.kind] = (ratingByKindKw[s.kind] ?? 0) + s.ratingKw;
    if (s.kind === 'genset') {
      dispatchable += s.ratingKw;
      if (s.operation === 'running') {
        spinning += s.ratingKw;
        kineticKws += s.inertiaS * kva(s);
      }
    } else if (s.kind === 'battery') {
      dispatchable += s.ratingKw;
      spinning += s.ratingKw;
      batteryEnergy += s.energyKwh;
      batteryReserve += (s.socReserveFraction - s.socMinFraction) * s.energyKwh;
      emulatedKws += s.virtualInertiaS * kva(s);
    } else if (s.kind === 'fuelcell') {
      dispatchable += s.ratingKw;
      spinning += s.ratingKw;
    } else if (s.kind === 'wind' && s.syntheticInertia) {
      // synthetic inertia is a control, not stored energy coupled to the grid: reported apart
      const gain = s.syntheticInertia.rocofGainPuPerHzPerS;
      // derived: P = gain * |df/dt| pu matches the swing term (2 H / f0) * df/dt, so H_eq = gain * f0 / 2
      // (before its power cap)
      emulatedKws += ((gain * c.system.frequencyHz) / 2) * kva(s);
    }
  }
  const peakByTierKw = Object.fromEntries(loadTiers.map((t) => [t, 0])) as Record<LoadTier, number>;
  for (const l of c.loads) peakByTierKw[l.tier] += l.peakKw;
  const peakKw = loadTiers.reduce((a, t) => a + peakByTierKw[t], 0);
  const inertiaSynchronousS = kineticKws / c.system.baseKva;
  const inertiaEmulatedS = emulatedKws / c.system.baseKva;
  const f0 = c.system.frequencyHz;
  const limits = defaultShutdownLimitsHz(f0);
  let cumulative = 0;
  const meanOutageH = distributionMean(c.events.outageDurationH);
  const summary: Omit<CaseSummary, 'notes'> = {
    name: c.name,
    invented: c.invented,
    frequencyHz: f0,
    voltageKv: c.system.voltageKv,
    baseKva: c.system.baseKva,
    sources: c.sources.map((s) => ({
      id: s.id,
      kind: s.kind,
      ratingKw: s.ratingKw,
      bus: s.bus,
      mode: mode(s),
      ...(s.kind === 'battery' ? { energyKwh: s.energyKwh } : {}),
    })),
    ratingByKindKw,
    totalRatingKw: c.sources.reduce((a, s) => a + s.ratingKw, 0),
    dispatchableRatingKw: dispatchable,
    peakByTierKw,
    peakKw,
    spinningAtSeparationKw: spinning,
    spinningReserveAtPeakKw: spinning - peakKw,
    reserveAfterStandbyStartKw: dispatchable - peakKw,
    batteryEnergyKwh: batteryEnergy,
    batteryReserveEnergyKwh: batteryReserve,
    batteryHoursAtCriticalLoad:
      peakByTierKw.critical > 0 ? batteryReserve / peakByTierKw.critical : Number.POSITIVE_INFINITY,
    inertiaSynchronousS,
    inertiaEmulatedS,
    rocofTenthPuHzPerS: rocofHzPerS(stepDeficitPu, f0, inertiaSynchronousS),
    rocofTenthPuWithEmulatedHzPerS: rocofHzPerS(
      stepDeficitPu,
      f0,
      inertiaSynchronousS + inertiaEmulatedS,
    ),
    ufls: c.protection.ufls.map((st) => {
      cumulative += st.shareOfLoad;
      return {
        thresholdHz: st.thresholdHz,
        delayS: st.pickupDelayS + st.breakerTimeS,
        shareOfLoad: st.shareOfLoad,
        cumulativeShare: cumulative,
      };
    }),
    shutdownUnderFrequencyHz: c.protection.shutdownUnderFrequencyHz ?? limits.underHz,
    shutdownOverFrequencyHz: c.protection.shutdownOverFrequencyHz ?? limits.overHz,
    shutdownDelayS: c.protection.shutdownDelayS,
    islandingRatePerYear: c.events.islandingRatePerYear,
    meanOutageH,
    outageHoursPerYear: c.events.islandingRatePerYear * meanOutageH,
  };
  return { ...summary, notes: notesFor(summary) };
}

const kw = (v: number) => `${Math.round(v).toLocaleString('en-US')} kW`;
const pct = (v: number) => `${(100 * v).toFixed(1)} %`;
const num = (v: number, digits: number) => (Number.isFinite(v) ? v.toFixed(digits) : 'unbounded');

/** The summary as text lines for a terminal (about 30 lines). */
export function formatSummary(s: CaseSummary, file: string): string {
  const lines: string[] = [];
  lines.push(`${s.name}${s.invented ? ' (invented demo data)' : ''}  [${file}]`);
  lines.push(`  system      ${s.frequencyHz} Hz, ${s.voltageKv} kV, base ${s.baseKva} kVA`);
  lines.push('  sources');
  for (const src of s.sources) {
    const energy = src.energyKwh !== undefined ? `, ${src.energyKwh} kWh` : '';
    lines.push(
      `    ${src.id.padEnd(14)} ${src.kind.padEnd(9)} ${kw(src.ratingKw).padStart(10)}${energy}  ${src.mode}  @${src.bus}`,
    );
  }
  const kinds = Object.entries(s.ratingByKindKw)
    .map(([k, v]) => `${k} ${kw(v)}`)
    .join(', ');
  lines.push(
    `    total ${kw(s.totalRatingKw)} (${kinds}); dispatchable ${kw(s.dispatchableRatingKw)}`,
  );
  lines.push(
    `  peak load   ${kw(s.peakKw)}: critical ${kw(s.peakByTierKw.critical)}, essential ${kw(s.peakByTierKw.essential)}, sheddable ${kw(s.peakByTierKw.sheddable)} (sum of load peaks)`,
  );
  lines.push(
    `  reserve     spinning at separation ${kw(s.spinningAtSeparationKw)}; at peak ${kw(s.spinningReserveAtPeakKw)} (${pct(s.peakKw > 0 ? s.spinningReserveAtPeakKw / s.peakKw : 0)} of peak); ${kw(s.reserveAfterStandbyStartKw)} once standby units run (PV and wind excluded)`,
  );
  lines.push(
    `  battery     ${s.batteryEnergyKwh} kWh; reserve above minimum ${num(s.batteryReserveEnergyKwh, 0)} kWh = ${num(s.batteryHoursAtCriticalLoad, 2)} h at critical peak`,
  );
  lines.push(
    `  inertia     H = ${num(s.inertiaSynchronousS, 2)} s synchronous + ${num(s.inertiaEmulatedS, 2)} s emulated on ${s.baseKva} kVA`,
  );
  lines.push(
    `              a 0.1 pu deficit gives an initial RoCoF of ${num(s.rocofTenthPuHzPerS, 2)} Hz/s (${num(s.rocofTenthPuWithEmulatedHzPerS, 2)} Hz/s with emulated inertia)`,
  );
  if (s.ufls.length === 0) lines.push('  UFLS        none');
  else {
    lines.push('  UFLS        threshold   delay   share   cumulative');
    for (const st of s.ufls)
      lines.push(
        `              ${st.thresholdHz.toFixed(2).padStart(6)} Hz  ${st.delayS.toFixed(2)} s  ${pct(st.shareOfLoad).padStart(6)}  ${pct(st.cumulativeShare).padStart(7)}`,
      );
  }
  lines.push(
    `  shutdown    below ${s.shutdownUnderFrequencyHz} Hz or above ${s.shutdownOverFrequencyHz} Hz for ${s.shutdownDelayS} s`,
  );
  lines.push(
    `  events      ${s.islandingRatePerYear} islanding events per year, mean outage ${num(s.meanOutageH, 2)} h (${num(s.outageHoursPerYear, 1)} h islanded per year)`,
  );
  for (const note of s.notes) lines.push(`  note        ${note}`);
  lines.push(
    '  Screening figures from nameplate data; protection settings and interconnection are decided under local codes by licensed engineers.',
  );
  return `${lines.join('\n')}\n`;
}
