import { describe, expect, it } from 'vitest';
import type { Case } from '../../src/case/schema.js';
import { monthOfHour, monthStartHour } from '../../src/sample/calendar.js';
import { conditionsAtHour } from '../../src/sample/conditions.js';
import { compileSampler, sampleScenario } from '../../src/sample/sampler.js';
import { Scenario } from '../../src/sample/scenario.js';
import { inventedCase } from './fixture.js';

const contexts = new Map<Case, ReturnType<typeof compileSampler>>();
/** One scenario, from a context compiled once per case object (compiling costs ~30 ms). */
function draw(c: Case, seed: number | string, id: number): Scenario {
  let ctx = contexts.get(c);
  if (!ctx) {
    ctx = compileSampler(c, '.');
    contexts.set(c, ctx);
  }
  const s = new Scenario(c.sources.length, c.loads.length);
  sampleScenario(ctx, seed, id, s);
  return s;
}

/** Everything the sampler writes, as plain numbers (NaN-free, Infinity kept). */
function snapshot(s: Scenario): Record<string, unknown> {
  return {
    scenarioId: s.scenarioId,
    weight: s.weight,
    hourOfYear: s.hourOfYear,
    loadKw: [...s.loadKw],
    available: [...s.available],
    running: [...s.running],
    failsToStart: [...s.failsToStart],
    availableKw: [...s.availableKw],
    dispatchKw: [...s.dispatchKw],
    socFraction: [...s.socFraction],
    timeToFailureH: [...s.timeToFailureH],
    gridImportKw: s.gridImportKw,
    dipRetainedPu: s.dipRetainedPu,
    dipDurationS: s.dipDurationS,
    outageDurationH: s.outageDurationH,
  };
}

/**
 * Wilson score interval (REFERENCES 9.1; Newcombe, Stat Med 17:857, 1998) at z, for the
 * binomial checks of availability.
 */
function wilson(x: number, n: number, z: number): [number, number] {
  const p = x / n;
  const q = 1 - p;
  const root = z * Math.sqrt(z * z + 4 * n * p * q);
  return [
    (2 * n * p + z * z - root) / (2 * (n + z * z)),
    (2 * n * p + z * z + root) / (2 * (n + z * z)),
  ];
}
// z for a two-sided 99.9 % interval: fixed seeds, so a correct sampler passes deterministically.
const z999 = 3.2905;

describe('scenario sampler: reproducibility', () => {
  it('gives the same scenario for the same (seed, id) whatever was drawn before', () => {
    const c = inventedCase();
    const alone = snapshot(draw(c, 7, 123));
    const ctx = compileSampler(c, '.');
    const s = new Scenario(c.sources.length, c.loads.length);
    for (let id = 500; id >= 0; id--) {
      sampleScenario(ctx, id % 2 === 1 ? 7 : 'other seed', id, s);
      if (id === 123) expect(snapshot(s)).toEqual(alone);
    }
    expect(snapshot(draw(c, 8, 123))).not.toEqual(alone);
  });

  it('zeroes the ride-through fields and fills every other field', () => {
    const c = inventedCase();
    const ctx = compileSampler(c, '.');
    const s = new Scenario(c.sources.length, c.loads.length);
    s.trippedAtSeparation.fill(1);
    s.cessationS.fill(9);
    sampleScenario(ctx, 1, 3, s);
    expect([...s.trippedAtSeparation]).toEqual([0, 0, 0, 0, 0, 0]);
    expect([...s.cessationS]).toEqual([0, 0, 0, 0, 0, 0]);
    expect(s.scenarioId).toBe(3);
  });

  it('keeps common random numbers: a design change moves no other draw', () => {
    const base = inventedCase();
    const bigger = inventedCase((c) => {
      const b = c.sources[2]!;
      if (b.kind === 'battery') b.energyKwh = 4000;
    });
    // One more genset, inserted first, and a different rating on the PV.
    const more = inventedCase((c) => {
      c.sources.unshift({ id: 'g0', kind: 'genset', bus: 'main', ratingKw: 300, inertiaS: 1 });
      const pv = c.sources[4]!;
      if (pv.kind === 'pv') pv.ratingKw = 900;
    });
    for (let id = 0; id < 300; id++) {
      const a = draw(base, 11, id);
      const b = draw(bigger, 11, id);
      expect(snapshot(b)).toEqual(snapshot(a));
      const m = draw(more, 11, id);
      expect(m.hourOfYear).toBe(a.hourOfYear);
      expect([...m.loadKw]).toEqual([...a.loadKw]);
      expect(m.outageDurationH).toBe(a.outageDurationH);
      expect(m.dipRetainedPu).toBe(a.dipRetainedPu);
      // Source k of the base is source k + 1 of the variant; all but the PV (rating changed).
      for (const k of [0, 1, 2, 4, 5]) {
        expect(m.available[k + 1]).toBe(a.available[k]);
        expect(m.failsToStart[k + 1]).toBe(a.failsToStart[k]);
        expect(m.timeToFailureH[k + 1]).toBe(a.timeToFailureH[k]);
        expect(m.socFraction[k + 1]).toBe(a.socFraction[k]);
        if (k !== 2) expect(m.availableKw[k + 1]).toBe(a.availableKw[k]);
      }
      // PV output scales with its rating when the model is not clipping (0.9 x 600 < 600).
      if (a.availableKw[3]! < 500) expect(m.availableKw[4]).toBeCloseTo(a.availableKw[3]! * 1.5, 6);
    }
  });
});

