/**
 * An invented 50-source island for the frequency benchmark (no real place): 12 gensets, 8
 * batteries (4 grid-forming), 15 PV plants, 10 wind turbines and 5 fuel cells, 20 loads.
 * The grid-following batteries' response time is `followingLagS`: 0.2 s by default, inside the
 * 0.1-0.5 s of grid-following primary frequency response (REFERENCES.md 6, from memory); the
 * benchmark also runs the schema's 50 ms default, which is the stiffest mode of the island.
 */
import { type Case, caseSchema } from '../case/schema.js';

export function fiftySourceCase(followingLagS = 0.2): Case {
  const sources: unknown[] = [];
  const b = 'main';
  for (let k = 0; k < 12; k++)
    sources.push({
      id: `g${k}`,
      kind: 'genset',
      bus: b,
      ratingKw: 800 + 100 * (k % 4),
      inertiaS: 1 + 0.1 * (k % 3),
      droopPu: 0.05,
      governor:
        k % 3 === 2
          ? { order: 2, naturalFrequencyRadPerS: 4, dampingRatio: 0.5 }
          : { order: 1, timeConstantS: 0.4 + 0.05 * (k % 3) },
      rampKwPerS: 200,
      operation: k >= 10 ? 'standby' : 'running',
      trips: {
        underFrequencyHz: 57.5,
        underFrequencyDelayS: 2,
        overFrequencyHz: 62.5,
        overFrequencyDelayS: 2,
      },
    });
  for (let k = 0; k < 8; k++)
    sources.push({
      id: `bess${k}`,
      kind: 'battery',
      bus: b,
      ratingKw: 1000,
      energyKwh: 2000,
      control: k < 4 ? 'grid-forming' : 'grid-following',
      droopPu: 0.02,
      virtualInertiaS: k < 4 ? 2 : 1,
      responseTimeConstantS: k < 4 ? 0.05 : followingLagS,
    });
  for (let k = 0; k < 15; k++)
    sources.push({
      id: `pv${k}`,
      kind: 'pv',
      bus: b,
      ratingKw: 600,
      operation: k % 5 === 0 ? 'curtailed' : 'mppt',
      headroomFraction: k % 5 === 0 ? 0.1 : 0,
      resource: { kind: 'parametric', latitudeDeg: 20 },
    });
  for (let k = 0; k < 10; k++)
    sources.push({
      id: `w${k}`,
      kind: 'wind',
      bus: b,
      ratingKw: 700,
      syntheticInertia:
        k % 2 === 0
          ? { rocofGainPuPerHzPerS: 0.08, droopGainPuPerHz: 0.1, capFraction: 0.1, deadbandHz: 0.1 }
          : undefined,
      resource: { kind: 'parametric', weibullScaleMPerSByMonth: Array(12).fill(7) },
    });
  for (let k = 0; k < 5; k++)
    sources.push({ id: `fc${k}`, kind: 'fuelcell', bus: b, ratingKw: 400, rampKwPerS: 40 });
  const tiers = ['critical', 'essential', 'sheddable', 'essential'] as const;
  const loads = Array.from({ length: 20 }, (_, j) => ({
    id: `l${j}`,
    bus: b,
    tier: tiers[j % 4],
    peakKw: 900 + 50 * (j % 5),
    frequencySensitivityPu: 1 + (j % 2),
  }));
  return caseSchema.parse({
    name: 'invented 50-source benchmark island',
    invented: true,
    system: { frequencyHz: 60, voltageKv: 13.8, baseKva: 20000 },
    sources,
    loads,
    network: { buses: [{ id: b }], pccBus: b },
    protection: {
      ufls: [
        { thresholdHz: 59.3, shareOfLoad: 0.15 },
        { thresholdHz: 59.0, shareOfLoad: 0.15 },
        { thresholdHz: 58.7, shareOfLoad: 0.2 },
      ],
      shutdownDelayS: 0.5,
    },
    events: { islandingRatePerYear: 2, outageDurationH: { kind: 'fixed', value: 4 } },
  });
}
