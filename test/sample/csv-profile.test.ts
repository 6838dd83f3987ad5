// Source: none needed: CSV profile reading and its error messages (internal behaviour).
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { CaseError } from '../../src/errors.js';
import { readCsvProfile } from '../../src/sample/csv-profile.js';
import { compileSampler, sampleScenario } from '../../src/sample/sampler.js';
import { Scenario } from '../../src/sample/scenario.js';
import { inventedCase } from './fixture.js';

const dir = mkdtempSync(join(tmpdir(), 'holdfast-csv-'));
function write(name: string, lines: string[]): string {
  writeFileSync(join(dir, name), `${lines.join('\n')}\n`);
  return name;
}
const hours = Array.from({ length: 8760 }, (_, h) => ((h % 24) / 24).toFixed(4));

function problem(file: string, column: string | number = 0): string {
  try {
    readCsvProfile({ file, column, path: '/loads/0/profile' }, dir, new Map());
  } catch (err) {
    expect(err).toBeInstanceOf(CaseError);
    const e = err as CaseError;
    expect(e.problems[0]!.path).toBe('/loads/0/profile/file');
    return e.problems[0]!.message;
  }
  throw new Error('expected a CaseError');
}

describe('CSV profiles', () => {
  it('reads a headed column by name and a bare column by index', () => {
    write('good.csv', ['hour,fraction', ...hours.map((v, h) => `${h},${v}`)]);
    const byName = readCsvProfile(
      { file: 'good.csv', column: 'fraction', path: '/p' },
      dir,
      new Map(),
    );
    const byIndex = readCsvProfile({ file: 'good.csv', column: 1, path: '/p' }, dir, new Map());
    expect(byName[13]).toBeCloseTo(13 / 24, 4);
    expect([...byIndex]).toEqual([...byName]);
  });

  it('names the file and the row count when the length is wrong', () => {
    write('short.csv', hours.slice(0, 8759));
    expect(problem('short.csv')).toMatch(/short\.csv: expected 8760 hourly rows, found 8759/);
  });

  it('names file, line and column of a gap, a non-number and a negative value', () => {
    const gap = [...hours];
    gap[99] = '';
    write('gap.csv', gap);
    expect(problem('gap.csv')).toMatch(/gap\.csv line 100: empty line/);
    const hole = hours.map((v) => `1,${v}`);
    hole[41] = '1,';
    write('hole.csv', hole);
    expect(problem('hole.csv', 1)).toMatch(/hole\.csv line 42 column 2: missing value/);
    const word = [...hours];
    word[6] = 'n/a';
    write('word.csv', ['cf', ...word]);
    expect(problem('word.csv')).toMatch(
      /word\.csv line 8 column 1: expected a non-negative number, found "n\/a"/,
    );
    const neg = [...hours];
    neg[9] = '-0.5';
    write('neg.csv', neg);
    expect(problem('neg.csv')).toMatch(
      /neg\.csv line 10 column 1: expected a non-negative number, found -0\.5/,
    );
  });

  it('reports a missing file and a missing header column', () => {
    expect(problem('nope.csv')).toMatch(/cannot read CSV profile nope\.csv/);
    write('noname.csv', ['a,b', ...hours.map((v) => `${v},${v}`)]);
    try {
      readCsvProfile({ file: 'noname.csv', column: 'load', path: '/x' }, dir, new Map());
      throw new Error('expected a CaseError');
    } catch (err) {
      expect((err as CaseError).problems[0]!.path).toBe('/x/column');
    }
  });

  it('drives a load (fractions of peakKw) and a PV capacity factor in the sampler', () => {
    write('load.csv', ['fraction', ...hours]);
    write(
      'pv.csv',
      hours.map((_, h) => (h % 24 >= 8 && h % 24 < 17 ? '0.5' : '0')),
    );
    const c = inventedCase((x) => {
      x.loads[0]!.profile = { kind: 'csv', file: 'load.csv', column: 'fraction' };
      const pv = x.sources[3]!;
      if (pv.kind === 'pv') pv.resource = { kind: 'csv', file: 'pv.csv' };
    });
    const ctx = compileSampler(c, dir);
    const s = new Scenario(c.sources.length, c.loads.length);
    for (let id = 0; id < 200; id++) {
      sampleScenario(ctx, 1, id, s);
      const hod = s.hourOfYear % 24;
      expect(s.loadKw[0]).toBeCloseTo(600 * Number((hod / 24).toFixed(4)), 9);
      if (s.available[3] === 1) expect(s.availableKw[3]).toBe(hod >= 8 && hod < 17 ? 300 : 0);
    }
  });

  it('fails compileSampler with the case path of a bad profile', () => {
    const c = inventedCase((x) => {
      const w = x.sources[4]!;
      if (w.kind === 'wind') w.resource = { kind: 'csv', file: 'short.csv' };
    });
    expect(() => compileSampler(c, dir)).toThrow(/short\.csv: expected 8760/);
    try {
      compileSampler(c, dir);
    } catch (err) {
      expect((err as CaseError).problems[0]!.path).toBe('/sources/4/resource/file');
    }
  });
});
