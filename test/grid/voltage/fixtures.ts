/** Case fixtures for the voltage tests: the shipped 33-bus feeder and small invented islands. */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import YAML from 'yaml';
import { type Case, type CaseInput, caseSchema } from '../../../src/case/schema.js';

export function baranWuCase(): Case {
  const path = fileURLToPath(new URL('../../../cases/reference/baran-wu-33.yaml', import.meta.url));
  return caseSchema.parse(YAML.parse(readFileSync(path, 'utf8')));
}

export function parseCase(input: CaseInput): Case {
  return caseSchema.parse(input);
}

/**
 * An invented 0.48 kV campus island (made-up place and numbers): a genset and a grid-forming
 * battery at the main bus and a second battery at a remote bus, PV on a feeder, three loads.
 */
export function inventedIslandInput(): CaseInput {
  return {
    name: 'Invented campus island (test fixture)',
    invented: true,
    system: { frequencyHz: 60, voltageKv: 0.48, baseKva: 1000 },
    sources: [
      { id: 'gen1', kind: 'genset', bus: 'main', ratingKw: 600, inertiaS: 1.2 },
      { id: 'bess1', kind: 'battery', bus: 'main', ratingKw: 400, energyKwh: 800 },
      { id: 'bess2', kind: 'battery', bus: 'east', ratingKw: 200, energyKwh: 400 },
      {
        id: 'pv1',
        kind: 'pv',
        bus: 'west',
        ratingKw: 300,
        resource: { kind: 'parametric', latitudeDeg: 35 },
      },
    ],
    loads: [
      { id: 'lab', bus: 'main', tier: 'critical', peakKw: 250 },
      { id: 'dorms', bus: 'east', tier: 'essential', peakKw: 300 },
      { id: 'pool', bus: 'west', tier: 'sheddable', peakKw: 200 },
    ],
    network: {
      pccBus: 'main',
      buses: [{ id: 'main' }, { id: 'east' }, { id: 'west' }],
      branches: [
        { id: 'feeder-e', from: 'main', to: 'east', rOhm: 0.012, xOhm: 0.01, ratingA: 900 },
        { id: 'feeder-w', from: 'main', to: 'west', rOhm: 0.02, xOhm: 0.012, ratingA: 600 },
      ],
    },
    events: { islandingRatePerYear: 2, outageDurationH: { kind: 'fixed', value: 4 } },
  };
}

/** Settled-event stand-in (the fields assessIsland reads from the frequency engine's result). */
export function settled(outputKw: number[], running: number[], served: number[]) {
  return {
    shutdown: false,
    runningAtEnd: Uint8Array.from(running),
    outputKwAtEnd: Float64Array.from(outputKw),
    loadServedFraction: Float64Array.from(served),
  };
}
