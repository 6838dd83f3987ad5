import { describe, expect, it } from 'vitest';
import { CaseError } from '../../../src/errors.js';
import { resolveLimits, voltageBands } from '../../../src/grid/voltage/limit-bands.js';
import { inventedIslandInput, parseCase } from './fixtures.js';

describe('voltage and frequency bands', () => {
  it('holds ANSI C84.1 Range A as 114-126 V on 120 V (REFERENCES.md 3.1)', () => {
    expect(voltageBands['ansi-c84.1-range-a'].minPu * 120).toBeCloseTo(114, 12);
    expect(voltageBands['ansi-c84.1-range-a'].maxPu * 120).toBeCloseTo(126, 12);
    // Range B 110-127 V, from memory (ANSI C84.1-2016 Table 1)
    expect(voltageBands['ansi-c84.1-range-b'].provenance).toBe('from memory');
  });

  it('uses the EN 50160 island row +10 % / -15 % for 50 Hz islands (REFERENCES.md 3.2, caution 8)', () => {
    const input = inventedIslandInput();
    input.system.frequencyHz = 50;
    const l = resolveLimits(parseCase(input));
    expect([l.voltageMinPu, l.voltageMaxPu]).toEqual([0.85, 1.1]);
    // frequency: 50 Hz +/- 2 % (95 % of a week, island row)
    expect([l.frequencyMinHz, l.frequencyMaxHz]).toEqual([49, 51]);
  });

  it('defaults to Range A and the IEEE 1547 Table 18 slow elements for 60 Hz', () => {
    const l = resolveLimits(parseCase(inventedIslandInput()));
    expect(l.voltageMinPu).toBeCloseTo(0.95, 12);
    expect([l.frequencyMinHz, l.frequencyMaxHz]).toEqual([58.5, 61.2]);
    expect(l.dampingRatioMin).toBe(0.05);
  });

  it('asks for both custom limits and names the field', () => {
    const input = inventedIslandInput();
    input.limits = { voltageBand: 'custom', voltageMinPu: 0.9 };
    expect(() => resolveLimits(parseCase(input))).toThrow(CaseError);
    try {
      resolveLimits(parseCase(input));
    } catch (e) {
      expect((e as CaseError).problems[0]!.path).toBe('/limits/voltageMinPu');
    }
    input.limits = { voltageBand: 'custom', voltageMinPu: 0.9, voltageMaxPu: 1.08 };
    expect(resolveLimits(parseCase(input)).voltageMaxPu).toBe(1.08);
  });
});
