/**
 * `npm run bench`: every speed and memory figure of the project in one run, written to
 * results/bench.json (CONTRACT.md "The benchmark") and printed. Speed goals are checked here,
 * never in a timed test.
 *
 * Options: `--quick` skips the two memory runs (the 1e6-scenario run takes minutes);
 * `--out FILE` writes elsewhere.
 */
import { mkdirSync, renameSync, writeFileSync } from 'node:fs';
import { availableParallelism, cpus, totalmem } from 'node:os';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { benchEnergy } from './energy.js';
import { benchFrequency } from './frequency.js';
import { benchPool, peakRssMb, writerPeakRssMb } from './pool.js';
import { benchSampler } from './sampler.js';
import { benchVoltage } from './voltage.js';

type Figures = Record<string, number>;

function prefixed(prefix: string, figures: Figures): Figures {
  const out: Figures = {};
  for (const [k, v] of Object.entries(figures)) out[`${prefix}${k}`] = v;
  return out;
}

async function timed<T>(label: string, f: () => Promise<T> | T): Promise<T> {
  const t0 = performance.now();
  process.stderr.write(`holdfast bench: ${label} ...`);
  const r = await f();
  process.stderr.write(` ${((performance.now() - t0) / 1000).toFixed(1)} s\n`);
  return r;
}

async function main(argv: string[]): Promise<void> {
  const quick = argv.includes('--quick');
  const outIdx = argv.indexOf('--out');
  const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
  const outFile = outIdx >= 0 ? resolve(argv[outIdx + 1]!) : resolve(root, 'results/bench.json');

  const frequency = await timed('frequency engine', () => benchFrequency());
  const sampler = await timed('sampler', () => benchSampler());
  const voltage = await timed('voltage stage', () => benchVoltage());
  const energy = await timed('outage energy balance', () => benchEnergy());
  const pool = await timed('pool and writer', () => benchPool());
  const memory: Figures = {};
  if (!quick) {
    memory.peak_rss_mb_1e6 = await timed('1e6-scenario run (memory)', () => peakRssMb(1_000_000));
    memory.writer_peak_rss_mb_1e7 = await timed('1e7-row writer (memory)', () =>
      writerPeakRssMb(10_000_000),
    );
  }

  const report = {
    machine: {
      cores: availableParallelism(),
      cpu_model: cpus()[0]?.model ?? 'unknown',
      memory_gb: Math.round(totalmem() / 2 ** 30),
      node_version: process.version,
      platform: `${process.platform}-${process.arch}`,
    },
    measured_at: new Date().toISOString(),
    // The contract's headline figures first, then everything each stage reports.
    events_per_s_thread: frequency.events_per_s_thread,
    events_per_s_thread_50_sources: frequency.events_per_s_thread_50_sources,
    full_scenarios_per_s_thread: pool.full_scenarios_per_s_thread,
    full_scenarios_per_s_all_workers: pool.full_scenarios_per_s_all_workers,
    parallel_efficiency: pool.parallel_efficiency,
    naive_events_per_s: frequency.naive_events_per_s,
    peak_rss_mb_1e6: memory.peak_rss_mb_1e6 ?? null,
    nadir_error_p99_hz: frequency.nadir_error_p99_hz,
    ...prefixed('frequency.', frequency),
    ...prefixed('sampler.', sampler),
    ...prefixed('voltage.', voltage),
    ...prefixed('energy.', energy),
    ...prefixed('pool.', pool),
    ...prefixed('memory.', memory),
  };
  mkdirSync(dirname(outFile), { recursive: true });
  const tmp = `${outFile}.${process.pid}.tmp`;
  writeFileSync(tmp, `${JSON.stringify(report, null, 2)}\n`);
  renameSync(tmp, outFile);
  process.stdout.write(`${JSON.stringify(report, null, 2)}\n`);
}

main(process.argv.slice(2)).catch((err: unknown) => {
  process.stderr.write(`holdfast bench: ${err instanceof Error ? err.message : String(err)}\n`);
  process.exitCode = 3;
});
