// Source: independent readers (nodejs-polars for Arrow IPC, DuckDB for Parquet) against summary.arrow (REFERENCES.md 9 estimators).
/**
 * Independent readers of the run's files: nodejs-polars 0.25.2 (the Rust polars Arrow IPC reader)
 * on scenarios.arrow and summary.arrow, and DuckDB (@duckdb/node-api) on the Parquet copies.
 * Row count, column types and p_shutdown recomputed from the rows equal the summary.
 * Weighted proportion p = sum(w * shutdown) / sum(w): REFERENCES.md 9 (the estimator the stats
 * module documents); with weight 1 it is the plain fraction.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { DuckDBInstance } from '@duckdb/node-api';
import pl from 'nodejs-polars';
import { beforeAll, describe, expect, it } from 'vitest';
import { allColumns } from '../../src/results/columns.js';
import { type RunOutcome, runAssessment } from '../../src/run/run.js';
import { inventedRunInput } from './fixture.js';

const n = 400;

describe('the files of a run, read by other programs', () => {
  let out: RunOutcome;
  beforeAll(async () => {
    const { input, dir } = inventedRunInput();
    out = await runAssessment(input, {
      outDir: join(dir, 'out'),
      scenarios: n,
      workers: 2,
      batchSize: 100,
      parquet: true,
    });
  });

  it('polars reads scenarios.arrow with the contract types and the row count', () => {
    const df = pl.readIPC(readFileSync(out.paths.scenarios));
    expect(df.height).toBe(n);
    const types = Object.fromEntries(df.columns.map((c, k) => [c, String(df.dtypes[k])]));
    expect(types['scenario_id']).toBe('DataType(Int64)');
    expect(types['weight']).toBe('DataType(Float64)');
    expect(types['hour_of_year']).toBe('DataType(Int16)');
    expect(types['shed_stages']).toBe('DataType(Int8)');
    expect(types['shutdown']).toBe('DataType(Bool)');
    expect(types['shutdown_cause']).toBe('DataType(Categorical)');
    expect(types['nadir_hz']).toBe('DataType(Float64)');
    // only columns of the models in this build, each of them documented
    expect(df.columns).toEqual(
      allColumns.filter((c) => out.manifest.columnGroups.includes(c.group)).map((c) => c.name),
    );
  });

  it('p_shutdown recomputed by polars from the rows equals summary.arrow', () => {
    const df = pl.readIPC(readFileSync(out.paths.scenarios));
    const summary = pl.readIPC(readFileSync(out.paths.summary));
    const row = summary.filter(pl.col('metric').eq(pl.lit('p_shutdown'))).toRecords()[0]!;
    // polars sums bool as bool: cast first (TOOLCHAIN.md 4)
    const shut = df.getColumn('shutdown').cast(pl.Float64);
    const w = df.getColumn('weight');
    const p = (shut.mul(w).sum() as number) / (w.sum() as number);
    expect(p).toBeGreaterThan(0); // the invented case sheds and shuts down now and then
    expect(row['estimate']).toBeCloseTo(p, 14); // exact sums on both sides; 1e-14 for rounding
    expect(Number(row['n_scenarios'])).toBe(n);
    // a shutdown has a cause and only a shutdown has one
    const causes = df.select('shutdown', 'shutdown_cause').toRecords();
    for (const r of causes) expect(r['shutdown'] === (r['shutdown_cause'] !== '')).toBe(true);
  });

  it('every field of the Arrow files carries unit and description metadata', async () => {
    const { tableFromIPC } = await import('apache-arrow');
    for (const path of [out.paths.scenarios, out.paths.summary, out.paths.exceedance]) {
      const t = tableFromIPC(readFileSync(path));
      for (const f of t.schema.fields) {
        expect(f.metadata.get('unit'), `${path} ${f.name}`).toBeTruthy();
        expect(f.metadata.get('description'), `${path} ${f.name}`).toBeTruthy();
      }
    }
  });

  it('DuckDB reads the Parquet copy with the same count and p_shutdown', async () => {
    const db = await DuckDBInstance.create(':memory:');
    const con = await db.connect();
    const file = join(out.paths.dir, 'scenarios.parquet');
    const reader = await con.runAndReadAll(
      `select count(*), sum(weight * cast(shutdown as double)) / sum(weight), typeof(first(scenario_id)) from read_parquet('${file}')`,
    );
    const [count, p, idType] = reader.getRows()[0]!;
    expect(Number(count)).toBe(n);
    expect(idType).toBe('BIGINT');
    const estimate = out.summary.find((r) => r.metric === 'p_shutdown')!.estimate;
    expect(p as number).toBeCloseTo(estimate, 14);
    con.closeSync();
  });
});
