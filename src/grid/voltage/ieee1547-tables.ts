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

/** A trip setting; the side follows from the name (OV over, UV under). */
function trip(
  name: VoltageTripSetting['name'],
  thresholdPu: number,
  clearingTimeS: number,
  rangePu: readonly [number, number],
  rangeTimeS: readonly [number, number],
): VoltageTripSetting {
  const side = name.startsWith('OV') ? 'over' : 'under';
  return { name, side, thresholdPu, clearingTimeS, rangePu, rangeTimeS };
}

// Settings that Tables 11 and 12 share (and OV2, fixed in all three tables).
const OV2_FIXED = trip('OV2', 1.2, 0.16, [1.2, 1.2], [0.16, 0.16]);
const OV1_2S = trip('OV1', 1.1, 2, [1.1, 1.2], [1, 13]);
const UV2_016S = trip('UV2', 0.45, 0.16, [0, 0.5], [0.16, 2]);

/** Default voltage trip settings, IEEE 1547-2018 Tables 11-13 (REFERENCES.md 2.2). */
export const voltageTripTables: Readonly<Record<RideThroughCategory, VoltageTripTable>> = {
  I: {
    table: 11,
    provenance: 'confirmed (quoted by a third party)',
    settings: [OV2_FIXED, OV1_2S, trip('UV1', 0.7, 2, [0, 0.88], [2, 21]), UV2_016S],
  },
  II: {
    table: 12,
    provenance: 'confirmed (quoted by a third party)',
    settings: [OV2_FIXED, OV1_2S, trip('UV1', 0.7, 10, [0, 0.88], [2, 21]), UV2_016S],
  },
  III: {
    table: 13,
    provenance: 'confirmed (quoted by a third party)',
    settings: [
      OV2_FIXED,
      trip('OV1', 1.1, 13, [1.1, 1.2], [1, 13]),
      trip('UV1', 0.88, 21, [0, 0.88], [21, 50]),
      trip('UV2', 0.5, 2, [0, 0.5], [2, 21]),
    ],
  },
};

const CONFIRMED: Provenance = 'confirmed (quoted by a third party)';
const MEMORY: Provenance = 'from memory';
const ALWAYS = Number.POSITIVE_INFINITY;

/** A ride-through band; the minimum time is constant unless an upper-edge time is given. */
function band(
  loPu: number,
  hiPu: number,
  mode: RideThroughMode,
  minTimeAtLoS: number,
  provenance: Provenance,
  minTimeAtHiS = minTimeAtLoS,
): RideThroughBand {
  return { loPu, hiPu, mode, minTimeAtLoS, minTimeAtHiS, provenance };
}

/**
 * Voltage ride-through bands, IEEE 1547-2018 Tables 14-16 (REFERENCES.md 2.3), lowest band
 * first, covering 0 pu to +Infinity without gaps (an invariant the tests check). Columns:
 * lower edge pu, upper edge pu, mode, minimum time s, provenance (, time at the upper edge s).
 */
export const voltageRideThroughTables: Readonly<Record<RideThroughCategory, RideThroughTable>> = {
  I: {
    table: 14,
    bands: [
      // below 0.50 pu: no ride-through requirement recalled (low confidence, from memory)
      band(0, 0.5, 'cease-to-energize', 0, MEMORY),
      band(0.5, 0.7, 'permissive', 0.16, MEMORY),
      band(0.7, 0.88, 'mandatory', 0.7, MEMORY),
      band(0.88, 1.1, 'continuous', ALWAYS, MEMORY),
      band(1.1, 1.2, 'permissive', 0.2, MEMORY),
      band(1.2, ALWAYS, 'cease-to-energize', 0, MEMORY),
    ],
  },
  II: {
    table: 15,
    bands: [
      band(0, 0.3, 'cease-to-energize', 0, CONFIRMED),
      band(0.3, 0.45, 'permissive', 0.16, CONFIRMED),
      band(0.45, 0.65, 'mandatory', 0.32, CONFIRMED),
      // T = 3 s + 8.7 s/pu (V - 0.65 pu): end points confirmed, the linear law from memory
      band(0.65, 0.88, 'mandatory', 3, CONFIRMED, 3 + 8.7 * (0.88 - 0.65)),
      band(0.88, 1.1, 'continuous', ALWAYS, CONFIRMED),
      band(1.1, 1.15, 'mandatory', 1, CONFIRMED),
      band(1.15, 1.175, 'mandatory', 0.5, CONFIRMED),
      band(1.175, 1.2, 'mandatory', 0.2, CONFIRMED),
      band(1.2, ALWAYS, 'cease-to-energize', 0, CONFIRMED),
    ],
  },
  III: {
    table: 16,
    bands: [
      // below 0.50 pu: momentary cessation for at least 1 s (from memory)
      band(0, 0.5, 'momentary-cessation', 1, MEMORY),
      band(0.5, 0.7, 'mandatory', 10, MEMORY),
      band(0.7, 0.88, 'mandatory', 20, MEMORY),
      band(0.88, 1.1, 'continuous', ALWAYS, MEMORY),
      band(1.1, 1.2, 'momentary-cessation', 12, MEMORY),
      band(1.2, ALWAYS, 'cease-to-energize', 0, MEMORY),
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