describe('scenario sampler: physics and dispatch invariants', () => {
  it('balances grid import against load and dispatch, and keeps outputs in range', () => {
    const c = inventedCase();
    const ctx = compileSampler(c, '.');
    const s = new Scenario(c.sources.length, c.loads.length);
    for (let id = 0; id < 3000; id++) {
      sampleScenario(ctx, 5, id, s);
      const load = s.loadKw.reduce((x, y) => x + y, 0);
      const dispatch = s.dispatchKw.reduce((x, y) => x + y, 0);
      expect(s.gridImportKw).toBeCloseTo(load - dispatch, 9);
      expect(s.hourOfYear).toBeGreaterThanOrEqual(0);
      expect(s.hourOfYear).toBeLessThan(8760);
      expect(s.weight).toBe(1);
      for (let i = 0; i < c.sources.length; i++) {
        const src = c.sources[i]!;
        if (s.available[i] === 0) {
          expect(s.availableKw[i]).toBe(0);
          expect(s.dispatchKw[i]).toBe(0);
        }
        expect(s.availableKw[i]).toBeLessThanOrEqual(src.ratingKw);
        if (src.kind === 'battery') {
          expect(s.socFraction[i]).toBeGreaterThanOrEqual(src.socMinFraction);
          expect(s.socFraction[i]).toBeLessThanOrEqual(src.socMaxFraction);
          expect(Math.abs(s.dispatchKw[i]!)).toBeLessThanOrEqual(src.ratingKw);
        }
        if (src.kind === 'pv') expect(s.dispatchKw[i]).toBeCloseTo(0.9 * s.availableKw[i]!, 9);
        if (src.kind === 'genset' && src.operation === 'standby') {
          expect(s.running[i]).toBe(0);
          expect(s.dispatchKw[i]).toBe(0);
        }
        if (src.kind === 'genset' && src.operation === 'running' && s.available[i] === 1) {
          expect(s.dispatchKw[i]).toBe(400);
        }
      }
      // Self-consumption: the battery cancels the net load when its rating allows.
      const net = load - (dispatch - s.dispatchKw[2]!);
      if (
        s.available[2] === 1 &&
        Math.abs(net) < 500 &&
        s.socFraction[2]! > 0.3 &&
        s.socFraction[2]! < 0.95
      ) {
        expect(Math.abs(s.gridImportKw)).toBeLessThan(1e-9);
      }
    }
  });

  it('charge-to-max batteries are full 90 % of the time by default and charge at rating otherwise', () => {
    const c = inventedCase((x) => {
      const b = x.sources[2]!;
      if (b.kind === 'battery') b.gridConnectedMode = 'charge-to-max';
    });
    const ctx = compileSampler(c, '.');
    const s = new Scenario(c.sources.length, c.loads.length);
    const n = 20_000;
    let full = 0;
    let seen = 0;
    for (let id = 0; id < n; id++) {
      sampleScenario(ctx, 6, id, s);
      if (s.available[2] === 0) continue;
      seen++;
      if (s.socFraction[2] === 0.95) {
        full++;
        expect(s.dispatchKw[2]).toBe(0);
      } else {
        expect(s.dispatchKw[2]).toBe(-500);
        expect(s.socFraction[2]).toBeGreaterThanOrEqual(0.3);
      }
    }
    const [lo, hi] = wilson(full, seen, z999);
    expect(0.9).toBeGreaterThanOrEqual(lo);
    expect(0.9).toBeLessThanOrEqual(hi);
  });

  it('follows a time-of-day state-of-charge pattern when the case gives one', () => {
    const pattern = Array.from({ length: 24 }, (_, k) => 0.4 + 0.02 * k);
    const c = inventedCase((x) => {
      const b = x.sources[2]!;
      if (b.kind === 'battery') b.socByHourOfDay = pattern;
    });
    const ctx = compileSampler(c, '.');
    const s = new Scenario(c.sources.length, c.loads.length);
    for (let id = 0; id < 500; id++) {
      sampleScenario(ctx, 8, id, s);
      // 0.4 + 0.02 k stays inside [socMin 0.1, socMax 0.95] for k <= 23, so no clipping.
      expect(s.socFraction[2]).toBe(pattern[s.hourOfYear % 24]);
    }
  });

  it('takes a source out in its maintenance window, wrapping past the year end', () => {
    const c = inventedCase((x) => {
      x.events.monthlyRateWeights = [1, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 1];
    });
    const ctx = compileSampler(c, '.');
    const s = new Scenario(c.sources.length, c.loads.length);
    let inside = 0;
    for (let id = 0; id < 4000; id++) {
      sampleScenario(ctx, 2, id, s);
      const h = s.hourOfYear;
      // Window: 8700 for 100 h, i.e. 8700..8759 and 0..39.
      if (h >= 8700 || h < 40) {
        inside++;
        expect(s.available[1]).toBe(0);
      }
    }
    expect(inside).toBeGreaterThan(20);
  });

  it('draws the outage duration with the lognormal mean of the case', () => {
    const c = inventedCase();
    const ctx = compileSampler(c, '.');
    const s = new Scenario(c.sources.length, c.loads.length);
    const n = 40_000;
    let sum = 0;
    for (let id = 0; id < n; id++) {
      sampleScenario(ctx, 3, id, s);
      sum += s.outageDurationH;
    }
    // Var = m^2 (e^(s^2) - 1) = 16 * 2.35; SE of the mean = 0.031 h; 5 SE tolerance.
    expect(Math.abs(sum / n - 4)).toBeLessThan(5 * Math.sqrt((16 * Math.expm1(1.21)) / n));
  });

  it('places events in months in proportion to the monthly rate weights times days', () => {
    const c = inventedCase();
    const ctx = compileSampler(c, '.');
    const s = new Scenario(c.sources.length, c.loads.length);
    const n = 40_000;
    const counts = new Array(12).fill(0);
    for (let id = 0; id < n; id++) {
      sampleScenario(ctx, 4, id, s);
      counts[monthOfHour(s.hourOfYear)]++;
    }
    const w = [1, 1, 1, 1, 1, 2, 3, 4, 4, 2, 1, 1];
    const days = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];
    const total = w.reduce((a, x, m) => a + x * days[m]!, 0);
    for (let m = 0; m < 12; m++) {
      const [lo, hi] = wilson(counts[m], n, z999);
      const p = (w[m]! * days[m]!) / total;
      expect(p).toBeGreaterThanOrEqual(lo);
      expect(p).toBeLessThanOrEqual(hi);
    }
  });
});

