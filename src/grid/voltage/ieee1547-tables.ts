/**
 * IEEE Std 1547-2018 voltage trip and voltage ride-through requirements, as data.
 *
 * Source: IEEE Std 1547-2018, "Standard for Interconnection and Interoperability of Distributed
 * Energy Resources with Associated Electric Power Systems Interfaces", clause 6.4:
 *  - default voltage trip settings (clearing times): Table 11 (Category I), Table 12 (Category II),
 *    Table 13 (Category III) -- confirmed (quoted by a third party), REFERENCES.md 2.2;
 *  - voltage ride-through requirements: Table 14 (Category I), Table 15 (Category II),
 *    Table 16 (Category III) -- REFERENCES.md 2.3. The Category II shape is confirmed (quoted by a
 *    third party); its linear 3 s -> 5 s law, all of Category III and all of Category I are
 *    from memory (Category I with low confidence). Each band carries its provenance below.
 *
 * Notation: thresholds in pu of nominal voltage, times in s. A trip setting says the DER shall
 * cease to energize and trip no later than `clearingTimeS` once the voltage stays beyond
 * `thresholdPu`; a ride-through band says it shall not trip for at least `minTimeS` while the
 * voltage is inside [loPu, hiPu). Between the two lies the "may ride through or may trip" zone.
 */

export type RideThroughCategory = 'I' | 'II' | 'III';

export type Provenance = 'confirmed (quoted by a third party)' | 'from memory';

export interface VoltageTripSetting {
  readonly name: 'OV2' | 'OV1' | 'UV1' | 'UV2';
  readonly side: 'over' | 'under';
  /** Default pickup, pu of nominal. */
  readonly thresholdPu: number;
  /** Default clearing time, s. */
  readonly clearingTimeS: number;
  /** Allowed adjustment range of the pickup, pu (equal ends: fixed). */
  readonly rangePu: readonly [number, number];
  /** Allowed adjustment range of the clearing time, s. */
  readonly rangeTimeS: readonly [number, number];
}

export interface VoltageTripTable {
  readonly table: number;
  readonly provenance: Provenance;
  readonly settings: readonly VoltageTripSetting[];
}

/**
 * How the DER behaves inside a ride-through band (IEEE 1547-2018 clause 3.1 terms):
 *  - continuous: normal operation without time limit;
 *  - mandatory: keeps exchanging current for at least minTimeS;
 *  - permissive: may keep exchanging current or cease to energize, must not trip, for minTimeS;
 *  - momentary-cessation: ceases to energize without tripping and restores output afterwards;
 *  - cease-to-energize: no ride-through requirement; the DER stops and the trip settings apply.
 */
export type RideThroughMode =
  | 'continuous'
  | 'mandatory'
  | 'permissive'
  | 'momentary-cessation'
  | 'cease-to-energize';

export interface RideThroughBand {
  /** Lower edge of the band, pu (inclusive). */
  readonly loPu: number;
  /** Upper edge of the band, pu (exclusive). */
  readonly hiPu: number;
  readonly mode: RideThroughMode;
  /** Minimum ride-through time at the band's lower edge, s (Infinity: continuous). */
  readonly minTimeAtLoS: number;
  /** Minimum ride-through time at the band's upper edge, s; equal to minTimeAtLoS unless linear. */
  readonly minTimeAtHiS: number;
  readonly provenance: Provenance;
}

export interface RideThroughTable {
  readonly table: number;
  readonly bands: readonly RideThroughBand[];
}

const OV2_FIXED: VoltageTripSetting = {
  name: 'OV2',
  side: 'over',
  thresholdPu: 1.2,
  clearingTimeS: 0.16,
  rangePu: [1.2, 1.2],
  rangeTimeS: [0.16, 0.16],
};

