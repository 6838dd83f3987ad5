// Source: none needed: the run command end to end (CONTRACT.md exit codes and outputs).
/**
 * `holdfast run`, `replay` and `merge` in-process through the CLI frame: exit codes and outputs
 * of CONTRACT.md, the headline text with its caution, `--json`, and replay printing the same
 * figures as row K of scenarios.arrow.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { tableFromIPC } from 'apache-arrow';
import { describe, expect, it } from 'vitest';
import { memoryIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/program.js';
import { inventedRunInput } from './fixture.js';

describe('holdfast run / replay / merge on the command line', () => {
  const { input, dir } = inventedRunInput();

  it('runs, prints the headline risks with the caution, and writes the contract files', async () => {
    const io = memoryIo(dir);
    const code = await runCli(
      ['run', input.path, '--scenarios', '300', '--workers', '1', '--out', 'cli-out'],
      io,
    );
    expect(io.err).toBe('');
    expect(code).toBe(0);
    expect(io.out).toMatch(/shuts down in/);
    expect(io.out).toMatch(/Screening estimates only/);
    for (const f of ['scenarios.arrow', 'summary.arrow', 'exceedance.arrow', 'run.json'])
      expect(existsSync(join(dir, 'cli-out', f)), f).toBe(true);
  });

  it('prints the summary as JSON with --json', async () => {
    const io = memoryIo(dir);
    const code = await runCli(
      ['run', input.path, '--scenarios', '200', '--workers', '1', '--out', 'cli-json', '--json'],
      io,
    );
    expect(code).toBe(0);
    const parsed = JSON.parse(io.out) as {
      summary: { metric: string }[];
      manifest: { status: string };
    };
    expect(parsed.manifest.status).toBe('complete');
    expect(parsed.summary.map((r) => r.metric)).toContain('p_shutdown');
  });

  it('exits 2 naming the file for a missing case, writing nothing', async () => {
    const io = memoryIo(dir);
    const code = await runCli(['run', 'no-such.yaml', '--out', 'nothing'], io);
    expect(code).toBe(2);
    expect(io.err).toMatch(/^holdfast: .*no-such\.yaml/m);
    expect(existsSync(join(dir, 'nothing'))).toBe(false);
  });

  it('exits 1 when a --fail-if gate is exceeded and 2, before writing, for an unknown metric', async () => {
    const io = memoryIo(dir);
    const args = ['run', input.path, '--scenarios', '200', '--workers', '1', '--quiet'];
    // p_load_shed is tens of % on this invented case: its upper bound is far above 0.001
    expect(await runCli([...args, '--out', 'gate1', '--fail-if', 'p_load_shed>0.001'], io)).toBe(1);
    expect(io.err).toMatch(/p_load_shed: upper confidence bound .* EXCEEDED/);
    const bad = memoryIo(dir);
    expect(await runCli([...args, '--out', 'gate2', '--fail-if', 'p_nonsense>0.1'], bad)).toBe(2);
    expect(bad.err).toMatch(/unknown metric "p_nonsense"/);
    expect(existsSync(join(dir, 'gate2'))).toBe(false);
  });

  it('replays scenario K with the figures of row K', async () => {
    const k = 137;
    const t = tableFromIPC(readFileSync(join(dir, 'cli-out', 'scenarios.arrow')));
    const row = t.get(k)!.toJSON() as Record<string, unknown>;
    const io = memoryIo(dir);
    const code = await runCli(
      ['replay', input.path, '--scenario', String(k), '--out', 'replay', '--json'],
      io,
    );
    expect(code).toBe(0);
    const replayed = JSON.parse(io.out) as Record<string, unknown>;
    for (const name of [
      'nadir_hz',
      'zenith_hz',
      'rocof_max_hz_per_s',
      'shed_kw',
      'deficit_kw',
      'unserved_kwh',
    ])
      expect(replayed[name], name).toBe(row[name]);
    expect(replayed['shutdown']).toBe(row['shutdown']);
    const traj = tableFromIPC(readFileSync(join(dir, 'replay', 'trajectory.arrow')));
    expect(traj.schema.fields.map((f) => f.name)).toEqual([
      't_s',
      'f_hz',
      'rocof_hz_per_s',
      'p_g1_kw',
      'p_b1_kw',
      'load_kw',
      'shed_kw',
    ]);
    // the traced minimum cannot be below the located nadir (samples every 10 ms, nadir located exactly)
    const f = traj.getChild('f_hz')!.toArray() as Float64Array;
    expect(Math.min(...f)).toBeGreaterThanOrEqual((row['nadir_hz'] as number) - 1e-9);
  });

  it('merges two shard folders given on the command line', async () => {
    for (const i of [1, 2]) {
      const code = await runCli(
        [
          'run',
          input.path,
          '--scenarios',
          '300',
          '--workers',
          '1',
          '--shard',
          `${i}/2`,
          '--out',
          `s${i}`,
          '--quiet',
        ],
        memoryIo(dir),
      );
      expect(code).toBe(0);
    }
    const io = memoryIo(dir);
    expect(await runCli(['merge', 'merged', 's1', 's2', '--quiet'], io)).toBe(0);
    const a = tableFromIPC(readFileSync(join(dir, 'merged', 'scenarios.arrow')));
    const b = tableFromIPC(readFileSync(join(dir, 'cli-out', 'scenarios.arrow')));
    expect(a.numRows).toBe(300);
    expect(a.getChild('nadir_hz')!.toArray()).toEqual(b.getChild('nadir_hz')!.toArray());
    const again = memoryIo(dir);
    expect(await runCli(['merge', 'merged2', 's1', 's1'], again)).toBe(2);
    expect(again.err).toMatch(/overlap/);
  });
});