describe('scenario sampler: availability (IEEE 762 FOR, REFERENCES 5.3)', () => {
  it('takes a source out with its forced outage rate, within the 99.9 % Wilson interval', () => {
    const c = inventedCase();
    const ctx = compileSampler(c, '.');
    const s = new Scenario(c.sources.length, c.loads.length);
    const n = 40_000;
    let out = 0;
    let failures = 0;
    let ttfSum = 0;
    for (let id = 0; id < n; id++) {
      sampleScenario(ctx, 'availability', id, s);
      if (s.available[0] === 0) out++;
      ttfSum += s.timeToFailureH[1]!;
      if (s.timeToFailureH[0] !== Number.POSITIVE_INFINITY) failures++;
    }
    const [lo, hi] = wilson(out, n, z999);
    expect(0.05).toBeGreaterThanOrEqual(lo);
    expect(0.05).toBeLessThanOrEqual(hi);
    // g1 has no running failure rate: never fails. g2: exponential, mean 1/0.01 = 100 h, SE 100/sqrt(n).
    expect(failures).toBe(0);
    expect(Math.abs(ttfSum / n - 100)).toBeLessThan(5 * (100 / Math.sqrt(n)));
  });

  it('two standby units with failure-to-start 0.01 both fail about 1e-4 of the time', () => {
    // King & Knight, Uninterruptible Power Supplies and Standby Power Systems, p. 100 (REFERENCES 5.3):
    // both start 0.9801, exactly one fails 0.0198, both fail 0.0001.
    const c = inventedCase((x) => {
      x.sources = [
        {
          id: 'sa',
          kind: 'genset',
          bus: 'main',
          ratingKw: 500,
          inertiaS: 1,
          operation: 'standby',
          failToStartProbability: 0.01,
          forcedOutageRate: 0,
        },
        {
          id: 'sb',
          kind: 'genset',
          bus: 'main',
          ratingKw: 500,
          inertiaS: 1,
          operation: 'standby',
          failToStartProbability: 0.01,
          forcedOutageRate: 0,
        },
      ];
    });
    const ctx = compileSampler(c, '.');
    const s = new Scenario(c.sources.length, c.loads.length);
    const n = 300_000;
    let both = 0;
    let one = 0;
    for (let id = 0; id < n; id++) {
      sampleScenario(ctx, 99, id, s);
      const k = s.failsToStart[0]! + s.failsToStart[1]!;
      if (k === 2) both++;
      else if (k === 1) one++;
    }
    const [lo2, hi2] = wilson(both, n, z999);
    expect(1e-4).toBeGreaterThanOrEqual(lo2);
    expect(1e-4).toBeLessThanOrEqual(hi2);
    const [lo1, hi1] = wilson(one, n, z999);
    expect(0.0198).toBeGreaterThanOrEqual(lo1);
    expect(0.0198).toBeLessThanOrEqual(hi1);
  });
});

