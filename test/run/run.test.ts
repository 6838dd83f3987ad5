// Source: none needed: determinism across workers, shards and resume (CONTRACT.md "Determinism").
/**
 * The pool end to end on a small invented case: determinism across workers and batch sizes,
 * shards merged equal one run, resume after a deterministic interruption equals an
 * uninterrupted run, and a failing scenario ends the run with its id (never dropped rows).
 * The files are read back with nodejs-polars 0.25.2, an Arrow reader independent of the writer.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import pl from 'nodejs-polars';
import { describe, expect, it } from 'vitest';
import { RunError } from '../../src/errors.js';
import { mergeShards } from '../../src/run/merge.js';
import { runAssessment } from '../../src/run/run.js';
import { inventedRunInput } from './fixture.js';

/** All rows of an Arrow IPC file, read by polars (from a Buffer: TOOLCHAIN.md 4). */
function readRows(path: string): Record<string, unknown>[] {
  return pl.readIPC(readFileSync(path)).toRecords() as Record<string, unknown>[];
}

function readJson(path: string): Record<string, unknown> {
  return JSON.parse(readFileSync(path, 'utf8')) as Record<string, unknown>;
}

const n = 450; // 5 feed blocks of 100, the last one partial; small enough for 2 shared cores

describe('runAssessment', () => {
  const { input, dir } = inventedRunInput();

  it('writes the same rows and summary with 1 or 2 workers and any batch size', async () => {
    const one = await runAssessment(input, {
      outDir: join(dir, 'w1'),
      scenarios: n,
      workers: 1,
      batchSize: 500,
    });
    const two = await runAssessment(input, {
      outDir: join(dir, 'w2'),
      scenarios: n,
      workers: 2,
      batchSize: 200,
    });
    expect(one.status).toBe('complete');
    expect(two.status).toBe('complete');
    const a = readRows(one.paths.scenarios);
    expect(a.length).toBe(n);
    expect(a.map((r) => Number(r['scenario_id']))).toEqual(Array.from({ length: n }, (_, i) => i));
    expect(readRows(two.paths.scenarios)).toEqual(a);
    expect(two.summary).toEqual(one.summary);
  });

  it('merges 3 shards into exactly the unsharded run', async () => {
    const whole = await runAssessment(input, {
      outDir: join(dir, 'whole'),
      scenarios: n,
      workers: 2,
      batchSize: 300,
    });
    const shardDirs: string[] = [];
    for (let i = 1; i <= 3; i++) {
      const d = join(dir, `shard${i}`);
      const o = await runAssessment(input, {
        outDir: d,
        scenarios: n,
        workers: 1,
        shard: { index: i, count: 3 },
      });
      expect(o.manifest.shard).toEqual({ index: i, count: 3 });
      shardDirs.push(d);
    }
    // given out of order on purpose: merge sorts by scenario id
    const merged = await mergeShards(join(dir, 'merged'), [
      shardDirs[2]!,
      shardDirs[0]!,
      shardDirs[1]!,
    ]);
    expect(merged.status).toBe('complete');
    expect(readRows(merged.paths.scenarios)).toEqual(readRows(whole.paths.scenarios));
    expect(merged.summary).toEqual(whole.summary);
  });

  it('refuses to merge overlapping shards', async () => {
    const d = join(dir, 'dup');
    await runAssessment(input, {
      outDir: d,
      scenarios: n,
      workers: 1,
      shard: { index: 1, count: 2 },
    });
    await expect(mergeShards(join(dir, 'dup-merged'), [d, d])).rejects.toThrow(/overlap/);
  });

  it('resumes an interrupted run to the uninterrupted result', async () => {
    const whole = await runAssessment(input, {
      outDir: join(dir, 'ref'),
      scenarios: 600,
      workers: 1,
      batchSize: 100,
    });
    const d = join(dir, 'resumed');
    // stop requested after 1 written batch; the batches in flight (window 4) are finished first
    const cut = await runAssessment(input, {
      outDir: d,
      scenarios: 600,
      workers: 1,
      batchSize: 100,
      stopAfterBatches: 1,
    });
    expect(cut.status).toBe('partial');
    expect(cut.stopReason).toBe('interrupted');
    const partialRows = readRows(cut.paths.scenarios);
    expect(partialRows.length).toBe(cut.manifest.scenarioCount);
    expect(partialRows.length).toBeLessThan(600);
    expect(readJson(join(d, 'run.json'))['status']).toBe('partial');
    const resumed = await runAssessment(input, {
      outDir: d,
      scenarios: 600,
      workers: 2,
      batchSize: 300,
      resume: true,
    });
    expect(resumed.status).toBe('complete');
    expect(readRows(resumed.paths.scenarios)).toEqual(readRows(whole.paths.scenarios));
    expect(resumed.summary).toEqual(whole.summary);
  });

  it('refuses to resume with another seed', async () => {
    const d = join(dir, 'resume-seed');
    await runAssessment(input, {
      outDir: d,
      scenarios: 500,
      workers: 1,
      batchSize: 100,
      stopAfterBatches: 1,
    });
    await expect(
      runAssessment(input, { outDir: d, scenarios: 500, seed: 99, workers: 1, resume: true }),
    ).rejects.toThrow(/seed/);
  });

  it('fails with the scenario id when a scenario throws, keeping the rows before it', async () => {
    const d = join(dir, 'throws');
    const run = runAssessment(input, {
      outDir: d,
      scenarios: n,
      workers: 2,
      batchSize: 200,
      faults: { throwAtScenarioId: 277 },
    });
    await expect(run).rejects.toThrow(RunError);
    await expect(run).rejects.toThrow(/scenario 277/);
    const m = readJson(join(d, 'run.json'));
    expect(m['status']).toBe('partial');
    const rows = readRows(join(d, 'scenarios.arrow'));
    expect(rows.length).toBe(m['scenarioCount']);
    expect(rows.length).toBeLessThanOrEqual(200); // only the contiguous prefix before batch 200-399
    expect(rows.map((r) => Number(r['scenario_id']))).toEqual(
      Array.from({ length: rows.length }, (_, i) => i),
    );
  });

  it('fails with the scenario id when a worker dies, after one retry', async () => {
    const d = join(dir, 'crash');
    await expect(
      runAssessment(input, {
        outDir: d,
        scenarios: 600,
        workers: 2,
        batchSize: 200,
        faults: { crashAtScenarioId: 345 },
      }),
    ).rejects.toThrow(/scenario 345 failed twice/);
  });
});
