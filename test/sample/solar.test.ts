import { describe, expect, it } from 'vitest';
import { caseSchema } from '../../src/case/schema.js';
import { hoursPerYear } from '../../src/sample/calendar.js';
import { haurwitzGhiWm2 } from '../../src/sample/clear-sky.js';
import {
  ClearnessTable,
  hollandsHugetCdf,
  hollandsHugetLambda,
  hollandsHugetMean,
} from '../../src/sample/clearness-index.js';
import { PvResource } from '../../src/sample/pv-output.js';
import {
  cosIncidence,
  cosZenith,
  declinationCooperDeg,
  declinationSpencerDeg,
} from '../../src/sample/solar-position.js';

const deg = Math.PI / 180;

describe('solar position', () => {
  it('gives the declinations of Cooper and Spencer on 13 February (n = 44)', () => {
    // REFERENCES 8.1 (recomputed): Cooper -13.95 deg, Spencer -13.63 deg.
    expect(declinationCooperDeg(44)).toBeCloseTo(-13.95, 2);
    expect(declinationSpencerDeg(44)).toBeCloseTo(-13.63, 2);
    // Solstices: Cooper peaks at 23.45 deg on day 172 (sin argument 90 deg at n = 172.25).
    expect(declinationCooperDeg(172)).toBeGreaterThan(23.44);
  });

  it('reproduces Duffie & Beckman Example 1.6.1: theta = 35.0 deg within 0.2 deg', () => {
    // Duffie & Beckman, Solar Engineering of Thermal Processes, 4th ed., Example 1.6.1
    // (REFERENCES 8.2): phi = 43 deg, 13 Feb, 10:30 solar time (omega = -22.5 deg),
    // tilt 45 deg, surface azimuth 15 deg west of south.
    const theta = Math.acos(cosIncidence(43, declinationCooperDeg(44), -22.5, 45, 15)) / deg;
    expect(Math.abs(theta - 35.0)).toBeLessThan(0.2);
    // With the book's continuous-day declination -13.80 deg the third party gets 35.0 too.
    const theta2 = Math.acos(cosIncidence(43, -13.8, -22.5, 45, 15)) / deg;
    expect(Math.abs(theta2 - 35.0)).toBeLessThan(0.15);
  });

  it('a horizontal surface sees the sun at the zenith angle (D&B eq. 1.6.2 reduces to 1.6.5)', () => {
    for (const w of [-60, -10, 0, 35, 80]) {
      expect(cosIncidence(30, 10, w, 0, 0)).toBeCloseTo(cosZenith(30, 10, w), 14);
    }
  });
});

describe('Haurwitz clear sky', () => {
  it('matches the recomputed values of REFERENCES 8.4', () => {
    expect(haurwitzGhiWm2(1)).toBeCloseTo(1035.09, 1);
    expect(haurwitzGhiWm2(Math.cos(30 * deg))).toBeCloseTo(888.27, 1);
    expect(haurwitzGhiWm2(Math.cos(60 * deg))).toBeCloseTo(487.89, 1);
    expect(haurwitzGhiWm2(-0.1)).toBe(0);
  });
});