/** Default voltage trip settings, IEEE 1547-2018 Tables 11-13 (REFERENCES.md 2.2). */
export const voltageTripTables: Readonly<Record<RideThroughCategory, VoltageTripTable>> = {
  I: {
    table: 11,
    provenance: 'confirmed (quoted by a third party)',
    settings: [
      OV2_FIXED,
      {
        name: 'OV1',
        side: 'over',
        thresholdPu: 1.1,
        clearingTimeS: 2,
        rangePu: [1.1, 1.2],
        rangeTimeS: [1, 13],
      },
      {
        name: 'UV1',
        side: 'under',
        thresholdPu: 0.7,
        clearingTimeS: 2,
        rangePu: [0, 0.88],
        rangeTimeS: [2, 21],
      },
      {
        name: 'UV2',
        side: 'under',
        thresholdPu: 0.45,
        clearingTimeS: 0.16,
        rangePu: [0, 0.5],
        rangeTimeS: [0.16, 2],
      },
    ],
  },
  II: {
    table: 12,
    provenance: 'confirmed (quoted by a third party)',
    settings: [
      { ...OV2_FIXED, rangePu: [1.2, 1.2], rangeTimeS: [0.16, 0.16] },
      {
        name: 'OV1',
        side: 'over',
        thresholdPu: 1.1,
        clearingTimeS: 2,
        rangePu: [1.1, 1.2],
        rangeTimeS: [1, 13],
      },
      {
        name: 'UV1',
        side: 'under',
        thresholdPu: 0.7,
        clearingTimeS: 10,
        rangePu: [0, 0.88],
        rangeTimeS: [2, 21],
      },
      {
        name: 'UV2',
        side: 'under',
        thresholdPu: 0.45,
        clearingTimeS: 0.16,
        rangePu: [0, 0.5],
        rangeTimeS: [0.16, 2],
      },
    ],
  },
  III: {
    table: 13,
    provenance: 'confirmed (quoted by a third party)',
    settings: [
      OV2_FIXED,
      {
        name: 'OV1',
        side: 'over',
        thresholdPu: 1.1,
        clearingTimeS: 13,
        rangePu: [1.1, 1.2],
        rangeTimeS: [1, 13],
      },
      {
        name: 'UV1',
        side: 'under',
        thresholdPu: 0.88,
        clearingTimeS: 21,
        rangePu: [0, 0.88],
        rangeTimeS: [21, 50],
      },
      {
        name: 'UV2',
        side: 'under',
        thresholdPu: 0.5,
        clearingTimeS: 2,
        rangePu: [0, 0.5],
        rangeTimeS: [2, 21],
      },
    ],
  },
};

const CONFIRMED: Provenance = 'confirmed (quoted by a third party)';
const MEMORY: Provenance = 'from memory';

/**
 * Voltage ride-through bands, IEEE 1547-2018 Tables 14-16 (REFERENCES.md 2.3), lowest band
 * first, covering 0 pu to +Infinity without gaps (an invariant the tests check).
 */
