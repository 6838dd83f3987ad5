// Source: none needed: the column dictionary against CONTRACT.md (internal behaviour).
/**
 * The column table against the contract (../shared/CONTRACT.md, "scenarios.arrow: required
 * columns"): every required column is present with its stated type, names are unique snake case
 * with a unit and a description, and the Arrow writer packs bool columns LSB first as the Arrow
 * columnar format specifies (arrow.apache.org, "Columnar format: validity bitmaps").
 */
import { describe, expect, it } from 'vitest';
import { packBits } from '../../src/results/arrow-writer.js';
import { allColumns, columnGroups, columnsOf } from '../../src/results/columns.js';

// CONTRACT.md: name -> type (float64 unless stated)
const contract: Record<string, string> = {
  scenario_id: 'int64',
  weight: 'float64',
  hour_of_year: 'int16',
  load_kw: 'float64',
  pv_kw: 'float64',
  wind_kw: 'float64',
  battery_soc: 'float64',
  grid_import_kw: 'float64',
  deficit_kw: 'float64',
  nadir_hz: 'float64',
  zenith_hz: 'float64',
  rocof_max_hz_per_s: 'float64',
  f_settled_hz: 'float64',
  shed_kw: 'float64',
  shed_stages: 'int8',
  shutdown: 'bool',
  shutdown_cause: 'category', // utf8 in the contract; written as Dictionary<Utf8>
  v_min_pu: 'float64',
  v_max_pu: 'float64',
  voltage_violation: 'bool',
  min_damping_ratio: 'float64',
  outage_h: 'float64',
  survived_h: 'float64',
  unserved_kwh: 'float64',
};

describe('the scenario column table', () => {
  it('has every contract column with its type', () => {
    const byName = new Map(allColumns.map((c) => [c.name, c]));
    for (const [name, kind] of Object.entries(contract))
      expect(byName.get(name)?.kind, name).toBe(kind);
  });

  it('has unique snake-case names, each with a unit and a description', () => {
    const names = allColumns.map((c) => c.name);
    expect(new Set(names).size).toBe(names.length);
    for (const c of allColumns) {
      expect(c.name).toMatch(/^[a-z][a-z0-9_]*$/);
      expect(c.unit.length, c.name).toBeGreaterThan(0);
      expect(c.description.length, c.name).toBeGreaterThan(10);
      expect(columnGroups).toContain(c.group);
    }
  });

  it('keeps category code 0 for "none" and selects columns by group in file order', () => {
    for (const c of allColumns.filter((x) => x.kind === 'category'))
      expect(c.categories!.length, c.name).toBeGreaterThan(1);
    expect(allColumns.find((c) => c.name === 'shutdown_cause')!.categories![0]).toBe('');
    const core = columnsOf(['core']).map((c) => c.name);
    expect(core).toEqual(['scenario_id', 'weight']);
  });

  it('packs bools least significant bit first, padded to 8 bytes', () => {
    const bits = packBits(Uint8Array.from([1, 0, 1, 1, 0, 0, 0, 0, 1]), 9);
    expect(bits.length).toBe(8);
    expect(bits[0]).toBe(0b00001101);
    expect(bits[1]).toBe(0b00000001);
  });
});
