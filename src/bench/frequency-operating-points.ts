/**
 * Seeded operating points for the frequency benchmark, built from the case alone (a stand-in
 * for the sampler, so the engine's benchmark does not depend on it): each scenario draws from
 * its own stream seedrandom.alea(`${seed}/${id}`). The spreads are invented for benchmarking,
 * not a model of any real island.
 */
import seedrandom from 'seedrandom';
import type { Case } from '../case/schema.js';
import { Scenario } from '../sample/scenario.js';

export function benchScenario(c: Case, seed: string, id: number, s: Scenario): void {
  const rng = seedrandom.alea(`${seed}/${id}`);
  const u = () => rng();
  s.scenarioId = id;
  let loadKw = 0;
  c.loads.forEach((l, j) => {
    s.loadKw[j] = l.peakKw * (0.45 + 0.55 * u());
    loadKw += s.loadKw[j]!;
  });
  let genKw = 0;
  c.sources.forEach((src, i) => {
    const available = u() > src.forcedOutageRate ? 1 : 0;
    s.available[i] = available;
    s.running[i] = 0;
    s.failsToStart[i] = 0;
    s.dispatchKw[i] = 0;
    s.availableKw[i] = 0;
    s.socFraction[i] = 0;
    s.trippedAtSeparation[i] = 0;
    s.cessationS[i] = 0;
    s.timeToFailureH[i] = Number.POSITIVE_INFINITY;
    if (!available) return;
    const inverter = src.kind !== 'genset';
    switch (src.kind) {
      case 'genset':
        if (src.operation === 'standby')
          s.failsToStart[i] = u() < src.failToStartProbability ? 1 : 0;
        else {
          s.running[i] = 1;
          s.dispatchKw[i] = src.ratingKw * (0.3 + 0.4 * u());
        }
        s.availableKw[i] = src.ratingKw;
        break;
      case 'battery':
        s.running[i] = 1;
        s.socFraction[i] = 0.3 + 0.65 * u();
        s.dispatchKw[i] = src.ratingKw * (0.6 * u() - 0.3);
        s.availableKw[i] = src.ratingKw;
        break;
      case 'pv':
      case 'wind': {
        s.running[i] = 1;
        const avail = src.ratingKw * u();
        s.availableKw[i] = avail;
        const headroom =
          src.kind === 'pv' && src.operation === 'curtailed' ? src.headroomFraction : 0;
        s.dispatchKw[i] = avail * (1 - headroom);
        break;
      }
      case 'fuelcell':
        s.running[i] = 1;
        s.dispatchKw[i] = src.ratingKw * src.gridConnectedLoadingFraction;
        s.availableKw[i] = src.ratingKw;
        break;
    }
    // Invented ride-through outcomes: 3 % of inverters lost to the dip, 10 % in momentary cessation.
    if (inverter && src.kind !== 'battery') {
      const r = u();
      if (r < 0.03) s.trippedAtSeparation[i] = 1;
      else if (r < 0.13) s.cessationS[i] = 0.2 + 0.8 * u();
    }
    if (s.running[i]) genKw += s.dispatchKw[i]!;
  });
  s.gridImportKw = loadKw - genKw;
}

export function makeBenchScenario(c: Case): Scenario {
  return new Scenario(c.sources.length, c.loads.length);
}
