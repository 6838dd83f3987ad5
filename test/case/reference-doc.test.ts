// Source: none needed: the generated case-file reference matches the schema (internal behaviour).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { caseReferenceMarkdown, unitOfKey } from '../../src/case/reference-doc.js';

describe('the case file reference', () => {
  it('docs/case-file.md is what `holdfast schema --markdown` prints (regenerate it if not)', () => {
    expect(readFileSync('docs/case-file.md', 'utf8')).toBe(caseReferenceMarkdown());
  });

  it('lists every kind of source and the cautions', () => {
    const md = caseReferenceMarkdown();
    for (const kind of ['genset', 'battery', 'pv', 'wind', 'fuelcell'])
      expect(md).toContain(`sources[] (kind: ${kind})`);
    expect(md).toContain('## Cautions');
  });

  it('reads the unit from the key name', () => {
    expect(unitOfKey('ratingKw')).toBe('kW');
    expect(unitOfKey('energyKwh')).toBe('kWh');
    expect(unitOfKey('inertiaS')).toBe('s');
    expect(unitOfKey('rocofHzPerS')).toBe('Hz/s');
    expect(unitOfKey('rocofGainPuPerHzPerS')).toBe('pu per Hz/s');
    expect(unitOfKey('islandingRatePerYear')).toBe('1/year');
    expect(unitOfKey('xOhm')).toBe('Ω');
    expect(unitOfKey('name')).toBe('');
    expect(unitOfKey('kind')).toBe('');
  });
});
