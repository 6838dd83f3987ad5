// Source: none needed: the sources_out column (internal behaviour).
/**
 * The `sources_out` column: per scenario the ids of the sources unavailable at the event hour
 * (forced outage or maintenance), joined by '+'. Checked against the case itself (a source
 * inside its maintenance window is out; the count agrees with `sources_available`) and through
 * the Arrow writer and reader (a Utf8 field with unit and description metadata, rows unchanged).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { tableFromIPC, Utf8 } from 'apache-arrow';
import { describe, expect, it } from 'vitest';
import { caseSchema } from '../../src/case/schema.js';
import { toColumnBatch } from '../../src/results/arrow-reader.js';
import { BatchEncoder, writeSmallArrowFile } from '../../src/results/arrow-writer.js';
import { utf8At } from '../../src/results/columns.js';
import { compileKernel } from '../../src/run/kernel.js';
import { inventedCaseInput, inventedRunInput } from './fixture.js';

// Invented: g1 out a third of the time, b1 in maintenance for the whole of hours 0-4379.
const input = structuredClone(inventedCaseInput) as typeof inventedCaseInput;
input.sources = [
  { ...input.sources[0]!, forcedOutageRate: 0.3 } as (typeof input.sources)[number],
  {
    ...input.sources[1]!,
    forcedOutageRate: 0,
    maintenance: [{ startHour: 0, durationH: 4380 }],
  } as (typeof input.sources)[number],
];
const c = caseSchema.parse(input);
const count = 300;

describe('sources_out', () => {
  const kernel = compileKernel(c, '.', { seed: 11 });
  const batch = kernel.runBatch(0, count);
  const text = (row: number) => utf8At(batch.columns['sources_out'] as Uint8Array, count, row);

  it('lists the sources in maintenance and agrees with sources_available', () => {
    const hour = batch.columns['hour_of_year'] as Int16Array;
    const available = batch.columns['sources_available'] as Int16Array;
    const seen = new Set<string>();
    for (let row = 0; row < count; row++) {
      const ids = text(row) === '' ? [] : text(row).split('+');
      seen.add(text(row));
      // a source inside its maintenance window is unavailable (schema: maintenance)
      expect(ids.includes('b1')).toBe(hour[row]! < 4380);
      expect(ids.length).toBe(c.sources.length - available[row]!);
      // case order, no repeats
      expect(ids).toEqual(c.sources.map((s) => s.id).filter((id) => ids.includes(id)));
    }
    // with FOR 0.3 and half the year in maintenance, all four combinations occur in 300 rows
    // (the rarest, 0.35 * 0.5 or 0.15 * 0.5, is expected about 22 times)
    expect([...seen].sort()).toEqual(['', 'b1', 'g1', 'g1+b1']);
  });

  it('is the same row whatever the batch it is computed in', () => {
    const single = compileKernel(c, '.', { seed: 11 }).runBatch(137, 1);
    expect(utf8At(single.columns['sources_out'] as Uint8Array, 1, 0)).toBe(text(137));
  });

  it('goes through the Arrow writer and reader as a Utf8 field with unit and description', async () => {
    const { dir } = inventedRunInput();
    const path = join(dir, 'rows.arrow');
    await writeSmallArrowFile(path, kernel.specs, batch);
    const table = tableFromIPC(readFileSync(path));
    const field = table.schema.fields.find((f) => f.name === 'sources_out')!;
    expect(field.type).toBeInstanceOf(Utf8);
    expect(field.metadata.get('unit')).toBe('1');
    expect(field.metadata.get('description')).toMatch(/forced outage or maintenance/);
    const column = table.getChild('sources_out')!;
    for (let row = 0; row < count; row++) expect(column.get(row)).toBe(text(row));
    // and back into a column batch, byte for byte
    const encoder = new BatchEncoder(kernel.specs);
    const back = toColumnBatch(encoder.encode(batch), kernel.specs, path);
    expect(back.columns['sources_out']).toEqual(batch.columns['sources_out']);
  });
});
