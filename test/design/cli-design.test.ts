// Source: Newcombe, Stat Med 17:2635-2650, 1998 (paired square-and-add, method 10; REFERENCES.md 9.5); common random numbers (a standard Monte Carlo variance-reduction property, common practice, no source).
/**
 * `holdfast compare` and `holdfast sweep` in-process on the bundled demo case (cases/kestrel-island,
 * invented): exit codes of CONTRACT.md (2 for bad input with nothing written, 1 for an exceeded
 * gate), the contract tables read back with an independent reader (nodejs-polars), exactly zero
 * differences for identical designs, and the narrowing that common random numbers buy.
 * Small runs (200-300 scenarios, one worker): the machine is shared.
 */
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import pl from 'nodejs-polars';
import { describe, expect, it } from 'vitest';
import { memoryIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/program.js';
import { readArrowFile } from '../../src/design/designTable.js';

const demo = resolve('cases/kestrel-island.yaml');
const work = mkdtempSync(join(tmpdir(), 'holdfast-design-'));
const small = ['--scenarios', '300', '--workers', '1', '--quiet'];

interface JsonRow {
  metric: string;
  estimate: number;
  ciLow: number;
  ciHigh: number;
}
interface CompareJson {
  comparison: {
    metric: string;
    base: number;
    variant: number;
    difference: number;
    diffCiLow: number;
    diffCiHigh: number;
  }[];
  base: JsonRow[];
  variant: JsonRow[];
}

describe('holdfast compare', () => {
  it('exits 2 naming the allowed paths for a bad override path, and writes nothing', async () => {
    const io = memoryIo(work);
    const out = join(work, 'bad-path');
    const code = await runCli(
      ['compare', demo, '--set', 'sources.bess.energyKwhh=6000', '--out', out, ...small],
      io,
    );
    expect(code).toBe(2);
    expect(io.err).toMatch(/^holdfast: --set sources\.bess\.energyKwhh: /);
    expect(io.err).toContain('energyKwh');
    expect(io.err).not.toMatch(/\n\s+at /); // no stack trace
    expect(existsSync(out)).toBe(false);
  });

  it('exits 2 for a value of the wrong type, an unknown gate metric or no variant at all', async () => {
    for (const args of [
      ['--set', 'sources.bess.energyKwh=lots'],
      ['--set', 'sources.bess.energyKwh=6000', '--fail-if', 'p_blackout>0.1'],
      [],
    ]) {
      const io = memoryIo(work);
      const out = join(work, 'bad-value');
      expect(await runCli(['compare', demo, ...args, '--out', out, ...small], io)).toBe(2);
      expect(io.err).toMatch(/^holdfast: /);
      expect(existsSync(out)).toBe(false);
    }
  });

  it('gives exactly zero differences with zero-width intervals for a variant equal to the base', async () => {
    const io = memoryIo(work);
    const out = join(work, 'same');
    const code = await runCli(['compare', demo, demo, '--out', out, ...small.slice(0, 4)], io);
    expect(io.err).toBe('');
    expect(code).toBe(0);
    expect(io.out).toContain('Paired comparison on 300 common scenarios');
    expect(io.out).toContain('Screening estimates');
    // read back with an independent Arrow reader (TOOLCHAIN.md 4: pass the bytes)
    const df = pl.readIPC(readFileSync(join(out, 'comparison.arrow')));
    expect(df.columns.slice(0, 7)).toEqual([
      'metric',
      'base',
      'variant',
      'difference',
      'diff_ci_low',
      'diff_ci_high',
      'method',
    ]);
    expect(df.height).toBeGreaterThan(5);
    for (const name of ['difference', 'diff_ci_low', 'diff_ci_high'])
      for (const v of df.getColumn(name).toArray() as number[]) expect(v).toBe(0);
    const table = readArrowFile(join(out, 'comparison.arrow'));
    for (const f of table.schema.fields) {
      expect(f.metadata.get('unit'), f.name).toBeTruthy();
      expect(f.metadata.get('description'), f.name).toBeTruthy();
    }
    for (const d of ['base', 'variant'])
      for (const f of ['scenarios.arrow', 'summary.arrow', 'run.json', 'drivers.arrow'])
        expect(existsSync(join(out, d, f)), `${d}/${f}`).toBe(true);
    // drivers.arrow of a real run: per driver, weight shares times conditional probabilities
    // add back to the summary's estimate (law of total probability), read with polars
    const drivers = pl.readIPC(readFileSync(join(out, 'base', 'drivers.arrow')));
    const summary = pl.readIPC(readFileSync(join(out, 'base', 'summary.arrow')));
    const estimateOf = (m: string) =>
      (
        summary
          .filter(pl.col('metric').eq(pl.lit(m)))
          .getColumn('estimate')
          .toArray() as number[]
      )[0]!;
    for (const [outcome, metric] of [
      ['shutdown', 'p_shutdown'],
      ['load_shed', 'p_load_shed'],
    ] as const)
      for (const driver of ['month', 'hour_of_day', 'soc_band', 'deficit_band']) {
        const rows = drivers.filter(
          pl
            .col('outcome')
            .eq(pl.lit(outcome))
            .and(pl.col('driver').eq(pl.lit(driver))),
        );
        const q = rows.getColumn('weight_share').toArray() as number[];
        const p = rows.getColumn('probability').toArray() as number[];
        const total = q.reduce((s, x, i) => s + x * p[i]!, 0);
        expect(total, `${outcome} by ${driver}`).toBeCloseTo(estimateOf(metric), 12);
      }
  });

  it('gives a paired interval much narrower than the unpaired one on the demo case', async () => {
    const io = memoryIo(work);
    const out = join(work, 'paired');
    const code = await runCli(
      [
        'compare',
        demo,
        '--set',
        'sources.bess.virtualInertiaS=1',
        '--out',
        out,
        '--json',
        ...small.slice(0, 4),
      ],
      io,
    );
    expect(code).toBe(0);
    const parsed = JSON.parse(io.out) as CompareJson;
    const row = parsed.comparison.find((r) => r.metric === 'p_load_shed')!;
    const b = parsed.base.find((r) => r.metric === 'p_load_shed')!;
    const v = parsed.variant.find((r) => r.metric === 'p_load_shed')!;
    // unpaired square-and-add for independent samples from each design's own interval
    // (Newcombe, Stat Med 17:873-890, 1998, method 10): what the difference would carry if the
    // two designs had been run on independent scenarios
    const unpairedWidth =
      Math.sqrt((v.estimate - v.ciLow) ** 2 + (b.ciHigh - b.estimate) ** 2) +
      Math.sqrt((v.ciHigh - v.estimate) ** 2 + (b.estimate - b.ciLow) ** 2);
    const pairedWidth = row.diffCiHigh - row.diffCiLow;
    // measured 2.36 (300 scenarios, battery virtual inertia 3 s -> 1 s, load shedding 7.3 % ->
    // 9.0 %): common random numbers leave only the discordant scenarios. The ratio is
    // sqrt((p1 q1 + p2 q2) / discordant share) roughly, so a change with a large effect (battery
    // rating 1500 -> 1000 kW: 7.3 % -> 17 %, nearly all pairs one-sided) gives only ~1.5.
    expect(unpairedWidth / pairedWidth).toBeGreaterThan(2);
    // the mean shed load: paired normal interval on per-scenario differences against the two
    // separate normal intervals combined as independent (sqrt of the sum of squared half-widths);
    // measured 7.1, asserted 3
    const mr = parsed.comparison.find((r) => r.metric === 'expected_shed_kw')!;
    const mb = parsed.base.find((r) => r.metric === 'expected_shed_kw')!;
    const mv = parsed.variant.find((r) => r.metric === 'expected_shed_kw')!;
    const unpairedMean = 2 * Math.hypot((mb.ciHigh - mb.ciLow) / 2, (mv.ciHigh - mv.ciLow) / 2);
    expect(unpairedMean / (mr.diffCiHigh - mr.diffCiLow)).toBeGreaterThan(3);
    expect(row.difference).toBeCloseTo(v.estimate - b.estimate, 12);
    // common random numbers: the battery rating moves none of the sampled conditions, so the
    // sampler's columns agree scenario by scenario (rows are written in scenario-id order)
    const sb = readArrowFile(join(out, 'base', 'scenarios.arrow'));
    const sv = readArrowFile(join(out, 'variant', 'scenarios.arrow'));
    for (const name of [
      'scenario_id',
      'hour_of_year',
      'load_kw',
      'pv_kw',
      'wind_kw',
      'outage_duration_h',
    ])
      expect([...sv.getChild(name)!], name).toEqual([...sb.getChild(name)!]);
  });

  it('exits 1 when the variant exceeds a risk gate on its upper confidence bound', async () => {
    const io = memoryIo(work);
    const out = join(work, 'gate');
    const code = await runCli(
      [
        'compare',
        demo,
        '--set',
        'sources.bess.ratingKw=1000',
        '--out',
        out,
        '--fail-if',
        'p_load_shed>0.0001',
        '--fail-if',
        'p_shutdown<0',
        ...small,
      ],
      io,
    );
    expect(code).toBe(1);
    expect(io.err).toMatch(/variant p_load_shed: upper confidence bound .* > 0\.0001: EXCEEDED/);
    expect(io.err).toMatch(/variant p_shutdown: lower confidence bound \S+ < 0: ok/);
  });
});

describe('holdfast sweep', () => {
  it('exits 2 for a bad value in the list before running anything', async () => {
    const io = memoryIo(work);
    const out = join(work, 'sweep-bad');
    const code = await runCli(
      ['sweep', demo, '--set', 'sources.bess.ratingKw=500,abc,1500', '--out', out, ...small],
      io,
    );
    expect(code).toBe(2);
    expect(io.err).toMatch(/^holdfast: .*ratingKw/);
    expect(existsSync(out)).toBe(false);
  });

  it('writes sweep.arrow with one row per value and every metric with its interval', async () => {
    const io = memoryIo(work);
    const out = join(work, 'sweep');
    const code = await runCli(
      [
        'sweep',
        demo,
        '--set',
        'sources.bess.ratingKw=500:1500:500',
        '--out',
        out,
        '--scenarios',
        '200',
        '--workers',
        '1',
      ],
      io,
    );
    expect(io.err).toBe('');
    expect(code).toBe(0);
    expect(io.out).toContain('Sweep of sources.bess.ratingKw');
    expect(io.out).toMatch(/knee/i);
    expect(io.out).toMatch(
      /What each step buys[^\n]*\n {2}load-shedding probability: 500 -> 1000 \S+ \(/,
    );
    const df = pl.readIPC(readFileSync(join(out, 'sweep.arrow')));
    expect(df.height).toBe(3);
    expect(df.getColumn('value').toArray()).toEqual([500, 1000, 1500]);
    expect(new Set(df.getColumn('parameter').toArray())).toEqual(
      new Set(['sources.bess.ratingKw']),
    );
    for (const m of ['p_load_shed', 'p_shutdown'])
      for (const suffix of ['', '_ci_low', '_ci_high'])
        expect(df.columns).toContain(`${m}${suffix}`);
    const est = df.getColumn('p_load_shed').toArray() as number[];
    const lo = df.getColumn('p_load_shed_ci_low').toArray() as number[];
    const hi = df.getColumn('p_load_shed_ci_high').toArray() as number[];
    est.forEach((e, i) => {
      expect(lo[i]!).toBeLessThanOrEqual(e);
      expect(hi[i]!).toBeGreaterThanOrEqual(e);
    });
  });
});