export const voltageRideThroughTables: Readonly<Record<RideThroughCategory, RideThroughTable>> = {
  I: {
    table: 14,
    bands: [
      // below 0.50 pu: no ride-through requirement recalled (low confidence, from memory)
      {
        loPu: 0,
        hiPu: 0.5,
        mode: 'cease-to-energize',
        minTimeAtLoS: 0,
        minTimeAtHiS: 0,
        provenance: MEMORY,
      },
      {
        loPu: 0.5,
        hiPu: 0.7,
        mode: 'permissive',
        minTimeAtLoS: 0.16,
        minTimeAtHiS: 0.16,
        provenance: MEMORY,
      },
      {
        loPu: 0.7,
        hiPu: 0.88,
        mode: 'mandatory',
        minTimeAtLoS: 0.7,
        minTimeAtHiS: 0.7,
        provenance: MEMORY,
      },
      {
        loPu: 0.88,
        hiPu: 1.1,
        mode: 'continuous',
        minTimeAtLoS: Number.POSITIVE_INFINITY,
        minTimeAtHiS: Number.POSITIVE_INFINITY,
        provenance: MEMORY,
      },
      {
        loPu: 1.1,
        hiPu: 1.2,
        mode: 'permissive',
        minTimeAtLoS: 0.2,
        minTimeAtHiS: 0.2,
        provenance: MEMORY,
      },
      {
        loPu: 1.2,
        hiPu: Number.POSITIVE_INFINITY,
        mode: 'cease-to-energize',
        minTimeAtLoS: 0,
        minTimeAtHiS: 0,
        provenance: MEMORY,
      },
    ],
  },
  II: {
    table: 15,
    bands: [
      {
        loPu: 0,
        hiPu: 0.3,
        mode: 'cease-to-energize',
        minTimeAtLoS: 0,
        minTimeAtHiS: 0,
        provenance: CONFIRMED,
      },
      {
        loPu: 0.3,
        hiPu: 0.45,
        mode: 'permissive',
        minTimeAtLoS: 0.16,
        minTimeAtHiS: 0.16,
        provenance: CONFIRMED,
      },
      {
        loPu: 0.45,
        hiPu: 0.65,
        mode: 'mandatory',
        minTimeAtLoS: 0.32,
        minTimeAtHiS: 0.32,
        provenance: CONFIRMED,
      },
      // T = 3 s + 8.7 s/pu (V - 0.65 pu): end points confirmed, the linear law from memory
      {
        loPu: 0.65,
        hiPu: 0.88,
        mode: 'mandatory',
        minTimeAtLoS: 3,
        minTimeAtHiS: 3 + 8.7 * (0.88 - 0.65),
        provenance: CONFIRMED,
      },
      {
        loPu: 0.88,
        hiPu: 1.1,
        mode: 'continuous',
        minTimeAtLoS: Number.POSITIVE_INFINITY,
        minTimeAtHiS: Number.POSITIVE_INFINITY,
        provenance: CONFIRMED,
      },
      {
        loPu: 1.1,
        hiPu: 1.15,
        mode: 'mandatory',
        minTimeAtLoS: 1,
        minTimeAtHiS: 1,
        provenance: CONFIRMED,
      },
      {
        loPu: 1.15,
        hiPu: 1.175,
        mode: 'mandatory',
        minTimeAtLoS: 0.5,
        minTimeAtHiS: 0.5,
        provenance: CONFIRMED,
      },
      {
        loPu: 1.175,
        hiPu: 1.2,
        mode: 'mandatory',
        minTimeAtLoS: 0.2,
        minTimeAtHiS: 0.2,
        provenance: CONFIRMED,
      },
      {
        loPu: 1.2,
        hiPu: Number.POSITIVE_INFINITY,
        mode: 'cease-to-energize',
        minTimeAtLoS: 0,
        minTimeAtHiS: 0,
        provenance: CONFIRMED,
      },
    ],
  },
  III: {
    table: 16,
    bands: [
      // below 0.50 pu: momentary cessation for at least 1 s (from memory)
      {
        loPu: 0,
        hiPu: 0.5,
        mode: 'momentary-cessation',
        minTimeAtLoS: 1,
        minTimeAtHiS: 1,
        provenance: MEMORY,
      },
      {
        loPu: 0.5,
        hiPu: 0.7,
        mode: 'mandatory',
        minTimeAtLoS: 10,
        minTimeAtHiS: 10,
        provenance: MEMORY,
      },
      {
        loPu: 0.7,
        hiPu: 0.88,
        mode: 'mandatory',
        minTimeAtLoS: 20,
        minTimeAtHiS: 20,
        provenance: MEMORY,
      },
      {
        loPu: 0.88,
        hiPu: 1.1,
        mode: 'continuous',
        minTimeAtLoS: Number.POSITIVE_INFINITY,
        minTimeAtHiS: Number.POSITIVE_INFINITY,
        provenance: MEMORY,
      },
      {
        loPu: 1.1,
        hiPu: 1.2,
        mode: 'momentary-cessation',
        minTimeAtLoS: 12,
        minTimeAtHiS: 12,
        provenance: MEMORY,
      },
      {
        loPu: 1.2,
        hiPu: Number.POSITIVE_INFINITY,
        mode: 'cease-to-energize',
        minTimeAtLoS: 0,
        minTimeAtHiS: 0,
        provenance: MEMORY,
      },
    ],
  },
};

/**
 * Output restoration after momentary cessation, s: IEEE 1547-2018 clause 6.4.2.7 asks the DER to
 * restore output within 0.4 s of the voltage returning to the continuous band (from memory).
 */
export const MOMENTARY_CESSATION_RESTORE_S = 0.4;

/** The band holding `vPu` (bands cover [0, Infinity) without gaps). */
export function rideThroughBandAt(
  table: RideThroughTable,
  vPu: number,
): RideThroughBand | undefined {
  for (const b of table.bands) if (vPu >= b.loPu && vPu < b.hiPu) return b;
  return undefined;
}

/** Minimum ride-through time at `vPu` inside band `b`, s (linear between the band's ends). */
export function minRideThroughTimeS(b: RideThroughBand, vPu: number): number {
  if (b.minTimeAtLoS === b.minTimeAtHiS) return b.minTimeAtLoS;
  const t = (vPu - b.loPu) / (b.hiPu - b.loPu);
  return b.minTimeAtLoS + t * (b.minTimeAtHiS - b.minTimeAtLoS);
}