describe('Hollands-Huget clearness index', () => {
  it('has the means of REFERENCES 8.5 (k_max = 0.864)', () => {
    // Recomputed closed form in REFERENCES 8.5: lambda = 5 -> 0.51742; 4.5909 -> 0.50; 7.2968 -> 0.60;
    // 0.2848 -> 0.30; lambda -> 0 -> k_max / 3.
    expect(hollandsHugetMean(5)).toBeCloseTo(0.51742, 5);
    expect(hollandsHugetMean(4.5909)).toBeCloseTo(0.5, 4);
    expect(hollandsHugetMean(7.2968)).toBeCloseTo(0.6, 4);
    expect(hollandsHugetMean(0.2848)).toBeCloseTo(0.3, 4);
    expect(hollandsHugetMean(0)).toBeCloseTo(0.864 / 3, 10);
    expect(hollandsHugetLambda(0.5)).toBeCloseTo(4.5909, 3);
  });

  it('has a CDF whose derivative is the published density with C = 0.30915 at lambda = 5', () => {
    // p(k) = C (k_max - k)/k_max e^(lambda k); REFERENCES 8.5 gives C = 0.30915 at lambda = 5.
    const k = 0.4;
    const h = 1e-6;
    const pdf = (hollandsHugetCdf(k + h, 5) - hollandsHugetCdf(k - h, 5)) / (2 * h);
    const c = (25 * 0.864) / (Math.exp(5 * 0.864) - 1 - 5 * 0.864);
    expect(c).toBeCloseTo(0.30915, 4);
    expect(pdf).toBeCloseTo(c * ((0.864 - k) / 0.864) * Math.exp(5 * k), 6);
    // Small lambda uses the series branch: continuity across |lambda k| = 1.
    expect(hollandsHugetCdf(0.5, 1.999)).toBeCloseTo(hollandsHugetCdf(0.5, 2.001), 3);
  });

  it('tabulated quantiles reproduce the mean (midpoint rule over 4000 points)', () => {
    const t = new ClearnessTable(0.55);
    let sum = 0;
    const m = 4000;
    for (let j = 0; j < m; j++) sum += t.quantile((j + 0.5) / m);
    // Linear interpolation over 256 nodes: error O(h^2) ~ 1e-5 in the mean.
    expect(sum / m).toBeCloseTo(0.55, 3);
  });
});

describe('PV output', () => {
  const pv = caseSchema.parse({
    name: 'Invented PV check',
    system: { frequencyHz: 50, voltageKv: 0.4, baseKva: 500 },
    sources: [
      {
        id: 'pv1',
        kind: 'pv',
        bus: 'm',
        ratingKw: 250,
        resource: {
          kind: 'parametric',
          latitudeDeg: 35,
          longitudeDeg: 15,
          timeZoneHours: 1,
          tiltDeg: 30,
        },
      },
    ],
    loads: [{ id: 'l', bus: 'm', tier: 'critical', peakKw: 100 }],
    network: { buses: [{ id: 'm' }], pccBus: 'm' },
    events: { islandingRatePerYear: 1, outageDurationH: { kind: 'fixed', value: 2 } },
  }).sources[0]!;

  it('never exceeds its rating and is zero at night, for every hour and clearness quantile', () => {
    if (pv.kind !== 'pv' || pv.resource.kind !== 'parametric') throw new Error('fixture');
    const r = new PvResource(pv, null);
    let maxKw = 0;
    let nightViolations = 0;
    for (let h = 0; h < hoursPerYear; h++) {
      for (const u of [1e-9, 0.3, 0.9, 1 - 1e-12]) {
        const kw = r.sampleKw(h, u);
        maxKw = Math.max(maxKw, kw);
        // Night: at 35 deg N the sun is down from 22:00 to 03:00 clock time all year (solar time
        // is within 20 minutes of the clock at 15 deg E, UTC+1), so these hours must give zero.
        const clock = h % 24;
        if ((clock <= 2 || clock >= 22) && kw !== 0) nightViolations++;
        if (kw < 0) nightViolations++;
      }
    }
    expect(nightViolations).toBe(0);
    expect(maxKw).toBeLessThanOrEqual(250);
    expect(maxKw).toBeGreaterThan(150);
  });

  it('gives zero output whenever the sun is below the horizon at mid-hour', () => {
    if (pv.kind !== 'pv' || pv.resource.kind !== 'parametric') throw new Error('fixture');
    const r = new PvResource(pv, null);
    let count = 0;
    for (let h = 0; h < hoursPerYear; h++)
      if (r.expectedKw[h]! === 0 && r.sampleKw(h, 0.99) !== 0) count++;
    expect(count).toBe(0);
  });

  it('clips a CSV capacity factor above 1 to the rating', () => {
    if (pv.kind !== 'pv') throw new Error('fixture');
    const cf = new Float64Array(hoursPerYear).fill(1.3);
    const r = new PvResource(pv, cf);
    expect(r.sampleKw(100, 0.5)).toBe(250);
  });
});
