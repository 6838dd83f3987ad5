/** A small invented microgrid (made-up names and numbers) for the runner's tests. */

import { createHash } from 'node:crypto';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { LoadedCase } from '../../src/case/load.js';
import { type Case, type CaseInput, caseSchema } from '../../src/case/schema.js';

export const inventedCaseInput: CaseInput = {
  name: 'Invented test island',
  invented: true,
  system: { frequencyHz: 60, voltageKv: 0.48, baseKva: 1000 },
  sources: [
    { id: 'g1', bus: 'main', kind: 'genset', ratingKw: 400, inertiaS: 1.2 },
    { id: 'b1', bus: 'main', kind: 'battery', ratingKw: 250, energyKwh: 500 },
  ],
  loads: [
    { id: 'crit', bus: 'main', tier: 'critical', peakKw: 150 },
    { id: 'rest', bus: 'main', tier: 'sheddable', peakKw: 300 },
  ],
  network: { buses: [{ id: 'main' }], pccBus: 'main' },
  protection: { ufls: [{ thresholdHz: 59.3, shareOfLoad: 0.5 }] },
  events: { islandingRatePerYear: 2, outageDurationH: { kind: 'lognormal', mean: 3, sigmaLn: 1 } },
  monteCarlo: { scenarios: 1000, seed: 7 },
};

export function inventedCase(): Case {
  return caseSchema.parse(inventedCaseInput);
}

/** The invented case as if loaded from a file in a fresh temporary folder. */
export function inventedRunInput(): { input: LoadedCase; dir: string } {
  const dir = mkdtempSync(join(tmpdir(), 'holdfast-run-'));
  const path = join(dir, 'invented.json');
  const text = JSON.stringify(inventedCaseInput);
  writeFileSync(path, text);
  const sha256 = createHash('sha256').update(text).digest('hex');
  return { input: { case: inventedCase(), path, dir, sha256, raw: inventedCaseInput }, dir };
}
