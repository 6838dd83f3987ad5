/**
 * Steady-state voltage and frequency bands the island is checked against, as data with their
 * sources, and their resolution from the case's `limits`.
 *
 * Voltage:
 *  - ANSI C84.1 Range A, service voltage 114-126 V on 120 V (0.95-1.05 pu): confirmed (quoted by
 *    a third party), REFERENCES.md 3.1.
 *  - ANSI C84.1 Range B, service voltage 110-127 V (0.9167-1.0583 pu): from memory (ANSI
 *    C84.1-2016 Table 1), REFERENCES.md 3.1.
 *  - EN 50160, supply not synchronously connected to an interconnected system (island rows):
 *    +10 % / -15 % of Un, 100 % of the time (0.85-1.10 pu): confirmed (quoted by a third party),
 *    REFERENCES.md 3.2 and caution 8 (there is no 95 %-of-week row for islands).
 * Frequency:
 *  - IEEE 1547-2018 Table 18 default trip settings, the slow elements UF1 58.5 Hz / OF1 61.2 Hz
 *    (60 Hz systems): confirmed (quoted by a third party), REFERENCES.md 2.1.
 *  - EN 50160 island rows: 50 Hz +/- 2 % for 95 % of each week (49-51 Hz) and +/- 15 % 100 % of the
 *    time: confirmed (quoted by a third party), REFERENCES.md 3.2. The 95 % row is used as the band.
 * Defaults when `limits.voltageBand` is omitted: Range A for 60 Hz, the EN 50160 island row for
 * 50 Hz; `custom` takes voltageMinPu / voltageMaxPu, which also override any named band.
 */
import type { Case } from '../../case/schema.js';
import { CaseError } from '../../errors.js';

export type VoltageBandName = 'ansi-c84.1-range-a' | 'ansi-c84.1-range-b' | 'en50160-island';

export interface VoltageBand {
  readonly minPu: number;
  readonly maxPu: number;
  readonly source: string;
  readonly provenance: 'confirmed (quoted by a third party)' | 'from memory';
}

export const voltageBands: Readonly<Record<VoltageBandName, VoltageBand>> = {
  'ansi-c84.1-range-a': {
    minPu: 114 / 120,
    maxPu: 126 / 120,
    source: 'ANSI C84.1 Range A service voltage, 114-126 V on 120 V',
    provenance: 'confirmed (quoted by a third party)',
  },
  'ansi-c84.1-range-b': {
    minPu: 110 / 120,
    maxPu: 127 / 120,
    source: 'ANSI C84.1-2016 Table 1 Range B service voltage, 110-127 V on 120 V',
    provenance: 'from memory',
  },
  'en50160-island': {
    minPu: 0.85,
    maxPu: 1.1,
    source: 'EN 50160, not synchronously connected systems: +10 % / -15 % Un, 100 % of time',
    provenance: 'confirmed (quoted by a third party)',
  },
};

export interface FrequencyBand {
  readonly minHz: number;
  readonly maxHz: number;
  readonly source: string;
}

export const frequencyBands: Readonly<Record<'ieee1547-60hz' | 'en50160-island', FrequencyBand>> = {
  'ieee1547-60hz': {
    minHz: 58.5,
    maxHz: 61.2,
    source: 'IEEE 1547-2018 Table 18 default UF1 / OF1 (REFERENCES.md 2.1)',
  },
  'en50160-island': {
    minHz: 49,
    maxHz: 51,
    source: 'EN 50160 island rows, 50 Hz +/- 2 % for 95 % of a week (REFERENCES.md 3.2)',
  },
};

export interface ResolvedLimits {
  readonly voltageMinPu: number;
  readonly voltageMaxPu: number;
  readonly voltageSource: string;
  readonly frequencyMinHz: number;
  readonly frequencyMaxHz: number;
  readonly frequencySource: string;
  readonly dampingRatioMin: number;
  readonly loadingMarginMin: number;
}

export function resolveLimits(c: Case): ResolvedLimits {
  const l = c.limits;
  const named: VoltageBandName | undefined =
    l.voltageBand === 'custom'
      ? undefined
      : (l.voltageBand ?? (c.system.frequencyHz === 60 ? 'ansi-c84.1-range-a' : 'en50160-island'));
  if (named === undefined && (l.voltageMinPu === undefined || l.voltageMaxPu === undefined)) {
    throw CaseError.single(
      '/limits/voltageMinPu',
      'voltageBand "custom" expects both voltageMinPu and voltageMaxPu (pu of nominal)',
    );
  }
  const band = named ? voltageBands[named] : undefined;
  const vMin = l.voltageMinPu ?? band!.minPu;
  const vMax = l.voltageMaxPu ?? band!.maxPu;
  if (!(vMin < vMax))
    throw CaseError.single(
      '/limits/voltageMinPu',
      `expected voltageMinPu below voltageMaxPu, got ${vMin} and ${vMax}`,
    );
  const fBand = frequencyBands[c.system.frequencyHz === 60 ? 'ieee1547-60hz' : 'en50160-island'];
  return {
    voltageMinPu: vMin,
    voltageMaxPu: vMax,
    voltageSource:
      band && l.voltageMinPu === undefined && l.voltageMaxPu === undefined
        ? band.source
        : 'custom limits',
    frequencyMinHz: l.frequencyMinHz ?? fBand.minHz,
    frequencyMaxHz: l.frequencyMaxHz ?? fBand.maxHz,
    frequencySource:
      l.frequencyMinHz === undefined && l.frequencyMaxHz === undefined
        ? fBand.source
        : 'custom limits',
    dampingRatioMin: l.dampingRatioMin,
    loadingMarginMin: l.loadingMarginMin,
  };
}
