/** An invented microgrid used by the sampler tests (all names and numbers are made up). */
import { type CaseInput, caseSchema } from '../../src/case/schema.js';

export const inventedIsland: CaseInput = {
  name: 'Invented test island',
  invented: true,
  system: { frequencyHz: 60, voltageKv: 0.48, baseKva: 2000 },
  sources: [
    { id: 'g1', kind: 'genset', bus: 'main', ratingKw: 800, inertiaS: 1, forcedOutageRate: 0.05 },
    {
      id: 'g2',
      kind: 'genset',
      bus: 'main',
      ratingKw: 800,
      inertiaS: 1,
      operation: 'standby',
      failurePerHour: 0.01,
      maintenance: [{ startHour: 8700, durationH: 100 }],
    },
    {
      id: 'b1',
      kind: 'battery',
      bus: 'main',
      ratingKw: 500,
      energyKwh: 1000,
      gridConnectedMode: 'self-consume',
    },
    {
      id: 'pv1',
      kind: 'pv',
      bus: 'main',
      ratingKw: 600,
      operation: 'curtailed',
      headroomFraction: 0.1,
      resource: { kind: 'parametric', latitudeDeg: 30, longitudeDeg: -60, timeZoneHours: -4 },
    },
    {
      id: 'w1',
      kind: 'wind',
      bus: 'main',
      ratingKw: 400,
      resource: {
        kind: 'parametric',
        weibullScaleMPerSByMonth: [8, 8, 7.5, 7, 6, 5.5, 5, 5, 6, 7, 7.5, 8],
      },
    },
    { id: 'fc1', kind: 'fuelcell', bus: 'main', ratingKw: 100 },
  ],
  loads: [
    { id: 'crit', bus: 'main', tier: 'critical', peakKw: 600 },
    { id: 'shed', bus: 'main', tier: 'sheddable', peakKw: 400 },
  ],
  network: { buses: [{ id: 'main' }], pccBus: 'main' },
  events: {
    islandingRatePerYear: 3,
    monthlyRateWeights: [1, 1, 1, 1, 1, 2, 3, 4, 4, 2, 1, 1],
    outageDurationH: { kind: 'lognormal', mean: 4, sigmaLn: 1.1 },
  },
};

export function inventedCase(patch: (c: CaseInput) => void = () => {}) {
  const input = structuredClone(inventedIsland);
  patch(input);
  return caseSchema.parse(input);
}
