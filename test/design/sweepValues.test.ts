// Source: none needed: parsing of sweep values (internal behaviour, no outside reference).
import { describe, expect, it } from 'vitest';
import { parseSweepSets } from '../../src/design/sweepValues.js';
import { CaseError } from '../../src/errors.js';

describe('parseSweepSets', () => {
  it('reads a list and keeps the other overrides fixed', () => {
    const s = parseSweepSets(['sources.0.energyKwh=500,1000, 2000', 'monteCarlo.horizonS=30']);
    expect(s.path).toBe('sources.0.energyKwh');
    expect(s.texts).toEqual(['500', '1000', '2000']);
    expect(s.numbers).toEqual([500, 1000, 2000]);
    expect(s.fixed).toEqual(['monteCarlo.horizonS=30']);
    const y = parseSweepSets(['a.b=[0.1, 0.2]', 'c={kind: fixed, value: 4}', 'x=1,2']);
    expect(y.path).toBe('x');
    expect(y.fixed).toEqual(['a.b=[0.1, 0.2]', 'c={kind: fixed, value: 4}']);
  });

  it('reads a range including its end, without binary round-off', () => {
    const s = parseSweepSets(['x=0:1:0.1']);
    expect(s.numbers).toHaveLength(11);
    expect(s.numbers?.[3]).toBe(0.3);
    expect(s.numbers?.[10]).toBe(1);
    expect(parseSweepSets(['x=2000:500:-500']).numbers).toEqual([2000, 1500, 1000, 500]);
    expect(parseSweepSets(['x=500:1200:250']).numbers).toEqual([500, 750, 1000]);
  });

  it('keeps non-numeric lists as text', () => {
    const s = parseSweepSets(['sources.1.operation=running,standby']);
    expect(s.numbers).toBeUndefined();
    expect(s.texts).toEqual(['running', 'standby']);
  });

  it('refuses zero or several swept parameters, bad ranges and empty items', () => {
    for (const bad of [
      ['x=1'],
      ['x=1,2', 'y=3,4'],
      ['x=0:1:0'],
      ['x=0:1:-1'],
      ['x=1,,2'],
      ['x=0:1e6:1'],
    ])
      expect(() => parseSweepSets(bad)).toThrow(CaseError);
  });
});