describe('scenario sampler: plans and weights', () => {
  it('stratified-month: each block of 12 ids covers every month once, weights = 12 p_m', () => {
    const c = inventedCase((x) => {
      x.monteCarlo = { plan: 'stratified-month' };
    });
    const ctx = compileSampler(c, '.');
    const s = new Scenario(c.sources.length, c.loads.length);
    for (let block = 0; block < 5; block++) {
      let weightSum = 0;
      const months = new Set<number>();
      for (let k = 0; k < 12; k++) {
        sampleScenario(ctx, 1, block * 12 + k, s);
        months.add(monthOfHour(s.hourOfYear));
        weightSum += s.weight;
        expect(s.weight).toBeCloseTo(
          12 * ctx.plan.monthProbability[monthOfHour(s.hourOfYear)]!,
          14,
        );
      }
      expect(months.size).toBe(12);
      // Weights average 1 over a block: sum_m 12 p_m = 12.
      expect(weightSum).toBeCloseTo(12, 12);
    }
  });

  it('stratified-month-hour: 288 ids per block, one per (month, hour of day)', () => {
    const c = inventedCase((x) => {
      x.monteCarlo = { plan: 'stratified-month-hour' };
    });
    const ctx = compileSampler(c, '.');
    const s = new Scenario(c.sources.length, c.loads.length);
    const seen = new Set<number>();
    let weightSum = 0;
    for (let id = 288; id < 576; id++) {
      sampleScenario(ctx, 1, id, s);
      seen.add(monthOfHour(s.hourOfYear) * 24 + (s.hourOfYear % 24));
      weightSum += s.weight;
      expect(s.hourOfYear).toBeGreaterThanOrEqual(monthStartHour[monthOfHour(s.hourOfYear)]!);
    }
    expect(seen.size).toBe(288);
    expect(weightSum).toBeCloseTo(288, 10);
  });

  it('every plan estimates the exact event-weighted mean load without bias', () => {
    // Exact value: sum_h P(event in hour h) * sum_i expected_i(h); P(h) = p_m / H_m in month m.
    // The forecast error has mean zero (the floor at 0 is ~1e-89 away at sd 0.05), so the mean load
    // at the event equals this sum.
    const base = inventedCase();
    const ctx0 = compileSampler(base, '.');
    let exact = 0;
    for (let h = 0; h < 8760; h++) {
      const m = monthOfHour(h);
      const p = ctx0.plan.monthProbability[m]! / (monthStartHour[m + 1]! - monthStartHour[m]!);
      exact += p * (ctx0.expectedLoadKw[0]![h]! + ctx0.expectedLoadKw[1]![h]!);
    }
    // Whole blocks: 288 * 40 ids for the stratified plans (12 and 288 divide it), 256 * 45 for LHS.
    const n = 288 * 40;
    const plans = [
      'plain',
      'stratified-month',
      'stratified-month-hour',
      'latin-hypercube',
    ] as const;
    for (const plan of plans) {
      const c = inventedCase((x) => {
        x.monteCarlo = { plan };
      });
      const ctx = compileSampler(c, '.');
      const s = new Scenario(c.sources.length, c.loads.length);
      const count = plan === 'latin-hypercube' ? 256 * 45 : n;
      let sw = 0;
      for (let id = 0; id < count; id++) {
        sampleScenario(ctx, 21, id, s);
        sw += s.weight * (s.loadKw[0]! + s.loadKw[1]!);
      }
      // SD of the total load over events ~ 200 kW, so the plain SE is ~2 kW at 11 520 draws
      // (measured over 5 seeds: errors up to 3.5 kW); tolerance 7.5 kW. Month x hour strata remove
      // the daily swing: errors over 5 seeds stayed below 0.2 kW; tolerance 1 kW.
      const tolerance = plan === 'stratified-month-hour' ? 1 : 7.5;
      expect(Math.abs(sw / count - exact)).toBeLessThan(tolerance);
    }
  });

  it('latin-hypercube: every block of 256 ids puts one draw in each of 256 strata per dimension', () => {
    const c = inventedCase((x) => {
      x.monteCarlo = { plan: 'latin-hypercube' };
      x.events.outageDurationH = { kind: 'uniform', min: 0, max: 256 };
      x.events.dipRetainedPu = { kind: 'uniform', min: 0, max: 1 };
    });
    const ctx = compileSampler(c, '.');
    const s = new Scenario(c.sources.length, c.loads.length);
    const cells = new Set<number>();
    const dipCells = new Set<number>();
    for (let id = 512; id < 768; id++) {
      sampleScenario(ctx, 3, id, s);
      expect(s.weight).toBe(1);
      cells.add(Math.floor(s.outageDurationH));
      dipCells.add(Math.floor(s.dipRetainedPu * 256));
    }
    expect(cells.size).toBe(256);
    expect(dipCells.size).toBe(256);
    // Any id is reproducible alone (a fresh context, no block drawn before).
    const ctx2 = compileSampler(c, '.');
    const alone = new Scenario(c.sources.length, c.loads.length);
    sampleScenario(ctx2, 3, 700, alone);
    sampleScenario(ctx, 3, 700, s);
    expect(snapshot(alone)).toEqual(snapshot(s));
  });
});

describe('conditions at later hours of the outage', () => {
  it('gives the expected load and resource, wrapping past hour 8759', () => {
    const c = inventedCase();
    const ctx = compileSampler(c, '.');
    const load = new Float64Array(2);
    const avail = new Float64Array(6);
    const load2 = new Float64Array(2);
    const avail2 = new Float64Array(6);
    conditionsAtHour(ctx, 8760 + 13, load, avail);
    conditionsAtHour(ctx, 13, load2, avail2);
    expect([...load]).toEqual([...load2]);
    expect([...avail]).toEqual([...avail2]);
    expect(load[0]).toBe(ctx.expectedLoadKw[0]![13]);
    // Gensets, battery, fuel cell at their rating; PV zero at 02:00 local time; PV <= rating at noon.
    expect(avail[0]).toBe(800);
    expect(avail[2]).toBe(500);
    expect(avail[5]).toBe(100);
    conditionsAtHour(ctx, 2, load, avail);
    expect(avail[3]).toBe(0);
    conditionsAtHour(ctx, 12 + 24 * 180, load, avail);
    expect(avail[3]).toBeGreaterThan(0);
    expect(avail[3]).toBeLessThanOrEqual(600);
  });
});
